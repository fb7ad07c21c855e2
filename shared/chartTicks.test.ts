import { describe, expect, it } from 'vitest';
import { digitsOf, positionTicks, roundTicks, symmetricExtent, tickText, toleranceTicks } from './chartTicks';

describe('ticks of a chart against a ± tolerance', () => {
  it('marks 0 and the two limits, not round numbers chosen by the charting library', () => {
    // Common practice for tolerance and control charts: the centre line and the limits are labelled.
    expect(toleranceTicks(0.005, symmetricExtent([0.001, -0.002], 0.005))).toEqual([-0.005, 0, 0.005]);
    expect(toleranceTicks(0.5, symmetricExtent([], 0.5))).toEqual([-0.5, 0, 0.5]);
  });

  it('adds one round tick on each side when values lie far outside the tolerance', () => {
    const extent = symmetricExtent([0.03], 0.005);
    expect(extent).toBeCloseTo(0.0345, 10);
    expect(toleranceTicks(0.005, extent)).toEqual([-0.02, -0.005, 0, 0.005, 0.02]);
  });

  it('writes ticks with the digits the tolerance has, and 0 as "0"', () => {
    expect(digitsOf(0.005)).toBe(3);
    expect(digitsOf(0.25)).toBe(2);
    expect(digitsOf(2)).toBe(0);
    expect(digitsOf(1 / 3)).toBe(6);
    const digits = digitsOf(0.005);
    expect(toleranceTicks(0.005, 0.008).map((t) => tickText(t, digits))).toEqual(['-0.005', '0', '0.005']);
    expect(tickText(-1e-12, 3)).toBe('0');
  });

  it('refuses a tolerance that is not positive', () => {
    expect(() => toleranceTicks(0, 1)).toThrow(/positive/);
    expect(() => symmetricExtent([1], -1)).toThrow(/positive/);
  });
});

describe('round ticks from 0', () => {
  it('steps by 1, 2, 2.5 or 5 times a power of ten and reaches past the end', () => {
    // Common practice for axis labelling: a handful of ticks at "nice" steps covering the data.
    expect(roundTicks(10)).toEqual({ ticks: [0, 2, 4, 6, 8, 10], digits: 0 });
    expect(roundTicks(12)).toEqual({ ticks: [0, 2.5, 5, 7.5, 10, 12.5], digits: 1 });
    expect(roundTicks(1.1)).toEqual({ ticks: [0, 0.25, 0.5, 0.75, 1, 1.25], digits: 2 });
    expect(roundTicks(0.3).ticks).toEqual([0, 0.1, 0.2, 0.3]);
  });

  it('refuses an axis that does not reach past 0', () => {
    expect(() => roundTicks(0)).toThrow(/past 0/);
  });
});

describe('ticks for places along an axis', () => {
  it('names the first and the last place and a few evenly spread between', () => {
    expect(positionTicks(1)).toEqual([1]);
    expect(positionTicks(4)).toEqual([1, 2, 3, 4]);
    expect(positionTicks(13)).toEqual([1, 4, 7, 10, 13]);
    expect(positionTicks(32)).toEqual([1, 8, 15, 22, 29, 32]);
    expect(() => positionTicks(0)).toThrow(/whole number/);
  });
});
