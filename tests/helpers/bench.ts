// The inspection bench as API tests drive it: a lot's sample, bench files of quarter-wave plates, an
// upload, a signed decision, and a document's text read back from its PDF.
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { as } from './api';
import { pdfPages } from './pdfText';

const TODAY = new Date().toISOString().slice(0, 10);

/** Quarter-wave plates at 632.8 nm; `bad` ones are 0.006 λ long, twice the ±0.003 λ tolerance. */
export function benchFile(serials: string[], bad: string[] = [], instrument = 'BENCH-2') {
  return stokesBenchFile(
    serials.map((serial, i) => ({
      serial,
      wavelengthNm: 632.8,
      retardanceWaves: bad.includes(serial) ? 0.256 : 0.25 + ((i % 5) - 2) * 0.0003,
      fastAxisDeg: 0.1,
    })),
    { instrument, date: TODAY, noise: 0.0005, seed: serials.length },
  );
}

type PieceView = { id: number; serial: string; inSample: boolean; toMeasure: boolean; verdict: string };

/** The lot's inspection view and the serials of its sample. */
export async function sampleOf(lotId: number) {
  const view = await (await as('inspector')).get(`/api/inspection/lots/${lotId}`).expect(200);
  const pieces = view.body.pieces as PieceView[];
  return { view: view.body, pieces, sample: pieces.filter((p) => p.inSample).map((p) => p.serial) };
}

/** Commits a bench file as the inspector; answers the response, whose status must be `status`. */
export async function uploadBench(lotId: number, name: string, content: string, status = 201) {
  return (await as('inspector'))
    .post(`/api/inspection/lots/${lotId}/measurements`)
    .attach('files', Buffer.from(content), { filename: name, contentType: 'text/csv' })
    .expect(status);
}

/** Signs a decision as the quality manager; answers the response, whose status must be `status`. */
export async function signDecision(lotId: number, decision: string, expectedDispositionId: number | null, extra: Record<string, unknown> = {}, status = 201) {
  return (await as('quality'))
    .post(`/api/inspection/lots/${lotId}/dispositions`)
    .send({ decision, password: 'phaselot-demo', meaningAcknowledged: true, expectedDispositionId, ...extra })
    .expect(status);
}

/** The text of an issued document (certificate or report), read back from its PDF. */
export async function documentText(number: string) {
  const pdf = await (
    await as('auditor')
  )
    .get(`/api/documents/${number}.pdf`)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    })
    .expect(200);
  return (await pdfPages(pdf.body as Buffer)).join('\n');
}
