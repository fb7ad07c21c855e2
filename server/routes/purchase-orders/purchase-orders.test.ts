import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';
import { orderedLine, receiveOk, uniqueTag } from '../../../tests/helpers/purchasing';

describe('/api/purchase-orders', () => {
  it('creates a PO with numbered lines and their frozen specification, and lists it with totals', async () => {
    const { order, tag } = await orderedLine(25);
    expect(order).toMatchObject({ number: `PO-${tag}`, status: 'open', currency: 'EUR' });
    expect(order.lines[0]).toMatchObject({ lineNumber: 1, quantity: 25, received: 0, outstanding: 25, inspectionLevel: 'II', aql: 1, hundredPercent: false });
    expect(order.lines[0].spec.nominalWaves).toBe(0.25);

    const list = await (await as('auditor')).get(`/api/purchase-orders?q=PO-${tag}`).expect(200);
    expect(list.body).toMatchObject({ total: 1, totals: { ordered: 25, received: 0 } });
    expect(list.body.data[0]).toMatchObject({ number: `PO-${tag}`, lineCount: 1, ordered: 25, value: 2250 });
  });

  it('refuses an AQL outside the series, a missing line and an unknown part, naming each field', async () => {
    const buyer = await as('buyer');
    const { supplierId, partId } = await orderedLine(1);
    const base = { number: `PO-${uniqueTag()}`, supplierId, orderedOn: '2026-11-30', currency: 'eur' };
    const noLines = await buyer
      .post('/api/purchase-orders')
      .send({ ...base, lines: [] })
      .expect(400);
    expect(noLines.body.error.details).toEqual([{ path: 'lines', message: 'A PO needs at least one line' }]);
    const aql = await buyer
      .post('/api/purchase-orders')
      .send({ ...base, lines: [{ partId, quantity: 5, unitPrice: 1, inspectionLevel: 'II', aql: 0.3 }] })
      .expect(400);
    expect(aql.body.error.details[0].path).toBe('lines.0.aql');
    const unknown = await buyer
      .post('/api/purchase-orders')
      .send({ ...base, lines: [{ partId: 999999, quantity: 5, unitPrice: 1, inspectionLevel: 'II', aql: 1 }] })
      .expect(400);
    expect(unknown.body.error.details).toEqual([{ path: 'lines.0.partId', message: 'This part does not exist' }]);
  });

  it('edits a PO: adds a line, but keeps received lines, their part and at least what arrived', async () => {
    const buyer = await as('buyer');
    const { order, lineId, partId, tag } = await orderedLine(20);
    await receiveOk(lineId, { quantity: 8, serials: `E${tag}-1..E${tag}-8` });
    const input = { number: order.number, supplierId: order.supplier.id, orderedOn: order.orderedOn, currency: 'EUR' };
    const line = { id: lineId, partId, quantity: 20, unitPrice: 90, inspectionLevel: 'II', aql: 1 };

    const below = await buyer
      .put(`/api/purchase-orders/${order.id}`)
      .send({ ...input, lines: [{ ...line, quantity: 5 }] })
      .expect(409);
    expect(below.body.error.details).toEqual([{ path: 'lines.0.quantity', message: 'Line 1 has already received 8' }]);
    const other = await orderedLine(1);
    const removed = await buyer
      .put(`/api/purchase-orders/${order.id}`)
      .send({ ...input, lines: [{ partId: other.partId, quantity: 3, unitPrice: 1, inspectionLevel: 'S-2', aql: 4 }] })
      .expect(409);
    expect(removed.body.error.details).toEqual([{ path: 'lines', message: 'Line 1 has received pieces and cannot be removed' }]);

    const grown = await buyer
      .put(`/api/purchase-orders/${order.id}`)
      .send({
        ...input,
        lines: [
          { ...line, quantity: 30 },
          { partId: other.partId, quantity: 3, unitPrice: 12.5, inspectionLevel: 'S-2', aql: 4, hundredPercent: true },
        ],
      })
      .expect(200);
    expect(grown.body.lines.map((l: { lineNumber: number; quantity: number; received: number }) => [l.lineNumber, l.quantity, l.received])).toEqual([
      [1, 30, 8],
      [2, 3, 0],
    ]);
    expect(grown.body.lines[1]).toMatchObject({ hundredPercent: true, aql: 4, inspectionLevel: 'S-2' });
  });

  it('offers the clerk the open lines with what each still expects', async () => {
    const { order, lineId, tag } = await orderedLine(12);
    await receiveOk(lineId, { quantity: 5, serials: `O${tag}-1..O${tag}-5` });
    const lines = await (await as('clerk')).get(`/api/purchase-orders/open-lines?q=${order.number}`).expect(200);
    expect(lines.body.data).toEqual([
      expect.objectContaining({ id: lineId, poNumber: order.number, lineNumber: 1, quantity: 12, received: 5, outstanding: 7 }),
    ]);
  });
});
