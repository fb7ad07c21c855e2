/** Stokes vectors and the input-state codes of a measurement file (readings.md). */
import { DEG } from './units.js';

/** (S0, S1, S2, S3) */
export type Stokes = readonly [number, number, number, number];

/**
 * How an instrument's export differs from our convention: s3Sign = -1 when its S3 (and its R/L
 * labels) have the opposite handedness, angleSign = -1 when its angles run from x toward -y
 * (which also reverses the sign of its S2 and its D/A labels).
 */
export interface InstrumentProfile {
  readonly s3Sign: 1 | -1;
  readonly angleSign: 1 | -1;
}

export const OUR_CONVENTION: InstrumentProfile = { s3Sign: 1, angleSign: 1 };

export const INPUT_STATE_CODES = ['H', 'V', 'D', 'A', 'R', 'L'] as const;
export type InputStateCode = (typeof INPUT_STATE_CODES)[number];

const CODED_STATES: Record<InputStateCode, Stokes> = {
  H: [1, 1, 0, 0],
  V: [1, -1, 0, 0],
  D: [1, 0, 1, 0],
  A: [1, 0, -1, 0],
  R: [1, 0, 0, 1],
  L: [1, 0, 0, -1],
};

/** Unit-intensity linear polarisation at angle a (rad). */
export function linearStokes(a: number): Stokes {
  return [1, Math.cos(2 * a), Math.sin(2 * a), 0];
}

/** A Stokes vector from an instrument's frame into ours. */
export function toOurFrame(s: Stokes, profile: InstrumentProfile): Stokes {
  if (profile.angleSign === 1 && profile.s3Sign === 1) return s;
  return [s[0], s[1], s[2] * profile.angleSign, s[3] * profile.s3Sign];
}

/** Bounds the reader's cache on a file whose every row names another angle. */
const MAX_CACHED_CELLS = 4096;

/**
 * A reader of input-state cells for one instrument: a code (H, V, D, A, R, L, any case) or a linear
 * polarisation angle in degrees, as a Stokes vector in our frame; null when the cell is neither.
 * Coded states, and the first few thousand distinct angles, are converted once, not per row: the
 * same cell gives the same array.
 */
export function inputStateReader(profile: InstrumentProfile): (cell: string) => Stokes | null {
  const known = new Map<string, Stokes>();
  for (const code of INPUT_STATE_CODES) {
    const state = toOurFrame(CODED_STATES[code], profile);
    known.set(code, state);
    known.set(code.toLowerCase(), state);
  }
  return (cell) => {
    const state = known.get(cell) ?? known.get(cell.trim());
    if (state) return state;
    const text = cell.trim();
    if (text === '') return null;
    const angle = Number(text);
    if (!Number.isFinite(angle)) return null;
    const linear = linearStokes(angle * profile.angleSign * DEG);
    if (known.size < MAX_CACHED_CELLS) known.set(text, linear);
    return linear;
  };
}

/** One input-state cell as a Stokes vector in our frame (see inputStateReader). */
export function parseInputState(cell: string, profile: InstrumentProfile): Stokes | null {
  return inputStateReader(profile)(cell);
}

/** Degree of polarisation sqrt(S1²+S2²+S3²)/S0. */
export function degreeOfPolarization(s: Stokes): number {
  return Math.sqrt(s[1] * s[1] + s[2] * s[2] + s[3] * s[3]) / s[0];
}
