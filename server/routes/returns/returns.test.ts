// Returns to the vendor: pieces an NCR dispositioned for return ship under the supplier's RMA number
// for a credit or a replacement; a replacement shipment is received against the NCR and the PO shows
// what was returned and what replaced. Shipping nonconforming material back against a return
// authorisation (RMA) for credit or replacement is common practice of supplier quality.
import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { sequelize } from '../../../db';
import { DEMO_PASSWORD } from '../../../db/seeders/demo';
import { as } from '../../../tests/helpers/api';
import { benchFile, sampleOf, signDecision, uploadBench } from '../../../tests/helpers/bench';
import { postReceipt, uniqueTag } from '../../../tests/helpers/purchasing';
import { receivedLot } from '../../../tests/helpers/receivedLot';

const TODAY = new Date().toISOString().slice(0, 10);

/** A rejected lot of 13 whose NCR has every piece dispositioned for return. */
async function returnableNcr() {
  const lot = await receivedLot({ quantity: 13, level: 'II', aql: 1 });
  const { sample } = await sampleOf(lot.lotId);
  await uploadBench(lot.lotId, 'bench.csv', benchFile(sample, sample.slice(0, 1)));
  await signDecision(lot.lotId, 'reject', null);
  const auditor = await as('auditor');
  const [{ id }] = (await auditor.get(`/api/nonconformances?lotId=${lot.lotId}`).expect(200)).body.data;
  const ncr = (
    await (
      await as('quality')
    )
      .post(`/api/nonconformances/${id}/dispositions`)
      .send({ password: DEMO_PASSWORD, meaningAcknowledged: true, decision: 'return-to-vendor' })
      .expect(201)
  ).body;
  const [{ lineId, poId }] = await sequelize.query<{ lineId: number; poId: number }>(
    'SELECT l.po_line_id AS "lineId", pol.purchase_order_id AS "poId" FROM lots l JOIN purchase_order_lines pol ON pol.id = l.po_line_id WHERE l.id = :lotId',
    { type: QueryTypes.SELECT, replacements: { lotId: lot.lotId } },
  );
  return { lot, ncr, lineId, poId };
}

async function states(serials: string[]) {
  const rows = await sequelize.query<{ state: string; n: number }>('SELECT state, count(*)::int AS n FROM pieces WHERE serial IN (:serials) GROUP BY state', {
    type: QueryTypes.SELECT,
    replacements: { serials },
  });
  return Object.fromEntries(rows.map((r) => [r.state, r.n]));
}

