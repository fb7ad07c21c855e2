/**
 * npm run bench:engine
 * Times the analysis engine on an invented Stokes file of 100,002 rows (16,667 pieces x 6 inputs)
 * built in memory, against csv-parse alone (same options) on the same text in the same run.
 * Prints the figures; the targets are a ratio total/parse-only <= 2 and the whole file under 2 s.
 * A third figure times the analysis as the server runs it, keeping the rows it read (to store them).
 */
import { faker } from '@faker-js/faker';
import { parse } from 'csv-parse/sync';
import { analyzeText } from '../shared/optics/index.js';
import { CSV_OPTIONS } from '../shared/optics/csv.js';
import { STOKES_HEADER, gaussian, stokesRows } from '../shared/optics/synthetic.js';

const PIECES = 16_667;
const RUNS = 5;

faker.seed(20261201);
const noise = gaussian(() => faker.number.float({ min: 0, max: 1 }));
const lines = ['# instrument: BENCH-9', '# operator: benchmark', STOKES_HEADER];
for (let i = 0; i < PIECES; i++) {
  const plate = {
    serial: `QW-${String(i + 1).padStart(5, '0')}`,
    wavelengthNm: 632.8,
    retardanceWaves: 0.25 + 0.002 * noise(),
    fastAxisDeg: 0.3 * noise(),
  };
  lines.push(...stokesRows(plate, undefined, () => 0.001 * noise()));
}
const text = `${lines.join('\n')}\n`;
const rows = lines.length - 3;
const spec = { nominalWaves: 0.25, designWavelengthNm: 632.8, retardanceTolWaves: 0.003, axisTolDeg: 0.5 };

let pieces = 0;
let verdicts = '';
const parseOnly = () => void parse(text, CSV_OPTIONS);
const analysis = () => {
  const result = analyzeText(text, spec);
  pieces = result.pieces.length;
  const counts = { pass: 0, fail: 0, incomplete: 0 };
  for (const p of result.pieces) counts[p.verdict]++;
  verdicts = `${counts.pass} pass, ${counts.fail} fail, ${counts.incomplete} incomplete, ${result.errors.length} errors`;
};

// Interleaved, so that a busy moment of the machine hits both; the fastest run of each is reported.
const keepingRows = () => void analyzeText(text, spec, { keepRows: true });
const times = { parse: [] as number[], total: [] as number[], rows: [] as number[] };
for (let i = 0; i < RUNS; i++) {
  for (const [name, run] of [['parse', parseOnly], ['total', analysis], ['rows', keepingRows]] as const) {
    const start = performance.now();
    run();
    times[name].push(performance.now() - start);
  }
}
const fastest = (xs: number[]) => Math.min(...xs);
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const parseMs = fastest(times.parse);
const totalMs = fastest(times.total);

const mib = (Buffer.byteLength(text) / 1024 / 1024).toFixed(1);
console.log(`file: ${rows} rows, ${pieces} pieces, ${mib} MiB (${verdicts})`);
console.log(`csv-parse alone:  ${parseMs.toFixed(0)} ms  (${Math.round(rows / (parseMs / 1000))} rows/s), median ${median(times.parse).toFixed(0)} ms`);
console.log(`parse + analysis: ${totalMs.toFixed(0)} ms  (${Math.round(rows / (totalMs / 1000))} rows/s), median ${median(times.total).toFixed(0)} ms`);
console.log(`ratio total/parse-only: ${(totalMs / parseMs).toFixed(2)} (target <= 2); whole file ${totalMs < 2000 ? 'under' : 'over'} 2 s`);
console.log(`keeping the rows (server): ${fastest(times.rows).toFixed(0)} ms, ratio ${(fastest(times.rows) / parseMs).toFixed(2)}`);
console.log(`fastest of ${RUNS} interleaved runs each`);
