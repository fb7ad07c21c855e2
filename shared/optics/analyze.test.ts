import { describe, expect, it } from 'vitest';
import directQwp from '../../tests/fixtures/readings/direct-qwp.csv?raw';
import quartzMultiwavelength from '../../tests/fixtures/readings/quartz-multiwavelength.csv?raw';
import scanHwp from '../../tests/fixtures/readings/scan-hwp.csv?raw';
import stokesErrors from '../../tests/fixtures/readings/stokes-errors.csv?raw';
import stokesQwp from '../../tests/fixtures/readings/stokes-qwp.csv?raw';
import { analyzeBuffer, analyzeStream, analyzeText } from './analyze.js';
import { MATERIALS } from './dispersion.js';
import { DIRECT_HEADER, SCAN_HEADER, STOKES_HEADER, directRow, scanRows, stokesRows, type SyntheticPlate } from './synthetic.js';
import { bytesOf, chunksOf, seededNormal, seededUniform } from './testing.js';
import type { PieceSpecInput } from './spec.js';

const QWP: PieceSpecInput = { nominalWaves: 0.25, designWavelengthNm: 632.8, retardanceTolWaves: 0.003, axisTolDeg: 0.5 };
const file = (header: string, rows: string[], metadata: string[] = []) => [...metadata, header, ...rows].join('\n');
const angles = Array.from({ length: 18 }, (_, i) => i * 10);

/** Random plates near a quarter wave, their fast axis near a random mark. */
function plates(seed: number, count: number): SyntheticPlate[] {
  const random = seededUniform(seed, -1, 1);
  return Array.from({ length: count }, (_, i) => {
    const mountDeg = 80 * random();
    return {
      serial: `QW-${String(i + 1).padStart(4, '0')}`,
      wavelengthNm: 632.8,
      retardanceWaves: 0.25 + 0.004 * random(),
      fastAxisDeg: mountDeg + 0.8 * random(),
      mountDeg,
    };
  });
}

function expectRecovered(result: ReturnType<typeof analyzeText>, truth: SyntheticPlate[], wavesTol: number, degTol: number) {
  expect(result.errors).toEqual([]);
  expect(result.pieces).toHaveLength(truth.length);
  result.pieces.forEach((piece, i) => {
    const plate = truth[i];
    expect(piece.serial).toBe(plate.serial);
    expect(Math.abs(piece.retardanceWaves! - plate.retardanceWaves)).toBeLessThanOrEqual(wavesTol);
    expect(Math.abs(piece.axisErrorDeg! - (plate.fastAxisDeg - (plate.mountDeg ?? 0)))).toBeLessThanOrEqual(degTol);
    expect(Math.abs(piece.retardanceErrorWaves! - (plate.retardanceWaves - 0.25))).toBeLessThanOrEqual(wavesTol);
  });
}

