// Backups: one ZIP holding the database (pg_dump's custom format), every stored file a row of that
// database names, and a manifest. The files are chosen from the same snapshot pg_dump reads, so the
// archive never names a file it lacks. A restore puts the files back first (named by their SHA-256,
// each is checked on the way), then the database in one transaction, then migrates and grants the
// application's role as `npm start` would.
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createWriteStream, existsSync, readdirSync } from 'node:fs';
import { mkdir, mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { Transform, type Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import archiver from 'archiver';
import pg from 'pg';
import yauzl from 'yauzl';
import { migrate } from '../../db/migrator';
import { isBlobKey, type BlobStore } from '../../server/storage/store';
import { BLOB_REFERENCES } from '../../server/storage/sweep';

export const BACKUP_FORMAT = 'phaselot-backup';
const FORMAT_VERSION = 1;
const DUMP_ENTRY = 'database.dump';
const MANIFEST_ENTRY = 'manifest.json';
const fileEntry = (key: string) => `files/${key.slice(0, 2)}/${key}`;

export type Manifest = {
  format: typeof BACKUP_FORMAT;
  version: number;
  createdAt: string;
  database: { name: string; serverVersion: string; entry: string; bytes: number; sha256: string };
  files: { store: string; count: number; bytes: number };
};

/** pg_dump and pg_restore of the newest PostgreSQL installed (they must not be older than the server), else from PATH. */
function postgresTool(name: 'pg_dump' | 'pg_restore') {
  const base = '/usr/lib/postgresql';
  const versions = existsSync(base)
    ? readdirSync(base)
        .filter((v) => /^\d+$/.test(v))
        .map(Number)
        .sort((a, b) => b - a)
    : [];
  return versions.length ? join(base, String(versions[0]), 'bin', name) : name;
}

/** Runs a PostgreSQL tool; its standard output goes to `output` when given. Rejects with its error text. */
function runTool(name: 'pg_dump' | 'pg_restore', args: string[], output?: NodeJS.WritableStream) {
  return new Promise<void>((resolve, reject) => {
    const child = spawn(postgresTool(name), args, { stdio: ['ignore', output ? 'pipe' : 'ignore', 'pipe'] });
    let errors = '';
    child.stderr!.on('data', (chunk: Buffer) => void (errors += chunk.toString()));
    if (output) child.stdout!.pipe(output);
    child.on('error', reject);
    child.on('close', (code) => (code === 0 ? resolve() : reject(new Error(`${name} failed (exit ${code}): ${errors.trim()}`))));
  });
}

/** The keys of every stored file a row names, in the tables this database has (an old one may lack some). */
async function referencedKeys(client: pg.Client) {
  const { rows } = await client.query<{ name: string }>('SELECT table_name AS name FROM information_schema.tables WHERE table_schema = current_schema()');
  const present = new Set(rows.map((r) => r.name));
  const sources = BLOB_REFERENCES.filter((r) => present.has(r.table)).map((r) =>
    'jsonKey' in r
      ? `SELECT element ->> '${r.jsonKey}' AS key FROM ${r.table}, jsonb_array_elements(${r.column}) AS element`
      : `SELECT ${r.column} AS key FROM ${r.table}`,
  );
  if (sources.length === 0) return [];
  const named = await client.query<{ key: string }>(`SELECT DISTINCT key FROM (${sources.join(' UNION ')}) named WHERE key IS NOT NULL ORDER BY key`);
  return named.rows.map((r) => r.key);
}

/** Passes bytes through, counting them and hashing them on the way (without making the stream flow early). */
const sha256Tap = () => {
  const hash = createHash('sha256');
  let bytes = 0;
  const tap = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      hash.update(chunk);
      bytes += chunk.length;
      done(null, chunk);
    },
  });
  return { tap, result: () => ({ sha256: hash.digest('hex'), bytes }) };
};

/**
 * Writes a backup of the database at `ownerUrl` (the owner role, which can read every table) and of
 * the files its rows name in `store` to `file`. Answers the manifest.
 */
