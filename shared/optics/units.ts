/** Direct conversions between the units a retardance is quoted in. */

export type RetardanceUnit = 'nm' | 'waves' | 'deg' | 'rad';

export const RETARDANCE_UNITS: readonly RetardanceUnit[] = ['nm', 'waves', 'deg', 'rad'];

export const DEG = Math.PI / 180;

export const degToRad = (deg: number): number => deg * DEG;
export const radToDeg = (rad: number): number => rad / DEG;

export const wavesToNm = (waves: number, wavelengthNm: number): number => waves * wavelengthNm;
export const nmToWaves = (nm: number, wavelengthNm: number): number => nm / wavelengthNm;
export const wavesToDeg = (waves: number): number => waves * 360;
export const wavesToRad = (waves: number): number => waves * 2 * Math.PI;
export const radToWaves = (rad: number): number => rad / (2 * Math.PI);

/** A retardance in any unit, in waves at the given wavelength. */
export function toWaves(value: number, unit: RetardanceUnit, wavelengthNm: number): number {
  switch (unit) {
    case 'nm':
      return nmToWaves(value, wavelengthNm);
    case 'waves':
      return value;
    case 'deg':
      return value / 360;
    case 'rad':
      return radToWaves(value);
  }
}

/** A retardance in waves, in any unit at the given wavelength. */
export function fromWaves(waves: number, unit: RetardanceUnit, wavelengthNm: number): number {
  switch (unit) {
    case 'nm':
      return wavesToNm(waves, wavelengthNm);
    case 'waves':
      return waves;
    case 'deg':
      return wavesToDeg(waves);
    case 'rad':
      return wavesToRad(waves);
  }
}

export function parseRetardanceUnit(text: string): RetardanceUnit | null {
  const unit = text.trim().toLowerCase();
  return (RETARDANCE_UNITS as readonly string[]).includes(unit) ? (unit as RetardanceUnit) : null;
}

/** x modulo `period`, in [0, period). */
export function modulo(x: number, period: number): number {
  const r = x % period;
  return r < 0 ? r + period : r;
}

/** An angle in degrees wrapped into (-half, half], e.g. half = 90 for axes (period 180). */
export function wrapDeg(deg: number, half: number): number {
  const r = modulo(deg + half, 2 * half) - half;
  return r === -half ? half : r;
}

/** A fraction of a wave wrapped into [-0.5, 0.5): the nearest signed distance between two retardances. */
export function wrapWaves(waves: number): number {
  return modulo(waves + 0.5, 1) - 0.5;
}
