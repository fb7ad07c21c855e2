import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { inTransaction, sequelize } from '../../../db';
import { Piece, StockMove } from '../../../db/models';
import { SYSTEM_ACTOR } from '../../audit/record';
import { movePieces } from '../../stock/ledger';
import { as } from '../../../tests/helpers/api';
import { receiveThroughApi } from '../../../tests/helpers/purchasing';

const locationId = async (code: string) => {
  const [row] = await sequelize.query<{ id: number }>('SELECT id FROM locations WHERE code = :code', { type: QueryTypes.SELECT, replacements: { code } });
  return row.id;
};

/** Inspection decides lots; here the decision is taken as given. */
const acceptLot = (lotId: number) => sequelize.query(`UPDATE lots SET state = 'accepted' WHERE id = :lotId`, { replacements: { lotId } });

async function onHand(partId: number) {
  const stock = await (await as('auditor')).get(`/api/stock?partId=${partId}&pageSize=50`).expect(200);
  return {
    rows: Object.fromEntries(stock.body.data.map((r: { locationCode: string; onHand: number }) => [r.locationCode, r.onHand])),
    total: stock.body.totals.onHand,
  };
}

describe('/api/stock', () => {
  it('puts away only accepted lots, into stock bins', async () => {
    const clerk = await as('clerk');
    const lot = await receiveThroughApi(10);
    const binA1 = await locationId('BIN-A1');
    const early = await clerk.post('/api/stock/release').send({ lotId: lot.lotId, toLocationId: binA1 }).expect(409);
    expect(early.body.error.message).toMatch(`Only pieces of accepted lots go to stock; lot L-${lot.lotId} is quarantine`);

    await acceptLot(lot.lotId);
    const toRtv = await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('RTV') })
      .expect(400);
    expect(toRtv.body.error.message).toBe('RTV is a return to vendor location, not a stock bin');

    await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: binA1, serials: lot.serials.slice(0, 4).join(',') })
      .expect(201);
    await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-A2') })
      .expect(201);
    expect(await onHand(lot.partId)).toEqual({ rows: { 'BIN-A1': 4, 'BIN-A2': 6 }, total: 10 });
    const again = await clerk.post('/api/stock/release').send({ lotId: lot.lotId, toLocationId: binA1 }).expect(400);
    expect(again.body.error.message).toBe(`Lot L-${lot.lotId} has no pieces waiting to be put away`);
  });

  it('transfers between bins and issues to a work order; stock never goes below what is there', async () => {
    const clerk = await as('clerk');
    const lot = await receiveThroughApi(6);
    await acceptLot(lot.lotId);
    await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-A1') })
      .expect(201);

    await clerk
      .post('/api/stock/transfer')
      .send({ partId: lot.partId, serials: lot.serials.slice(0, 2).join('\n'), toLocationId: await locationId('BIN-B1') })
      .expect(201);
    const toQuarantine = await clerk
      .post('/api/stock/transfer')
      .send({ partId: lot.partId, serials: lot.serials[2], toLocationId: await locationId('QUARANTINE') })
      .expect(400);
    expect(toQuarantine.body.error.message).toBe('Transfers go between stock bins; QUARANTINE is not one');
    const same = await clerk
      .post('/api/stock/transfer')
      .send({ partId: lot.partId, serials: lot.serials[0], toLocationId: await locationId('BIN-B1') })
      .expect(409);
    expect(same.body.error.message).toBe(`Already in BIN-B1: ${lot.serials[0]}`);

    await clerk
      .post('/api/stock/issue')
      .send({ partId: lot.partId, serials: `${lot.serials[0]}, ${lot.serials[3]}`, workOrder: 'WO-T-77' })
      .expect(201);
    expect(await onHand(lot.partId)).toEqual({ rows: { 'BIN-A1': 3, 'BIN-B1': 1 }, total: 4 });

    const twice = await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: lot.serials[0], workOrder: 'WO-T-78' }).expect(409);
    expect(twice.body.error.message).toBe(`Not available: ${lot.serials[0]} (issued)`);
    const unknown = await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: 'NEVER-RECEIVED-1', workOrder: 'WO-T-78' }).expect(400);
    expect(unknown.body.error.message).toMatch(/^Never received for part T-\w+: NEVER-RECEIVED-1$/);
    const quarantined = await receiveThroughApi(1);
    const notReleased = await clerk
      .post('/api/stock/issue')
      .send({ partId: quarantined.partId, serials: quarantined.serials[0], workOrder: 'WO-T-79' })
      .expect(409);
    expect(notReleased.body.error.message).toBe(`Not available: ${quarantined.serials[0]} (quarantine)`);

    const moves = await (await as('auditor')).get('/api/stock/moves?workOrder=WO-T-77').expect(200);
    expect(moves.body.data.map((m: { serial: string; reason: string; from: string; to: string | null }) => [m.serial, m.reason, m.to]).sort()).toEqual([
      [lot.serials[0], 'issue', null],
      [lot.serials[3], 'issue', null],
    ]);
    const csv = await (await as('auditor')).get('/api/stock/moves/export.csv?workOrder=WO-T-77').expect(200);
    expect(csv.text.trim().split('\n')).toHaveLength(3);
  });

  it('never stocks or issues a piece set aside in material review or return-to-vendor', async () => {
    const clerk = await as('clerk');
    const lot = await receiveThroughApi(3);
    await acceptLot(lot.lotId);
    await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-A1') })
      .expect(201);
    const [mrb, rtv] = lot.serials;
    const pieces = await Piece.findAll({ where: { lotId: lot.lotId }, order: [['serial', 'ASC']] });
    await inTransaction(async (t) => {
      await movePieces({ pieceIds: [pieces[0].id], toLocationId: await locationId('MRB'), reason: 'hold' }, SYSTEM_ACTOR, t);
      await movePieces({ pieceIds: [pieces[1].id], toLocationId: await locationId('RTV'), reason: 'return-to-vendor' }, SYSTEM_ACTOR, t);
    });
    const back = await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-A2'), serials: `${mrb}, ${rtv}` })
      .expect(409);
    expect(back.body.error).toMatchObject({
      message: `Nonconforming pieces cannot go to stock: ${mrb} (in material review at MRB), ${rtv} (in return to vendor at RTV)`,
      details: { serials: [mrb, rtv] },
    });
    const issue = await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: mrb, workOrder: 'WO-MRB-1' }).expect(409);
    expect(issue.body.error.message).toBe(`Nonconforming pieces cannot be issued: ${mrb} (in material review at MRB)`);
  });

  it('lets one of two clerks issuing the same serial at once succeed; the other gets 409', async () => {
    const clerk = await as('clerk');
    const lot = await receiveThroughApi(3);
    await acceptLot(lot.lotId);
    await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-A1') })
      .expect(201);

    const [first, second] = await Promise.all([
      clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: lot.serials[1], workOrder: 'WO-RACE-1' }),
      clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: lot.serials[1], workOrder: 'WO-RACE-2' }),
    ]);
    expect([first.status, second.status].sort()).toEqual([201, 409]);
    const [{ issues }] = await sequelize.query<{ issues: string }>(
      `SELECT count(*) AS issues FROM stock_moves m JOIN pieces p ON p.id = m.piece_id WHERE p.part_id = :partId AND m.reason = 'issue'`,
      { type: QueryTypes.SELECT, replacements: { partId: lot.partId } },
    );
    expect(Number(issues)).toBe(1);
  });

  it('keeps the ledger append-only and every move starting where the piece is', async () => {
    const lot = await receiveThroughApi(1);
    const move = await StockMove.findOne({ where: { reason: 'receipt' }, order: [['id', 'DESC']] });
    move!.set({ note: 'rewritten' });
    await expect(move!.save()).rejects.toThrow('The stock ledger is append-only');
    await expect(move!.destroy()).rejects.toThrow('The stock ledger is append-only');
    await expect(sequelize.query(`UPDATE stock_moves SET note = 'rewritten' WHERE id = ${move!.id}`)).rejects.toThrow(/append-only: UPDATE refused/);
    await expect(sequelize.query(`DELETE FROM stock_moves WHERE id = ${move!.id}`)).rejects.toThrow(/append-only: DELETE refused/);
    const [piece] = await sequelize.query<{ id: number }>(`SELECT id FROM pieces WHERE lot_id = :lotId`, {
      type: QueryTypes.SELECT,
      replacements: { lotId: lot.lotId },
    });
    await expect(
      sequelize.query(`INSERT INTO stock_moves (piece_id, from_location_id, to_location_id, reason) VALUES (:piece, :from, :to, 'transfer')`, {
        replacements: { piece: piece.id, from: await locationId('BIN-A1'), to: await locationId('BIN-A2') },
      }),
    ).rejects.toThrow(/is not where the move starts from/);
  });

  it('tells the whole history of a serial', async () => {
    const clerk = await as('clerk');
    const lot = await receiveThroughApi(2);
    await acceptLot(lot.lotId);
    await clerk
      .post('/api/stock/release')
      .send({ lotId: lot.lotId, toLocationId: await locationId('BIN-A2') })
      .expect(201);
    await clerk.post('/api/stock/issue').send({ partId: lot.partId, serials: lot.serials[0], workOrder: 'WO-HIST-5' }).expect(201);

    const history = await (await as('auditor')).get(`/api/pieces/${lot.serials[0]}`).expect(200);
    expect(history.body.total).toBe(1);
    const piece = history.body.data[0];
    expect(piece).toMatchObject({
      serial: lot.serials[0],
      state: 'issued',
      location: null,
      lot: { id: lot.lotId, state: 'accepted' },
      purchaseOrder: { number: lot.order.number, lineNumber: 1 },
    });
    expect(
      piece.moves.map((m: { reason: string; from: string | null; to: string | null; workOrder: string | null }) => [m.reason, m.from, m.to, m.workOrder]),
    ).toEqual([
      ['receipt', null, 'QUARANTINE', null],
      ['release', 'QUARANTINE', 'BIN-A2', null],
      ['issue', 'BIN-A2', null, 'WO-HIST-5'],
    ]);
    await (await as('auditor')).get('/api/pieces/NO-SUCH-SERIAL').expect(404);
  });

  it('counts every matching move on the first page or when asked; later pages answer a lower bound', async () => {
    const auditor = await as('auditor');
    const lot = await receiveThroughApi(7);
    const page = (n: number, extra = '') => auditor.get(`/api/stock/moves?lotId=${lot.lotId}&pageSize=2&page=${n}${extra}`).expect(200);
    expect((await page(1)).body).toMatchObject({ total: 7, totalExact: true, totals: {} });
    const second = (await page(2)).body;
    // Two pages read and one more row seen: at least 5.
    expect(second).toMatchObject({ total: 5, totalExact: false });
    expect(second.data).toHaveLength(2);
    expect(second).not.toHaveProperty('totals');
    const last = (await page(4)).body;
    expect(last).toMatchObject({ total: 7, totalExact: true });
    expect(last.data).toHaveLength(1);
    expect((await page(2, '&count=true')).body).toMatchObject({ total: 7, totalExact: true, totals: {} });
    expect((await page(1, '&count=false')).body).toMatchObject({ total: 3, totalExact: false });
    // A page past the end (a stale bookmark) is counted, so the pager can find its way back.
    expect((await page(9)).body).toMatchObject({ data: [], total: 7, totalExact: true });
    await auditor.get(`/api/stock/moves?lotId=${lot.lotId}&count=maybe`).expect(400);
    expect((await auditor.get(`/api/stock?partId=${lot.partId}&page=2&count=true`).expect(200)).body).toMatchObject({
      data: [],
      total: 1,
      totals: { onHand: 7 },
    });
  });

  it('reads for everyone and moves only for the clerk', async () => {
    const lot = await receiveThroughApi(1);
    for (const role of ['buyer', 'inspector', 'quality', 'auditor', 'admin'] as const) {
      const client = await as(role);
      await client.get('/api/stock').expect(200);
      await client.get('/api/stock/locations').expect(200);
      await client.post('/api/stock/issue').send({ partId: lot.partId, serials: lot.serials[0], workOrder: 'WO-X' }).expect(403);
      await client.post('/api/stock/transfer').send({ partId: lot.partId, serials: lot.serials[0], toLocationId: 1 }).expect(403);
      await client.post('/api/stock/release').send({ lotId: lot.lotId, toLocationId: 1 }).expect(403);
    }
  });
});