export async function createBackup({ ownerUrl, store, file }: { ownerUrl: string; store: BlobStore; file: string }): Promise<Manifest> {
  await mkdir(dirname(file), { recursive: true });
  const client = new pg.Client({ connectionString: ownerUrl });
  await client.connect();
  const archive = archiver('zip', { zlib: { level: 6 } });
  const written = pipeline(archive, createWriteStream(file));
  try {
    // The snapshot stays open while pg_dump reads it and while the files it names are collected.
    await client.query('BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY');
    const {
      rows: [{ snapshot, name, version }],
    } = await client.query<{ snapshot: string; name: string; version: string }>(
      "SELECT pg_export_snapshot() AS snapshot, current_database() AS name, current_setting('server_version') AS version",
    );
    const keys = await referencedKeys(client);

    const dump = sha256Tap();
    archive.append(dump.tap, { name: DUMP_ENTRY, store: true });
    const dumped = new Promise((done, fail) => dump.tap.on('end', done).on('error', fail));
    await runTool('pg_dump', ['--format=custom', `--snapshot=${snapshot}`, `--dbname=${ownerUrl}`], dump.tap);
    await dumped;

    let fileBytes = 0;
    for (const key of keys) {
      if (!isBlobKey(key)) throw new Error(`The database names a stored file by an invalid key: ${JSON.stringify(key)}`);
      const content = await store.open(key);
      const counted = sha256Tap();
      archive.append(content.pipe(counted.tap), { name: fileEntry(key) });
      await new Promise((done, fail) => {
        counted.tap.on('end', done);
        counted.tap.on('error', fail);
        content.on('error', fail);
      });
      const { sha256, bytes } = counted.result();
      if (sha256 !== key) throw new Error(`The stored file ${key} does not hold the bytes it is named after (SHA-256 ${sha256}): the store is damaged`);
      fileBytes += bytes;
    }
    await client.query('COMMIT');

    const manifest: Manifest = {
      format: BACKUP_FORMAT,
      version: FORMAT_VERSION,
      createdAt: new Date().toISOString(),
      database: { name, serverVersion: version, entry: DUMP_ENTRY, ...dump.result() },
      files: { store: store.location, count: keys.length, bytes: fileBytes },
    };
    archive.append(`${JSON.stringify(manifest, null, 2)}\n`, { name: MANIFEST_ENTRY });
    await archive.finalize();
    await written;
    return manifest;
  } catch (error) {
    archive.abort();
    await written.catch(() => undefined);
    await rm(file, { force: true });
    throw error;
  } finally {
    await client.end();
  }
}

type ZipFile = yauzl.ZipFile;

const openZip = (file: string) =>
  new Promise<ZipFile>((resolve, reject) =>
    yauzl.open(file, { lazyEntries: true, autoClose: false }, (error, zip) =>
      error ? reject(new Error(`${file} is not a backup archive: ${error.message}`)) : resolve(zip),
    ),
  );

const entriesOf = (zip: ZipFile) =>
  new Promise<yauzl.Entry[]>((resolve, reject) => {
    const entries: yauzl.Entry[] = [];
    zip.on('entry', (entry: yauzl.Entry) => {
      entries.push(entry);
      zip.readEntry();
    });
    zip.on('end', () => resolve(entries));
    zip.on('error', reject);
    zip.readEntry();
  });

const streamOf = (zip: ZipFile, entry: yauzl.Entry) =>
  new Promise<Readable>((resolve, reject) => zip.openReadStream(entry, (error, stream) => (error ? reject(error) : resolve(stream))));

