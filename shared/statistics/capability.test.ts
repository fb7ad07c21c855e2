import jstat from 'jstat';
import { describe, expect, it } from 'vitest';
import { capability, cpInterval, cpkInterval, summarize } from './capability';

const { jStat } = jstat;

describe('summaries', () => {
  it('agrees with jstat on the mean and the sample standard deviation', () => {
    const values = [0.0012, -0.0004, 0.0021, 0.0003, -0.0011, 0.0008, 0.0015];
    const summary = summarize(values);
    expect(summary.n).toBe(7);
    expect(summary.mean).toBeCloseTo(jStat.mean(values), 15);
    expect(summary.sd).toBeCloseTo(jStat.stdev(values, true), 15);
  });

  it('has no spread below two values', () => {
    expect(summarize([3]).sd).toBeNaN();
    expect(summarize([]).mean).toBeNaN();
  });
});

describe('Cp and Cpk', () => {
  it('reproduces the handbook example of an off-centre process', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods, 6.1.6 "What is Process Capability?", worked
    // example: USL = 20, LSL = 8, mean 16, σ = 2 give Cp = 1.0 and Cpk = 0.6667.
    const result = capability({ n: 50, mean: 16, sd: 2 }, { lower: 8, upper: 20 })!;
    expect(result.cp).toBeCloseTo(1.0, 4);
    expect(result.cpk).toBeCloseTo(0.6667, 4);
  });

  it('gives the confidence interval on Cp of the textbook example', () => {
    // Montgomery, Introduction to Statistical Quality Control, example of a 95 % confidence interval
    // on Cp: USL = 62, LSL = 38, n = 20, s = 1.75 give Ĉp = 2.29 and, from that rounded Ĉp,
    // 1.57 ≤ Cp ≤ 3.01. From memory, printed to two decimals (±0.005); the chi-square quantiles it
    // rests on, 8.91 and 32.85 at 19 degrees, are checked against R in distributions.test.ts.
    const result = capability({ n: 20, mean: 50, sd: 1.75 }, { lower: 38, upper: 62 })!;
    expect(result.cp).toBeCloseTo(2.29, 2);
    const interval = cpInterval(2.29, 20, 0.95);
    expect(Math.abs(interval.low - 1.57)).toBeLessThan(0.005);
    expect(Math.abs(interval.high - 3.01)).toBeLessThan(0.005);
  });

  it('gives the confidence interval on Cpk of a published worked example', () => {
    // Quality Digest, May 2000, "Last Word" column, worked example: a Cpk of 1.15 from a random sample
    // of n = 45 lies, with 95 % confidence, between 0.89 and 1.41 (printed to two decimals).
    const interval = cpkInterval(1.15, 45, 0.95);
    expect(Math.abs(interval.low - 0.89)).toBeLessThan(0.005);
    expect(Math.abs(interval.high - 1.41)).toBeLessThan(0.005);
  });

  it('gives the confidence interval on Cpk of the textbook example', () => {
    // Montgomery, Introduction to Statistical Quality Control, example of a 95 % confidence interval
    // on Cpk: Ĉpk = 1.33 from n = 20 gives 0.88 ≤ Cpk ≤ 1.78. From memory, printed to two decimals
    // (±0.005); no readable copy of the example was found.
    const interval = cpkInterval(1.33, 20, 0.95);
    expect(Math.abs(interval.low - 0.88)).toBeLessThan(0.005);
    expect(Math.abs(interval.high - 1.78)).toBeLessThan(0.005);
  });

  it('builds the Cp interval from jstat chi-square quantiles', () => {
    // The definition with jstat's quantiles as the reference: Ĉp·√(χ²_{α/2}/ν), Ĉp·√(χ²_{1−α/2}/ν).
    const interval = cpInterval(1.1, 8, 0.9);
    expect(interval.low).toBeCloseTo(1.1 * Math.sqrt(jStat.chisquare.inv(0.05, 7) / 7), 9);
    expect(interval.high).toBeCloseTo(1.1 * Math.sqrt(jStat.chisquare.inv(0.95, 7) / 7), 9);
  });

  it('builds the Cpk interval from the jstat normal quantile', () => {
    const z = jStat.normal.inv(0.995, 0, 1);
    const interval = cpkInterval(0.9, 12, 0.99);
    const half = 0.9 * z * Math.sqrt(1 / (9 * 12 * 0.81) + 1 / 22);
    expect(interval.low).toBeCloseTo(0.9 - half, 9);
    expect(interval.high).toBeCloseTo(0.9 + half, 9);
  });

  it('keeps an interval for a process centred on a limit and for one outside it', () => {
    const onLimit = cpkInterval(0, 10);
    expect(onLimit.low).toBeLessThan(0);
    expect(onLimit.high).toBeGreaterThan(0);
    const outside = capability({ n: 10, mean: 25, sd: 2 }, { lower: 8, upper: 20 })!;
    expect(outside.cpk).toBeLessThan(0);
    expect(outside.cpkInterval!.low).toBeLessThan(outside.cpk);
    expect(outside.cpkInterval!.high).toBeGreaterThan(outside.cpk);
  });

  it('has nothing to say without a spread, and refuses limits in the wrong order', () => {
    expect(capability({ n: 1, mean: 0, sd: Number.NaN }, { lower: -1, upper: 1 })).toBeNull();
    expect(capability({ n: 5, mean: 0, sd: 0 }, { lower: -1, upper: 1 })).toBeNull();
    expect(() => capability({ n: 5, mean: 0, sd: 1 }, { lower: 1, upper: -1 })).toThrow(RangeError);
    expect(() => cpInterval(1, 1)).toThrow(RangeError);
  });
});
