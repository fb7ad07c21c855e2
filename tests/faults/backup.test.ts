// Backup and restore, round trip: the seeded database and a lot accepted with its certificate are
// backed up, restored into a new database and a new file store, and the restored application
// verifies its audit chain and the certificate (number, data hash and the PDF's SHA-256).
import { execFile } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync, truncateSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '../../db';
import { databaseUrl, dropDatabase, ensureDatabase } from '../../scripts/lib/postgres';
import { createBackup, restoreBackup, type Manifest } from '../../scripts/lib/backup';
import { config } from '../../server/config';
import { blobStore } from '../../server/storage/blobs';
import { LocalBlobStore } from '../../server/storage/local';
import { acceptedLot } from '../helpers/acceptedLot';

const run = promisify(execFile);
const source = new URL(config.DATABASE_URL);
const port = Number(source.port);
const target = `${source.pathname.slice(1)}_restored`;
const work = mkdtempSync(join(tmpdir(), 'phaselot-backup-test-'));
const restoredFiles = join(work, 'restored-files');
const archive = join(work, 'backup.zip');

/** Row counts and the chain head of a database, read through its owner. */
async function census(url: string) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const tables = [
      'users',
      'lots',
      'pieces',
      'measurement_files',
      'readings',
      'piece_results',
      'dispositions',
      'lot_documents',
      'audit_events',
      'stock_moves',
    ];
    const counts: Record<string, number> = {};
    for (const table of tables) counts[table] = Number((await client.query(`SELECT count(*) FROM ${table}`)).rows[0].count);
    const head = (await client.query('SELECT seq, hash FROM audit_chain_head')).rows[0];
    return { counts, head };
  } finally {
    await client.end();
  }
}

const restoreInto = (options: { force?: boolean; file?: string } = {}) =>
  restoreBackup(options.file ?? archive, {
    ownerUrl: databaseUrl(port, target, 'owner'),
    appUrl: databaseUrl(port, target, 'app'),
    store: new LocalBlobStore(restoredFiles),
    force: options.force,
  });

let lot: Awaited<ReturnType<typeof acceptedLot>>;
let manifest: Manifest;
let before: Awaited<ReturnType<typeof census>>;

beforeAll(async () => {
  lot = await acceptedLot(20);
  await ensureDatabase(port, target, { recreate: true });
});

afterAll(async () => {
  await dropDatabase(port, target);
  rmSync(work, { recursive: true, force: true });
});

describe('backup and restore', () => {
  it('writes the database and every stored file its rows name into one archive', async () => {
    manifest = await createBackup({ ownerUrl: config.MIGRATION_DATABASE_URL, store: blobStore, file: archive });
    before = await census(config.MIGRATION_DATABASE_URL);
    const [{ named }] = await sequelize.query<{ named: string }>(
      `SELECT count(DISTINCT key) AS named FROM (
         SELECT storage_key AS key FROM measurement_files UNION SELECT storage_key FROM lot_documents
         UNION SELECT storage_key FROM export_jobs UNION SELECT sha256 FROM attachments
         UNION SELECT element ->> 'storageKey' FROM mail_outbox, jsonb_array_elements(attachments) AS element) k WHERE key IS NOT NULL`,
      { type: QueryTypes.SELECT },
    );
    expect(manifest).toMatchObject({ format: 'phaselot-backup', version: 1, files: { count: Number(named) } });
    expect(manifest.files.count).toBeGreaterThan(0);
    expect(manifest.database.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('restores into a new database and file store, where the audit chain and the certificate verify', async () => {
    const restored = await restoreInto();
    expect(restored.files).toBe(manifest.files.count);
    // Nothing lost or added on the way (the restored side has not been used yet).
    expect(await census(databaseUrl(port, target, 'owner'))).toEqual(before);

    const env = {
      ...process.env,
      DATABASE_URL: databaseUrl(port, target, 'app'),
      MIGRATION_DATABASE_URL: databaseUrl(port, target, 'owner'),
      STORAGE: 'local',
      UPLOAD_DIR: restoredFiles,
      JWT_SECRET: randomBytes(32).toString('base64url'),
    };
    const { stdout } = await run(
      join(import.meta.dirname, '../../node_modules/.bin/tsx'),
      [join(import.meta.dirname, 'check-restored.ts'), lot.certificate.number, lot.certificate.dataHash],
      { env },
    );
    const check = JSON.parse(stdout.trim().split('\n').pop()!);
    expect(check.chain).toMatchObject({ status: 200, intact: true, problems: [] });
    expect(check.chain.checked).toBeGreaterThan(Number(before.head.seq));
    expect(check.certificate).toMatchObject({ status: 200, genuine: true, current: true, document: { number: lot.certificate.number } });
    const [{ pdf_sha256 }] = await sequelize.query<{ pdf_sha256: string }>('SELECT pdf_sha256 FROM lot_documents WHERE number = :number', {
      type: QueryTypes.SELECT,
      replacements: { number: lot.certificate.number },
    });
    expect(check.pdf).toEqual({ status: 200, sha256: pdf_sha256 });

    // The restored application's role is the application's: rows only, the trail not rewritable.
    const app = new pg.Client({ connectionString: databaseUrl(port, target, 'app') });
    await app.connect();
    try {
      await expect(app.query('ALTER TABLE audit_events DISABLE TRIGGER ALL')).rejects.toThrow(/must be owner/);
      await expect(app.query("UPDATE audit_events SET action = 'x'")).rejects.toThrow(/permission denied/);
    } finally {
      await app.end();
    }
  });

  it('refuses to overwrite a database that holds data unless forced, and then replaces it', async () => {
    await expect(restoreInto()).rejects.toThrow(/The target database is not empty: .*--force/);
    await restoreInto({ force: true });
    expect((await census(databaseUrl(port, target, 'owner'))).counts).toEqual(before.counts);
  });

  it('refuses an archive that is cut short or is no backup at all', async () => {
    const cut = join(work, 'cut.zip');
    copyFileSync(archive, cut);
    truncateSync(cut, 1000);
    await expect(restoreInto({ force: true, file: cut })).rejects.toThrow(/is not a backup archive/);
    await expect(restoreInto({ force: true, file: join(work, 'missing.zip') })).rejects.toThrow(/no such backup file/);
  });
});
