// A Phaselot server for the benchmarks: server/main.ts in a child process of its own (API and
// background jobs, as in production), on the bench database, so that its memory can be read apart
// from the benchmark's and the load generator does not share its event loop. Its log goes to
// .data/bench/server.log.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { appendFileSync, closeSync, openSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { benchDir, benchEnvironment, repoRoot, withBenchClient } from './database';

export const BENCH_SERVER_PORT = Number(process.env.PHASELOT_BENCH_SERVER_PORT ?? 4872);
const READY_WITHIN_MS = 120_000;

export type BenchServer = {
  baseUrl: string;
  pid: number;
  /** Resident memory now, and the peak since the last resetPeak(), in MB. */
  memory(): { rssMb: number; peakMb: number };
  /** Processor time the server has used so far, in seconds. */
  cpuSeconds(): number;
  resetPeak(): void;
  stop(): Promise<void>;
};

const logPath = join(benchDir, 'server.log');

function logTail() {
  return readFileSync(logPath, 'utf8').trim().split('\n').slice(-15).join('\n');
}

/** Brings a database filled by an older checkout up to this one's schema, as `npm run migrate` would. */
function migrateBenchDatabase() {
  const migrated = spawnSync(process.execPath, ['--import', 'tsx', join(repoRoot, 'scripts/migrate.ts')], {
    cwd: repoRoot,
    env: { ...process.env, ...benchEnvironment() },
    encoding: 'utf8',
  });
  if (migrated.status !== 0) throw new Error(`Migrating the bench database failed:\n${migrated.stdout}${migrated.stderr}`);
  console.log(`bench: ${migrated.stdout.trim()}`);
}

