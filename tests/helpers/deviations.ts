// A deviation of the register for tests: written by the demo buyer, approved by the demo quality
// manager and then by the demo administrator, as a use-as-is decision needs it.
import { DEMO_PASSWORD } from '../../db/seeders/demo';
import { as } from './api';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

type Options = { quantityLimit?: number; expiresOn?: string; allowed?: string; retardanceTolWaves?: number };

export async function approvedDeviation(supplierId: number, partId: number, options: Options = {}) {
  const created = await (await as('buyer'))
    .post('/api/deviations')
    .send({
      supplierId,
      partId,
      allowed: options.allowed ?? 'Retardance tolerance widened for the alignment jig build',
      retardanceTolWaves: options.retardanceTolWaves,
      quantityLimit: options.quantityLimit ?? 50,
      expiresOn: options.expiresOn ?? inDays(30),
    })
    .expect(201);
  const sign = { password: DEMO_PASSWORD, meaningAcknowledged: true };
  await (await as('quality')).post(`/api/deviations/${created.body.id}/approvals`).send(sign).expect(201);
  const approved = await (await as('admin')).post(`/api/deviations/${created.body.id}/approvals`).send(sign).expect(201);
  return approved.body as { id: number; number: string; status: string; quantityLeft: number };
}
