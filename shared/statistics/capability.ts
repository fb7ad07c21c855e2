// Process capability of a characteristic against two-sided specification limits: Cp (spread only)
// and Cpk (spread and centring), each with a two-sided confidence interval, since the samples a
// receiving bench sees are small. Cp's interval is exact for normal data (chi-square on n − 1
// degrees of freedom); Cpk's is the usual normal approximation (Bissell's).
import { chiSquareQuantile, normalQuantile } from './distributions';

export type Summary = { n: number; mean: number; sd: number };

/** Count, mean and sample standard deviation (n − 1 in the denominator); sd is NaN below two values. */
export function summarize(values: readonly number[]): Summary {
  const n = values.length;
  if (n === 0) return { n, mean: Number.NaN, sd: Number.NaN };
  const mean = values.reduce((sum, v) => sum + v, 0) / n;
  if (n < 2) return { n, mean, sd: Number.NaN };
  const squares = values.reduce((sum, v) => sum + (v - mean) ** 2, 0);
  return { n, mean, sd: Math.sqrt(squares / (n - 1)) };
}

export type Interval = { low: number; high: number };

export type Capability = {
  cp: number;
  cpk: number;
  /** Two-sided intervals at `confidence`; null when n is too small for them. */
  cpInterval: Interval | null;
  cpkInterval: Interval | null;
  confidence: number;
};

function checkConfidence(confidence: number) {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence must be between 0 and 1, got ${confidence}`);
}

/** Ĉp·√(χ²_{α/2,n−1}/(n−1)) ≤ Cp ≤ Ĉp·√(χ²_{1−α/2,n−1}/(n−1)). */
export function cpInterval(cp: number, n: number, confidence = 0.95): Interval {
  checkConfidence(confidence);
  if (!(n >= 2)) throw new RangeError(`a Cp interval needs at least 2 values, got ${n}`);
  const alpha = 1 - confidence;
  const degrees = n - 1;
  return { low: cp * Math.sqrt(chiSquareQuantile(alpha / 2, degrees) / degrees), high: cp * Math.sqrt(chiSquareQuantile(1 - alpha / 2, degrees) / degrees) };
}

/** Ĉpk·[1 ∓ z_{1−α/2}·√(1/(9nĈpk²) + 1/(2(n−1)))], written without dividing by Ĉpk so that a
 * process centred on a limit (Ĉpk = 0) still gets its interval. */
export function cpkInterval(cpk: number, n: number, confidence = 0.95): Interval {
  checkConfidence(confidence);
  if (!(n >= 2)) throw new RangeError(`a Cpk interval needs at least 2 values, got ${n}`);
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const half = z * Math.sqrt(1 / (9 * n) + (cpk * cpk) / (2 * (n - 1)));
  return { low: cpk - half, high: cpk + half };
}

/** Cp and Cpk of a sample against [lower, upper]; null when the spread is unknown or zero. */
export function capability(summary: Summary, limits: { lower: number; upper: number }, confidence = 0.95): Capability | null {
  if (!(limits.upper > limits.lower)) throw new RangeError(`the upper limit must exceed the lower one, got [${limits.lower}, ${limits.upper}]`);
  const { n, mean, sd } = summary;
  if (!(n >= 2) || !(sd > 0)) return null;
  const cp = (limits.upper - limits.lower) / (6 * sd);
  const cpk = Math.min(limits.upper - mean, mean - limits.lower) / (3 * sd);
  return { cp, cpk, cpInterval: cpInterval(cp, n, confidence), cpkInterval: cpkInterval(cpk, n, confidence), confidence };
}
