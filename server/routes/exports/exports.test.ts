import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { QueryTypes } from 'sequelize';
import { renameSync } from 'node:fs';
import { join } from 'node:path';
import { sequelize } from '../../../db';
import { startBackgroundWork, stopBackgroundWork } from '../../background';
import { sha256 } from '../../storage/blobs';
import { as } from '../../../tests/helpers/api';
import { acceptedLot, rejectAfterAcceptance } from '../../../tests/helpers/acceptedLot';
import { binaryParser, readZip } from '../../../tests/helpers/zip';
import type { ExportJobView } from '../../../shared/schemas/exports';

const TODAY = new Date().toISOString().slice(0, 10);

let auditor: Awaited<ReturnType<typeof as>>;
let revokedLot: Awaited<ReturnType<typeof acceptedLot>>;
let issuedNumbers: string[];

beforeAll(async () => {
  // Bundles are built by the queue's workers, here in the test's own process.
  await startBackgroundWork();
  auditor = await as('auditor');
  // Accepted, then rejected after all: a revoked certificate and a current inspection report.
  revokedLot = await acceptedLot(20);
  const rejected = await rejectAfterAcceptance(revokedLot);
  issuedNumbers = [...revokedLot.documents, ...rejected].map((d) => d.number);
});

afterAll(() => stopBackgroundWork());

async function finished(id: number): Promise<ExportJobView> {
  for (let attempt = 0; attempt < 200; attempt++) {
    const job = (await auditor.get(`/api/exports/${id}`).expect(200)).body as ExportJobView;
    if (job.status === 'done' || job.status === 'failed') return job;
    await new Promise((wait) => setTimeout(wait, 50));
  }
  throw new Error(`export ${id} did not finish`);
}

async function lastEvent(action: string) {
  const [row] = await sequelize.query<{ entity_id: string; actor_email: string; after: Record<string, unknown> }>(
    'SELECT entity_id, actor_email, after FROM audit_events WHERE action = :action ORDER BY id DESC LIMIT 1',
    { type: QueryTypes.SELECT, replacements: { action } },
  );
  return row;
}

