// A lot carries its shipment's receipt time (migration 0901), kept by the database: set when the lot
// is written, followed when the shipment's time is corrected, never set apart from it.
import { QueryTypes } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { sequelize } from '../../db';
import { as } from '../../tests/helpers/api';
import { receiveThroughApi } from '../../tests/helpers/purchasing';

const times = async (lotId: number) =>
  (
    await sequelize.query<{ lot: Date; shipment: Date }>(
      'SELECT l.received_at AS lot, s.received_at AS shipment FROM lots l JOIN shipments s ON s.id = l.shipment_id WHERE l.id = :lotId',
      {
        type: QueryTypes.SELECT,
        replacements: { lotId },
      },
    )
  )[0];

describe("a lot's receipt time", () => {
  it('is its shipment’s, when received, corrected or written over', async () => {
    const lot = await receiveThroughApi(2);
    const received = await times(lot.lotId);
    expect(received.lot).toEqual(received.shipment);

    await sequelize.query(`UPDATE shipments SET received_at = received_at - interval '2 days' WHERE id = (SELECT shipment_id FROM lots WHERE id = :lotId)`, {
      replacements: { lotId: lot.lotId },
    });
    const corrected = await times(lot.lotId);
    expect(corrected.shipment.getTime()).toBe(received.shipment.getTime() - 2 * 86_400_000);
    expect(corrected.lot).toEqual(corrected.shipment);

    await sequelize.query(`UPDATE lots SET received_at = now() WHERE id = :lotId`, { replacements: { lotId: lot.lotId } });
    expect((await times(lot.lotId)).lot).toEqual(corrected.shipment);

    // The lot list orders by it: two days back puts the lot behind one received after it.
    const later = await receiveThroughApi(1);
    const listed = await (await as('auditor')).get('/api/lots').query({ sort: 'receivedAt', q: 'Test supplier', pageSize: 500 }).expect(200);
    const order = listed.body.data.map((l: { id: number }) => l.id);
    expect(order.indexOf(lot.lotId)).toBeLessThan(order.indexOf(later.lotId));
  });
});
