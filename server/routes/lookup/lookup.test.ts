// The scan look-up: what a scanned or typed code names, among what the user may read.
import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';
import { receivedLot } from '../../../tests/helpers/receivedLot';
import { uniqueTag } from '../../../tests/helpers/purchasing';

describe('GET /api/lookup', () => {
  it('finds a serial, a lot by its name in either case, and a PO by its number', async () => {
    const lot = await receivedLot({ quantity: 2 });
    const clerk = await as('clerk');
    const serial = await clerk
      .get('/api/lookup')
      .query({ code: ` ${lot.serials[0]} ` })
      .expect(200);
    expect(serial.body).toEqual({
      code: lot.serials[0],
      matches: [{ kind: 'piece', serial: lot.serials[0], partNumber: expect.stringMatching(/^WP-T-/), lotId: lot.lotId, path: `/pieces/${lot.serials[0]}` }],
    });
    const byName = await clerk
      .get('/api/lookup')
      .query({ code: `l-${lot.lotId}` })
      .expect(200);
    expect(byName.body.matches).toEqual([
      { kind: 'lot', lotId: lot.lotId, name: `L-${lot.lotId}`, partNumber: expect.any(String), path: `/lots/${lot.lotId}` },
    ]);
    const order = await clerk.get('/api/lookup').query({ code: lot.poNumber.toLowerCase() }).expect(200);
    expect(order.body.matches).toEqual([
      {
        kind: 'purchase-order',
        purchaseOrderId: expect.any(Number),
        number: lot.poNumber,
        supplierName: expect.stringMatching(/^Test supplier/),
        path: expect.stringMatching(/^\/purchasing\/orders\/\d+$/),
      },
    ]);
  });

  it('answers every piece of a serial that two parts use, and nothing for an unknown code', async () => {
    const serialPrefix = `DUP${uniqueTag()}-`;
    const first = await receivedLot({ quantity: 1, serialPrefix });
    const second = await receivedLot({ quantity: 1, serialPrefix });
    const inspector = await as('inspector');
    const both = await inspector.get('/api/lookup').query({ code: first.serials[0] }).expect(200);
    expect(both.body.matches.map((m: { lotId: number }) => m.lotId).sort()).toEqual([first.lotId, second.lotId].sort());
    expect(
      (
        await inspector
          .get('/api/lookup')
          .query({ code: `NOPE-${uniqueTag()}` })
          .expect(200)
      ).body.matches,
    ).toEqual([]);
    expect((await inspector.get('/api/lookup').query({ code: '   ' }).expect(400)).body.error.details[0].message).toBe('Scan or type a code');
  });
});