describe('synthetic readings recovered by each method', () => {
  it('stokes: exact readings give retardance and axis to 1e-6', () => {
    const truth = plates(61, 12);
    const result = analyzeText(
      file(
        STOKES_HEADER,
        truth.flatMap((p) => stokesRows(p)),
      ),
      QWP,
    );
    expect(result.method).toBe('stokes');
    expectRecovered(result, truth, 1e-6, 1e-4);
    for (const piece of result.pieces) {
      expect(piece.diattenuation!).toBeLessThan(1e-5);
      expect(piece.depolarizationIndex!).toBeCloseTo(1, 5);
      expect(Math.abs(piece.circularRetardanceDeg!)).toBeLessThan(1e-3);
    }
  });

  it('stokes: 0.002 noise on each Stokes component stays within 0.001 wave and 0.15° (seeded)', () => {
    const truth = plates(62, 30);
    const noise = seededNormal(63);
    const rows = truth.flatMap((p) => stokesRows(p, undefined, () => 0.002 * noise()));
    expectRecovered(analyzeText(file(STOKES_HEADER, rows), QWP), truth, 0.001, 0.15);
  });

  it('stokes: four inputs H, V, D, R are enough', () => {
    const truth = plates(64, 5);
    expectRecovered(
      analyzeText(
        file(
          STOKES_HEADER,
          truth.flatMap((p) => stokesRows(p, ['H', 'V', 'D', 'R'])),
        ),
        QWP,
      ),
      truth,
      1e-6,
      1e-4,
    );
  });

  it('scan: crossed and parallel readings without noise, then with 0.2 % noise (seeded)', () => {
    const truth = plates(65, 10).map((p) => ({ ...p, mountDeg: 0, fastAxisDeg: p.fastAxisDeg - p.mountDeg! }));
    const exact = truth.flatMap((p) => scanRows(p, angles, { analyzers: ['crossed', 'parallel'] }));
    const result = analyzeText(file(SCAN_HEADER, exact), QWP);
    expect(result.method).toBe('scan');
    expectRecovered(result, truth, 1e-6, 1e-4);
    expect(result.pieces.every((p) => p.axisAmbiguous)).toBe(true);
    const noise = seededNormal(66);
    const noisy = truth.flatMap((p) => scanRows(p, angles, { analyzers: ['crossed', 'parallel'] }, () => 0.002 * noise()));
    expectRecovered(analyzeText(file(SCAN_HEADER, noisy), QWP), truth, 0.001, 0.1);
  });

  it('direct: every unit, and a reading above half a wave with its axis turned by 90°', () => {
    const truth = plates(67, 4);
    const rows = truth.map((p, i) => directRow(p, (['nm', 'waves', 'deg', 'rad'] as const)[i]));
    expectRecovered(analyzeText(file(DIRECT_HEADER, rows), QWP), truth, 1e-6, 1e-5);
    const turned = analyzeText(file(DIRECT_HEADER, ['QW-0009,632.8,0.7507,waves,90.31,0']), QWP);
    expect(turned.pieces[0]).toMatchObject({ retardanceWaves: expect.closeTo(0.2493, 9), fastAxisDeg: expect.closeTo(0.31, 9), verdict: 'pass' });
  });

  it('direct: several readings of one piece are averaged along the mark', () => {
    const result = analyzeText(file(DIRECT_HEADER, ['QW-0010,632.8,0.2497,waves,0.2,0', 'QW-0010,632.8,0.2503,waves,0.4,0']), QWP);
    expect(result.pieces[0]).toMatchObject({ retardanceWaves: expect.closeTo(0.25, 12), axisErrorDeg: expect.closeTo(0.3, 12), lines: [2, 3] });
  });
});

describe('verdicts through the whole file', () => {
  it('fails a plate mounted with its fast-axis mark on the slow axis', () => {
    const rows = stokesRows({ serial: 'QW-0020', wavelengthNm: 632.8, retardanceWaves: 0.2496, fastAxisDeg: 90.1 });
    const [piece] = analyzeText(file(STOKES_HEADER, rows), QWP).pieces;
    expect(piece).toMatchObject({ verdict: 'fail', reasons: ['fast-axis mark on the slow axis'], axisErrorDeg: expect.closeTo(0.1, 4) });
  });

  it('judges an achromatic part at every measured wavelength inside its band', () => {
    const rows = [450, 632.8, 900].flatMap((nm, i) =>
      stokesRows({ serial: 'AQ-0001', wavelengthNm: nm, retardanceWaves: [0.2512, 0.2498, 0.25][i], fastAxisDeg: 0.1 }),
    );
    const result = analyzeText(file(STOKES_HEADER, rows), { ...QWP, bandNm: [400, 700] });
    expect(result.pieces.map((p) => [p.wavelengthNm, p.judged, p.verdict])).toEqual([
      [450, true, 'pass'],
      [632.8, true, 'pass'],
      [900, false, 'incomplete'],
    ]);
    expect(result.pieces[2].reasons).toEqual(['900 nm is outside the band 400-700 nm: not judged']);
    expect(result.serials).toEqual([{ serial: 'AQ-0001', verdict: 'pass', reasons: [], wavelengthsNm: [450, 632.8, 900] }]);
    const tight = analyzeText(file(STOKES_HEADER, rows), { ...QWP, bandNm: [400, 700], retardanceTolWaves: 0.001 });
    expect(tight.serials[0]).toMatchObject({ verdict: 'fail', reasons: ['450 nm: retardance error 0.0012 waves is outside ±0.001 waves'] });
  });

  it('estimates the order of a quartz plate and flags a multi-order plate shipped against a zero-order order', () => {
    const result = analyzeBuffer(bytesOf(quartzMultiwavelength), {
      ...QWP,
      multiOrder: 0,
      material: 'quartz',
    });
    const atDesign = result.pieces.filter((p) => p.wavelengthNm === 632.8);
    expect(atDesign.map((p) => [p.serial, p.estimatedOrder, p.orderAmbiguous, p.verdict])).toEqual([
      ['QZ-0001', 0, false, 'pass'],
      ['QZ-0002', 6, false, 'fail'],
    ]);
    const thickness = (6.2504 * 632.8e-6) / MATERIALS.quartz!.birefringence(632.8);
    expect(atDesign[1].thicknessMm).toBeCloseTo(thickness, 3);
    expect(atDesign[1].reasons).toEqual([
      expect.stringMatching(
        /^order 6 \(thickness 0\.437\d mm\) estimated from the birefringence dispersion of crystal quartz \(Ghosh 1999\); ordered: zero-order \(m = 0\)$/,
      ),
    ]);
    expect(result.serials.map((s) => s.verdict)).toEqual(['pass', 'fail']);
    // Ordered as a 6th-order plate, the same piece passes.
    const asOrdered = analyzeBuffer(bytesOf(quartzMultiwavelength), { ...QWP, nominalWaves: 6.25, material: 'quartz' });
    expect(asOrdered.serials.map((s) => s.verdict)).toEqual(['pass', 'pass']);
  });
});

