// The benchmark's own PostgreSQL cluster (`.data/pg-bench`, 127.0.0.1:54872) and database, apart
// from the development and test clusters so that filling millions of rows, or stopping the cluster
// afterwards, never disturbs anyone's `npm start` or `npm test`. The settings every process of a
// benchmark reads (the fill, the server it starts) come from here.
import { randomBytes } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import pg from 'pg';
import { databaseUrl, ensureCluster, ensureDatabase, type Cluster } from '../../lib/postgres';

// Two runs at once on one machine (two checkouts) need their own ports: PHASELOT_BENCH_PORT (and
// PHASELOT_BENCH_SERVER_PORT, lib/server.ts); a cluster on another port keeps its data apart too.
export const BENCH_PORT = Number(process.env.PHASELOT_BENCH_PORT ?? 54872);
const suffix = BENCH_PORT === 54872 ? '' : `-${BENCH_PORT}`;
const CLUSTER = `pg-bench${suffix}`;
export const BENCH_DATABASE = 'phaselot_bench';
export const repoRoot = resolve(import.meta.dirname, '../../..');
/** Stored files, mail, logs and builds of the benchmarks. */
export const benchDir = join(repoRoot, '.data', `bench${suffix}`);

export const benchUrl = (role: 'admin' | 'owner' | 'app') => databaseUrl(BENCH_PORT, BENCH_DATABASE, role);

/** The environment of a Phaselot process working on the bench database. */
export function benchEnvironment(): Record<string, string> {
  return {
    DATABASE_URL: benchUrl('app'),
    MIGRATION_DATABASE_URL: benchUrl('owner'),
    UPLOAD_DIR: join(benchDir, 'uploads'),
    MAIL_CATCHER_DIR: join(benchDir, 'mail'),
    // Nothing listens here: mail the benchmarks cause stays queued, as with a relay that is down.
    SMTP_URL: 'smtp://127.0.0.1:9',
    JWT_SECRET: randomBytes(32).toString('base64url'),
    LOG_LEVEL: 'warn',
  };
}

export function startBenchCluster(): Cluster {
  mkdirSync(benchDir, { recursive: true });
  return ensureCluster(CLUSTER, BENCH_PORT);
}

export const ensureBenchDatabase = (options: { recreate?: boolean } = {}) => ensureDatabase(BENCH_PORT, BENCH_DATABASE, options);

/** A plain connection to the bench database (the owner's by default); closed after `work`. */
export async function withBenchClient<T>(work: (client: pg.Client) => Promise<T>, role: 'admin' | 'owner' | 'app' = 'owner'): Promise<T> {
  const client = new pg.Client({ connectionString: benchUrl(role) });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

/** What a completed fill wrote on the database (its comment), or null when it was never completed
 * (or the database is not there yet); asked of the cluster, so it works before the roles exist. */
export async function fillRecord(): Promise<string | null> {
  const client = new pg.Client({ connectionString: databaseUrl(BENCH_PORT, 'postgres', 'admin') });
  await client.connect();
  try {
    const { rows } = await client.query<{ note: string | null }>("SELECT shobj_description(oid, 'pg_database') AS note FROM pg_database WHERE datname = $1", [
      BENCH_DATABASE,
    ]);
    return rows[0]?.note?.startsWith('phaselot bench fill') ? rows[0].note : null;
  } finally {
    await client.end();
  }
}
