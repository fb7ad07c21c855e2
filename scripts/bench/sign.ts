// `npm run bench -- sign`: the quality manager signs the acceptance of a 500-piece lot (received for
// the run, its sample of 50 measured conforming), which issues a certificate listing all 500 serials
// and an inspection report of the sample. Its limit, in the same run: rendering those two PDFs alone
// with the same renderer and one bcrypt comparison of the signer's password. Target: <= 1.5x.
import bcrypt from 'bcryptjs';
import { DEMO_PASSWORD } from '../../db/seeders/demo';
import { renderLotReport, type LotReportData, type ReportPiece } from '../../server/documents/lotReport';
import { specLines } from '../../server/inspection/specText';
import type { PartSpec } from '../../shared/schemas/spec';
import { receivedLot } from '../../tests/helpers/receivedLot';
import { stokesFile, upload } from './lib/benchFile';
import { withBenchClient } from './lib/database';
import { measured, timed, type Figure } from './lib/figures';
import { api, signIn, waitUntilIdle, type BenchServer } from './lib/server';

const PIECES = 500;

type Row = { serial: string; verdict: string | null; result: Record<string, number | null> | null };

/** The two documents' data as the signature assembles it: every piece on the certificate, the sample on the report. */
async function documentsOf(lotId: number, signer: string, baseUrl: string): Promise<LotReportData[]> {
  return withBenchClient(async (client) => {
    const [lot] = (
      await client.query<{
        supplier_lot: string;
        quantity: number;
        received_at: Date;
        po: string;
        line: number;
        spec: PartSpec;
        part: string;
        description: string;
        supplier: string;
        site: string;
        plan: string;
      }>(
        `SELECT l.supplier_lot, l.quantity, s.received_at, po.number AS po, pol.line_number AS line, pol.spec, p.number AS part, p.description, sup.name AS supplier,
                (SELECT value->>'siteName' FROM site_settings) AS site,
                li.severity || ' inspection, level ' || li.inspection_level || ', AQL ' || li.aql::float8 || ': n = ' || li.sample_size || ', Ac ' || li.accept_number || ', Re ' || li.reject_number AS plan
           FROM lots l JOIN shipments s ON s.id = l.shipment_id JOIN purchase_order_lines pol ON pol.id = l.po_line_id JOIN purchase_orders po ON po.id = pol.purchase_order_id
           JOIN parts p ON p.id = l.part_id JOIN suppliers sup ON sup.id = po.supplier_id JOIN lot_inspections li ON li.lot_id = l.id WHERE l.id = $1`,
        [lotId],
      )
    ).rows;
    const rows = (
      await client.query<Row>(
        `SELECT p.serial, r.verdict, r.result FROM pieces p LEFT JOIN piece_results r ON r.piece_id = p.id AND r.superseded_by_file_id IS NULL WHERE p.lot_id = $1 ORDER BY p.serial`,
        [lotId],
      )
    ).rows;
    const piece = (row: Row, unmeasured: ReportPiece['verdict']): ReportPiece => ({
      serial: row.serial,
      wavelengthNm: row.result?.wavelengthNm ?? null,
      retardanceWaves: row.result?.retardanceWaves ?? null,
      retardanceNm: row.result?.retardanceNm ?? null,
      retardanceErrorWaves: row.result?.retardanceErrorWaves ?? null,
      axisErrorDeg: row.result?.axisErrorDeg ?? null,
      verdict: (row.verdict as ReportPiece['verdict'] | null) ?? unmeasured,
      reasons: [],
    });
    const now = `${new Date().toISOString().slice(0, 16).replace('T', ' ')} UTC`;
    const common = {
      issuedAt: now,
      siteName: lot.site,
      supplier: lot.supplier,
      purchaseOrder: `${lot.po} line ${lot.line}`,
      part: { number: lot.part, description: lot.description },
      specLines: specLines(lot.spec),
      lot: { id: lotId, supplierLot: lot.supplier_lot, quantity: lot.quantity, receivedAt: lot.received_at.toISOString().slice(0, 10) },
      sampling: { summary: lot.plan, defectives: 0, result: 'accept: 0 defective(s) in the sample, within Ac' },
      instruments: [{ code: 'BENCH-2', calibratedOn: '2026-05-12', calibrationDueOn: '2027-05-12', uncertainty: '±0.0008 λ, ±0.05° (k = 2)' }],
      decisionRule: 'simple acceptance: |error| ≤ tolerance (ILAC-G8:09/2019)',
      disposition: { decision: 'Accept', signer, signedAt: now, meaning: 'I approve this lot for use.', outcome: `${lot.quantity} pieces released to stock` },
      dataHash: '0'.repeat(64),
      verifyUrl: `${baseUrl}/verify?number=PLC-2026-00000&hash=${'0'.repeat(64)}`,
    };
    return [
      { ...common, kind: 'certificate', number: 'PLC-2026-00000', pieces: rows.map((r) => piece(r, 'released under the sampling plan')) },
      { ...common, kind: 'inspection-report', number: 'PLR-2026-00000', pieces: rows.filter((r) => r.verdict).map((r) => piece(r, 'not measured')) },
    ];
  });
}

