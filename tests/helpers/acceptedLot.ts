// A lot taken through the API from receipt to a signed acceptance: the sample measured on the bench
// within tolerance, then accepted by the quality manager, which issues its certificate.
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { as } from './api';
import { receivedLot } from './receivedLot';

type IssuedDocument = { number: string; kind: 'certificate' | 'inspection-report'; dataHash: string };

export async function acceptedLot(quantity = 20) {
  const lot = await receivedLot({ quantity, level: 'II', aql: 1 });
  const inspector = await as('inspector');
  const view = await inspector.get(`/api/inspection/lots/${lot.lotId}`).expect(200);
  const sample: string[] = view.body.pieces.filter((p: { inSample: boolean }) => p.inSample).map((p: { serial: string }) => p.serial);
  const file = stokesBenchFile(
    sample.map((serial) => ({ serial, wavelengthNm: 632.8, retardanceWaves: 0.2501, fastAxisDeg: 0.05 })),
    { instrument: 'BENCH-2', date: new Date().toISOString().slice(0, 10), noise: 0.0004, seed: sample.length },
  );
  await inspector
    .post(`/api/inspection/lots/${lot.lotId}/measurements`)
    .attach('files', Buffer.from(file), { filename: 'bench.csv', contentType: 'text/csv' })
    .expect(201);
  const signed = await (
    await as('quality')
  )
    .post(`/api/inspection/lots/${lot.lotId}/dispositions`)
    .send({ decision: 'accept', password: 'phaselot-demo', meaningAcknowledged: true, expectedDispositionId: null })
    .expect(201);
  const documents = signed.body.documents as IssuedDocument[];
  const certificate = documents.find((d) => d.kind === 'certificate');
  if (!certificate) throw new Error(`lot ${lot.lotId} was accepted without a certificate`);
  return { ...lot, dispositionId: signed.body.dispositionId as number, certificate, documents };
}

/** Reverses an acceptance: the rejection supersedes it, revokes its documents and issues a report. */
export async function rejectAfterAcceptance(lot: Awaited<ReturnType<typeof acceptedLot>>) {
  const rejected = await (
    await as('quality')
  )
    .post(`/api/inspection/lots/${lot.lotId}/dispositions`)
    .send({
      decision: 'reject',
      password: 'phaselot-demo',
      meaningAcknowledged: true,
      expectedDispositionId: lot.dispositionId,
      justification: 'Chipped edges found at kitting',
    })
    .expect(201);
  return rejected.body.documents as IssuedDocument[];
}
