import jstat from 'jstat';
import { describe, expect, it } from 'vitest';
import { ocCurve, probabilityOfAcceptance } from './oc';

// jstat, a general-purpose statistics library, as the independent reference. Its binomial cdf
// is rounded to 10 decimals, hence the tolerance of 1e-9.
const { jStat } = jstat;

// Plans (n, Ac) of Table 2-A, normal inspection (as checked cell by cell in tables.test.ts), and p
// across their working range.
const plans: [number, number][] = [
  [2, 0],
  [13, 0],
  [50, 1],
  [80, 2],
  [125, 3],
  [200, 5],
  [315, 7],
  [500, 10],
  [800, 14],
  [1250, 21],
];
const fractions = [0.0005, 0.001, 0.005, 0.01, 0.02, 0.04, 0.065, 0.1, 0.25];

describe('probability of acceptance', () => {
  it.each(plans)('agrees with jstat binomial cdf for n = %i, Ac = %i', (n, ac) => {
    for (const p of fractions) expect(probabilityOfAcceptance(n, ac, p)).toBeCloseTo(jStat.binomial.cdf(ac, n, p), 9);
  });

  it.each(plans)('agrees with jstat Poisson cdf (mean np) for n = %i, Ac = %i', (n, ac) => {
    for (const p of fractions) expect(probabilityOfAcceptance(n, ac, p, 'poisson')).toBeCloseTo(jStat.poisson.cdf(ac, n * p), 12);
  });

  it('matches closed forms: (1-p)^n for Ac 0, (1-p)^n + np(1-p)^(n-1) for Ac 1', () => {
    // Binomial distribution (common practice): n = 50 at 1 % gives 0.99^50 ≈ 0.6050 and 0.9106.
    expect(probabilityOfAcceptance(50, 0, 0.01)).toBeCloseTo(0.99 ** 50, 14);
    expect(probabilityOfAcceptance(50, 1, 0.01)).toBeCloseTo(0.99 ** 50 + 50 * 0.01 * 0.99 ** 49, 14);
    expect(probabilityOfAcceptance(50, 1, 0.01)).toBeCloseTo(0.9106, 4);
  });

  it('is 1 at p = 0, 0 at p = 1, and 1 when Ac ≥ n (every outcome accepts)', () => {
    expect(probabilityOfAcceptance(125, 3, 0)).toBe(1);
    expect(probabilityOfAcceptance(125, 3, 1)).toBe(0);
    expect(probabilityOfAcceptance(2, 2, 0.7)).toBe(1);
  });

  it('stays finite and tiny for a large sample at a high fraction nonconforming', () => {
    const pa = probabilityOfAcceptance(2000, 21, 0.5);
    expect(Number.isFinite(pa)).toBe(true);
    expect(pa).toBeGreaterThanOrEqual(0);
    expect(pa).toBeLessThan(1e-100);
  });

  it('refuses arguments outside their range', () => {
    expect(() => probabilityOfAcceptance(0, 0, 0.1)).toThrow(/sample size/);
    expect(() => probabilityOfAcceptance(50, -1, 0.1)).toThrow(/acceptance number/);
    expect(() => probabilityOfAcceptance(50, 1, 1.5)).toThrow(/between 0 and 1/);
  });
});

describe('OC curve', () => {
  it('starts at Pa 1, falls monotonically, and ends where Pa is down to about 1 %', () => {
    const curve = ocCurve({ sampleSize: 50, accept: 1 }, 41);
    expect(curve).toHaveLength(41);
    expect(curve[0]).toEqual({ percentDefective: 0, pa: 1 });
    for (let i = 1; i < curve.length; i++) expect(curve[i].pa).toBeLessThan(curve[i - 1].pa);
    // Binomial: Pa(50, 1) falls to 1 % near 12.4 % nonconforming; the edge is rounded up to 20 %.
    expect(curve.at(-1)?.percentDefective).toBe(20);
    expect(curve.at(-1)?.pa).toBeLessThan(0.01);
  });

  it('takes an explicit right edge and model', () => {
    const curve = ocCurve({ sampleSize: 125, accept: 3 }, 11, { maxPercentDefective: 10, model: 'poisson' });
    expect(curve.map((point) => point.percentDefective)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10].map((v) => expect.closeTo(v, 12)));
    expect(curve[5].pa).toBeCloseTo(jStat.poisson.cdf(3, 125 * 0.05), 12);
  });

  it('refuses fewer than two points', () => {
    expect(() => ocCurve({ sampleSize: 50, accept: 1 }, 1)).toThrow(/number of points/);
  });
});
