// A supplier and part of their own for supplier-performance tests, and the demo people who order,
// receive, measure and decide their lots through the operations the demo history uses.
import { User } from '../../db/models';
import { DEMO_PASSWORD } from '../../db/seeders/demo';
import type { HistoryPeople } from '../../db/seeders/performanceDemo';
import { as } from './api';
import { uniqueTag } from './purchasing';
import { QUARTER_WAVE_633 } from './receivedLot';

export async function historyPeople(): Promise<HistoryPeople> {
  const find = (role: string) => User.findOne({ where: { email: `${role}@phaselot.test` }, rejectOnEmpty: true });
  return {
    buyer: await find('buyer'),
    clerk: await find('clerk'),
    inspector: await find('inspector'),
    quality: await find('quality'),
    password: DEMO_PASSWORD,
  };
}

/** A fresh supplier (owned by the demo buyer) and a quarter-wave part at 632.8 nm, ±0.003 λ, ±0.5°. */
export async function freshSupplierPart(tag = uniqueTag()) {
  const buyer = await as('buyer');
  const supplier = await buyer
    .post('/api/suppliers')
    .send({ name: `Scorecard supplier ${tag}`, contactEmail: `orders-${tag.toLowerCase()}@example.test` })
    .expect(201);
  const part = await buyer
    .post('/api/parts')
    .send({ number: `SP-${tag}`, description: 'Scorecard test quarter-wave plate', spec: QUARTER_WAVE_633 })
    .expect(201);
  return { tag, supplierId: supplier.body.id as number, partId: part.body.id as number };
}
