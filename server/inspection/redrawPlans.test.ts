// Existing records after the sampling tables were corrected: undecided lots get the plan the tables
// now give, at the severity they were sampled under, their old plan kept and audited; decided lots
// stay as signed. Plans drawn before the correction are made here by writing the old, wrong plan
// over a lot's plan, then the migration's redraw runs in a transaction that is rolled back.
import { QueryTypes, Sequelize, type Transaction } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { sequelize } from '../../db';
import { config } from '../config';
import { redrawUndecidedPlans, REDRAW_REASON } from '../../db/migrations/20261202-0201-redraw-undecided-plans';
import { drawSample } from '../../shared/sampling';
import { acceptedLot } from '../../tests/helpers/acceptedLot';
import { as } from '../../tests/helpers/api';
import { receivedLot } from '../../tests/helpers/receivedLot';
import { benchFile } from '../../tests/helpers/switching';

// Migrations run as the database owner.
const owner = new Sequelize(process.env.MIGRATION_DATABASE_URL ?? config.DATABASE_URL, { dialect: 'postgres', logging: false, pool: { max: 1 } });
afterAll(() => owner.close());

type Plan = { sampleSize: number; planLetter: string; accept: number; reject: number; severity: string; seed: string; sample: string[]; state: string };

async function planOf(lotId: number, transaction?: Transaction): Promise<Plan> {
  const db = transaction ? owner : sequelize;
  const [plan] = await db.query<Omit<Plan, 'sample'> & { id: number }>(
    `SELECT li.id, li.sample_size AS "sampleSize", li.plan_letter AS "planLetter", li.accept_number AS accept, li.reject_number AS reject,
            li.severity, li.sample_seed AS seed, l.state
       FROM lot_inspections li JOIN lots l ON l.id = li.lot_id WHERE li.lot_id = :lotId`,
    { type: QueryTypes.SELECT, transaction, replacements: { lotId } },
  );
  const sample = await db.query<{ serial: string }>(
    'SELECT p.serial FROM sample_pieces sp JOIN pieces p ON p.id = sp.piece_id WHERE sp.inspection_id = :id ORDER BY p.serial',
    { type: QueryTypes.SELECT, transaction, replacements: { id: plan.id } },
  );
  return {
    sampleSize: plan.sampleSize,
    planLetter: plan.planLetter,
    accept: plan.accept,
    reject: plan.reject,
    severity: plan.severity,
    seed: plan.seed,
    state: plan.state,
    sample: sample.map((s) => s.serial),
  };
}

/** Writes a plan as an earlier table gave it over the lot's plan, with the sample its seed draws at that size. */
async function outdate(lotId: number, old: { severity: string; planLetter: string; sampleSize: number; accept: number; reject: number }) {
  const [{ id, seed }] = await sequelize.query<{ id: number; seed: string }>('SELECT id, sample_seed AS seed FROM lot_inspections WHERE lot_id = :lotId', {
    type: QueryTypes.SELECT,
    replacements: { lotId },
  });
  const pieces = await sequelize.query<{ id: number; serial: string }>('SELECT id, serial FROM pieces WHERE lot_id = :lotId ORDER BY serial', {
    type: QueryTypes.SELECT,
    replacements: { lotId },
  });
  const chosen = new Set(
    drawSample(
      pieces.map((p) => p.serial),
      old.sampleSize,
      seed,
    ),
  );
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string, replacements: Record<string, unknown>) => sequelize.query(sql, { transaction, replacements });
    await run(
      'UPDATE lot_inspections SET severity = :severity, plan_letter = :planLetter, sample_size = :sampleSize, accept_number = :accept, reject_number = :reject WHERE id = :id',
      { ...old, id },
    );
    await run('DELETE FROM sample_pieces WHERE inspection_id = :id', { id });
    await run('INSERT INTO sample_pieces (inspection_id, piece_id) SELECT :id, unnest(ARRAY[:pieces]::integer[])', {
      id,
      pieces: pieces.filter((p) => chosen.has(p.serial)).map((p) => p.id),
    });
  });
}

/** Runs `work` as the owner in a transaction that is always rolled back. */
async function rolledBack<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  const transaction = await owner.transaction();
  try {
    return await work(transaction);
  } finally {
    await transaction.rollback();
  }
}

