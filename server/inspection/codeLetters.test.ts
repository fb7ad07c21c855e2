// A lot's plan names Table 1's code letter and the letter whose plan is used. A lot of 20 at level II
// is code letter C; at AQL 1.0 the arrow of Table 2-A leads to the plan of letter E, n = 13, Ac 0 /
// Re 1 (ISO 2859-1 / ANSI/ASQ Z1.4 Tables 1 and 2-A, as in AQLSchemes R/AAZ14Single.R).
import { QueryTypes, Sequelize, type Transaction } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { config } from '../config';
import { addTableCodeLetter, dropTableCodeLetter } from '../../db/migrations/20261202-0100-table-code-letter';
import { acceptedLot } from '../../tests/helpers/acceptedLot';
import { as } from '../../tests/helpers/api';
import { pdfPages } from '../../tests/helpers/pdfText';
import { receivedLot } from '../../tests/helpers/receivedLot';

const BOTH_LETTERS = 'code letter C (plan of letter E after the arrow)';

async function pdfText(number: string) {
  const pdf = await (
    await as('auditor')
  )
    .get(`/api/documents/${number}.pdf`)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    })
    .expect(200);
  return (await pdfPages(pdf.body as Buffer)).join(' ').replace(/\s+/g, ' ');
}

// Migrations run as the database owner; the application's role may not alter tables.
const owner = new Sequelize(process.env.MIGRATION_DATABASE_URL ?? config.DATABASE_URL, { dialect: 'postgres', logging: false, pool: { max: 1 } });
afterAll(() => owner.close());

/** Runs `work` as the owner in a transaction that is always rolled back. */
async function rolledBack<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  const transaction = await owner.transaction();
  try {
    return await work(transaction);
  } finally {
    await transaction.rollback();
  }
}

describe('code letter and plan letter', () => {
  it('are both shown on the lot page and the inspection page and printed on the certificate and the report', async () => {
    const lot = await acceptedLot(20);
    const lotPage = (await (await as('clerk')).get(`/api/lots/${lot.lotId}`).expect(200)).body;
    expect(lotPage.plan).toMatchObject({ severity: 'normal', codeLetter: 'C', planLetter: 'E', sampleSize: 13, accept: 0, reject: 1, hundredPercent: false });
    expect(lotPage.plan.summary).toContain(`${BOTH_LETTERS}, n = 13, Ac 0, Re 1`);

    const inspection = (await (await as('inspector')).get(`/api/inspection/lots/${lot.lotId}`).expect(200)).body;
    expect(inspection.plan).toMatchObject({ codeLetter: 'C', planLetter: 'E', sampleSize: 13 });
    expect(inspection.plan.summary).toContain(BOTH_LETTERS);

    expect(lot.documents.map((d) => d.kind).sort()).toEqual(['certificate', 'inspection-report']);
    for (const document of lot.documents) expect(await pdfText(document.number), document.kind).toContain(BOTH_LETTERS);
  });

  it('are both stored for plans drawn before the migration: Table 1 letter recomputed from lot size and level', async () => {
    const small = await receivedLot({ quantity: 20, level: 'II', aql: 1 });
    // 400 pieces at level S-4 is code letter E; at AQL 0.4 the arrow leads down to the plan of G, n = 32.
    const special = await receivedLot({ quantity: 400, level: 'S-4', aql: 0.4 });
    const letters = (transaction: Transaction, column: string) =>
      owner.query<{ lotId: number; letter: string }>(
        `SELECT lot_id AS "lotId", ${column} AS letter FROM lot_inspections WHERE lot_id IN (:lots) ORDER BY lot_id`,
        { type: QueryTypes.SELECT, transaction, replacements: { lots: [small.lotId, special.lotId] } },
      );
    const { before, codeLetters, planLetters } = await rolledBack(async (transaction) => {
      await dropTableCodeLetter(owner, transaction);
      const before = await letters(transaction, 'code_letter');
      await addTableCodeLetter(owner, transaction);
      return { before, codeLetters: await letters(transaction, 'code_letter'), planLetters: await letters(transaction, 'plan_letter') };
    });
    // Before: one column, holding the plan's letter.
    expect(before).toEqual([
      { lotId: small.lotId, letter: 'E' },
      { lotId: special.lotId, letter: 'G' },
    ]);
    expect(planLetters).toEqual(before);
    expect(codeLetters).toEqual([
      { lotId: small.lotId, letter: 'C' },
      { lotId: special.lotId, letter: 'E' },
    ]);
  });
});