describe('instrument profiles', () => {
  const plate: SyntheticPlate = { serial: 'QW-0030', wavelengthNm: 632.8, retardanceWaves: 0.2495, fastAxisDeg: 20.2, mountDeg: 20 };
  /** The same readings as exported by an instrument with the opposite S3 sign or angle direction. */
  const exported = (s3Sign: 1 | -1, angleSign: 1 | -1, inputs?: string[]) =>
    stokesRows(plate, inputs).map((row) => {
      const [serial, nm, input, s0, s1, s2, s3, mount] = row.split(',');
      const relabel: Record<string, string> = {
        ...(angleSign === -1 ? { D: 'A', A: 'D' } : {}),
        ...(s3Sign === -1 ? { R: 'L', L: 'R' } : {}),
      };
      const label = relabel[input] ?? (Number.isNaN(Number(input)) ? input : String(Number(input) * angleSign));
      return [serial, nm, label, s0, s1, Number(s2) * angleSign, Number(s3) * s3Sign, Number(mount) * angleSign].join(',');
    });

  it('reads an export with the opposite S3 sign correctly with s3Sign = -1, and as a slow-axis mark without it', () => {
    const rows = exported(-1, 1);
    expect(analyzeText(file(STOKES_HEADER, rows), { ...QWP, s3Sign: -1 }).pieces[0]).toMatchObject({
      verdict: 'pass',
      retardanceWaves: expect.closeTo(0.2495, 6),
      axisErrorDeg: expect.closeTo(0.2, 4),
    });
    expect(analyzeText(file(STOKES_HEADER, rows), QWP).pieces[0].reasons).toEqual(['fast-axis mark on the slow axis']);
  });

  it('reads an export with angles the other way correctly with angleSign = -1', () => {
    const rows = exported(1, -1);
    expect(analyzeText(file(STOKES_HEADER, rows), { ...QWP, angleSign: -1 }).pieces[0]).toMatchObject({
      verdict: 'pass',
      fastAxisDeg: expect.closeTo(20.2, 4),
      axisErrorDeg: expect.closeTo(0.2, 4),
    });
    expect(analyzeText(file(STOKES_HEADER, rows), QWP).pieces[0].verdict).toBe('fail');
  });

  it('applies the profile to numeric input angles and to direct readings', () => {
    const direct = analyzeText(file(DIRECT_HEADER, ['QW-0031,632.8,0.2495,waves,-20.2,-20']), { ...QWP, angleSign: -1 });
    expect(direct.pieces[0]).toMatchObject({ fastAxisDeg: expect.closeTo(20.2, 9), axisErrorDeg: expect.closeTo(0.2, 9), verdict: 'pass' });
    // With the opposite handedness the instrument's fast axis is our slow one.
    const handed = analyzeText(file(DIRECT_HEADER, ['QW-0032,632.8,0.2495,waves,110.2,20']), { ...QWP, s3Sign: -1 });
    expect(handed.pieces[0]).toMatchObject({ fastAxisDeg: expect.closeTo(20.2, 9), verdict: 'pass' });
    const byAngle = exported(1, -1, ['0', '90', '45', 'R']);
    expect(analyzeText(file(STOKES_HEADER, byAngle), { ...QWP, angleSign: -1 }).pieces[0]).toMatchObject({
      verdict: 'pass',
      axisErrorDeg: expect.closeTo(0.2, 4),
    });
  });
});

