// Record numbers given per calendar year (DEV-2026-0001, CAR-2026-0001, NCR-2026-0001) from the counter row of the
// series, which the taking transaction holds until it ends: numbers follow one another without gaps
// from committed records and never repeat.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';

export async function nextYearlyNumber(series: 'DEV' | 'CAR' | 'NCR', transaction: Transaction) {
  const year = new Date().getUTCFullYear();
  const [{ last }] = await sequelize.query<{ last: number }>(
    `INSERT INTO record_counters (series, year, last) VALUES (:series, :year, 1)
     ON CONFLICT (series, year) DO UPDATE SET last = record_counters.last + 1 RETURNING last`,
    { type: QueryTypes.SELECT, transaction, replacements: { series, year } },
  );
  return `${series}-${year}-${String(last).padStart(4, '0')}`;
}
