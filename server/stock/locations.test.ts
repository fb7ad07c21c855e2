// The current location of every piece and the on-hand counts are kept by the ledger's triggers
// (migration 0900). Checked against the ledger itself: replaying stock_moves in id order, each move
// puts its piece at its destination (common practice of a perpetual inventory: the balance is the
// sum of the movements), so the replay must equal what is stored, for every piece.
import { faker } from '@faker-js/faker';
import { QueryTypes, Sequelize, Transaction } from 'sequelize';
import { afterAll, describe, expect, it } from 'vitest';
import { inTransaction, sequelize } from '../../db';
import * as migration from '../../db/migrations/20261202-0900-stored-piece-locations';
import { SYSTEM_ACTOR } from '../audit/record';
import { config } from '../config';
import { AppError } from '../http/errors';
import { receiveThroughApi } from '../../tests/helpers/purchasing';
import { movePieces, type MoveRequest } from './ledger';

type Stored = { pieceId: number; locationId: number | null; movedAt: string; moveId: string };
type Replayed = { locations: Map<number, Stored>; onHand: Map<string, number> };

const pairKey = (partId: number, locationId: number) => `${partId}@${locationId}`;

/** Reads the whole ledger and what the triggers stored, in one snapshot (other tests write
 * meanwhile), or in the transaction the connection has open. */
async function ledgerAndStored(db: Sequelize, openTransaction = false) {
  const work = async (t?: Transaction) => {
    const select = <T extends object>(sql: string) => db.query<T>(sql, { type: QueryTypes.SELECT, transaction: t });
    const moves = await select<{ id: string; piece_id: number; part_id: number; to_location_id: number | null; moved_at: Date }>(
      'SELECT m.id, m.piece_id, p.part_id, m.to_location_id, m.moved_at FROM stock_moves m JOIN pieces p ON p.id = m.piece_id ORDER BY m.id',
    );
    const stored = await select<{ piece_id: number; location_id: number | null; moved_at: Date; move_id: string }>(
      'SELECT piece_id, location_id, moved_at, move_id FROM piece_locations',
    );
    const onHand = await select<{ part_id: number; location_id: number; pieces: number }>('SELECT part_id, location_id, pieces FROM on_hand');
    return { moves, stored, onHand };
  };
  return openTransaction ? work() : db.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ, readOnly: true }, work);
}

function replay(moves: Awaited<ReturnType<typeof ledgerAndStored>>['moves']): Replayed {
  const locations = new Map<number, Stored & { partId: number }>();
  for (const m of moves)
    locations.set(m.piece_id, {
      pieceId: m.piece_id,
      partId: m.part_id,
      locationId: m.to_location_id,
      movedAt: m.moved_at.toISOString(),
      moveId: String(m.id),
    });
  const onHand = new Map<string, number>();
  for (const piece of locations.values()) {
    if (piece.locationId === null) continue;
    const key = pairKey(piece.partId, piece.locationId);
    onHand.set(key, (onHand.get(key) ?? 0) + 1);
  }
  return { locations: new Map([...locations].map(([id, { partId: _part, ...rest }]) => [id, rest])), onHand };
}

/** The replay of the ledger against what is stored, as comparable maps. */
async function compared(db: Sequelize, openTransaction = false) {
  const { moves, stored, onHand } = await ledgerAndStored(db, openTransaction);
  const expected = replay(moves);
  return {
    expected,
    storedLocations: new Map(
      stored.map((s) => [s.piece_id, { pieceId: s.piece_id, locationId: s.location_id, movedAt: s.moved_at.toISOString(), moveId: String(s.move_id) }]),
    ),
    storedOnHand: new Map(onHand.map((o) => [pairKey(o.part_id, o.location_id), Number(o.pieces)])),
  };
}

const locationIds = async () =>
  Object.fromEntries(
    (await sequelize.query<{ id: number; code: string }>('SELECT id, code FROM locations', { type: QueryTypes.SELECT })).map((l) => [l.code, l.id]),
  );