describe('reading the same file three ways', () => {
  const fixtures = {
    'stokes-qwp.csv': stokesQwp,
    'scan-hwp.csv': scanHwp,
    'direct-qwp.csv': directQwp,
    'stokes-errors.csv': stokesErrors,
    'quartz-multiwavelength.csv': quartzMultiwavelength,
  };

  it('gives the same result from text, bytes and a stream of small chunks', async () => {
    for (const [name, text] of Object.entries(fixtures)) {
      const bytes = bytesOf(text);
      const spec = { ...QWP, designWavelengthNm: name.startsWith('scan') ? 532 : 632.8 };
      const fromText = analyzeText(text, spec);
      expect(analyzeBuffer(bytes, spec)).toEqual(fromText);
      expect(await analyzeStream(chunksOf(bytes, 97), spec)).toEqual(fromText);
    }
  });

  it('reads a byte-order mark, CRLF and CR-only line ends in a stream as LF, wherever the chunks are cut', async () => {
    const expected = analyzeText(stokesQwp, QWP);
    expect(expected.metadata.instrument).toBe('BENCH-2');
    for (const text of [`\uFEFF${stokesQwp}`, stokesQwp.replaceAll('\n', '\r\n'), `\uFEFF${stokesQwp.replaceAll('\n', '\r')}`]) {
      for (const size of [1, 2, 7, 97]) expect(await analyzeStream(chunksOf(bytesOf(text), size), QWP)).toEqual(expected);
    }
  });

  // Text is parsed in slices of about a million characters (2^20); a stream parses each as the next begins.
  describe('a file of several slices', () => {
    const noise = seededNormal(6);
    const rows = plates(5, 4500).flatMap((plate) => stokesRows(plate, undefined, () => 0.001 * noise()));
    rows[100] = rows[100].replace(/,[^,]*$/, ',abc');
    rows[20_000] = rows[20_000].replace(/^[^,]*/, '');
    const big = file(STOKES_HEADER, rows, ['# instrument: BENCH-2', '# operator: QC-07']);
    const stream = (text: string) => chunksOf(bytesOf(text), 65_536);

    it('gives the same result from text and from a stream in chunks of 64 KiB', async () => {
      expect(big.length).toBeGreaterThan(1.5 * 2 ** 20);
      const fromText = analyzeText(big, QWP, { keepRows: true });
      expect(fromText.pieces).toHaveLength(4500);
      expect(fromText.errors.map((e) => e.line)).toEqual([104, 20_004]);
      expect(await analyzeStream(stream(big), QWP, { keepRows: true })).toEqual(fromText);
    });

    it('gives the same result when a quote left open in a later slice swallows the rest of the file', async () => {
      const quoted = [...rows];
      quoted[22_000] = quoted[22_000].replace(/,[^,]*$/, ',"0.1');
      const text = file(STOKES_HEADER, quoted, ['# instrument: BENCH-2']);
      const fromText = analyzeText(text, QWP);
      // csv-parse finds the quote unclosed at the end of the file (27,002 lines) and skips that one record.
      expect(fromText.errors.map((e) => e.line)).toEqual([103, 20_003, 27_002]);
      expect(fromText.errors[2].message).toMatch(/^the CSV could not be read here: Quote Not Closed: .* at line 27002$/);
      expect(fromText.pieces).toHaveLength(3667);
      expect(await analyzeStream(stream(text), QWP)).toEqual(fromText);
    });

    it('refuses a file over the row limit', async () => {
      const refusal = 'the file has more than 20000 data rows; split it into smaller files';
      expect(analyzeText(big, QWP, { maxRows: 20_000 })).toMatchObject({ fatal: refusal, pieces: [], rows: [] });
      expect(await analyzeStream(stream(big), QWP, { maxRows: 20_000 })).toMatchObject({ fatal: refusal, pieces: [], rows: [] });
    });
  });
});
