// Existing records: lots decided before NCRs existed get the NCR their decision would open now. Such a
// lot is made here by deciding it and then removing the NCR the decision opened, in a transaction of
// the database owner (who runs migrations) that is rolled back after the migration's work has run.
import { QueryTypes, Sequelize, type Transaction } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { openNcrsForEarlierDecisions } from '../../db/migrations/20261202-1002-ncrs-for-earlier-decisions';
import { as } from '../../tests/helpers/api';
import { benchFile, sampleOf, signDecision, uploadBench } from '../../tests/helpers/bench';
import { receivedLot } from '../../tests/helpers/receivedLot';
import { config } from '../config';

const owner = new Sequelize(process.env.MIGRATION_DATABASE_URL ?? config.DATABASE_URL, { dialect: 'postgres', logging: false, pool: { max: 1 } });
afterAll(() => owner.close());

async function rolledBack<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  const transaction = await owner.transaction();
  try {
    return await work(transaction);
  } finally {
    await transaction.rollback();
  }
}

async function forgetNcrs(lotIds: number[], transaction: Transaction) {
  const run = (sql: string) => owner.query(sql, { transaction, replacements: { lotIds } });
  await run('DELETE FROM nonconformance_defects WHERE nonconformance_id IN (SELECT id FROM nonconformances WHERE lot_id IN (:lotIds))');
  await run('DELETE FROM nonconformance_pieces WHERE nonconformance_id IN (SELECT id FROM nonconformances WHERE lot_id IN (:lotIds))');
  await run('DELETE FROM nonconformances WHERE lot_id IN (:lotIds)');
}

async function decided(decision: 'reject' | 'accept', quantity: number, aql: number, bad: number) {
  const lot = await receivedLot({ quantity, level: 'II', aql });
  const { sample } = await sampleOf(lot.lotId);
  await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, sample.slice(0, bad)));
  await signDecision(lot.lotId, decision, null);
  return { ...lot, failed: sample.slice(0, bad) };
}

describe('migration 1002: NCRs for lots decided earlier', () => {
  it('opens one NCR per rejected lot (its pieces, failing reasons, defect codes) and per accepted lot with failed pieces, numbered in the decision year and audited', async () => {
    const rejected = await decided('reject', 30, 1, 2);
    const accepted = await decided('accept', 60, 2.5, 1);
    const clean = await decided('accept', 20, 1, 0);
    const lotIds = [rejected.lotId, accepted.lotId, clean.lotId];
    const expected = (await (await as('auditor')).get(`/api/nonconformances?lotId=${rejected.lotId}`).expect(200)).body.data[0];

    const result = await rolledBack(async (transaction) => {
      await forgetNcrs(lotIds, transaction);
      const opened = await openNcrsForEarlierDecisions(owner, transaction);
      const ncrs = await owner.query<{
        id: number;
        number: string;
        origin: string;
        lotId: number;
        status: string;
        pieces: number;
        failing: number;
        defects: string[];
        audited: number;
      }>(
        `SELECT n.id, n.number, n.origin, n.lot_id AS "lotId", n.status,
                (SELECT count(*)::int FROM nonconformance_pieces np WHERE np.nonconformance_id = n.id) AS pieces,
                (SELECT count(*)::int FROM nonconformance_pieces np WHERE np.nonconformance_id = n.id AND jsonb_array_length(np.reasons) > 0) AS failing,
                (SELECT array_agg(c.code ORDER BY c.code) FROM nonconformance_defects d JOIN defect_codes c ON c.id = d.defect_code_id WHERE d.nonconformance_id = n.id) AS defects,
                (SELECT count(*)::int FROM audit_events a WHERE a.action = 'ncr.opened-for-earlier-decision' AND a.entity_id = n.id::text) AS audited
           FROM nonconformances n WHERE n.lot_id IN (:lotIds) ORDER BY n.lot_id`,
        { type: QueryTypes.SELECT, transaction, replacements: { lotIds } },
      );
      // Run again, it finds nothing left to open.
      const again = await openNcrsForEarlierDecisions(owner, transaction);
      return { opened, ncrs, again };
    });

    expect(result.ncrs).toEqual([
      {
        id: expect.any(Number),
        number: expect.stringMatching(/^NCR-\d{4}-\d{4}$/),
        origin: 'rejection',
        lotId: rejected.lotId,
        status: 'open',
        pieces: 30,
        failing: 2,
        defects: ['retardance'],
        audited: 1,
      },
      {
        id: expect.any(Number),
        number: expect.stringMatching(/^NCR-\d{4}-\d{4}$/),
        origin: 'accepted-lot',
        lotId: accepted.lotId,
        status: 'open',
        pieces: 1,
        failing: 1,
        defects: ['retardance'],
        audited: 1,
      },
    ]);
    expect(result.opened).toEqual(expect.arrayContaining(result.ncrs.map((n) => n.id)));
    expect(result.again).toEqual([]);
    // The same NCR the decision opens today, but for its number.
    expect(expected).toMatchObject({ origin: 'rejection', pieces: 30, defects: ['retardance'] });
  });
});
