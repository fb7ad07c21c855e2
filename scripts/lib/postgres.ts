// The project's own PostgreSQL cluster: created on first use, started on 127.0.0.1, reused after.
// PostgreSQL refuses to run as root, so as root the cluster belongs to the `postgres` system user;
// when that user cannot enter the checkout, the data lives in a folder it can reach.
//
// Three roles: `phaselot`, the cluster's superuser, only creates roles and databases; `phaselot_owner`
// owns each database and everything in it and runs the migrations; the application connects as
// `phaselot_app`, which may read and write rows and nothing more (db/roles.ts). A cluster made before
// the roles existed is brought to this layout on the next start, its data kept.
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
    const started = runAsOwner(join(bin, 'pg_ctl'), ['-D', dataDir, '-l', join(dataDir, 'server.log'), '-o', options, '-w', '-t', '60', 'start'], {
      allowFail: true,
    });
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

export const ROLES = { admin: 'phaselot', owner: 'phaselot_owner', app: 'phaselot_app' } as const;

/** Where `npm start` keeps its data (the test cluster listens on 54871). */
export const PROJECT_DATABASE = { port: 54870, name: 'phaselot' } as const;

export function databaseUrl(port: number, database: string, role: keyof typeof ROLES): string {
  return `postgres://${ROLES[role]}@127.0.0.1:${port}/${database}`;
}

/**
 * `npm start`'s database: the project's cluster (started if need be), the database in it, and the
 * environment pointed at it unless DATABASE_URL / MIGRATION_DATABASE_URL say otherwise.
 */
export async function useProjectDatabase(port: number, database: string) {
  const cluster = ensureCluster('pg', port);
  await ensureDatabase(port, database);
  process.env.DATABASE_URL ??= databaseUrl(port, database, 'app');
  process.env.MIGRATION_DATABASE_URL ??= databaseUrl(port, database, 'owner');
  return cluster;
}

/** The owner and application roles; neither may create roles or databases, the application inherits nothing. */
async function ensureRoles(client: pg.Client) {
  const roles = [
    `${ROLES.owner} LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS`,
    `${ROLES.app} LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS NOINHERIT`,
  ];
  for (const definition of roles) {
    const name = definition.split(' ')[0];
    const found = await client.query('SELECT 1 FROM pg_roles WHERE rolname = $1', [name]);
    if (found.rowCount && found.rowCount > 0) continue;
    // Two starts at once may both find it missing: the loser's duplicate is harmless.
    await client.query(`CREATE ROLE ${definition}`).catch((error) => {
      if ((error as { code?: string }).code !== '42710') throw error;
    });
  }
}

/**
 * The database, created (or, from a cluster older than the roles, taken over) by the owner role:
 * the database and every object in it not in the system schemas change hands, nothing is copied.
 */
export async function ensureDatabase(port: number, database: string, options: { recreate?: boolean } = {}) {
  await withAdmin(port, async (client) => {
    await ensureRoles(client);
    if (options.recreate) await client.query(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`);
    const found = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
    if (found.rowCount === 0) await client.query(`CREATE DATABASE "${database}" OWNER ${ROLES.owner}`);
  });
  await withAdmin(port, (client) => handOver(client, database), database);
}

/** Gives the database and what is in it to the owner role; a no-op once done. */
async function handOver(client: pg.Client, database: string) {
  await client.query(`ALTER DATABASE "${database}" OWNER TO ${ROLES.owner}`);
  await client.query(`
    DO $handover$
    DECLARE
      item record;
      owner_oid oid := '${ROLES.owner}'::regrole;
    BEGIN
      FOR item IN
        SELECT n.nspname AS schema_name FROM pg_namespace n
         WHERE n.nspowner <> owner_oid AND n.nspname NOT IN ('public', 'information_schema') AND n.nspname NOT LIKE 'pg\\_%'
      LOOP
        EXECUTE format('ALTER SCHEMA %I OWNER TO ${ROLES.owner}', item.schema_name);
      END LOOP;
      -- Tables take their indexes and the sequences of their serial columns with them.
      FOR item IN
        SELECT n.nspname AS schema_name, c.relname, c.relkind FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
         WHERE c.relowner <> owner_oid AND c.relkind IN ('r', 'p', 'v', 'm', 'f')
           AND n.nspname <> 'information_schema' AND n.nspname NOT LIKE 'pg\\_%'
      LOOP
        EXECUTE format('ALTER %s %I.%I OWNER TO ${ROLES.owner}',
          CASE item.relkind WHEN 'v' THEN 'VIEW' WHEN 'm' THEN 'MATERIALIZED VIEW' WHEN 'f' THEN 'FOREIGN TABLE' ELSE 'TABLE' END,
          item.schema_name, item.relname);
      END LOOP;
      FOR item IN
        SELECT n.nspname AS schema_name, c.relname FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
         WHERE c.relowner <> owner_oid AND c.relkind = 'S' AND n.nspname <> 'information_schema' AND n.nspname NOT LIKE 'pg\\_%'
      LOOP
        EXECUTE format('ALTER SEQUENCE %I.%I OWNER TO ${ROLES.owner}', item.schema_name, item.relname);
      END LOOP;
      FOR item IN
        SELECT p.oid::regprocedure AS routine FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
         WHERE p.proowner <> owner_oid AND n.nspname <> 'information_schema' AND n.nspname NOT LIKE 'pg\\_%'
           AND NOT EXISTS (SELECT 1 FROM pg_depend d WHERE d.classid = 'pg_proc'::regclass AND d.objid = p.oid AND d.deptype = 'e')
      LOOP
        EXECUTE format('ALTER ROUTINE %s OWNER TO ${ROLES.owner}', item.routine);
      END LOOP;
      -- Enums, domains and ranges (a table's own row type follows its table).
      FOR item IN
        SELECT t.oid::regtype AS type_name FROM pg_type t JOIN pg_namespace n ON n.oid = t.typnamespace
         WHERE t.typowner <> owner_oid AND t.typtype IN ('e', 'd', 'r') AND n.nspname <> 'information_schema' AND n.nspname NOT LIKE 'pg\\_%'
           AND NOT EXISTS (SELECT 1 FROM pg_depend d WHERE d.classid = 'pg_type'::regclass AND d.objid = t.oid AND d.deptype = 'e')
      LOOP
        EXECUTE format('ALTER TYPE %s OWNER TO ${ROLES.owner}', item.type_name);
      END LOOP;
    END
    $handover$;
    REVOKE CREATE ON SCHEMA public FROM PUBLIC;
  `);
}

async function withAdmin<T>(port: number, work: (client: pg.Client) => Promise<T>, database = 'postgres') {
  const client = new pg.Client({ connectionString: databaseUrl(port, database, 'admin') });
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
