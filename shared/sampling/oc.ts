// Operating characteristic of a single sampling plan: the probability that a lot of a given
// fraction nonconforming is accepted. Binomial (sampling from a large lot or a process) by
// default; Poisson, the approximation the standard's own OC curves use, on request. For a
// 100 % plan the binomial is itself an approximation (the exact model would be hypergeometric).

export type OcModel = 'binomial' | 'poisson';

export interface OcPoint {
  percentDefective: number;
  pa: number;
}

function assertCount(value: number, name: string, min: number) {
  if (!Number.isInteger(value) || value < min) throw new RangeError(`${name} must be a whole number of at least ${min}, got ${value}`);
}

/** log(e^a + e^b) without overflow; -Infinity stands for a zero probability. */
function logAdd(a: number, b: number) {
  if (a === Number.NEGATIVE_INFINITY) return b;
  const high = Math.max(a, b);
  return high + Math.log1p(Math.exp(Math.min(a, b) - high));
}

/**
 * P(defectives ≤ ac) with n pieces sampled and fraction nonconforming p (0 ≤ p ≤ 1).
 * Terms are summed in log space so that n = 2000 at large p does not underflow.
 */
export function probabilityOfAcceptance(n: number, ac: number, p: number, model: OcModel = 'binomial'): number {
  assertCount(n, 'sample size', 1);
  assertCount(ac, 'acceptance number', 0);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`fraction nonconforming must be between 0 and 1, got ${p}`);
  if (p === 0) return 1;
  if (model === 'binomial' && ac >= n) return 1;
  if (model === 'binomial' && p === 1) return 0;
  let logTerm: number;
  let logStep: (k: number) => number;
  if (model === 'binomial') {
    // C(n,k+1) p^(k+1) q^(n-k-1) = C(n,k) p^k q^(n-k) · (n-k)/(k+1) · p/q
    logTerm = n * Math.log1p(-p);
    const logOdds = Math.log(p) - Math.log1p(-p);
    logStep = (k) => Math.log((n - k) / (k + 1)) + logOdds;
  } else {
    const mean = n * p;
    logTerm = -mean;
    logStep = (k) => Math.log(mean / (k + 1));
  }
  let logSum = logTerm;
  for (let k = 0; k < ac; k++) {
    logTerm += logStep(k);
    logSum = logAdd(logSum, logTerm);
  }
  return Math.min(1, Math.exp(logSum));
}

/** The smallest of 1, 2, 2.5, 5 × 10^k that is at least value. */
function roundUpForAxis(value: number) {
  const decade = 10 ** Math.floor(Math.log10(value));
  const mantissa = [1, 2, 2.5, 5, 10].find((step) => step * decade >= value * (1 - 1e-12)) ?? 10;
  return mantissa * decade;
}

/** Percent nonconforming at which the plan accepts only 1 % of lots: a chart's natural right edge. */
function percentWherePaFallsTo(n: number, ac: number, pa: number, model: OcModel) {
  let low = 0;
  let high = 1;
  for (let i = 0; i < 60; i++) {
    const mid = (low + high) / 2;
    if (probabilityOfAcceptance(n, ac, mid, model) > pa) low = mid;
    else high = mid;
  }
  return high * 100;
}

export interface OcCurveOptions {
  /** Right edge of the curve in percent; by default where Pa has fallen to 1 %, rounded up. */
  maxPercentDefective?: number;
  model?: OcModel;
}

/** Evenly spaced points from 0 % nonconforming to the right edge, for charting. */
export function ocCurve(plan: { sampleSize: number; accept: number }, points = 41, options: OcCurveOptions = {}): OcPoint[] {
  assertCount(points, 'number of points', 2);
  const model = options.model ?? 'binomial';
  const maxPercent = options.maxPercentDefective ?? Math.min(100, roundUpForAxis(percentWherePaFallsTo(plan.sampleSize, plan.accept, 0.01, model)));
  if (!(maxPercent > 0 && maxPercent <= 100)) throw new RangeError(`right edge must be in (0, 100] percent, got ${maxPercent}`);
  return Array.from({ length: points }, (_, index) => {
    const percentDefective = (maxPercent * index) / (points - 1);
    return { percentDefective, pa: probabilityOfAcceptance(plan.sampleSize, plan.accept, percentDefective / 100, model) };
  });
}
