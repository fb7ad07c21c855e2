// A deviation of the register for tests: written by the demo buyer, approved by the demo quality
// manager and then by the demo administrator, as a use-as-is decision needs it.
import { DEMO_PASSWORD } from '../../db/seeders/demo';
import { as } from './api';
import { benchFile, inspectionOf, type supplierPart } from './switching';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

type Options = { quantityLimit?: number; expiresOn?: string; allowed?: string; retardanceTolWaves?: number };

export async function approvedDeviation(supplierId: number, partId: number, options: Options = {}) {
  const created = await (
    await as('buyer')
  )
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

/** A lot of 20 of the supplier's part whose sample rejects it (Re failing pieces measured): ready for a use-as-is decision. */
export async function rejectedSample(pair: Awaited<ReturnType<typeof supplierPart>>) {
  const { lotId } = await pair.receive(20);
  const { view, sample } = await inspectionOf(lotId);
  const failing = sample.slice(0, view.plan.reject);
  await (
    await as('inspector')
  )
    .post(`/api/inspection/lots/${lotId}/measurements`)
    .attach('files', Buffer.from(benchFile(failing, failing)), { filename: 'bench.csv', contentType: 'text/csv' })
    .expect(201);
  return lotId;
}

/** Signs a use-as-is decision of the lot under the deviation, as the demo quality manager. */
export const useAsIs = async (lotId: number, deviationId: number, expectedDispositionId: number | null = null) =>
  (await as('quality')).post(`/api/inspection/lots/${lotId}/dispositions`).send({
    decision: 'use-as-is',
    password: DEMO_PASSWORD,
    meaningAcknowledged: true,
    expectedDispositionId,
    deviationId,
    justification: 'Harmless in the alignment jig build',
  });
