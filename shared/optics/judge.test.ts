import { describe, expect, it } from 'vitest';
import { jonesRotatedRetarder, jonesToMueller } from './jones.js';
import { MARK_ON_SLOW_AXIS, accepts, describeAlongMark, judge, measuredFromAlongMark } from './judge.js';
import { parsePieceSpec, type PieceSpecInput } from './spec.js';
import { expectClose } from './testing.js';
import { DEG } from './units.js';

const spec = (overrides: Partial<PieceSpecInput> = {}) => {
  const parsed = parsePieceSpec({
    nominalWaves: 0.25,
    designWavelengthNm: 632.8,
    retardanceTolWaves: 0.003,
    axisTolDeg: 0.5,
    ...overrides,
  });
  if (!parsed.ok) throw new Error(parsed.message);
  return parsed.spec;
};

const judgeMeasured = (waves: number, fastAxisDeg: number, s = spec(), mountDeg = 0) =>
  judge({ along: describeAlongMark({ waves, fastAxisDeg }, mountDeg), axisAmbiguous: false }, s);

describe('the same element, two descriptions', () => {
  // Hecht ch. 8 and readings.md: a half-wave element at t and at t + 90° are the same element.
  it('makes a half-wave plate at t and at t + 90° the same element', () => {
    for (const t of [0, 0.3, -1.1]) {
      expectClose(jonesToMueller(jonesRotatedRetarder(Math.PI, t)), jonesToMueller(jonesRotatedRetarder(Math.PI, t + Math.PI / 2)), 1e-14);
    }
  });

  // readings.md: a quarter-wave element with its fast axis at 90° is a 0.75-wave element at 0°.
  it('makes a quarter wave at 90° the same element as three quarters at 0°', () => {
    expectClose(jonesToMueller(jonesRotatedRetarder(Math.PI / 2, 90 * DEG)), jonesToMueller(jonesRotatedRetarder(1.5 * Math.PI, 0)), 1e-14);
    expect(describeAlongMark({ waves: 0.25, fastAxisDeg: 90 }, 0)).toEqual({ waves: 0.75, axisErrorDeg: 0 });
    expect(judgeMeasured(0.25, 90, spec({ nominalWaves: 0.75 })).failures).toEqual([]);
  });

  it('picks the description with the axis error within ±45° of the mark, and back', () => {
    expect(describeAlongMark({ waves: 0.2493, fastAxisDeg: 10.31 }, 10)).toEqual({ waves: 0.2493, axisErrorDeg: expect.closeTo(0.31, 12) });
    const along = describeAlongMark({ waves: 0.2493, fastAxisDeg: -79.7 }, 10);
    expect(along.waves).toBeCloseTo(0.7507, 12);
    expect(along.axisErrorDeg).toBeCloseTo(0.3, 12);
    const back = measuredFromAlongMark(along, 10);
    expect(back.waves).toBeCloseTo(0.2493, 12);
    expect(back.fastAxisDeg).toBeCloseTo(-79.7, 12);
  });
});

