// The project's own PostgreSQL cluster: created on first use, started on 127.0.0.1, reused after.
// PostgreSQL refuses to run as root, so as root the cluster belongs to the `postgres` system user;
// when that user cannot enter the checkout, the data lives in a folder it can reach.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, chownSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import pg from 'pg';

export interface Cluster {
  dataDir: string;
  port: number;
  startedByUs: boolean;
  stop(): void;
}

const repoRoot = resolve(import.meta.dirname, '../..');
const isRoot = process.getuid?.() === 0;

function binDir(): string {
  const base = '/usr/lib/postgresql';
  const versions = existsSync(base) ? readdirSync(base).filter((v) => /^\d+$/.test(v)) : [];
  if (versions.length === 0) throw new Error('PostgreSQL server binaries not found under /usr/lib/postgresql');
  const newest = versions.map(Number).sort((a, b) => b - a)[0];
  return join(base, String(newest), 'bin');
}

function runAsOwner(cmd: string, args: string[], options: { allowFail?: boolean } = {}) {
  const [file, fullArgs] = isRoot ? ['runuser', ['-u', 'postgres', '--', cmd, ...args]] : [cmd, args];
  const result = spawnSync(file, fullArgs, { encoding: 'utf8' });
  if (result.status !== 0 && !options.allowFail) {
    throw new Error(`${cmd} ${args.join(' ')} failed:\n${result.stdout}${result.stderr}`);
  }
  return result;
}

function ownerCanUse(dir: string): boolean {
  if (!isRoot) return true;
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-w', dir, '-a', '-x', dir]).status === 0;
}

/** Picks the data folder: `.data/<name>` in the checkout, or a per-checkout folder under /var/tmp. */
function chooseDataDir(name: string): string {
  const inCheckout = join(repoRoot, '.data', name);
  mkdirSync(inCheckout, { recursive: true });
  if (isRoot) execFileSync('chown', ['postgres:postgres', inCheckout]);
  if (ownerCanUse(inCheckout)) return inCheckout;
  const tag = createHash('sha256').update(repoRoot).digest('hex').slice(0, 10);
  const outside = join('/var/tmp', `phaselot-${tag}`, name);
  mkdirSync(outside, { recursive: true });
  if (isRoot) {
    chownSync(join('/var/tmp', `phaselot-${tag}`), 0, 0);
    execFileSync('chown', ['postgres:postgres', outside]);
  }
  writeFileSync(join(repoRoot, '.data', `${name}.location`), `${outside}\n`);
  return outside;
}

function isRunning(bin: string, dataDir: string): boolean {
  return runAsOwner(join(bin, 'pg_ctl'), ['-D', dataDir, 'status'], { allowFail: true }).status === 0;
}

export function ensureCluster(name: string, port: number): Cluster {
  const bin = binDir();
  const dataDir = chooseDataDir(name);
  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    console.log(`phaselot: creating PostgreSQL cluster in ${dataDir}`);
    runAsOwner(join(bin, 'initdb'), ['-D', dataDir, '-U', 'phaselot', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
  }
  let startedByUs = false;
  if (!isRunning(bin, dataDir)) {
    const options = `-p ${port} -c listen_addresses=127.0.0.1 -k ${dataDir} -c fsync=${name.includes('test') ? 'off' : 'on'}`;
    const started = runAsOwner(join(bin, 'pg_ctl'), ['-D', dataDir, '-l', join(dataDir, 'server.log'), '-o', options, '-w', '-t', '60', 'start'], { allowFail: true });
    if (started.status !== 0) {
      const log = readFileSync(join(dataDir, 'server.log'), 'utf8').trim().split('\n').slice(-4).join('\n');
      throw new Error(`PostgreSQL did not start on 127.0.0.1:${port} (is another server using the port?):\n${log}`);
    }
    startedByUs = true;
  }
  return {
    dataDir,
    port,
    startedByUs,
    stop() {
      if (startedByUs) runAsOwner(join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', 'stop'], { allowFail: true });
    },
  };
}

export function databaseUrl(port: number, database: string): string {
  return `postgres://phaselot@127.0.0.1:${port}/${database}`;
}

export function ensureDatabase(port: number, database: string, options: { recreate?: boolean } = {}) {
  return withAdmin(port, async (client) => {
    if (options.recreate) await client.query(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`);
    const found = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
    if (found.rowCount === 0) await client.query(`CREATE DATABASE "${database}"`);
  });
}

async function withAdmin<T>(port: number, work: (client: pg.Client) => Promise<T>) {
  const client = new pg.Client({ connectionString: databaseUrl(port, 'postgres') });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

export function dropDatabase(port: number, database: string) {
  return withAdmin(port, (client) => client.query(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`));
}

/** Whether anyone is connected to a database of this cluster other than `database`. */
export function otherDatabasesInUse(port: number, database: string) {
  return withAdmin(port, async (client) => {
    const { rowCount } = await client.query("SELECT 1 FROM pg_stat_activity WHERE datname LIKE 'phaselot_test_%' AND datname <> $1", [database]);
    return (rowCount ?? 0) > 0;
  });
}
