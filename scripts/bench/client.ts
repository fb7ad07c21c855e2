// `npm run bench -- client`: builds the client (into .data/bench/client, so a running server's dist/
// is left alone) and weighs the JavaScript the first page loads: the entry script of index.html,
// the modules it preloads and everything they import statically, followed through Vite's manifest.
// Pages behind lazy routes are not part of it. Target: under 200 kB gzipped, and no chart code.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { build, type Manifest, type Plugin } from 'vite';
import { benchDir, repoRoot } from './lib/database';
import { measured } from './lib/figures';

const outDir = join(benchDir, 'client');
const CHART_PACKAGE = '/node_modules/recharts/';

/** Records which output chunks hold code of the chart library. */
function chartChunks(found: Set<string>): Plugin {
  return {
    name: 'bench-chart-chunks',
    generateBundle(_options, bundle) {
      for (const chunk of Object.values(bundle)) {
        if (chunk.type === 'chunk' && Object.keys(chunk.modules).some((id) => id.includes(CHART_PACKAGE))) found.add(chunk.fileName);
      }
    },
  };
}

/** The files index.html loads at once: its module scripts and module preloads. */
function firstPageFiles(html: string) {
  const files = new Set<string>();
  for (const match of html.matchAll(/<script\b[^>]*\btype="module"[^>]*\bsrc="\/?([^"]+)"/g)) files.add(match[1]);
  for (const match of html.matchAll(/<link\b[^>]*\brel="modulepreload"[^>]*\bhref="\/?([^"]+)"/g)) files.add(match[1]);
  if (files.size === 0) throw new Error('client: index.html loads no module script');
  return files;
}

/** Those files and every chunk they import statically, transitively (dynamic imports are left out). */
function staticClosure(start: Set<string>, manifest: Manifest) {
  const byFile = new Map(Object.values(manifest).map((entry) => [entry.file, entry]));
  const seen = new Set<string>();
  const visit = (file: string) => {
    if (seen.has(file)) return;
    seen.add(file);
    for (const key of byFile.get(file)?.imports ?? []) visit(manifest[key].file);
  };
  start.forEach(visit);
  return [...seen].filter((file) => file.endsWith('.js'));
}

export async function run({ tries }: { tries: number }) {
  const charts = new Set<string>();
  const built = performance.now();
  await build({
    root: repoRoot,
    configFile: join(repoRoot, 'vite.config.ts'),
    logLevel: 'warn',
    build: { outDir, emptyOutDir: true, manifest: true },
    plugins: [chartChunks(charts)],
  });
  console.log(`client | built in ${((performance.now() - built) / 1000).toFixed(0)} s into ${outDir}`);

  const manifest = JSON.parse(readFileSync(join(outDir, '.vite', 'manifest.json'), 'utf8')) as Manifest;
  const first = staticClosure(firstPageFiles(readFileSync(join(outDir, 'index.html'), 'utf8')), manifest);
  // kB of 1000 bytes, as Vite reports them.
  const gzipKb = (file: string) => gzipSync(readFileSync(join(outDir, file))).length / 1000;
  const allChunks = [...new Set(Object.values(manifest).map((e) => e.file))].filter((file) => file.endsWith('.js'));
  const firstKb = first.reduce((sum, file) => sum + gzipKb(file), 0);
  const chartsFirst = first.filter((file) => charts.has(file));
  console.log(`client | first page: ${first.map((f) => `${f} ${gzipKb(f).toFixed(1)} kB`).join(', ')}`);
  console.log(`client | chart code in: ${[...charts].join(', ') || 'no chunk'}; ${allChunks.length} JavaScript chunks in all`);

  await measured(
    'client',
    async () => [
      { name: `first page's JavaScript, gzipped (${first.length} chunk${first.length === 1 ? '' : 's'})`, value: firstKb, unit: 'kB', target: { max: 200 } },
      { name: 'chunks of the first page holding chart code', value: chartsFirst.length, unit: 'count', target: { max: 0 } },
      { name: 'all JavaScript, gzipped (every page)', value: allChunks.reduce((sum, file) => sum + gzipKb(file), 0), unit: 'kB', target: null },
    ],
    tries,
    { timed: false },
  );
}
