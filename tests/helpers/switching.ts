// Lots of one supplier and part taken through receipt (the clerk's API, which draws their plans),
// measurement and a signed decision, to move the supplier and part through the switching rules.
import { expect } from 'vitest';
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { as } from './api';
import { orderedLine, receiveOk, uniqueTag } from './purchasing';

export const DEMO_PASSWORD = 'phaselot-demo';

/** A supplier and part with an open PO line long enough for every lot a test receives. */
export async function supplierPart() {
  const line = await orderedLine(2000);
  return {
    ...line,
    receive: async (quantity = 60) => {
      const prefix = `${uniqueTag()}-`;
      return receiveOk(line.lineId, { quantity, serials: `${prefix}0001..${prefix}${String(quantity).padStart(4, '0')}` });
    },
  };
}

/** Quarter-wave plates at 632.8 nm; the `bad` ones are 0.006 λ long, twice the ±0.003 λ ordered. */
export function benchFile(serials: string[], bad: string[] = []) {
  return stokesBenchFile(
    serials.map((serial) => ({ serial, wavelengthNm: 632.8, retardanceWaves: bad.includes(serial) ? 0.256 : 0.2501, fastAxisDeg: 0.05 })),
    { instrument: 'BENCH-2', date: new Date().toISOString().slice(0, 10), noise: 0.0004, seed: serials.length },
  );
}

export async function inspectionOf(lotId: number) {
  const view = await (await as('inspector')).get(`/api/inspection/lots/${lotId}`).expect(200);
  return { view: view.body, sample: view.body.pieces.filter((p: { inSample: boolean }) => p.inSample).map((p: { serial: string }) => p.serial) as string[] };
}

export async function sign(lotId: number, decision: string, expectedDispositionId: number | null = null, extra: Record<string, unknown> = {}) {
  return (await as('quality'))
    .post(`/api/inspection/lots/${lotId}/dispositions`)
    .send({ decision, password: DEMO_PASSWORD, meaningAcknowledged: true, expectedDispositionId, ...extra });
}

/** Measures the lot's sample (all within tolerance, or Re pieces failing) and signs the decision. */
export async function decide(lotId: number, decision: 'accept' | 'reject') {
  const { view, sample } = await inspectionOf(lotId);
  const measured = decision === 'accept' ? sample : sample.slice(0, view.plan.reject);
  await (
    await as('inspector')
  )
    .post(`/api/inspection/lots/${lotId}/measurements`)
    .attach('files', Buffer.from(benchFile(measured, decision === 'accept' ? [] : measured)), { filename: 'bench.csv', contentType: 'text/csv' })
    .expect(201);
  const signed = await sign(lotId, decision);
  expect(signed.status, JSON.stringify(signed.body)).toBe(201);
  return { plan: view.plan, dispositionId: signed.body.dispositionId as number };
}