async function textOf(zip: ZipFile, entry: yauzl.Entry) {
  const chunks: Buffer[] = [];
  for await (const chunk of await streamOf(zip, entry)) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

/** Streams an entry to `path`, answering the SHA-256 of what was written. */
async function extract(zip: ZipFile, entry: yauzl.Entry, path: string) {
  const counted = sha256Tap();
  await pipeline(await streamOf(zip, entry), counted.tap, createWriteStream(path));
  return counted.result();
}

function readManifest(text: string, file: string): Manifest {
  let manifest: Manifest;
  try {
    manifest = JSON.parse(text) as Manifest;
  } catch {
    throw new Error(`${file}: its manifest is not JSON`);
  }
  if (manifest.format !== BACKUP_FORMAT) throw new Error(`${file} is not a Phaselot backup (format ${JSON.stringify(manifest.format)})`);
  if (manifest.version !== FORMAT_VERSION)
    throw new Error(`${file} is a backup of format version ${manifest.version}; this Phaselot reads version ${FORMAT_VERSION}`);
  return manifest;
}

/** How many relations (tables, sequences, views) other roles' work left in the database, outside the system schemas. */
async function relationCount(client: pg.Client) {
  const { rows } = await client.query<{ count: string }>(
    `SELECT count(*) FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
      WHERE c.relkind IN ('r', 'p', 'S', 'v', 'm', 'f') AND n.nspname <> 'information_schema' AND n.nspname NOT LIKE 'pg\\_%'`,
  );
  return Number(rows[0].count);
}

export type RestoreOptions = {
  /** The target database, as its owner role. */
  ownerUrl: string;
  /** The application's connection to the target, granted its rows afterwards. */
  appUrl: string;
  store: BlobStore;
  /** Empty the target first when it holds data (everything the owner role owns there is dropped). */
  force?: boolean;
};

/** Restores a backup into an empty database (or, with `force`, one emptied first) and the given store. */
export async function restoreBackup(file: string, { ownerUrl, appUrl, store, force = false }: RestoreOptions) {
  if (!(await stat(file).catch(() => null))?.isFile()) throw new Error(`${file}: no such backup file`);
  const zip = await openZip(file);
  const work = await mkdtemp(join(tmpdir(), 'phaselot-restore-'));
  const client = new pg.Client({ connectionString: ownerUrl });
  try {
    const entries = await entriesOf(zip);
    const byName = new Map(entries.map((e) => [e.fileName, e]));
    const manifestEntry = byName.get(MANIFEST_ENTRY);
    if (!manifestEntry) throw new Error(`${file} has no ${MANIFEST_ENTRY}: not a Phaselot backup, or cut short`);
    const manifest = readManifest(await textOf(zip, manifestEntry), file);
    const dumpEntry = byName.get(manifest.database.entry);
    if (!dumpEntry) throw new Error(`${file} lacks its database dump (${manifest.database.entry})`);
    const fileEntries = entries.filter((e) => e.fileName.startsWith('files/') && !e.fileName.endsWith('/'));
    if (fileEntries.length !== manifest.files.count) {
      throw new Error(`${file} holds ${fileEntries.length} stored file(s), its manifest says ${manifest.files.count}: the archive is incomplete`);
    }

    const dumpPath = join(work, DUMP_ENTRY);
    const dump = await extract(zip, dumpEntry, dumpPath);
    if (dump.sha256 !== manifest.database.sha256)
      throw new Error(`${file}: the database dump does not match the SHA-256 in its manifest: the archive is damaged`);

    await client.connect();
    if ((await relationCount(client)) > 0) {
      if (!force) throw new Error('The target database is not empty: restore into an empty or new database, or give --force to replace what it holds');
      await client.query('DROP OWNED BY CURRENT_USER CASCADE');
      const left = await relationCount(client);
      if (left > 0)
        throw new Error(`The target database still holds ${left} relation(s) owned by other roles after emptying what its owner owns; empty it by hand`);
    }

    // Files first: named by their content, they are harmless extras should the database step fail.
    for (const entry of fileEntries) {
      const key = entry.fileName.split('/').pop()!;
      if (!isBlobKey(key)) throw new Error(`${file}: ${entry.fileName} is not a stored file's name`);
      if (await store.has(key)) continue;
      const path = join(work, key);
      const { sha256 } = await extract(zip, entry, path);
      if (sha256 !== key) throw new Error(`${file}: ${entry.fileName} does not hold the bytes it is named after: the archive is damaged`);
      await store.putFile(key, path);
      await rm(path);
    }

    // Ownership and grants come from this installation's roles, not from the ones in the dump.
    await runTool('pg_restore', ['--no-owner', '--no-acl', '--exit-on-error', '--single-transaction', `--dbname=${ownerUrl}`, dumpPath]);
    const applied = await migrate({ owner: ownerUrl, app: appUrl });
    return { manifest, files: fileEntries.length, migrationsApplied: applied };
  } finally {
    zip.close();
    await client.end().catch(() => undefined);
    await rm(work, { recursive: true, force: true });
  }
}
