// The defect codes an NCR takes from its pieces' failing reasons, as the optics engine words them.
// Which code a failure belongs to (retardance out of tolerance, fast-axis mark error, mark on the
// slow axis, diattenuation, wrong order) is common practice of wave-plate inspection.
import { describe, expect, it } from 'vitest';
import { describeAlongMark, judge } from '../optics/judge';
import { parsePieceSpec, type PieceSpecInput } from '../optics/spec';
import { failingReasons } from './automatic';
import { defectCodesFor } from './defectCodes';
import { ncrOpenItems, ncrStatusOf, pieceAwaitsDisposition, type PieceProgress } from './progress';

const quarterWave = (overrides: Partial<PieceSpecInput> = {}) => {
  const parsed = parsePieceSpec({ nominalWaves: 0.25, designWavelengthNm: 632.8, retardanceTolWaves: 0.003, axisTolDeg: 0.5, ...overrides });
  if (!parsed.ok) throw new Error(parsed.message);
  return parsed.spec;
};
const failuresOf = (waves: number, fastAxisDeg: number, extra: { diattenuation?: number; depolarization?: number } = {}, spec = quarterWave()) =>
  judge({ along: describeAlongMark({ waves, fastAxisDeg }, 0), axisAmbiguous: false, ...extra }, spec).failures;

describe('defect codes from failing reasons', () => {
  it('names retardance, axis mark, diattenuation and depolarisation failures by their code, each once', () => {
    // 0.2451 λ against 0.25 ± 0.003 λ and a mark 0.9° off against ±0.5°: both out.
    const failures = failuresOf(0.2451, -0.9, { diattenuation: 0.02, depolarization: 0.05 }, quarterWave({ maxDiattenuation: 0.01, maxDepolarization: 0.02 }));
    expect(defectCodesFor(failures)).toEqual(['retardance', 'axis-mark', 'diattenuation', 'depolarisation']);
    expect(defectCodesFor([...failures, ...failures])).toEqual(['retardance', 'axis-mark', 'diattenuation', 'depolarisation']);
  });

  it('tells a mark on the slow axis from a retardance error', () => {
    // A quarter-wave plate whose fast axis lies 90° from its mark reads 0.75 λ along the mark.
    const failures = failuresOf(0.2498, 90.2);
    expect(defectCodesFor(failures)).toEqual(['mark-on-slow-axis']);
  });

  it('reads reasons with a wavelength before or after them, and ignores what it does not know', () => {
    expect(defectCodesFor(['632.8 nm: retardance error 0.0061 waves is outside ±0.003 waves', 'fast-axis error 0.71° is outside ±0.5° at 532 nm'])).toEqual([
      'retardance',
      'axis-mark',
    ]);
    expect(defectCodesFor(['order 3 (thickness 0.2012 mm) estimated from the birefringence dispersion of quartz; ordered: zero-order (m = 0)'])).toEqual([
      'wrong-order',
    ]);
    expect(defectCodesFor(['something else entirely'])).toEqual([]);
  });

  it('takes a piece’s reasons from its failing results only, naming the wavelength when several fail', () => {
    expect(
      failingReasons([
        { wavelengthNm: 632.8, verdict: 'pass', reasons: [] },
        { wavelengthNm: 1064, verdict: 'fail', reasons: ['retardance error'] },
      ]),
    ).toEqual(['retardance error']);
    expect(
      failingReasons([
        { wavelengthNm: 532, verdict: 'fail', reasons: ['a'] },
        { wavelengthNm: 632.8, verdict: 'fail', reasons: ['a', 'b'] },
      ]),
    ).toEqual(['a at 532 nm', 'a at 632.8 nm', 'b at 632.8 nm']);
  });
});

describe('what stands between an NCR and its closing', () => {
  const piece = (serial: string, decision: PieceProgress['decision'], more: Partial<PieceProgress> = {}): PieceProgress => ({
    serial,
    decision,
    reworkReleased: false,
    shipped: false,
    ...more,
  });

  it('lists pieces awaiting a disposition, to ship back, and in rework; nothing once every one is carried out', () => {
    const pieces = [piece('A', null), piece('B', 'return-to-vendor'), piece('C', 'rework'), piece('D', 'scrap'), piece('E', 'use-as-is')];
    expect(ncrOpenItems(pieces)).toEqual([
      '1 piece awaits a disposition: A',
      '1 piece to ship back to the vendor: B',
      '1 piece in rework, to be released or dispositioned again: C',
    ]);
    expect(ncrStatusOf(pieces)).toBe('open');
    const done = [
      piece('B', 'return-to-vendor', { shipped: true }),
      piece('C', 'rework', { reworkReleased: true }),
      piece('D', 'scrap'),
      piece('E', 'use-as-is'),
    ];
    expect(ncrOpenItems(done)).toEqual([]);
    expect(ncrStatusOf(done)).toBe('dispositioned');
  });

  it('lets a piece waiting in rework be dispositioned again, otherwise, but not a decided one', () => {
    expect(pieceAwaitsDisposition(piece('A', null))).toBe(true);
    expect(pieceAwaitsDisposition(piece('C', 'rework'), 'scrap')).toBe(true);
    expect(pieceAwaitsDisposition(piece('C', 'rework'), 'rework')).toBe(false);
    expect(pieceAwaitsDisposition(piece('C', 'rework', { reworkReleased: true }), 'scrap')).toBe(false);
    expect(pieceAwaitsDisposition(piece('D', 'scrap'), 'return-to-vendor')).toBe(false);
  });
});
