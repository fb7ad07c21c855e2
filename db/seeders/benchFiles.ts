// Invented bench files for the demo and the tests: what the site's Stokes polarimeter would export
// for plates of a chosen retardance and axis, through the engine's forward model.
import { gaussian, STOKES_HEADER, stokesRows, type SyntheticPlate } from '../../shared/optics/synthetic';

/** A small deterministic uniform source (mulberry32), so the same seed gives the same file. */
export function seededUniform(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export type BenchFileOptions = { instrument: string; date: string; operator?: string; noise?: number; seed?: number };

export function stokesBenchFile(plates: SyntheticPlate[], options: BenchFileOptions): string {
  const normal = gaussian(seededUniform(options.seed ?? 1));
  const noise = () => (options.noise ?? 0.0015) * normal();
  return [
    '# Invented readings (Phaselot demo data)',
    `# instrument: ${options.instrument}`,
    `# operator: ${options.operator ?? 'QC-01'}`,
    `# date: ${options.date}`,
    STOKES_HEADER,
    ...plates.flatMap((plate) => stokesRows(plate, ['H', 'V', 'D', 'A', 'R', 'L'], noise)),
    '',
  ].join('\n');
}
