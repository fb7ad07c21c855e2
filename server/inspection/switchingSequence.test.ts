// Existing switching history becomes the sequence the state is recomputed from: the migration fills
// each lot event's position and result in from the lot's first signed decision and its plan, and
// leaves the stored state alone. Run here on history written through the API, taken back to what it
// was before the migration, in a transaction that is rolled back.
import { QueryTypes, Sequelize, type Transaction } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { sequelize } from '../../db';
import { config } from '../config';
import { sequenceSwitchingEvents, unsequenceSwitchingEvents } from '../../db/migrations/20261202-0200-switching-sequence';
import { decide, supplierPart } from '../../tests/helpers/switching';

// Migrations run as the database owner; the application's role may not alter tables.
const owner = new Sequelize(process.env.MIGRATION_DATABASE_URL ?? config.DATABASE_URL, { dialect: 'postgres', logging: false, pool: { max: 1 } });
afterAll(() => owner.close());

type EventRow = { lot_id: number; position: number; kind: string; result: unknown; disposition_id: number; actor_id: number; explanation: string };

const events = (supplierId: number, db: Sequelize = sequelize, transaction?: Transaction) =>
  db.query<EventRow>(
    `SELECT lot_id, position, kind, result, disposition_id, actor_id, explanation FROM switching_events WHERE supplier_id = :supplierId ORDER BY id`,
    { type: QueryTypes.SELECT, transaction, replacements: { supplierId } },
  );
const stateOf = async (supplierId: number, db: Sequelize = sequelize, transaction?: Transaction) =>
  (
    await db.query<{ state: unknown }>('SELECT state FROM switching_states WHERE supplier_id = :supplierId', {
      type: QueryTypes.SELECT,
      transaction,
      replacements: { supplierId },
    })
  )[0].state;

describe('the switching sequence of existing history', () => {
  it('gives every earlier lot decision its place and result, as it was fed, and keeps the stored state', async () => {
    const pair = await supplierPart();
    const lots = [await pair.receive(), await pair.receive(), await pair.receive()];
    await decide(lots[0].lotId, 'accept');
    await decide(lots[1].lotId, 'reject');
    await decide(lots[2].lotId, 'accept');
    const written = await events(pair.supplierId);
    expect(written.map((e) => [e.lot_id, e.position])).toEqual(lots.map((l, i) => [l.lotId, i + 1]));
    const state = await stateOf(pair.supplierId);

    const transaction = await owner.transaction();
    try {
      await unsequenceSwitchingEvents(owner, transaction);
      const [{ columns }] = await owner.query<{ columns: string[] }>(
        `SELECT array_agg(column_name::text ORDER BY column_name) AS columns FROM information_schema.columns WHERE table_name = 'switching_events'`,
        { type: QueryTypes.SELECT, transaction },
      );
      expect(columns).not.toContain('position');
      await sequenceSwitchingEvents(owner, transaction);
      expect(await events(pair.supplierId, owner, transaction)).toEqual(written);
      expect(await stateOf(pair.supplierId, owner, transaction)).toEqual(state);
    } finally {
      await transaction.rollback();
    }
  });
});
