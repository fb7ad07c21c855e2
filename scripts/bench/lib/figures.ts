// How every benchmark reports: one line per figure with the limit measured in the same run, the
// ratio, the target, whether it is met, and the machine's load average beside it. The machine may
// be shared: a figure taken while the 1-minute load average exceeded the core count is marked so
// and measured again (up to `tries` times in all). Each figure also goes to .data/bench/results.jsonl.
import { appendFileSync, mkdirSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { join } from 'node:path';
import { benchDir } from './database';

export type Target =
  /** value <= ratio x the limit */
  | { ratio: number; max?: undefined }
  /** value <= max, in the figure's unit */
  | { max: number; ratio?: undefined }
  | { ratio: number; max: number }
  /** reported, no target (the issue sets none) */
  | null;

export type Figure = {
  name: string;
  value: number;
  unit: Unit;
  /** What the figure is weighed against, measured in the same run: the ratio is value / limit. */
  limit?: { name: string; value: number; unit?: Unit };
  target: Target;
  note?: string;
};

type Unit = 'ms' | 's' | 'MB' | 'kB' | 'count' | 'x';

export const CORES = cpus().length;

const group = (n: number, digits = 0) => n.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });

export function formatValue(value: number, unit: Unit): string {
  if (!Number.isFinite(value)) return 'none completed';
  switch (unit) {
    case 'ms':
      return `${group(value)} ms`;
    case 's':
      return `${group(value, 1)} s`;
    case 'MB':
      return `${group(value)} MB`;
    case 'kB':
      return `${group(value, 1)} kB`;
    case 'x':
      return `${group(value, 2)}x`;
    case 'count':
      return group(value);
  }
}

const ratioOf = (figure: Figure) => (figure.limit && figure.limit.value > 0 ? figure.value / figure.limit.value : undefined);

export function isMet(figure: Figure): boolean | undefined {
  if (!figure.target) return undefined;
  const ratio = ratioOf(figure);
  if (figure.target.ratio !== undefined && !(ratio !== undefined && ratio <= figure.target.ratio)) return false;
  if (figure.target.max !== undefined && !(figure.value <= figure.target.max)) return false;
  return true;
}

function targetText(figure: Figure) {
  const t = figure.target;
  if (!t) return 'no target';
  const parts = [];
  if (t.ratio !== undefined) parts.push(`ratio <= ${t.ratio}`);
  if (t.max !== undefined) parts.push(`<= ${formatValue(t.max, figure.unit)}`);
  return parts.join(' and ');
}

export type Load = [number, number, number];
const loadText = (load: Load) => `load ${load.map((l) => l.toFixed(2)).join(' / ')} (${CORES} cores)`;
export const underLoad = (load: Load) => load[0] > CORES;

export function figureLine(figure: Figure, load: Load, tryNumber: number, timed = true): string {
  const ratio = ratioOf(figure);
  const met = isMet(figure);
  const cells = [
    `${figure.name}: ${formatValue(figure.value, figure.unit)}`,
    figure.limit ? `limit ${figure.limit.name}: ${formatValue(figure.limit.value, figure.limit.unit ?? figure.unit)}` : 'limit: none',
    ratio !== undefined && Number.isFinite(ratio) ? `ratio ${ratio.toFixed(2)}` : 'ratio -',
    `target ${targetText(figure)}`,
    met === undefined ? 'reported' : met ? 'MET' : 'NOT MET',
    loadText(load),
  ];
  if (figure.note) cells.push(figure.note);
  if (timed && underLoad(load)) cells.push(`taken under load${tryNumber > 1 ? ` (try ${tryNumber})` : ''}`);
  return cells.join(' | ');
}

export type Measured = { figures: Figure[]; load: Load; tries: number };

/**
 * Runs `measure` and prints its figures; while the 1-minute load average at either end of the run
 * exceeded the core count, says so and measures again, `tries` times at most. Answers the last run.
 * Figures that are no times (sizes) are printed with the load but never marked or measured again.
 */
export async function measured(
  benchmark: string,
  measure: () => Promise<Figure[]>,
  tries: number,
  options: { timed: boolean } = { timed: true },
): Promise<Measured> {
  for (let attempt = 1; ; attempt++) {
    const before = loadavg()[0];
    const figures = await measure();
    const after = loadavg() as Load;
    const load: Load = [Math.max(before, after[0]), after[1], after[2]];
    for (const figure of figures) {
      console.log(`${benchmark} | ${figureLine(figure, load, attempt, options.timed)}`);
      record(benchmark, figure, load, attempt, options.timed);
    }
    if (!options.timed) return { figures, load, tries: attempt };
    if (!underLoad(load) || attempt >= tries) {
      if (underLoad(load))
        console.log(`${benchmark} | taken under load in all ${attempt} tries: compare ratios, not times, and run again when the machine is quieter`);
      return { figures, load, tries: attempt };
    }
    console.log(`${benchmark} | taken under load (1-min load ${load[0].toFixed(2)} > ${CORES} cores): measuring again`);
  }
}

function record(benchmark: string, figure: Figure, load: Load, attempt: number, timed: boolean) {
  mkdirSync(benchDir, { recursive: true });
  const entry = {
    at: new Date().toISOString(),
    benchmark,
    ...figure,
    ratio: ratioOf(figure),
    met: isMet(figure),
    load,
    underLoad: timed && underLoad(load),
    try: attempt,
  };
  appendFileSync(join(benchDir, 'results.jsonl'), `${JSON.stringify(entry, (_k, v) => (v === Infinity ? 'Infinity' : v))}\n`);
}

/** Milliseconds `work` takes, with its answer. */
export async function timed<T>(work: () => Promise<T> | T): Promise<{ ms: number; result: T }> {
  const start = performance.now();
  const result = await work();
  return { ms: performance.now() - start, result };
}

/** The p-th percentile (0..100) by the nearest-rank method; a request that never completed counts as Infinity. */
export function percentile(values: number[], p: number): number {
  if (values.length === 0) return Infinity;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}

export const median = (values: number[]) => percentile(values, 50);