describe('verdict of one reading', () => {
  it('passes a quarter-wave plate inside both tolerances', () => {
    const j = judgeMeasured(0.2493, 0.31);
    expect(j.failures).toEqual([]);
    expect(j.retardanceErrorWaves).toBeCloseTo(-0.0007, 12);
    expect(j.axisErrorDeg).toBeCloseTo(0.31, 12);
  });

  it('fails a quarter-wave plate whose mark is on the slow axis, with that reason alone', () => {
    const j = judgeMeasured(0.2498, 90.2);
    expect(j.failures).toEqual([MARK_ON_SLOW_AXIS]);
    expect(j.waves).toBeCloseTo(0.7502, 12);
    expect(j.axisErrorDeg).toBeCloseTo(0.2, 12);
  });

  it('judges a half-wave plate with its axis modulo 90°, never as a mark on the slow axis', () => {
    const s = spec({ nominalWaves: 0.5 });
    expect(judgeMeasured(0.4995, 90.3, s).failures).toEqual([]);
    expect(judgeMeasured(0.4995, 90.3, s).axisErrorDeg).toBeCloseTo(0.3, 12);
    expect(judgeMeasured(0.49, 0, s).failures).toEqual(['retardance error -0.0100 waves is outside ±0.003 waves']);
  });

  it('compares the fractional parts of a multi-order plate', () => {
    expect(judgeMeasured(0.2505, 0.1, spec({ nominalWaves: 6.25, multiOrder: 6 })).failures).toEqual([]);
  });

  it('lists every failing reason', () => {
    const j = judge(
      { along: { waves: 0.2451, axisErrorDeg: -0.9 }, axisAmbiguous: false, diattenuation: 0.02, depolarization: 0.05 },
      spec({ maxDiattenuation: 0.01, maxDepolarization: 0.02 }),
    );
    expect(j.failures).toEqual([
      'retardance error -0.0049 waves is outside ±0.003 waves',
      'fast-axis error -0.90° is outside ±0.5°',
      'diattenuation 0.0200 is above the limit 0.01',
      'depolarisation 0.0500 is above the limit 0.02',
    ]);
  });

  it('lets a scan (fast and slow not told apart) match either description', () => {
    const j = judge({ along: { waves: 0.2496, axisErrorDeg: 89.8 }, axisAmbiguous: true }, spec({ nominalWaves: 0.75 }));
    expect(j.failures).toEqual([]);
    expect(j.waves).toBeCloseTo(0.7504, 12);
    expect(j.axisErrorDeg).toBeCloseTo(-0.2, 12);
  });
});

describe('decision rules (ILAC-G8:09/2019; ISO 14253-1:2017)', () => {
  it('accepts inside the tolerance with simple acceptance, and only inside tolerance - U when guarded', () => {
    expect(accepts(0.0025, 0.003, 'simple', 0.001)).toBe(true);
    expect(accepts(0.0025, 0.003, 'guarded', 0.001)).toBe(false);
    expect(accepts(-0.0019, 0.003, 'guarded', 0.001)).toBe(true);
    expect(accepts(0.003, 0.003, 'simple', 0)).toBe(true);
    expect(accepts(0.0031, 0.003, 'simple', 0)).toBe(false);
  });

  it('says that a guarded rejection counted the uncertainty', () => {
    const guarded = spec({ decisionRule: 'guarded', uncertaintyWaves: 0.001, uncertaintyDeg: 0.2 });
    expect(judgeMeasured(0.2475, 0.4, guarded).failures).toEqual([
      'retardance error -0.0025 waves with uncertainty 0.001 waves (guarded acceptance) is outside ±0.003 waves',
      'fast-axis error 0.40° with uncertainty 0.2° (guarded acceptance) is outside ±0.5°',
    ]);
    expect(judgeMeasured(0.2475, 0.4).failures).toEqual([]);
  });
});

describe('specification', () => {
  it('fills defaults and refuses contradictions with readable messages', () => {
    expect(spec()).toMatchObject({ decisionRule: 'simple', uncertaintyWaves: 0, s3Sign: 1, angleSign: 1 });
    expect(parsePieceSpec({ nominalWaves: 0.25, retardanceTolWaves: 0.003, axisTolDeg: 0.5 })).toEqual({
      ok: false,
      message: expect.stringContaining('designWavelengthNm'),
    });
    expect(parsePieceSpec({ ...spec(), nominalWaves: 6.25, multiOrder: 2 })).toEqual({
      ok: false,
      message: 'multiOrder: multiOrder disagrees with the whole waves of nominalWaves',
    });
    expect(parsePieceSpec({ ...spec(), bandNm: [700, 400] })).toEqual({ ok: false, message: expect.stringContaining('low < high') });
  });
});
