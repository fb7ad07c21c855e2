// The export bundle: one ZIP of the documents' PDFs, an index of them, the audit events of their
// lots and a manifest of SHA-256 sums. Everything is streamed: PDFs come from the file store, the
// CSVs and the ZIP go through a temporary folder, the ZIP hashed as it is written, and the caller
// keeps the finished ZIP (in the file store) before the folder is removed.
import archiver from 'archiver';
import { stringify } from 'csv-stringify';
import { createHash } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable, Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { DISPOSITION_LABELS } from '../../shared/inspection/lotVerdict';
import { AUDIT_CSV_COLUMNS, streamAuditEvents } from '../audit/query';
import { chainHead } from '../audit/verify';
import { escapeCsvCell, type CsvColumn } from '../http/csv';
import type { documentsForExport } from '../documents/certificates';
import { JobFailure } from '../jobs/queue';
import { openBlob } from '../storage/blobs';
import { BlobMissingError } from '../storage/store';

export type ExportDocument = Awaited<ReturnType<typeof documentsForExport>>[number];

export const INDEX_CSV_COLUMNS: CsvColumn<ExportDocument>[] = [
  { header: 'number', value: (d) => d.number },
  { header: 'kind', value: (d) => d.kind },
  { header: 'lot', value: (d) => d.lot.id },
  { header: 'supplier_lot', value: (d) => d.lot.supplierLot },
  { header: 'part', value: (d) => d.part.number },
  { header: 'supplier', value: (d) => d.supplier.name },
  { header: 'decision', value: (d) => DISPOSITION_LABELS[d.decision] },
  { header: 'signer', value: (d) => d.signer },
  { header: 'issued_at', value: (d) => d.issuedAt },
  { header: 'revoked_at', value: (d) => d.revokedAt },
  { header: 'data_sha256', value: (d) => d.dataHash },
  { header: 'pdf_sha256', value: (d) => d.pdfSha256 },
];

/** A pass-through stream that hashes and counts what flows through it. */
function hashing() {
  const hash = createHash('sha256');
  let bytes = 0;
  const stream = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      hash.update(chunk);
      bytes += chunk.length;
      done(null, chunk);
    },
  });
  return { stream, digest: () => hash.digest('hex'), bytes: () => bytes };
}

async function* csvRecords<T>(columns: CsvColumn<T>[], rows: Iterable<T> | AsyncIterable<T>) {
  for await (const row of rows) yield columns.map((column) => escapeCsvCell(column.value(row)));
}

/** Writes rows as CSV to `path` and answers the file's SHA-256. */
async function writeCsvFile<T>(path: string, columns: CsvColumn<T>[], rows: Iterable<T> | AsyncIterable<T>) {
  const hashed = hashing();
  await pipeline(
    Readable.from(csvRecords(columns, rows)),
    stringify({ header: true, columns: columns.map((c) => c.header), bom: true }),
    hashed.stream,
    createWriteStream(path),
  );
  return hashed.digest();
}

/** Adds one entry and waits until the archive has written it, so entries never pile up in memory. */
function appendEntry(archive: archiver.Archiver, name: string, source: Readable, options: { store?: boolean } = {}) {
  return new Promise<void>((resolve, reject) => {
    const onEntry = (entry: archiver.EntryData) => {
      if (entry.name !== name) return;
      archive.off('entry', onEntry);
      resolve();
    };
    archive.on('entry', onEntry);
    source.once('error', reject);
    archive.append(source, { name, store: options.store });
  });
}

export type BundleFile = { path: string; size: number; sha256: string };

/** Opens a document's stored PDF; a PDF that is not there is a failure no retry can mend. */
async function storedPdf(document: ExportDocument) {
  try {
    return await openBlob(document.storageKey);
  } catch (error) {
    if (error instanceof BlobMissingError) throw new JobFailure(`The stored PDF of ${document.number} could not be read (it is missing from the file store)`);
    throw error;
  }
}

/** Writes the bundle and hands the finished ZIP to `keep` while it still exists; answers what `keep` answers. */
export async function writeExportBundle<T>(
  documents: ExportDocument[],
  onPdfAdded: (done: number) => Promise<void>,
  keep: (file: BundleFile) => Promise<T>,
): Promise<T> {
  const workDir = await mkdtemp(join(tmpdir(), 'phaselot-export-'));
  const zipPath = join(workDir, 'bundle.zip');
  const archive = archiver('zip', { zlib: { level: 6 } });
  const zipHash = hashing();
  const written = pipeline(archive, zipHash.stream, createWriteStream(zipPath));
  // An archive error rejects `written`; until it is awaited, keep it from counting as unhandled.
  written.catch(() => undefined);
  try {
    // The audit chain's head when the bundle was made: printed in the manifest so a copy kept
    // outside can anchor the trail, and the lots' audit log ends there.
    const head = await chainHead();
    const sums: { path: string; sha256: string }[] = [];
    const indexPath = join(workDir, 'index.csv');
    sums.push({ path: 'index.csv', sha256: await writeCsvFile(indexPath, INDEX_CSV_COLUMNS, documents) });
    const auditPath = join(workDir, 'audit-log.csv');
    const lotIds = [...new Set(documents.map((d) => String(d.lot.id)))];
    sums.push({
      path: 'audit-log.csv',
      sha256: await writeCsvFile(auditPath, AUDIT_CSV_COLUMNS, streamAuditEvents({ entityType: 'lot', entityIds: lotIds, uptoSeq: head.seq })),
    });

    await appendEntry(archive, 'index.csv', createReadStream(indexPath));
    await appendEntry(archive, 'audit-log.csv', createReadStream(auditPath));
    for (const [i, document] of documents.entries()) {
      const path = `pdf/${document.number}.pdf`;
      const pdfHash = hashing();
      const source = (await storedPdf(document)).once('error', (error: NodeJS.ErrnoException) => {
        pdfHash.stream.destroy(new Error(`The stored PDF of ${document.number} could not be read (${error.code ?? error.message})`));
      });
      // PDFs are compressed already; deflating them again costs time and saves nothing.
      await appendEntry(archive, path, source.pipe(pdfHash.stream), { store: true });
      const sha256 = pdfHash.digest();
      if (sha256 !== document.pdfSha256) throw new JobFailure(`The stored PDF of ${document.number} does not match the SHA-256 recorded when it was issued`);
      sums.push({ path, sha256 });
      await onPdfAdded(i + 1);
    }
    // A '#' line is a comment to sha256sum -c.
    const headLine = `# audit chain head: position ${head.seq}, sha256 ${head.hash ?? 'none'}, recorded ${head.occurredAt ?? 'never'}\n`;
    const manifest = headLine + sums.map((s) => `${s.sha256}  ${s.path}\n`).join('');
    await appendEntry(archive, 'manifest.sha256', Readable.from([Buffer.from(manifest)]));
    await archive.finalize();
    await written;
    return await keep({ path: zipPath, size: zipHash.bytes(), sha256: zipHash.digest() });
  } catch (error) {
    archive.abort();
    throw error;
  } finally {
    await rm(workDir, { recursive: true, force: true });
  }
}