describe('redrawing the plans of undecided lots from the corrected tables', () => {
  it('redraws an undecided lot on its severity with its seed, keeps the old plan and sample, audits it, and leaves decided lots as signed', async () => {
    // Lot of 60 at level II is code letter E; on tightened inspection at AQL 1.0 the arrow leads to
    // letter F, n = 20, Ac 0, Re 1 (ISO 2859-1 Table 2-B; every cell is checked in
    // shared/sampling/tables.test.ts). The plan written over it is the one letter further down (G,
    // n = 32) that the tables gave before they were corrected.
    const waiting = await receivedLot({ quantity: 60, level: 'II', aql: 1 });
    await outdate(waiting.lotId, { severity: 'tightened', planLetter: 'G', sampleSize: 32, accept: 0, reject: 1 });
    const decided = await acceptedLot(20);
    const signed = await planOf(decided.lotId);
    await outdate(decided.lotId, { severity: 'normal', planLetter: 'F', sampleSize: 20, accept: 0, reject: 1 });
    const before = await planOf(waiting.lotId);
    expect(before).toMatchObject({ sampleSize: 32, planLetter: 'G' });

    await rolledBack(async (transaction) => {
      const redrawn = await redrawUndecidedPlans(owner, transaction);
      expect(redrawn).toContain(waiting.lotId);
      expect(redrawn).not.toContain(decided.lotId);

      const after = await planOf(waiting.lotId, transaction);
      expect(after).toMatchObject({ severity: 'tightened', planLetter: 'F', sampleSize: 20, accept: 0, reject: 1, seed: before.seed, state: 'quarantine' });
      expect(after.sample).toHaveLength(20);
      // The same seed at the smaller size: the new sample lies within the old one.
      expect(after.sample.every((serial) => before.sample.includes(serial))).toBe(true);
      // The decided lot keeps the plan it was signed under, even one the tables no longer give.
      expect(signed.sampleSize).toBe(13);
      expect((await planOf(decided.lotId, transaction)).sampleSize).toBe(20);

      const [kept] = await owner.query<{ plan: { sampleSize: number; planLetter: string; seed: string }; sample: string[]; reason: string }>(
        'SELECT plan, sample, reason FROM superseded_lot_plans WHERE lot_id = :lotId',
        { type: QueryTypes.SELECT, transaction, replacements: { lotId: waiting.lotId } },
      );
      expect(kept).toMatchObject({ plan: { sampleSize: 32, planLetter: 'G', seed: before.seed }, sample: before.sample, reason: REDRAW_REASON });
      const [audit] = await owner.query<{
        actor_email: string;
        before: { plan: { sampleSize: number } };
        after: { plan: { sampleSize: number }; sample: string[] };
      }>(`SELECT actor_email, before, after FROM audit_events WHERE action = 'lot.plan-redrawn' AND entity_id = :lotId`, {
        type: QueryTypes.SELECT,
        transaction,
        replacements: { lotId: String(waiting.lotId) },
      });
      expect(audit).toMatchObject({ actor_email: 'system', before: { plan: { sampleSize: 32 } }, after: { plan: { sampleSize: 20 }, sample: after.sample } });

      // Run again, nothing is left to redraw.
      expect(await redrawUndecidedPlans(owner, transaction)).not.toContain(waiting.lotId);
    });
  });

  it('puts a lot whose larger new sample is not yet measured back under inspection', async () => {
    // Lot of 60 at level II, AQL 1.0, normal: code letter E, n = 13, Ac 0, Re 1 (ISO 2859-1 Table 2-A).
    // Written over with a smaller plan of 8 whose every piece is measured within tolerance.
    const lot = await receivedLot({ quantity: 60, level: 'II', aql: 1 });
    await outdate(lot.lotId, { severity: 'normal', planLetter: 'D', sampleSize: 8, accept: 0, reject: 1 });
    const small = await planOf(lot.lotId);
    await (
      await as('inspector')
    )
      .post(`/api/inspection/lots/${lot.lotId}/measurements`)
      .attach('files', Buffer.from(benchFile(small.sample)), { filename: 'bench.csv', contentType: 'text/csv' })
      .expect(201);
    expect((await planOf(lot.lotId)).state).toBe('awaiting-disposition');

    await rolledBack(async (transaction) => {
      await redrawUndecidedPlans(owner, transaction);
      const after = await planOf(lot.lotId, transaction);
      expect(after).toMatchObject({ sampleSize: 13, planLetter: 'E', state: 'inspection' });
      // Every piece measured before is still in the sample; 5 more wait for the bench.
      expect(small.sample.every((serial) => after.sample.includes(serial))).toBe(true);
    });
  });
});