export async function run({ server, tries }: { server: BenchServer; tries: number }) {
  const inspector = await signIn(server, 'inspector@phaselot.test', DEMO_PASSWORD);
  const quality = await signIn(server, 'quality@phaselot.test', DEMO_PASSWORD);
  const signer = await withBenchClient(
    async (c) =>
      (
        await c.query<{ name: string; email: string; hash: string }>(
          "SELECT name, email, password_hash AS hash FROM users WHERE email = 'quality@phaselot.test'",
        )
      ).rows[0],
  );
  let run = 0;
  await measured(
    'sign',
    async (): Promise<Figure[]> => {
      run++;
      const lot = await receivedLot({ quantity: PIECES });
      const sample = await withBenchClient(async (c) =>
        (
          await c.query<{ serial: string }>(
            'SELECT p.serial FROM sample_pieces sp JOIN lot_inspections li ON li.id = sp.inspection_id JOIN pieces p ON p.id = sp.piece_id WHERE li.lot_id = $1 ORDER BY p.serial',
            [lot.lotId],
          )
        ).rows.map((r) => r.serial),
      );
      await api(server, `/api/inspection/lots/${lot.lotId}/measurements`, {
        token: inspector,
        form: upload(stokesFile(sample, 100 + run), 'bench-sample.csv'),
      });
      // The upload queues the background work that follows every bench file (the supplier's drift
      // check): it is let finish first, so that the signature is timed alone, as its limit is.
      const { busySeconds } = await waitUntilIdle(server, 120);
      console.log(
        `sign | lot L-${lot.lotId} of ${PIECES} pieces received, its sample of ${sample.length} measured; the server's work after the upload took ${busySeconds.toFixed(1)} s`,
      );

      server.resetPeak();
      const signing = await timed(() =>
        api(server, `/api/inspection/lots/${lot.lotId}/dispositions`, {
          token: quality,
          json: { decision: 'accept', password: DEMO_PASSWORD, meaningAcknowledged: true, expectedDispositionId: null },
        }),
      );
      const peak = server.memory().peakMb;

      const documents = await documentsOf(lot.lotId, `${signer.name} (${signer.email})`, server.baseUrl);
      const rendering = await timed(async () => {
        for (const data of documents) await renderLotReport(data);
        if (!(await bcrypt.compare(DEMO_PASSWORD, signer.hash))) throw new Error('sign: the demo password does not match the quality manager');
      });
      return [
        {
          name: `signing acceptance of a ${PIECES}-piece lot`,
          value: signing.ms,
          unit: 'ms',
          target: { ratio: 1.5 },
          limit: {
            name: `rendering the certificate (${documents[0].pieces.length} pieces) and the report (${documents[1].pieces.length}) + one bcrypt compare`,
            value: rendering.ms,
          },
          note: `server peak RSS ${peak.toFixed(0)} MB`,
        },
      ];
    },
    tries,
  );
}