describe('export bundle', () => {
  it('builds a ZIP of the PDFs, index, lot audit log and a manifest whose sums match, and records request and download', async () => {
    const filter = { from: TODAY, to: TODAY, supplierId: revokedLot.supplierId };
    const started = await auditor.post('/api/exports').send(filter).expect(202);
    expect(started.body).toMatchObject({ status: 'queued', filter, total: issuedNumbers.length });
    expect(await lastEvent('export.create')).toMatchObject({ entity_id: String(started.body.id), actor_email: 'auditor@phaselot.test' });

    const job = await finished(started.body.id);
    expect(job).toMatchObject({ status: 'done', done: issuedNumbers.length, total: issuedNumbers.length, error: null });

    const download = await auditor.get(`/api/exports/${job.id}/download`).buffer(true).parse(binaryParser).expect(200);
    expect(download.headers['content-type']).toBe('application/zip');
    const zip = download.body as Buffer;
    expect(sha256(zip)).toBe(job.sha256);
    expect(zip.length).toBe(job.size);
    expect(await lastEvent('export.download')).toMatchObject({ entity_id: String(job.id), after: { sha256: job.sha256 } });

    const entries = await readZip(zip);
    const certificateNumber = revokedLot.certificate.number;
    expect([...entries.keys()].sort()).toEqual(['audit-log.csv', 'index.csv', 'manifest.sha256', ...issuedNumbers.map((number) => `pdf/${number}.pdf`)].sort());

    const manifestLines = entries.get('manifest.sha256')!.toString('utf8').trim().split('\n');
    // The audit chain head, as a comment line (sha256sum -c skips it): the hash of the event at that position.
    const [, headSeq, headHash] = manifestLines[0].match(/^# audit chain head: position (\d+), sha256 ([0-9a-f]{64}), recorded \S+$/)!;
    const [headRow] = await sequelize.query<{ hash: string }>('SELECT hash FROM audit_events WHERE seq = :seq', {
      type: QueryTypes.SELECT,
      replacements: { seq: headSeq },
    });
    expect(headRow.hash).toBe(headHash);
    const manifest = manifestLines.slice(1).map((line) => line.match(/^([0-9a-f]{64}) {2}(.+)$/)!.slice(1));
    expect(manifest.map(([, path]) => path).sort()).toEqual([...entries.keys()].filter((path) => path !== 'manifest.sha256').sort());
    for (const [sum, path] of manifest) expect(sha256(entries.get(path)!), path).toBe(sum);

    const listed = (await auditor.get('/api/certificates').query(filter).expect(200)).body.data as {
      number: string;
      pdfSha256: string;
      dataHash: string;
      revokedAt: string | null;
    }[];
    const index = parse(entries.get('index.csv')!, { columns: true, bom: true }) as Record<string, string>[];
    expect(index.map((row) => row.number).sort()).toEqual(listed.map((d) => d.number).sort());
    expect(index.map((row) => row.number).sort()).toEqual([...issuedNumbers].sort());
    for (const document of listed) {
      const row = index.find((r) => r.number === document.number)!;
      expect(row).toMatchObject({
        lot: String(revokedLot.lotId),
        pdf_sha256: document.pdfSha256,
        data_sha256: document.dataHash,
        revoked_at: document.revokedAt ?? '',
      });
      expect(sha256(entries.get(`pdf/${document.number}.pdf`)!)).toBe(document.pdfSha256);
    }
    expect(index.find((r) => r.number === certificateNumber)).toMatchObject({
      kind: 'certificate',
      decision: 'Accept',
      revoked_at: expect.stringMatching(/^\d{4}-/),
    });

    const auditLog = parse(entries.get('audit-log.csv')!, { columns: true, bom: true }) as Record<string, string>[];
    expect(auditLog.every((row) => BigInt(row.seq) <= BigInt(headSeq))).toBe(true);
    expect(auditLog.every((row) => row.entity_type === 'lot' && row.entity_id === String(revokedLot.lotId))).toBe(true);
    const [{ count }] = await sequelize.query<{ count: string }>("SELECT count(*) FROM audit_events WHERE entity_type = 'lot' AND entity_id = :id", {
      type: QueryTypes.SELECT,
      replacements: { id: String(revokedLot.lotId) },
    });
    expect(auditLog).toHaveLength(Number(count));
    expect(auditLog.map((row) => row.action)).toContain('measurement.upload');
  });

  it('exports by part across suppliers', async () => {
    const job = await finished((await auditor.post('/api/exports').send({ from: TODAY, to: TODAY, partId: revokedLot.partId }).expect(202)).body.id);
    expect(job).toMatchObject({ status: 'done', total: issuedNumbers.length });
  });

  it('says why a job failed when a stored PDF is missing', async () => {
    const lot = await acceptedLot(10);
    const [{ storage_key: key }] = await sequelize.query<{ storage_key: string }>('SELECT storage_key FROM lot_documents WHERE number = :number', {
      type: QueryTypes.SELECT,
      replacements: { number: lot.certificate.number },
    });
    const stored = join(process.env.UPLOAD_DIR!, key.slice(0, 2), key);
    renameSync(stored, `${stored}.away`);
    try {
      const job = await finished((await auditor.post('/api/exports').send({ from: TODAY, to: TODAY, supplierId: lot.supplierId }).expect(202)).body.id);
      expect(job.status).toBe('failed');
      expect(job.error).toContain(`The stored PDF of ${lot.certificate.number} could not be read`);
      const refused = await auditor.get(`/api/exports/${job.id}/download`).expect(409);
      expect(refused.body.error.message).toMatch(/This export failed/);
    } finally {
      renameSync(`${stored}.away`, stored);
    }
  });

  it('refuses a bad filter and a filter that matches nothing, with the reason', async () => {
    const backwards = await auditor.post('/api/exports').send({ from: TODAY, to: '2020-01-01' }).expect(400);
    expect(backwards.body.error.details).toContainEqual({ path: 'to', message: 'The last day comes before the first day' });
    const missing = await auditor.post('/api/exports').send({ to: TODAY }).expect(400);
    expect(missing.body.error.details).toContainEqual(expect.objectContaining({ path: 'from' }));
    const empty = await auditor.post('/api/exports').send({ from: '2001-01-01', to: '2001-01-31' }).expect(400);
    expect(empty.body.error.message).toMatch(/nothing to export/);
  });

  it('tells the form how many documents a choice finds and on which days, so its default range has documents', async () => {
    // The supplier of the lot accepted then rejected: the documents of both decisions, issued today.
    const span = await auditor.get('/api/exports/span').query({ supplierId: revokedLot.supplierId }).expect(200);
    expect(span.body).toEqual({ documents: issuedNumbers.length, first: TODAY, last: TODAY });
    const inRange = await auditor.get('/api/exports/span').query({ supplierId: revokedLot.supplierId, from: TODAY, to: TODAY }).expect(200);
    expect(inRange.body.documents).toBe(issuedNumbers.length);
    // A range before anything was issued finds nothing: an answer, not an error.
    const empty = await auditor.get('/api/exports/span').query({ supplierId: revokedLot.supplierId, from: '2020-01-01', to: '2020-01-31' }).expect(200);
    expect(empty.body).toEqual({ documents: 0, first: null, last: null });
    // Every document on record: the range the form offers first.
    const all = await auditor.get('/api/exports/span').expect(200);
    expect(all.body.documents).toBeGreaterThanOrEqual(issuedNumbers.length);
    expect(all.body.first <= TODAY && all.body.last >= TODAY).toBe(true);
    await auditor.get('/api/exports/span').query({ from: '2026-02-30' }).expect(400);
  });

  it('is for auditors and quality managers only', async () => {
    const clerk = await as('clerk');
    await clerk.post('/api/exports').send({ from: TODAY, to: TODAY }).expect(403);
    await clerk.get('/api/exports').expect(403);
    const mine = await auditor.get('/api/exports').expect(200);
    await clerk.get(`/api/exports/${mine.body.data[0].id}`).expect(403);
    await clerk.get(`/api/exports/${mine.body.data[0].id}/download`).expect(403);
    await (await as('quality')).get(`/api/exports/${mine.body.data[0].id}`).expect(200);
  });
});
