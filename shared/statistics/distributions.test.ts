import jstat from 'jstat';
import { describe, expect, it } from 'vitest';
import { chiSquareCdf, chiSquareQuantile, logGamma, normalCdf, normalQuantile } from './distributions';

// jstat, a general-purpose statistics library, is the independent reference for the distributions.
const { jStat } = jstat;

describe('normal quantiles', () => {
  it.each([0.5, 0.8, 0.9, 0.95, 0.975, 0.99, 0.995, 0.9995, 0.001, 0.025, 0.3])('agrees with jstat at p = %f', (p) => {
    expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 9);
  });

  it('gives the two-sided 95 % factor 1.96 printed in every table', () => {
    // Standard normal table, z_{0.975} = 1.96 (common practice; to the table's two decimals).
    expect(normalQuantile(0.975)).toBeCloseTo(1.96, 2);
  });

  it.each([-3, -1.5, 0, 0.4, 2.2, 5])('normal cdf agrees with jstat at x = %f', (x) => {
    expect(normalCdf(x)).toBeCloseTo(jStat.normal.cdf(x, 0, 1), 12);
  });

  it('refuses probabilities outside (0, 1)', () => {
    expect(() => normalQuantile(0)).toThrow(RangeError);
    expect(() => normalQuantile(1.2)).toThrow(RangeError);
  });
});

describe('chi-square quantiles', () => {
  const cases = [1, 2, 3, 4, 5, 9, 19, 29, 49, 99, 250].flatMap((degrees) => [0.005, 0.025, 0.05, 0.5, 0.95, 0.975, 0.995].map((p) => [p, degrees] as const));

  it.each(cases)('agrees with jstat at p = %f, %i degrees of freedom', (p, degrees) => {
    const reference = jStat.chisquare.inv(p, degrees);
    expect(Math.abs(chiSquareQuantile(p, degrees) - reference) / reference).toBeLessThan(1e-8);
  });

  it('gives the 19-degree quantiles of R and of the printed chi-square table', () => {
    // R (stats::qchisq): qchisq(0.025, df = 19) = 8.906516, qchisq(0.975, df = 19) = 32.85233,
    // qchisq(0.95, 19) = 30.14353, as R prints them (7 significant digits).
    expect(Math.abs(chiSquareQuantile(0.025, 19) - 8.906516)).toBeLessThan(5e-7);
    expect(Math.abs(chiSquareQuantile(0.975, 19) - 32.85233)).toBeLessThan(5e-6);
    expect(Math.abs(chiSquareQuantile(0.95, 19) - 30.14353)).toBeLessThan(5e-6);
    // NIST/SEMATECH e-Handbook 1.3.6.7.4, lower-tail critical values of the chi-square distribution,
    // 19 degrees of freedom: 10.117 exceeded with probability 0.95, 8.907 with 0.975 (three decimals).
    expect(Math.abs(chiSquareQuantile(0.05, 19) - 10.117)).toBeLessThan(5e-4);
    expect(Math.abs(chiSquareQuantile(0.025, 19) - 8.907)).toBeLessThan(5e-4);
  });

  it.each([0.3, 1, 4.5, 12, 40])('cdf agrees with jstat at x = %f (7 degrees)', (x) => {
    expect(chiSquareCdf(x, 7)).toBeCloseTo(jStat.chisquare.cdf(x, 7), 12);
  });

  it.each([0.25, 0.5, 1, 3.5, 10, 57.5])('ln Γ agrees with jstat at %f', (x) => {
    const reference = jStat.gammaln(x);
    expect(Math.abs(logGamma(x) - reference)).toBeLessThan(1e-12 * Math.max(1, Math.abs(reference)));
  });
});
