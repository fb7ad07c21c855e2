// `npm run bench -- lists`: the lists of a site with years of records under 50 concurrent
// connections (autocannon), each run right after the same load on GET /api/health, whose p95 is its
// limit (target: p95 <= 2x health's); opening one lot, median of 20 warm requests one after another
// against health's median (target <= 5x); and 50 requests whose clients leave before the answer
// (target: none of their queries still running 2 s later, and the server under 400 MB).
import autocannon from 'autocannon';
import { request } from 'node:http';
import { setTimeout as sleep } from 'node:timers/promises';
import { DEMO_PASSWORD } from '../../db/seeders/demo';
import { withBenchClient } from './lib/database';
import { measured, median, percentile, timed, type Figure } from './lib/figures';
import { api, runningQueries, signIn, waitUntilIdle, type BenchServer } from './lib/server';

const CONNECTIONS = 50;
const HEALTH_SECONDS = 10;
const LIST_SECONDS = 20;
const TIMEOUT_SECONDS = 30;
/** How long a list's leftover requests may keep the server busy before the next measurement. */
const SETTLE_SECONDS = 60;

type Load = { p95: number; p50: number; completed: number; unfinished: number; perSecond: number; failed: number };

/** 50 connections on one address for `seconds`; a request unanswered when the run ends counts as never answered. */
async function load(server: BenchServer, path: string, token: string | null, seconds: number): Promise<Load> {
  const latencies: number[] = [];
  let failed = 0;
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const options = { url: `${server.baseUrl}${path}`, connections: CONNECTIONS, duration: seconds, timeout: TIMEOUT_SECONDS, headers: token ? { authorization: `Bearer ${token}` } : {} };
    const instance = autocannon(options, (error, done) => (error ? reject(error) : resolve(done)));
    instance.on('response', (_client: unknown, statusCode: number, _bytes: number, responseTime: number) => {
      if (statusCode >= 200 && statusCode < 300) latencies.push(responseTime);
      else failed++;
    });
  });
  const unfinished = Math.max(0, result.requests.sent - latencies.length - failed) + result.timeouts;
  const all = [...latencies, ...Array<number>(unfinished).fill(Infinity)];
  return { p95: percentile(all, 95), p50: median(all), completed: latencies.length, unfinished, perSecond: latencies.length / seconds, failed: failed + result.errors };
}

const loadNote = (l: Load) =>
  `${l.completed} answered (${l.perSecond.toFixed(1)}/s), ${l.unfinished} unanswered in the run${l.failed ? `, ${l.failed} failed` : ''}; p50 ${Number.isFinite(l.p50) ? `${l.p50.toFixed(0)} ms` : 'not reached'}`;

async function settle(label: string) {
  const { busySeconds, cancelled } = await waitUntilIdle(SETTLE_SECONDS);
  if (busySeconds > 0.5) console.log(`lists | after ${label}: the server ran its queries ${busySeconds.toFixed(1)} s more${cancelled ? `; ${cancelled} still running were cancelled` : ''}`);
}

async function sequentialMedian(server: BenchServer, path: string, token: string | null, times = 20) {
  const call = () => api(server, path, { token: token ?? undefined });
  for (let i = 0; i < 3; i++) await call();
  const ms: number[] = [];
  for (let i = 0; i < times; i++) ms.push((await timed(call)).ms);
  return median(ms);
}

/** Requests whose clients hang up after `patienceMs`, as a user leaving a slow page does. */
function abandon(server: BenchServer, path: string, token: string, count: number, patienceMs: number) {
  return Promise.all(
    Array.from({ length: count }, () => new Promise<void>((done) => {
      const req = request(`${server.baseUrl}${path}`, { headers: { authorization: `Bearer ${token}` } }, (res) => res.resume().on('end', done).on('error', done));
      req.on('error', () => done());
      req.end();
      setTimeout(() => {
        req.destroy();
        done();
      }, patienceMs);
    })),
  );
}

export async function run({ server, tries }: { server: BenchServer; tries: number }) {
  const token = await signIn(server, 'auditor@phaselot.test', DEMO_PASSWORD);
  const lotId = await withBenchClient(async (c) => (await c.query<{ id: number }>("SELECT id FROM lots WHERE supplier_lot = 'FSL-050000'")).rows[0]?.id);
  if (!lotId) throw new Error('lists: the filled lot FSL-050000 is missing: fill the bench database again (npm run bench -- fill --force)');
  const lists = [
    ['GET /api/stock (on hand)', '/api/stock'],
    ['GET /api/lots accepted, newest first, page 2', '/api/lots?state=accepted&sort=-receivedAt&page=2&pageSize=50'],
    ['GET /api/audit lot events of a half-year, page 2', '/api/audit?entityType=lot&from=2026-01-01&to=2026-06-30&page=2&pageSize=50'],
    ['GET /api/inspection/queue page 2', '/api/inspection/queue?page=2&pageSize=50'],
  ] as const;

  for (const [name, path] of lists) {
    const alone = await timed(() => api(server, path, { token }));
    console.log(`lists | ${name}: one request alone ${alone.ms.toFixed(0)} ms, ${(alone.result.bytes / 1024).toFixed(1)} kB of JSON`);
    await measured('lists', async (): Promise<Figure[]> => {
      const health = await load(server, '/api/health', null, HEALTH_SECONDS);
      const list = await load(server, path, token, LIST_SECONDS);
      await settle(name);
      return [{ name: `${name}, p95 at ${CONNECTIONS} connections`, value: list.p95, unit: 'ms', limit: { name: 'health p95 just before', value: health.p95 }, target: { ratio: 2 }, note: loadNote(list) }];
    }, tries);
  }

  await measured('lists', async (): Promise<Figure[]> => {
    const health = await sequentialMedian(server, '/api/health', null);
    const lot = await sequentialMedian(server, `/api/lots/${lotId}`, token);
    return [{ name: `GET /api/lots/${lotId} (L-${lotId}), median of 20 warm requests in a row`, value: lot, unit: 'ms', limit: { name: 'health, the same', value: health }, target: { ratio: 5 } }];
  }, tries);

  await measured('lists', async (): Promise<Figure[]> => {
    await abandon(server, '/api/stock', token, CONNECTIONS, 1000);
    await sleep(2000);
    const running = await runningQueries();
    const { rssMb } = server.memory();
    const { busySeconds, cancelled } = await waitUntilIdle(180);
    return [
      { name: `queries of ${CONNECTIONS} abandoned GET /api/stock still running 2 s after their clients left`, value: running.count, unit: 'count', target: { max: 0 }, note: running.count ? `oldest running ${running.oldestSeconds.toFixed(1)} s` : undefined },
      { name: 'server RSS 2 s after they left', value: rssMb, unit: 'MB', target: { max: 400 } },
      { name: 'server busy with them after they left', value: busySeconds, unit: 's', target: null, note: cancelled ? `stopped by the benchmark at 180 s: ${cancelled} queries cancelled` : undefined },
    ];
  }, tries);
}
