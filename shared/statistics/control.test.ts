import { describe, expect, it } from 'vitest';
import { ewmaChart, individualsChart } from './control';

describe('EWMA chart', () => {
  // NIST/SEMATECH e-Handbook of Statistical Methods, 6.3.2.4 "EWMA Control Charts", worked
  // example: target 50, s = 2.0539, λ = 0.3, limits at 3 standard deviations of the statistic.
  const data = [52.0, 47.0, 53.0, 49.3, 50.1, 47.0, 51.0, 50.1, 51.2, 50.5, 49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];
  // The handbook's EWMA statistics, printed to two decimals (after EWMA_0 = 50.00).
  const printed = [50.6, 49.52, 50.56, 50.18, 50.16, 49.21, 49.75, 49.85, 50.26, 50.33, 50.11, 49.36, 49.52, 50.05, 49.38, 49.92, 50.73, 51.23, 51.94, 51.99];
  const chart = ewmaChart(data, { target: 50, sigma: 2.0539, lambda: 0.3, width: 3 });

  it('reproduces every printed EWMA value', () => {
    chart.forEach((point, i) => expect(point.ewma).toBeCloseTo(printed[i], 2));
  });

  it('reaches the printed steady-state limits', () => {
    // Handbook: UCL = 50 + 3(0.4201)(2.0539) = 52.5884, LCL = 47.4115; the page rounds the factor
    // √(λ/(2 − λ)) to 0.4201, so the last digit carries ±0.001.
    const last = chart[chart.length - 1];
    expect(Math.abs(last.upper - 52.5884)).toBeLessThan(1e-3);
    expect(Math.abs(last.lower - 47.4115)).toBeLessThan(1e-3);
  });

  it('finds the process in control, as the handbook concludes', () => {
    expect(chart.every((point) => point.signal === null)).toBe(true);
  });

  it('narrows the first limits to λσ·width (the exact limits at i = 1)', () => {
    // At i = 1 the factor λ/(2 − λ)·(1 − (1 − λ)²) is λ² (common practice; algebra of the definition).
    expect(chart[0].upper - 50).toBeCloseTo(3 * 2.0539 * 0.3, 10);
  });

  it('signals a drift on the side it goes', () => {
    // By hand: z = 0, 0.02, 0.076, 0.1608, 0.2886, 0.4509, 0.6407 against half-widths
    // 1.5·√(1/9·(1 − 0.8^{2i})), 0.4825 at i = 6 and 0.4889 at i = 7: only the last is out.
    const drifting = ewmaChart([0, 0.1, 0.3, 0.5, 0.8, 1.1, 1.4], { target: 0, sigma: 0.5, lambda: 0.2, width: 3 });
    expect(drifting.map((p) => p.signal)).toEqual([null, null, null, null, null, null, 'high']);
    expect(drifting[5].ewma).toBeCloseTo(0.4509, 4);
    const falling = ewmaChart([-1, -2, -2], { target: 0, sigma: 0.5, lambda: 0.5, width: 3 });
    expect(falling.at(-1)!.signal).toBe('low');
  });

  it('refuses a weight, spread or width it cannot use', () => {
    expect(() => ewmaChart([1], { target: 0, sigma: 1, lambda: 0, width: 3 })).toThrow(RangeError);
    expect(() => ewmaChart([1], { target: 0, sigma: 0, lambda: 0.2, width: 3 })).toThrow(RangeError);
    expect(() => ewmaChart([1], { target: 0, sigma: 1, lambda: 0.2, width: -1 })).toThrow(RangeError);
  });
});

describe('individuals and moving-range chart', () => {
  it('sets its limits from the mean moving range', () => {
    // Worked by hand with the constants for ranges of two from R's qcc package (.qcc.options:
    // exp.R.unscaled d₂ = 1.128, se.R.unscaled d₃ = 0.8525033, so D₄ = 1 + 3d₃/d₂ = 3.267, common
    // practice): values 10, 12, 11, 14, 13 have moving ranges 2, 1, 3, 1, so MR̄ = 1.75, x̄ = 12,
    // σ̂ = 1.75 / 1.128 = 1.5514, limits 12 ± 4.6543 = 7.3457 and 16.6543, MR limit 5.7173.
    const chart = individualsChart([10, 12, 11, 14, 13])!;
    expect(chart.center).toBe(12);
    expect(chart.meanMovingRange).toBeCloseTo(1.75, 12);
    expect(chart.sigma).toBeCloseTo(1.5514, 4);
    expect(chart.upper).toBeCloseTo(16.6543, 4);
    expect(chart.lower).toBeCloseTo(7.3457, 4);
    expect(chart.movingRangeUpper).toBeCloseTo(5.7173, 4);
    expect(chart.points.map((p) => p.movingRange)).toEqual([null, 2, 1, 3, 1]);
    expect(chart.points.some((p) => p.outside)).toBe(false);
  });

  it('marks a value beyond its limits', () => {
    const chart = individualsChart([0, 0.1, -0.1, 0.05, -0.05, 0, 0.1, -0.1, 3])!;
    expect(chart.points.at(-1)!.outside).toBe(true);
  });

  it('needs two values', () => {
    expect(individualsChart([1])).toBeNull();
  });
});
