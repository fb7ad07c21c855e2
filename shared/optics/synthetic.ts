/**
 * Forward models: the readings an instrument would report for a known plate. For tests, the
 * benchmark and invented demo files; the engine itself never calls them.
 */
import { cAbs2, jonesApply, jonesLinear, jonesLinearPolarizer, jonesMultiply, jonesRotatedRetarder, jonesToMueller } from './jones.js';
import { mat4Apply } from './mueller.js';
import { parseInputState, OUR_CONVENTION, type Stokes } from './stokes.js';
import { DEG, fromWaves, wavesToRad, type RetardanceUnit } from './units.js';

export interface SyntheticPlate {
  serial: string;
  wavelengthNm: number;
  /** Total retardance, waves (any order). */
  retardanceWaves: number;
  /** Fast axis in the lab frame, degrees. */
  fastAxisDeg: number;
  /** Where the fast-axis mark is, degrees (default 0). */
  mountDeg?: number;
}

/** A standard normal sample from a uniform source on [0, 1) (Box-Muller). */
export function gaussian(uniform: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

const noNoise = () => 0;
const fixed = (x: number) => x.toFixed(6);

export const STOKES_HEADER = 'serial,wavelength_nm,input,s0,s1,s2,s3,mount_deg';
export const SCAN_HEADER = 'serial,wavelength_nm,analyzer,angle_deg,intensity';
export const DIRECT_HEADER = 'serial,wavelength_nm,retardance,unit,fast_axis_deg,mount_deg';

/** Output Stokes vector of the plate for one input state (in our convention). */
export function plateOutput(plate: SyntheticPlate, input: Stokes): Stokes {
  const mueller = jonesToMueller(jonesRotatedRetarder(wavesToRad(plate.retardanceWaves), plate.fastAxisDeg * DEG));
  return mat4Apply(mueller, input);
}

/** Stokes-method rows; `noise` gives the error added to each of s1, s2, s3 (and s0). */
export function stokesRows(plate: SyntheticPlate, inputs: readonly string[] = ['H', 'V', 'D', 'A', 'R', 'L'], noise: () => number = noNoise): string[] {
  return inputs.map((code) => {
    const output = plateOutput(plate, parseInputState(code, OUR_CONVENTION)!);
    const values = output.map((s) => fixed(s + noise()));
    return [plate.serial, plate.wavelengthNm, code, ...values, plate.mountDeg ?? 0].join(',');
  });
}

/**
 * Rotating-plate rows: polariser at 0°, the plate's mark at each stage angle, analyser at 90°
 * (crossed) or 0° (parallel), computed through the Jones matrices, with an `open` reference row.
 */
export function scanRows(
  plate: SyntheticPlate,
  stageAnglesDeg: readonly number[],
  options: { analyzers?: readonly ('crossed' | 'parallel')[]; open?: boolean; i0?: number } = {},
  noise: () => number = noNoise,
): string[] {
  const { analyzers = ['crossed'], open = true, i0 = 1 } = options;
  const markError = plate.fastAxisDeg - (plate.mountDeg ?? 0);
  const rows: string[] = open ? [[plate.serial, plate.wavelengthNm, 'open', 0, fixed(i0 + noise())].join(',')] : [];
  for (const analyzer of analyzers) {
    const analyser = jonesLinearPolarizer(analyzer === 'crossed' ? Math.PI / 2 : 0);
    for (const t of stageAnglesDeg) {
      const plateJones = jonesRotatedRetarder(wavesToRad(plate.retardanceWaves), (t + markError) * DEG);
      const out = jonesApply(jonesMultiply(analyser, plateJones), jonesLinear(0));
      const intensity = i0 * (cAbs2(out[0]) + cAbs2(out[1]));
      rows.push([plate.serial, plate.wavelengthNm, analyzer, t, fixed(intensity + noise())].join(','));
    }
  }
  return rows;
}

/** One direct-method row, the retardance in the given unit. */
export function directRow(plate: SyntheticPlate, unit: RetardanceUnit): string {
  const value = fromWaves(plate.retardanceWaves, unit, plate.wavelengthNm);
  return [plate.serial, plate.wavelengthNm, fixed(value), unit, fixed(plate.fastAxisDeg), plate.mountDeg ?? 0].join(',');
}