export async function startBenchServer(): Promise<BenchServer> {
  migrateBenchDatabase();
  const baseUrl = `http://127.0.0.1:${BENCH_SERVER_PORT}`;
  if (
    await fetch(`${baseUrl}/api/health`).then(
      () => true,
      () => false,
    )
  )
    throw new Error(`Something already answers on ${baseUrl}: stop it first (a bench server left running?)`);
  appendFileSync(logPath, `\n--- bench server started ${new Date().toISOString()}\n`);
  const log = openSync(logPath, 'a');
  // The flags `npm start` runs the server with, then PHASELOT_BENCH_NODE_ARGS, e.g. `--cpu-prof
  // --cpu-prof-dir=/tmp/prof` to profile a benchmark.
  const nodeArgs = [readFileSync(join(repoRoot, 'scripts/server-node-options'), 'utf8'), process.env.PHASELOT_BENCH_NODE_ARGS ?? '']
    .join(' ')
    .split(/\s+/)
    .filter(Boolean);
  const child: ChildProcess = spawn(process.execPath, [...nodeArgs, '--import', 'tsx', join(repoRoot, 'server/main.ts')], {
    cwd: repoRoot,
    env: { ...process.env, ...benchEnvironment(), NODE_ENV: 'production', HOST: '127.0.0.1', PORT: String(BENCH_SERVER_PORT), PUBLIC_URL: baseUrl },
    stdio: ['ignore', log, log],
  });
  closeSync(log);
  let exited: number | null = null;
  child.once('exit', (code) => (exited = code ?? 1));

  const deadline = Date.now() + READY_WITHIN_MS;
  for (;;) {
    if (exited !== null) throw new Error(`The bench server stopped (status ${exited}) before answering:\n${logTail()}`);
    const up = await fetch(`${baseUrl}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    // Only once this child is still there: the answer could have come from a server on its way out.
    if (up && exited === null) break;
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`The bench server did not answer /api/health within ${READY_WITHIN_MS / 1000} s:\n${logTail()}`);
    }
    await sleep(250);
  }

  const pid = child.pid!;
  const statusKb = (field: 'VmRSS' | 'VmHWM') =>
    Number(new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? NaN);
  return {
    baseUrl,
    pid,
    memory: () => ({ rssMb: statusKb('VmRSS') / 1024, peakMb: statusKb('VmHWM') / 1024 }),
    // utime and stime, the 14th and 15th fields of /proc/<pid>/stat, in clock ticks of 1/100 s.
    cpuSeconds: () => {
      const fields = readFileSync(`/proc/${pid}/stat`, 'utf8')
        .replace(/^.*\) /, '')
        .split(' ');
      return (Number(fields[11]) + Number(fields[12])) / 100;
    },
    // Writing 5 to clear_refs resets the kernel's peak resident size (VmHWM) to the current one.
    resetPeak: () => writeFileSync(`/proc/${pid}/clear_refs`, '5'),
    async stop() {
      if (exited !== null) return;
      const gone = new Promise((done) => child.once('exit', done));
      child.kill('SIGTERM');
      const stopped = await Promise.race([gone.then(() => true), sleep(15_000).then(() => false)]);
      if (!stopped) child.kill('SIGKILL');
    },
  };
}

type Call = { method?: string; token?: string; json?: unknown; form?: FormData };

/** One API call; throws with the server's error unless it answers 2xx. */
export async function api<T = unknown>(server: Pick<BenchServer, 'baseUrl'>, path: string, call: Call = {}): Promise<{ body: T; bytes: number }> {
  const headers: Record<string, string> = {};
  if (call.token) headers.authorization = `Bearer ${call.token}`;
  if (call.json !== undefined) headers['content-type'] = 'application/json';
  const method = call.method ?? (call.json !== undefined || call.form ? 'POST' : 'GET');
  const response = await fetch(`${server.baseUrl}${path}`, {
    method,
    headers,
    body: call.form ?? (call.json !== undefined ? JSON.stringify(call.json) : undefined),
  }).catch((error: Error) => {
    throw new Error(`${method} ${path} got no answer: ${error.message} (${String((error.cause as Error | undefined)?.message ?? error.cause)})`);
  });
  const text = await response.text();
  if (!response.ok) throw new Error(`${method} ${path} answered ${response.status}: ${text.slice(0, 500)}`);
  return { body: (text ? JSON.parse(text) : undefined) as T, bytes: Buffer.byteLength(text) };
}

export async function signIn(server: Pick<BenchServer, 'baseUrl'>, email: string, password: string): Promise<string> {
  const { body } = await api<{ token: string }>(server, '/api/auth/login', { json: { email, password } });
  return body.token;
}

/** The application's queries running now (the job queue's own polling aside): how many, and the oldest's age. */
export function runningQueries(): Promise<{ count: number; oldestSeconds: number }> {
  return withBenchClient(async (client) => {
    const { rows } = await client.query<{ count: number; oldest: number }>(
      `SELECT count(*)::int AS count, coalesce(max(extract(epoch FROM now() - query_start)), 0)::float8 AS oldest
         FROM pg_stat_activity
        WHERE datname = current_database() AND usename = 'phaselot_app' AND state <> 'idle' AND pid <> pg_backend_pid() AND query NOT ILIKE '%pgboss%'`,
    );
    return { count: rows[0].count, oldestSeconds: rows[0].oldest };
  }, 'admin');
}

/**
 * Waits until the server has been quiet for 2 s (no query of the application's running, under 5 % of
 * a core used): requests whose clients have gone may still be working, between queries too. After
 * `maxSeconds` cancels the queries left, so that the next measurement starts on a quiet server.
 * Answers how long it stayed busy and how many queries were cancelled.
 */
export async function waitUntilIdle(server: BenchServer, maxSeconds: number): Promise<{ busySeconds: number; cancelled: number }> {
  const start = performance.now();
  const elapsed = () => (performance.now() - start) / 1000;
  let quietSince: number | null = null;
  let cpu = server.cpuSeconds();
  while (elapsed() < maxSeconds) {
    await sleep(500);
    const used = server.cpuSeconds() - cpu;
    cpu += used;
    const quiet = used < 0.025 && (await runningQueries()).count === 0;
    if (!quiet) quietSince = null;
    else {
      quietSince ??= elapsed() - 0.5;
      if (elapsed() - quietSince >= 2) return { busySeconds: quietSince, cancelled: 0 };
    }
  }
  const cancelled = await withBenchClient(async (client) => {
    const { rowCount } = await client.query(
      `SELECT pg_cancel_backend(pid) FROM pg_stat_activity
        WHERE datname = current_database() AND usename = 'phaselot_app' AND state <> 'idle' AND pid <> pg_backend_pid() AND query NOT ILIKE '%pgboss%'`,
    );
    return rowCount ?? 0;
  }, 'admin');
  return { busySeconds: maxSeconds, cancelled };
}
