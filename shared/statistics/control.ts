// Control charts of a series of single values (here: one mean per lot, in the order the lots came):
// the individuals and moving-range chart, and the EWMA chart that catches a slow drift long before
// a single value leaves its three-sigma band.

// Control-chart constants for moving ranges of two consecutive values.
const D2 = 1.128;
const D4 = 3.267;

export type IndividualsChart = {
  center: number;
  /** Mean moving range, and σ estimated from it (MR̄/d₂). */
  meanMovingRange: number;
  sigma: number;
  upper: number;
  lower: number;
  movingRangeUpper: number;
  points: { value: number; movingRange: number | null; outside: boolean }[];
};

/** Individuals and moving-range chart with three-sigma limits; null below two values. */
export function individualsChart(values: readonly number[]): IndividualsChart | null {
  if (values.length < 2) return null;
  const center = values.reduce((sum, v) => sum + v, 0) / values.length;
  const ranges = values.slice(1).map((v, i) => Math.abs(v - values[i]));
  const meanMovingRange = ranges.reduce((sum, r) => sum + r, 0) / ranges.length;
  const sigma = meanMovingRange / D2;
  const upper = center + 3 * sigma;
  const lower = center - 3 * sigma;
  return {
    center,
    meanMovingRange,
    sigma,
    upper,
    lower,
    movingRangeUpper: D4 * meanMovingRange,
    points: values.map((value, i) => ({ value, movingRange: i === 0 ? null : ranges[i - 1], outside: value > upper || value < lower })),
  };
}

export type EwmaOptions = {
  /** The value the process should hold (the chart's centre and the statistic's start). */
  target: number;
  /** Standard deviation of one plotted value. */
  sigma: number;
  /** Weight of the newest value, 0 < λ ≤ 1. */
  lambda: number;
  /** Width of the limits in standard deviations of the statistic. */
  width: number;
};

export type EwmaPoint = { value: number; ewma: number; upper: number; lower: number; signal: 'high' | 'low' | null };

/** z_i = λx_i + (1 − λ)z_{i−1}, z_0 = target, with the exact limits of observation i:
 * target ± Lσ√(λ/(2 − λ)·(1 − (1 − λ)^{2i})), which widen towards their steady value. */
export function ewmaChart(values: readonly number[], { target, sigma, lambda, width }: EwmaOptions): EwmaPoint[] {
  if (!(lambda > 0 && lambda <= 1)) throw new RangeError(`λ must be in (0, 1], got ${lambda}`);
  if (!(sigma > 0)) throw new RangeError(`σ must be positive, got ${sigma}`);
  if (!(width > 0)) throw new RangeError(`the limits' width must be positive, got ${width}`);
  let ewma = target;
  return values.map((value, index) => {
    ewma = lambda * value + (1 - lambda) * ewma;
    const half = width * sigma * Math.sqrt((lambda / (2 - lambda)) * (1 - (1 - lambda) ** (2 * (index + 1))));
    const upper = target + half;
    const lower = target - half;
    return { value, ewma, upper, lower, signal: ewma > upper ? 'high' : ewma < lower ? 'low' : null };
  });
}
