// Bench files the benchmarks upload: what BENCH-2 (the demo's Stokes polarimeter) would write today
// for quarter-wave plates at 632.8 nm, all within the demo parts' tolerance.
import { seededUniform } from '../../../db/seeders/benchFiles';
import { gaussian, STOKES_HEADER, stokesRows } from '../../../shared/optics/synthetic';

export function stokesFile(serials: string[], seed: number) {
  const noise = gaussian(seededUniform(seed));
  const lines = ['# instrument: BENCH-2', '# operator: QC-07', `# date: ${new Date().toISOString().slice(0, 10)}`, STOKES_HEADER];
  for (const serial of serials) {
    lines.push(
      ...stokesRows({ serial, wavelengthNm: 632.8, retardanceWaves: 0.25 + 0.0005 * noise(), fastAxisDeg: 0.1 * noise() }, undefined, () => 0.0008 * noise()),
    );
  }
  return `${lines.join('\n')}\n`;
}

/** The multipart body of a measurement upload. */
export function upload(text: string, name: string) {
  const form = new FormData();
  form.append('files', new Blob([text], { type: 'text/csv' }), name);
  return form;
}
