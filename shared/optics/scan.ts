/**
 * The rotating-plate measurement: the plate turns between fixed polarisers. With t the stage angle
 * of the mark and e the axis error of the mark (fast axis at t + e), for a retardance d:
 *   crossed  I = I0 sin²(2(t + e)) sin²(d/2)      (Born & Wolf, crystal optics)
 *   parallel I = I0 (1 - sin²(2(t + e)) sin²(d/2))
 * Both are linear in the 4t harmonics, y = A + C cos 4t + S sin 4t with y = I (crossed) or
 * I0 - I (parallel), A = I0 sin²(d/2)/2, C = -A cos 4e, S = A sin 4e.
 */

export type Analyzer = 'crossed' | 'parallel' | 'open';
export const ANALYZERS: readonly Analyzer[] = ['crossed', 'parallel', 'open'];

export interface ScanReading {
  analyzer: Analyzer;
  /** Stage angle of the mark (rad). */
  angle: number;
  intensity: number;
}

export interface ScanFit {
  /** Retardance in [0, π] (rad); fast and slow axis cannot be told apart. */
  retardance: number;
  /** Axis error of the mark modulo 90°, in (-π/4, π/4] (rad). */
  axisError: number;
  referenceIntensity: number;
  /** sin²(d/2) as fitted, before clamping to [0, 1]. */
  sinSquaredHalf: number;
  /** Amplitude of the 4t harmonic over its mean term: 1 for an ideal retarder between ideal polarisers. */
  modulationRatio: number;
  /** Rms residual of the fit over the reference intensity. */
  residualRms: number;
}

export type ScanResult = { ok: true; value: ScanFit } | { ok: false; reason: string };

/** How far sin²(d/2) may leave [0, 1] before it is an error rather than noise. */
const SIN_SQUARED_SLACK = 0.02;

export function fitScan(readings: readonly ScanReading[]): ScanResult {
  const open = readings.filter((r) => r.analyzer === 'open');
  const crossed = readings.filter((r) => r.analyzer === 'crossed');
  const parallel = readings.filter((r) => r.analyzer === 'parallel');
  const i0 = open.length > 0 ? mean(open.map((r) => r.intensity)) : referenceFromPairs(crossed, parallel);
  if (i0 === null) {
    return { ok: false, reason: 'no reference intensity: add an open row or parallel and crossed readings at the same angles' };
  }
  if (!(i0 > 0)) return { ok: false, reason: `the reference intensity ${i0} is not positive` };

  // Normal equations of y = A + C cos 4t + S sin 4t.
  const normal = new Float64Array(9);
  const rhs = new Float64Array(3);
  const samples: { basis: [number, number, number]; y: number }[] = [];
  for (const r of readings) {
    if (r.analyzer === 'open') continue;
    const basis: [number, number, number] = [1, Math.cos(4 * r.angle), Math.sin(4 * r.angle)];
    const y = r.analyzer === 'crossed' ? r.intensity : i0 - r.intensity;
    samples.push({ basis, y });
    for (let i = 0; i < 3; i++) {
      rhs[i] += basis[i] * y;
      for (let j = 0; j < 3; j++) normal[3 * i + j] += basis[i] * basis[j];
    }
  }
  const solution = solve3(normal, rhs);
  if (!solution) {
    return { ok: false, reason: 'too few stage angles: at least 3 distinct angles (modulo 90°) are needed' };
  }
  const [a, c, s] = solution;
  let squares = 0;
  for (const { basis, y } of samples) squares += (a * basis[0] + c * basis[1] + s * basis[2] - y) ** 2;

  const sinSquaredHalf = (2 * a) / i0;
  if (sinSquaredHalf > 1 + SIN_SQUARED_SLACK || sinSquaredHalf < -SIN_SQUARED_SLACK) {
    return {
      ok: false,
      reason: `the readings are not those of a retarder: sin²(d/2) = ${sinSquaredHalf.toFixed(3)} is outside [0, 1]`,
    };
  }
  const clamped = Math.min(1, Math.max(0, sinSquaredHalf));
  const amplitude = Math.hypot(c, s);
  return {
    ok: true,
    value: {
      retardance: 2 * Math.asin(Math.sqrt(clamped)),
      axisError: axisFromHarmonics(c, s),
      referenceIntensity: i0,
      sinSquaredHalf,
      modulationRatio: a > 0 ? amplitude / a : 0,
      residualRms: Math.sqrt(squares / samples.length) / i0,
    },
  };
}

/** e from C = -A cos 4e, S = A sin 4e, in (-π/4, π/4]. */
function axisFromHarmonics(c: number, s: number): number {
  const e = Math.atan2(s, -c) / 4;
  return e <= -Math.PI / 4 ? e + Math.PI / 2 : e;
}

const mean = (xs: readonly number[]): number => xs.reduce((sum, x) => sum + x, 0) / xs.length;

/** I0 as the mean of crossed + parallel at the angles measured both ways; null when there are none. */
function referenceFromPairs(crossed: readonly ScanReading[], parallel: readonly ScanReading[]): number | null {
  const parallelAt = new Map<number, number[]>();
  for (const r of parallel) parallelAt.set(r.angle, [...(parallelAt.get(r.angle) ?? []), r.intensity]);
  const sums: number[] = [];
  for (const r of crossed) {
    const matches = parallelAt.get(r.angle);
    if (matches) sums.push(r.intensity + mean(matches));
  }
  return sums.length > 0 ? mean(sums) : null;
}

/** Solves the symmetric 3x3 system by Cramer's rule; null when it is (nearly) singular. */
function solve3(m: Float64Array, b: Float64Array): [number, number, number] | null {
  const det = (a: ArrayLike<number>) => a[0] * (a[4] * a[8] - a[5] * a[7]) - a[1] * (a[3] * a[8] - a[5] * a[6]) + a[2] * (a[3] * a[7] - a[4] * a[6]);
  const d = det(m);
  const scale = m[0] * m[4] * m[8];
  if (!(Math.abs(d) > 1e-9 * scale)) return null;
  const out: [number, number, number] = [0, 0, 0];
  for (let k = 0; k < 3; k++) {
    const replaced = Float64Array.from(m);
    for (let i = 0; i < 3; i++) replaced[3 * i + k] = b[i];
    out[k] = det(replaced) / d;
  }
  return out;
}
