// Existing records when the deviation register arrived: use-as-is decisions signed with a free-text
// deviation number become register entries marked as recorded before the register, one per number,
// supplier and part, each decision tied to its entry and its pieces booked as a use (given back for a
// superseded decision). Decisions signed "the old way" are made here from decisions signed through
// the API: in the owner's transaction, which is always rolled back, their register link is removed
// and a free-text number put in its place; then the migration's step runs.
import { QueryTypes, Sequelize, type Transaction } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { EARLIER_ENTRY_NOTE, registerEarlierDeviations } from '../../db/migrations/20261202-1050-deviation-register';
import { approvedDeviation, rejectedSample, useAsIs } from '../../tests/helpers/deviations';
import { sign, supplierPart } from '../../tests/helpers/switching';
import { config } from '../config';

// Migrations run as the database owner.
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

async function signedAsIs(pair: Awaited<ReturnType<typeof supplierPart>>, deviationId: number) {
  const lotId = await rejectedSample(pair);
  const signed = await useAsIs(lotId, deviationId);
  expect(signed.status, JSON.stringify(signed.body)).toBe(201);
  return { lotId, dispositionId: signed.body.dispositionId as number };
}

describe('migration 1050: earlier deviation numbers', () => {
  it('turns the free-text numbers of earlier use-as-is decisions into register entries recorded before the register', async () => {
    const pair = await supplierPart();
    const other = await supplierPart();
    const deviation = await approvedDeviation(pair.supplierId, pair.partId, { quantityLimit: 100 });
    const elsewhere = await approvedDeviation(other.supplierId, other.partId);
    const first = await signedAsIs(pair, deviation.id);
    const second = await signedAsIs(pair, deviation.id);
    const third = await signedAsIs(other, elsewhere.id);
    // The second decision was later superseded by a rejection.
    const rejected = await sign(second.lotId, 'reject', second.dispositionId, { justification: 'Deviation no longer wanted for this lot' });
    expect(rejected.status).toBe(201);

    await rolledBack(async (transaction) => {
      const run = (sql: string, replacements: Record<string, unknown> = {}) => owner.query(sql, { transaction, replacements });
      const select = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
        owner.query<T>(sql, { transaction, replacements, type: QueryTypes.SELECT });
      const ids = [first.dispositionId, second.dispositionId, third.dispositionId];
      // As before the register: a free-text number on each decision, no entry, no uses.
      await run('ALTER TABLE dispositions DROP CONSTRAINT dispositions_deviation_registered');
      await run('DELETE FROM deviation_uses WHERE disposition_id IN (:ids)', { ids });
      await run(`UPDATE dispositions SET deviation_id = NULL, deviation_number = 'DEV-2025-07' WHERE id IN (:ids)`, { ids });

      const created = await registerEarlierDeviations(owner, transaction);
      // One entry per number, supplier and part: the same number of two suppliers is two entries.
      expect(created).toHaveLength(2);
      const entries = await select<{
        id: number;
        number: string;
        supplierId: number;
        allowed: string;
        recorded: boolean;
        quantityLimit: number | null;
        expiresOn: string | null;
      }>(
        `SELECT id, number, supplier_id AS "supplierId", allowed, recorded_before_register AS recorded, quantity_limit AS "quantityLimit", expires_on AS "expiresOn"
           FROM deviations WHERE id IN (:created) ORDER BY id`,
        { created },
      );
      const mine = entries.find((e) => e.supplierId === pair.supplierId)!;
      expect(mine).toMatchObject({ number: 'DEV-2025-07', recorded: true, quantityLimit: null, expiresOn: null });
      expect(mine.allowed).toBe(`${EARLIER_ENTRY_NOTE}s of L-${first.lotId}, L-${second.lotId}. Justification given: Harmless in the alignment jig build`);
      expect(entries.find((e) => e.supplierId === other.supplierId)!.allowed).toBe(
        `${EARLIER_ENTRY_NOTE} of L-${third.lotId}. Justification given: Harmless in the alignment jig build`,
      );

      const tied = await select<{ id: number; deviationId: number }>(
        'SELECT id, deviation_id AS "deviationId" FROM dispositions WHERE id IN (:ids) ORDER BY id',
        { ids },
      );
      expect(tied.map((d) => d.deviationId)).toEqual([mine.id, mine.id, entries.find((e) => e.supplierId === other.supplierId)!.id]);

      // The pieces each decision released are booked; the superseded one's are given back.
      const uses = await select<{ dispositionId: number; quantity: number; released: boolean }>(
        'SELECT disposition_id AS "dispositionId", quantity, released_at IS NOT NULL AS released FROM deviation_uses WHERE disposition_id IN (:ids) ORDER BY disposition_id',
        { ids },
      );
      expect(uses).toEqual([
        { dispositionId: first.dispositionId, quantity: 20, released: false },
        { dispositionId: second.dispositionId, quantity: 20, released: true },
        { dispositionId: third.dispositionId, quantity: 20, released: false },
      ]);

      const audited = await select<{ entityId: string; after: { number: string; lots: number[] } }>(
        `SELECT entity_id AS "entityId", after FROM audit_events WHERE action = 'deviation.recorded-before-register' AND entity_id IN (:keys) ORDER BY id`,
        { keys: created.map(String) },
      );
      expect(audited.find((a) => a.entityId === String(mine.id))!.after).toMatchObject({ number: 'DEV-2025-07', lots: [first.lotId, second.lotId] });

      // Run again (a retried migration): nothing new, and every use-as-is decision names an entry.
      expect(await registerEarlierDeviations(owner, transaction)).toEqual([]);
      const [{ untied }] = await select<{ untied: number }>(
        `SELECT count(*)::int AS untied FROM dispositions WHERE decision = 'use-as-is' AND deviation_id IS NULL`,
      );
      expect(untied).toBe(0);
    });
  });
});
