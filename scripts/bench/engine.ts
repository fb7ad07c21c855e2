// `npm run bench -- engine` (also `npm run bench:engine`): the analysis engine on an invented Stokes
// file of 100,002 rows (16,667 pieces x 6 inputs) built in memory, against csv-parse alone (same
// options) on the same text in the same run; target: parse + analysis <= 1.5x csv-parse alone. A
// second figure times the analysis as the server runs it, keeping the rows it read (to store them).
import { faker } from '@faker-js/faker';
import { parse } from 'csv-parse/sync';
import { analyzeText } from '../../shared/optics/index.js';
import { CSV_OPTIONS } from '../../shared/optics/csv.js';
import { STOKES_HEADER, gaussian, stokesRows } from '../../shared/optics/synthetic.js';
import { measured } from './lib/figures';

const PIECES = 16_667;
const RUNS = 5;

function benchText() {
  faker.seed(20261201);
  const noise = gaussian(() => faker.number.float({ min: 0, max: 1 }));
  const lines = ['# instrument: BENCH-9', '# operator: benchmark', STOKES_HEADER];
  for (let i = 0; i < PIECES; i++) {
    const plate = { serial: `QW-${String(i + 1).padStart(5, '0')}`, wavelengthNm: 632.8, retardanceWaves: 0.25 + 0.002 * noise(), fastAxisDeg: 0.3 * noise() };
    lines.push(...stokesRows(plate, undefined, () => 0.001 * noise()));
  }
  return { text: `${lines.join('\n')}\n`, rows: lines.length - 3 };
}

export async function run({ tries }: { tries: number }) {
  const { text, rows } = benchText();
  const spec = { nominalWaves: 0.25, designWavelengthNm: 632.8, retardanceTolWaves: 0.003, axisTolDeg: 0.5 };
  const check = analyzeText(text, spec);
  const counts = { pass: 0, fail: 0, incomplete: 0 };
  for (const p of check.pieces) counts[p.verdict as keyof typeof counts]++;
  console.log(
    `engine | file: ${rows} rows, ${check.pieces.length} pieces, ${(Buffer.byteLength(text) / 1024 / 1024).toFixed(1)} MiB (${counts.pass} pass, ${counts.fail} fail, ${counts.incomplete} incomplete, ${check.errors.length} errors)`,
  );

  await measured(
    'engine',
    async () => {
      // Interleaved, so that a busy moment of the machine hits all three; the fastest run of each counts.
      const runs = {
        parse: () => void parse(text, CSV_OPTIONS),
        analysis: () => void analyzeText(text, spec),
        keepingRows: () => void analyzeText(text, spec, { keepRows: true }),
      };
      const times = { parse: [] as number[], analysis: [] as number[], keepingRows: [] as number[] };
      for (let i = 0; i < RUNS; i++) {
        for (const [name, work] of Object.entries(runs) as [keyof typeof runs, () => void][]) {
          const start = performance.now();
          work();
          times[name].push(performance.now() - start);
        }
      }
      const parseMs = Math.min(...times.parse);
      const limit = { name: `csv-parse alone, fastest of ${RUNS}`, value: parseMs };
      return [
        { name: `parse + analysis, fastest of ${RUNS}`, value: Math.min(...times.analysis), unit: 'ms', limit, target: { ratio: 1.5 } },
        { name: 'parse + analysis keeping the rows (as the server does)', value: Math.min(...times.keepingRows), unit: 'ms', limit, target: null },
      ];
    },
    tries,
  );
}