describe('returns to the vendor', () => {
  it('ships pieces back for a credit and for a replacement, receives the replacement against the NCR, and the PO counts returned and replaced pieces', async () => {
    const { lot, ncr, lineId, poId } = await returnableNcr();
    const ids = ncr.pieces.map((p: { pieceId: number }) => p.pieceId) as number[];
    const shipment = { nonconformanceId: ncr.id, shipDate: TODAY, carrier: 'Brightline Freight', tracking: 'BF-2231-77' };

    // Shipping back is the buyer's and the quality manager's.
    await (
      await as('clerk')
    )
      .post('/api/returns')
      .send({ ...shipment, rmaNumber: 'RMA-1', remedy: 'credit' })
      .expect(403);
    await (
      await as('inspector')
    )
      .post('/api/returns')
      .send({ ...shipment, rmaNumber: 'RMA-1', remedy: 'credit' })
      .expect(403);
    const badCredit = await (
      await as('buyer')
    )
      .post('/api/returns')
      .send({ ...shipment, rmaNumber: 'RMA-1', remedy: 'replacement', creditAmount: 12 })
      .expect(400);
    expect(badCredit.body.error.details).toEqual([{ path: 'creditAmount', message: 'A replacement has no credit amount' }]);

    const credit = await (
      await as('buyer')
    )
      .post('/api/returns')
      .send({ ...shipment, pieceIds: ids.slice(0, 3), rmaNumber: 'RMA-88120', remedy: 'credit', creditAmount: 360 })
      .expect(201);
    expect(credit.body).toMatchObject({
      ncrNumber: ncr.number,
      rmaNumber: 'RMA-88120',
      remedy: 'credit',
      creditAmount: 360,
      currency: 'EUR',
      serials: ncr.pieces.slice(0, 3).map((p: { serial: string }) => p.serial),
    });
    const replacement = await (
      await as('quality')
    )
      .post('/api/returns')
      .send({ ...shipment, rmaNumber: 'RMA-88121', remedy: 'replacement' })
      .expect(201);
    expect(replacement.body.serials).toHaveLength(10);
    expect(await states(lot.serials)).toEqual({ 'shipped-back': 13 });
    const [move] = await sequelize.query<{ reason: string; to: number | null; note: string }>(
      `SELECT m.reason, m.to_location_id AS "to", m.note FROM stock_moves m JOIN pieces p ON p.id = m.piece_id WHERE p.serial = :serial ORDER BY m.id DESC LIMIT 1`,
      { type: QueryTypes.SELECT, replacements: { serial: lot.serials[12] } },
    );
    expect(move).toEqual({ reason: 'ship-to-vendor', to: null, note: `${ncr.number}: RMA RMA-88121, Brightline Freight BF-2231-77, for replacement` });
    // Nothing is left to ship.
    const nothing = await (
      await as('buyer')
    )
      .post('/api/returns')
      .send({ ...shipment, rmaNumber: 'RMA-88122', remedy: 'credit' })
      .expect(409);
    expect(nothing.body.error.message).toBe('No piece of this NCR is dispositioned for return and not yet shipped');

    // The replacement is received against the NCR, in two shipments: up to the 10 pieces owed it needs no
    // over-receipt reason although the line's 13 have all arrived; one more does. A first shipment of 6
    // leaves 4 owed (the line's own 13 are not counted again against the second).
    const tag = uniqueTag();
    const first = await postReceipt(lineId, { quantity: 6, serials: `R${tag}-0001..R${tag}-0006`, replacementForNcrId: ncr.id });
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    const tooMany = await postReceipt(lineId, { quantity: 5, serials: `R${tag}-0007..R${tag}-0011`, replacementForNcrId: ncr.id });
    expect(tooMany.status, JSON.stringify(tooMany.body)).toBe(400);
    expect(tooMany.body.error.message).toBe(`Line 1 of PO ${lot.poNumber} still expects 4; receiving 5 needs a stated reason for the extra pieces`);
    const received = await postReceipt(lineId, { quantity: 4, serials: `R${tag}-0007..R${tag}-0010`, replacementForNcrId: ncr.id });
    expect(received.status, JSON.stringify(received.body)).toBe(201);
    // A shipment of another supplier's part cannot replace this NCR's pieces.
    const other = await receivedLot({ quantity: 5 });
    const [{ otherLine }] = await sequelize.query<{ otherLine: number }>('SELECT po_line_id AS "otherLine" FROM lots WHERE id = :id', {
      type: QueryTypes.SELECT,
      replacements: { id: other.lotId },
    });
    const elsewhere = await postReceipt(otherLine, { quantity: 1, serials: `X${tag}-0001`, replacementForNcrId: ncr.id });
    expect(elsewhere.status).toBe(400);
    expect(elsewhere.body.error.message).toBe(`${ncr.number} is for another supplier or part than this PO line`);

    const view = (await (await as('clerk')).get(`/api/nonconformances/${ncr.id}`).expect(200)).body;
    expect(view.replacements).toEqual([
      expect.objectContaining({ shipmentId: first.body.shipmentId, lots: [{ id: first.body.lotId, quantity: 6 }] }),
      expect.objectContaining({ shipmentId: received.body.shipmentId, lots: [{ id: received.body.lotId, quantity: 4 }] }),
    ]);
    // Each piece counted once: the line's 13 received as ordered, 13 returned, 10 replacing them.
    const order = (await (await as('buyer')).get(`/api/purchase-orders/${poId}`).expect(200)).body;
    expect(order.lines[0]).toMatchObject({ quantity: 13, received: 13, outstanding: 0, returned: 13, replaced: 10 });
    const orders = (await (await as('buyer')).get(`/api/purchase-orders?q=${lot.poNumber}`).expect(200)).body;
    expect(orders.data).toEqual([expect.objectContaining({ number: lot.poNumber, ordered: 13, received: 13, returned: 13 })]);

    const listed = (await (await as('auditor')).get(`/api/returns?nonconformanceId=${ncr.id}&sort=rmaNumber`).expect(200)).body;
    expect(listed.data.map((r: { rmaNumber: string; pieces: number; replaced: number }) => [r.rmaNumber, r.pieces, r.replaced])).toEqual([
      ['RMA-88120', 3, 0],
      ['RMA-88121', 10, 10],
    ]);
    const csv = await (await as('auditor')).get(`/api/returns/export.csv?nonconformanceId=${ncr.id}`).expect(200);
    expect(csv.text).toContain(`RMA-88120,${ncr.number},`);

    const closed = await (
      await as('quality')
    )
      .post(`/api/nonconformances/${ncr.id}/close`)
      .send({ note: 'Credit note received; replacements in quarantine' })
      .expect(200);
    expect(closed.body).toMatchObject({ status: 'closed', closingNote: 'Credit note received; replacements in quarantine', openItems: [] });
  });
});