describe('stored piece locations and on-hand counts', () => {
  it('equal the replay of the ledger for every piece after a random sequence of moves', async () => {
    faker.seed(20261202);
    const lots = [await receiveThroughApi(12), await receiveThroughApi(9)];
    await sequelize.query(`UPDATE lots SET state = 'accepted' WHERE id IN (:ids)`, { replacements: { ids: lots.map((l) => l.lotId) } });
    const pieceIds = (
      await sequelize.query<{ id: number }>('SELECT id FROM pieces WHERE lot_id IN (:ids)', {
        type: QueryTypes.SELECT,
        replacements: { ids: lots.map((l) => l.lotId) },
      })
    ).map((p) => p.id);
    const at = await locationIds();
    const kinds: Omit<MoveRequest, 'pieceIds'>[] = [
      { toLocationId: at['BIN-A1'], reason: 'release' },
      { toLocationId: at['BIN-A2'], reason: 'transfer' },
      { toLocationId: at['BIN-B1'], reason: 'transfer' },
      { toLocationId: at.MRB, reason: 'hold' },
      { toLocationId: at.RTV, reason: 'return-to-vendor' },
      { toLocationId: at.QUARANTINE, reason: 'inspection' },
      { toLocationId: null, reason: 'issue', workOrder: 'WO-REPLAY-1' },
      { toLocationId: at['BIN-A2'], reason: 'return' },
    ];
    let moved = 0;
    let refused = 0;
    for (let step = 0; step < 90; step++) {
      const request = { ...faker.helpers.arrayElement(kinds), pieceIds: faker.helpers.arrayElements(pieceIds, { min: 1, max: 5 }) };
      try {
        await inTransaction((t) => movePieces(request, SYSTEM_ACTOR, t));
        moved++;
      } catch (error) {
        // The ledger refuses what its rules forbid (e.g. issuing a piece set aside); nothing moves then.
        if (!(error instanceof AppError)) throw error;
        refused++;
      }
    }
    expect(moved).toBeGreaterThan(20);
    expect(refused).toBeGreaterThan(0);

    const { expected, storedLocations, storedOnHand } = await compared(sequelize);
    expect(storedLocations).toEqual(expected.locations);
    expect(storedOnHand).toEqual(expected.onHand);
    for (const id of pieceIds) expect(storedLocations.get(id)?.moveId).toBeDefined();

    // The counts of a part and location are folded now and then, so their rows stay few.
    const [{ most }] = await sequelize.query<{ most: number }>(
      'SELECT coalesce(max(n), 0)::int AS most FROM (SELECT count(*) AS n FROM on_hand_changes WHERE part_id IN (:parts) GROUP BY part_id, location_id) c',
      { type: QueryTypes.SELECT, replacements: { parts: lots.map((l) => l.partId) } },
    );
    expect(most).toBeLessThanOrEqual(17);
  });

  it('refuse a move that does not start where the stored location says the piece is', async () => {
    const lot = await receiveThroughApi(1);
    const at = await locationIds();
    const [piece] = await sequelize.query<{ id: number }>('SELECT id FROM pieces WHERE lot_id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: lot.lotId },
    });
    const insert = (from: number | null, to: number, reason: string) =>
      sequelize.query('INSERT INTO stock_moves (piece_id, from_location_id, to_location_id, reason) VALUES (:piece, :from, :to, :reason)', {
        replacements: { piece: piece.id, from, to, reason },
      });
    await expect(insert(at['BIN-A1'], at['BIN-A2'], 'transfer')).rejects.toThrow(`piece ${piece.id} is not where the move starts from`);
    await expect(insert(null, at['BIN-A1'], 'receipt')).rejects.toThrow(`piece ${piece.id} was already received`);
    await insert(at.QUARANTINE, at.MRB, 'hold');
    const [stored] = await sequelize.query<{ location_id: number }>('SELECT location_id FROM piece_locations WHERE piece_id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: piece.id },
    });
    expect(stored.location_id).toBe(at.MRB);
  });
});

describe('migration 0900 on existing rows', () => {
  // Migrations run as the database owner. Its one connection holds a transaction opened by hand
  // around the whole round trip, which is rolled back, so other tests never see it.
  const owner = new Sequelize(process.env.MIGRATION_DATABASE_URL ?? config.DATABASE_URL, {
    dialect: 'postgres',
    logging: false,
    pool: { max: 1, min: 1, idle: 600_000 },
  });
  afterAll(() => owner.close());

  it('fills the stored locations and counts from the ledger written under the view', async () => {
    const lot = await receiveThroughApi(3);
    const at = await locationIds();
    const context = { sequelize: owner, queryInterface: owner.getQueryInterface() };
    await owner.query('BEGIN');
    try {
      await migration.down(context);
      const [{ kind }] = await owner.query<{ kind: string }>(`SELECT relkind AS kind FROM pg_class WHERE relname = 'piece_locations'`, {
        type: QueryTypes.SELECT,
      });
      expect(kind).toBe('v');
      // History written while the location was still a view over the ledger.
      await owner.query(
        `INSERT INTO stock_moves (piece_id, from_location_id, to_location_id, reason) SELECT id, :from, :to, 'hold' FROM pieces WHERE lot_id = :lot ORDER BY id`,
        {
          replacements: { from: at.QUARANTINE, to: at.MRB, lot: lot.lotId },
        },
      );

      await migration.up(context);
      const { expected, storedLocations, storedOnHand } = await compared(owner, true);
      expect(storedLocations.size).toBeGreaterThan(3);
      expect(storedLocations).toEqual(expected.locations);
      expect(storedOnHand).toEqual(expected.onHand);
      expect(expected.onHand.get(pairKey(lot.partId, at.MRB))).toBe(3);
    } finally {
      await owner.query('ROLLBACK');
    }
  });
});
