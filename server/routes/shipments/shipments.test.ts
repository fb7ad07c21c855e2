import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { sequelize } from '../../../db';
import { as } from '../../../tests/helpers/api';
import { TINY_PDF, orderedLine, postReceipt, receiveOk, uniqueTag } from '../../../tests/helpers/purchasing';

/** Row counts of everything a receipt writes, to show that a refused one writes nothing. */
async function receivingRows() {
  const [row] = await sequelize.query<Record<string, string>>(
    `SELECT (SELECT count(*) FROM shipments) AS shipments, (SELECT count(*) FROM lots) AS lots, (SELECT count(*) FROM pieces) AS pieces,
            (SELECT count(*) FROM stock_moves) AS moves, (SELECT count(*) FROM attachments) AS attachments`,
    { type: QueryTypes.SELECT },
  );
  return row;
}

async function expectRefused(send: () => Promise<{ status: number; body: { error: { code: string; message: string; details?: unknown } } }>, status: number) {
  const before = await receivingRows();
  const response = await send();
  expect(response.status, JSON.stringify(response.body)).toBe(status);
  expect(await receivingRows()).toEqual(before);
  return response.body.error;
}

describe('POST /api/shipments (receiving)', () => {
  it('receives 50 serials given as a range with a PDF into quarantine', async () => {
    const { lineId, tag } = await orderedLine(50);
    const response = await postReceipt(lineId, { quantity: 50, serials: `QW${tag}-0001..QW${tag}-0050`, supplierLot: `LOT-${tag}` }, [
      ['packingSlip', TINY_PDF, 'packing slip.pdf'],
      ['certificate', TINY_PDF, 'CoC.pdf'],
    ]);
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body).toMatchObject({ quantity: 50, state: 'quarantine' });
    expect(response.body.attachments.map((a: { kind: string }) => a.kind)).toEqual(['packing-slip', 'certificate']);

    const lot = (await (await as('auditor')).get(`/api/lots/${response.body.lotId}`).expect(200)).body;
    expect(lot).toMatchObject({ supplierLot: `LOT-${tag}`, state: 'quarantine', quantity: 50, pieceStates: { quarantine: 50 } });
    expect(lot.pieces[0]).toMatchObject({ serial: `QW${tag}-0001`, state: 'quarantine', location: 'QUARANTINE' });
    expect(lot.pieces).toHaveLength(50);
    expect(lot.history[0]).toMatchObject({ what: 'Received into quarantine' });

    const download = await (await as('auditor')).get(`/api/attachments/${lot.attachments[0].id}`).expect(200);
    expect(download.headers['content-type']).toBe('application/pdf');
    expect(Buffer.compare(download.body as Buffer, TINY_PDF)).toBe(0);
  });

  it('reads serials from an uploaded CSV, by its "serial" column', async () => {
    const { lineId, tag } = await orderedLine(3);
    const csv = Buffer.from(`note,serial\nfirst,C${tag}-1\n\nsecond,C${tag}-2\nthird,C${tag}-3\n`);
    const response = await postReceipt(lineId, { quantity: 3 }, [['serialsFile', csv, 'serials.csv']]);
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const lot = (await (await as('clerk')).get(`/api/lots/${response.body.lotId}`).expect(200)).body;
    expect(lot.pieces.map((p: { serial: string }) => p.serial)).toEqual([`C${tag}-1`, `C${tag}-2`, `C${tag}-3`]);
  });

  it('refuses a serial given twice, with its lines', async () => {
    const { lineId, tag } = await orderedLine(10);
    const error = await expectRefused(() => postReceipt(lineId, { quantity: 4, serials: `D${tag}-1\nD${tag}-2\nD${tag}-3\nD${tag}-1` }), 400);
    expect(error).toMatchObject({ code: 'serials', details: [{ line: 4, message: `D${tag}-1 is given twice (lines 1, 4)` }] });
  });

  it('refuses a CSV with a bad line, naming the line', async () => {
    const { lineId, tag } = await orderedLine(10);
    const csv = Buffer.from(`serial\nF${tag}-1\nF${tag}-2\nnot a serial!\n`);
    const error = await expectRefused(() => postReceipt(lineId, { quantity: 3 }, [['serialsFile', csv, 'serials.csv']]), 400);
    expect(error.details).toEqual([{ line: 4, message: '"not a serial!" is not a serial number (letters, digits and . _ / -, at most 80 characters)' }]);
  });

  it('refuses a serial already received for the same part, and allows it for another part', async () => {
    const first = await orderedLine(10);
    await receiveOk(first.lineId, { quantity: 2, serials: `R${first.tag}-1, R${first.tag}-2` });
    const error = await expectRefused(() => postReceipt(first.lineId, { quantity: 2, serials: `R${first.tag}-2, R${first.tag}-3` }), 409);
    expect(error.message).toMatch(new RegExp(`^Already received for this part: R${first.tag}-2 \\(lot L-\\d+\\)$`));

    const other = await orderedLine(10);
    await receiveOk(other.lineId, { quantity: 1, serials: `R${first.tag}-2` });
  });

  it('refuses a quantity that does not match the serials', async () => {
    const { lineId, tag } = await orderedLine(10);
    const error = await expectRefused(() => postReceipt(lineId, { quantity: 6, serials: `Q${tag}-1..Q${tag}-5` }), 400);
    expect(error.message).toBe('The quantity is 6 but the serial numbers give 5');
  });

  it('refuses more than the line still expects unless a reason is stated', async () => {
    const { lineId, tag, order } = await orderedLine(5);
    await receiveOk(lineId, { quantity: 3, serials: `M${tag}-1..M${tag}-3` });
    const error = await expectRefused(() => postReceipt(lineId, { quantity: 3, serials: `M${tag}-4..M${tag}-6` }), 400);
    expect(error.message).toBe(`Line 1 of PO ${order.number} still expects 2; receiving 3 needs a stated reason for the extra pieces`);

    const accepted = await receiveOk(lineId, {
      quantity: 3,
      serials: `M${tag}-4..M${tag}-6`,
      overReceiptReason: 'Supplier sent a spare; buyer agreed by phone',
    });
    const lot = (await (await as('clerk')).get(`/api/lots/${accepted.lotId}`).expect(200)).body;
    expect(lot.overReceiptReason).toBe('Supplier sent a spare; buyer agreed by phone');
  });

  it('refuses a closed PO', async () => {
    const { lineId, tag, order } = await orderedLine(5);
    const line = order.lines[0];
    await (
      await as('buyer')
    )
      .put(`/api/purchase-orders/${order.id}`)
      .send({
        number: order.number,
        supplierId: order.supplier.id,
        orderedOn: order.orderedOn,
        currency: 'EUR',
        status: 'closed',
        lines: [{ id: line.id, partId: line.part.id, quantity: 5, unitPrice: 90, inspectionLevel: 'II', aql: 1 }],
      })
      .expect(200);
    const error = await expectRefused(() => postReceipt(lineId, { quantity: 1, serials: `X${tag}-1` }), 409);
    expect(error.message).toBe(`PO ${order.number} is closed; nothing more can be received against it`);
  });

  it('sniffs the documents: a text file named .pdf is refused, whatever its name', async () => {
    const { lineId, tag } = await orderedLine(5);
    const error = await expectRefused(
      () => postReceipt(lineId, { quantity: 1, serials: `P${tag}-1` }, [['certificate', Buffer.from('just text, not a certificate'), 'certificate.pdf']]),
      415,
    );
    expect(error.message).toBe("Supplier's certificate certificate.pdf is not a PDF, PNG or JPEG");
  });

  it('refuses a document over 20 MB', async () => {
    const { lineId, tag } = await orderedLine(5);
    const big = Buffer.concat([TINY_PDF, Buffer.alloc(20 * 1024 * 1024)]);
    const error = await expectRefused(() => postReceipt(lineId, { quantity: 1, serials: `B${tag}-1` }, [['packingSlip', big, 'huge.pdf']]), 413);
    expect(error.message).toBe('Packing slip is larger than 20 MB');
  });

  it('refuses missing serials, both kinds of serials at once, and a missing packing-slip number', async () => {
    const { lineId, tag } = await orderedLine(5);
    expect((await expectRefused(() => postReceipt(lineId, { quantity: 1, serials: '' }), 400)).message).toMatch(/^Give the serial numbers/);
    const csv = Buffer.from(`serial\nZ${tag}-1\n`);
    expect((await expectRefused(() => postReceipt(lineId, { quantity: 1, serials: `Z${tag}-1` }, [['serialsFile', csv, 's.csv']]), 400)).message).toBe(
      'Give the serial numbers either typed or as a file, not both',
    );
    const noSlip = await expectRefused(() => postReceipt(lineId, { quantity: 1, serials: `Z${tag}-1`, packingSlipNumber: '' }), 400);
    expect(noSlip.details).toEqual([{ path: 'packingSlipNumber', message: 'Give the packing-slip number' }]);
  });

  it('lists shipments with their pieces, searchable by packing slip', async () => {
    const { lineId, tag } = await orderedLine(4);
    await receiveOk(lineId, { quantity: 4, serials: `L${tag}-1..L${tag}-4`, packingSlipNumber: `PS-${tag}` });
    const list = await (await as('buyer')).get(`/api/shipments?q=PS-${tag}`).expect(200);
    expect(list.body).toMatchObject({ total: 1, totals: { pieces: 4 } });
    expect(list.body.data[0]).toMatchObject({ packingSlip: `PS-${tag}`, lots: 1, pieces: 4, carrier: 'Test carrier' });
  });

  it.each(['buyer', 'inspector', 'quality', 'auditor', 'admin'] as const)('answers %s with 403 and writes nothing', async (role) => {
    const { lineId } = await orderedLine(2);
    const client = await as(role);
    await expectRefused(() => client.post('/api/shipments').field('poLineId', String(lineId)).field('quantity', '1').field('serials', `N-${uniqueTag()}`), 403);
  });
});
