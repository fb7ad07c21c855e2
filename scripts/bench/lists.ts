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
/** A request unanswered after this long counts as never answered. */
const TIMEOUT_SECONDS = 30;
/** How long a list's leftover requests may keep the server busy before the next measurement. */
const SETTLE_SECONDS = 90;

type Load = { p95: number; p50: number; answered: number; unanswered: number; perSecond: number; failed: number };

/**
 * `amount` requests over 50 connections, all of them waited for (a request that times out counts as
 * never answered), so no request is cut off by the end of a timed run.
 */
async function load(server: BenchServer, path: string, token: string | null, amount: number): Promise<Load> {
  const latencies: number[] = [];
  let failed = 0;
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const options = {
      url: `${server.baseUrl}${path}`,
      connections: CONNECTIONS,
      amount,
      timeout: TIMEOUT_SECONDS,
      headers: token ? { authorization: `Bearer ${token}` } : {},
    };
    const instance = autocannon(options, (error, done) => (error ? reject(error) : resolve(done)));
    instance.on('response', (_client: unknown, statusCode: number, _bytes: number, responseTime: number) => {
      if (statusCode >= 200 && statusCode < 300) latencies.push(responseTime);
      else failed++;
    });
  });
  const unanswered = result.timeouts + result.errors;
  const all = [...latencies, ...Array<number>(unanswered).fill(Infinity)];
  return { p95: percentile(all, 95), p50: median(all), answered: latencies.length, unanswered, perSecond: latencies.length / (result.duration || 1), failed };
}

/** Enough requests for about `seconds` of load, judging by one request alone on two cores; two per connection at least. */
const amountFor = (aloneMs: number, seconds: number) => Math.min(5_000, Math.max(2 * CONNECTIONS, Math.round((seconds * 1000 * 2) / Math.max(aloneMs, 1))));

const loadNote = (l: Load) =>
  `${l.answered} answered (${l.perSecond.toFixed(1)}/s)${l.unanswered ? `, ${l.unanswered} unanswered within ${TIMEOUT_SECONDS} s` : ''}${l.failed ? `, ${l.failed} failed` : ''}; ` +
  `p50 ${Number.isFinite(l.p50) ? `${l.p50.toFixed(0)} ms` : 'not reached'}`;

async function settle(server: BenchServer, label: string) {
  const { busySeconds, cancelled } = await waitUntilIdle(server, SETTLE_SECONDS);
  if (busySeconds > 0.5)
    console.log(
      `lists | after ${label}: the server stayed busy ${busySeconds.toFixed(1)} s more${cancelled ? `; ${cancelled} queries still running were cancelled` : ''}`,
    );
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
    Array.from(
      { length: count },
      () =>
        new Promise<void>((done) => {
          const req = request(`${server.baseUrl}${path}`, { headers: { authorization: `Bearer ${token}` } }, (res) =>
            res.resume().on('end', done).on('error', done),
          );
          req.on('error', () => done());
          req.end();
          setTimeout(() => {
            req.destroy();
            done();
          }, patienceMs);
        }),
    ),
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

  const healthAlone = await timed(() => api(server, '/api/health'));
  for (const [name, path] of lists) {
    // The first request reads the database (and compiles the list's code); the next, with nothing
    // changed since, gets the answer kept from it (server/http/unchangedAnswers.ts).
    const first = await timed(() => api(server, path, { token }));
    const alone = await timed(() => api(server, path, { token }));
    console.log(
      `lists | ${name}: one request alone ${first.ms.toFixed(0)} ms the first time, ${alone.ms.toFixed(0)} ms again; ${(alone.result.bytes / 1024).toFixed(1)} kB of JSON`,
    );
    await measured(
      'lists',
      async (): Promise<Figure[]> => {
        const health = await load(server, '/api/health', null, amountFor(healthAlone.ms, HEALTH_SECONDS));
        const list = await load(server, path, token, amountFor(alone.ms, LIST_SECONDS));
        await settle(server, name);
        return [
          {
            name: `${name}, p95 at ${CONNECTIONS} connections`,
            value: list.p95,
            unit: 'ms',
            limit: { name: 'health p95 just before', value: health.p95 },
            target: { ratio: 2 },
            note: loadNote(list),
          },
        ];
      },
      tries,
    );
  }

  await measured(
    'lists',
    async (): Promise<Figure[]> => {
      const health = await sequentialMedian(server, '/api/health', null);
      const lot = await sequentialMedian(server, `/api/lots/${lotId}`, token);
      return [
        {
          name: `GET /api/lots/${lotId} (L-${lotId}), median of 20 warm requests in a row`,
          value: lot,
          unit: 'ms',
          limit: { name: 'health, the same', value: health },
          target: { ratio: 5 },
        },
      ];
    },
    tries,
  );

  // The filtered lot list, the slowest of the lists a user would give up on.
  const [abandonedName, abandonedPath] = lists[1];
  await measured(
    'lists',
    async (): Promise<Figure[]> => {
      await abandon(server, abandonedPath, token, CONNECTIONS, 1000);
      await sleep(2000);
      const running = await runningQueries();
      const { rssMb } = server.memory();
      const { busySeconds, cancelled } = await waitUntilIdle(server, 180);
      return [
        {
          name: `queries of ${CONNECTIONS} abandoned ${abandonedName} still running 2 s after their clients left (after 1 s)`,
          value: running.count,
          unit: 'count',
          target: { max: 0 },
          note: running.count ? `oldest running ${running.oldestSeconds.toFixed(1)} s` : undefined,
        },
        { name: 'server RSS 2 s after they left', value: rssMb, unit: 'MB', target: { max: 400 } },
        {
          name: 'server busy with them after they left',
          value: busySeconds,
          unit: 's',
          target: null,
          note: cancelled ? `stopped by the benchmark at 180 s: ${cancelled} queries cancelled` : undefined,
        },
      ];
    },
    tries,
  );
}
