// `npm run bench -- <fill|lists|commit|sign|export|client|engine|all>... [--force] [--tries N]`
// The figures of the site-scale issue, each beside its limit measured in the same run (see
// README "Performance"). `fill` builds the bench database once (--force rebuilds it); the server
// benchmarks start a Phaselot server on it; `client` and `engine` need neither. `all` fills when
// the database is not filled yet, then runs every benchmark. A figure taken while the machine was
// loaded is measured again, up to --tries times (default 2).
import { spawnSync } from 'node:child_process';
import { parseArgs } from 'node:util';
import { CORES } from './lib/figures';
import { benchEnvironment, fillRecord, startBenchCluster } from './lib/database';
import { startBenchServer, type BenchServer } from './lib/server';

const BENCHMARKS = ['fill', 'lists', 'commit', 'sign', 'export', 'client', 'engine'] as const;
type Benchmark = (typeof BENCHMARKS)[number];
const NEEDS_SERVER: Benchmark[] = ['lists', 'commit', 'sign', 'export'];

const usage = `usage: npm run bench -- <${[...BENCHMARKS, 'all'].join('|')}>... [--force] [--tries N]`;
const { values, positionals } = parseArgs({
  options: { force: { type: 'boolean', default: false }, tries: { type: 'string', default: '2' } },
  allowPositionals: true,
});
const tries = Number(values.tries);
// Several names run in the order given, on one server (as `all` does): e.g. `commit export`.
if (!positionals.length || !positionals.every((n) => [...BENCHMARKS, 'all'].includes(n)) || !Number.isInteger(tries) || tries < 1) {
  console.error(usage);
  process.exit(2);
}
const name = positionals.includes('all') ? 'all' : positionals[0];
const chosen: Benchmark[] = name === 'all' ? [...BENCHMARKS] : (positionals as Benchmark[]);
console.log(`bench: ${chosen.join(', ')} on ${CORES} cores, ${new Date().toISOString()}`);

const usesDatabase = chosen.some((b) => b === 'fill' || NEEDS_SERVER.includes(b));
// Set before anything that reads the server's configuration is imported: the fill and the benchmarks'
// own setup (lots received for a run) work on the bench database.
if (usesDatabase) Object.assign(process.env, benchEnvironment());
const cluster = usesDatabase ? startBenchCluster() : null;
let server: BenchServer | null = null;
let failed = false;
try {
  for (const benchmark of chosen) {
    if (benchmark === 'fill') {
      const { fill, FillRefused } = await import('./fill');
      // `all` fills only a database that is not filled yet.
      if (name === 'all' && !values.force && (await fillRecord())) console.log(`fill: ${await fillRecord()}`);
      else
        await fill({ force: values.force }).catch((error) => {
          if (!(error instanceof FillRefused)) throw error;
          console.error(`fill: ${error.message}`);
          failed = true;
        });
      continue;
    }
    // The engine is timed in a process of its own: after the other benchmarks (the server-side code
    // they load, the files they build, the client's Vite build) this one's heap slows the analysis
    // (1.85-2.08x csv-parse after them, 1.2-1.4x alone), which would not be the engine's figure.
    if (benchmark === 'engine' && chosen.length > 1) {
      const alone = spawnSync(process.execPath, ['--import', 'tsx', import.meta.filename, 'engine', '--tries', String(tries)], { stdio: 'inherit' });
      if (alone.status !== 0) failed = true;
      continue;
    }
    // Loaded before the server starts: loading takes seconds on a busy machine, long enough for the
    // server to close the kept-alive connection of its readiness check just as the first call reuses it.
    const module = await import(`./${benchmark}.ts`);
    if (NEEDS_SERVER.includes(benchmark)) {
      if (!(await fillRecord())) throw new Error('The bench database is not filled: run `npm run bench -- fill` first');
      server ??= await startBenchServer();
    }
    await module.run({ server, tries });
  }
} catch (error) {
  console.error(error instanceof Error ? error.stack : error);
  failed = true;
} finally {
  await server?.stop();
  cluster?.stop();
}
process.exit(failed ? 1 : 0);
