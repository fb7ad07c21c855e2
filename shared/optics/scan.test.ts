import { describe, expect, it } from 'vitest';
import { fitScan, type ScanReading } from './scan.js';
import { scanRows } from './synthetic.js';
import { seededNormal } from './testing.js';
import { DEG } from './units.js';

const angles = Array.from({ length: 18 }, (_, i) => i * 10);

function readings(rows: string[]): ScanReading[] {
  return rows.map((row) => {
    const [, , analyzer, angle, intensity] = row.split(',');
    return { analyzer: analyzer as ScanReading['analyzer'], angle: Number(angle) * DEG, intensity: Number(intensity) };
  });
}

const plate = (retardanceWaves: number, fastAxisDeg: number) => ({ serial: 'QW-0001', wavelengthNm: 632.8, retardanceWaves, fastAxisDeg });

describe('rotating-plate fit', () => {
  // Born & Wolf (from memory): crossed I = I0 sin²(2(t + e)) sin²(d/2); the synthetic readings come
  // from Jones matrices, so the fit is checked against the law, not against itself.
  it('recovers retardance and axis error from crossed readings and an open reference', () => {
    for (const [waves, axis] of [
      [0.25, 0.3],
      [0.4993, -1.2],
      [0.1, 20],
      [0.37, -33],
    ]) {
      const fit = fitScan(readings(scanRows(plate(waves, axis), angles, { i0: 850 })));
      expect(fit.ok).toBe(true);
      if (!fit.ok) continue;
      expect(fit.value.retardance / (2 * Math.PI)).toBeCloseTo(waves, 6);
      expect(fit.value.axisError / DEG).toBeCloseTo(axis, 4);
      expect(fit.value.referenceIntensity).toBeCloseTo(850, 4);
      expect(fit.value.modulationRatio).toBeCloseTo(1, 5);
    }
  });

  it('takes I0 from crossed plus parallel at the same angles when there is no open row', () => {
    const fit = fitScan(readings(scanRows(plate(0.25, 0.4), angles, { analyzers: ['crossed', 'parallel'], open: false, i0: 2 })));
    expect(fit.ok && fit.value.referenceIntensity).toBeCloseTo(2, 5);
    expect(fit.ok && fit.value.retardance / (2 * Math.PI)).toBeCloseTo(0.25, 6);
  });

  it('cannot tell a fast axis from a slow one: the axis comes out modulo 90°', () => {
    const fit = fitScan(readings(scanRows(plate(0.25, 90.4), angles)));
    expect(fit.ok && fit.value.axisError / DEG).toBeCloseTo(0.4, 4);
  });

  it('stays within 0.001 wave and 0.1° with 0.2 % intensity noise (seeded)', () => {
    const noise = seededNormal(41);
    for (let i = 0; i < 10; i++) {
      const fit = fitScan(readings(scanRows(plate(0.25, 0.3), angles, { analyzers: ['crossed', 'parallel'] }, () => 0.002 * noise())));
      expect(fit.ok).toBe(true);
      if (!fit.ok) continue;
      expect(Math.abs(fit.value.retardance / (2 * Math.PI) - 0.25)).toBeLessThan(0.001);
      expect(Math.abs(fit.value.axisError / DEG - 0.3)).toBeLessThan(0.1);
    }
  });

  it('says what is missing', () => {
    const rows = readings(scanRows(plate(0.25, 0), angles, { open: false }));
    expect(fitScan(rows)).toEqual({ ok: false, reason: expect.stringContaining('no reference intensity') });
    const twoAngles = readings(scanRows(plate(0.25, 0), [0, 90, 10]));
    expect(fitScan(twoAngles)).toEqual({ ok: false, reason: expect.stringContaining('too few stage angles') });
  });

  it('refuses crossed readings brighter than the reference', () => {
    const rows = readings(scanRows(plate(0.5, 0), angles)).map((r) => (r.analyzer === 'open' ? { ...r, intensity: 0.5 } : r));
    expect(fitScan(rows)).toEqual({ ok: false, reason: expect.stringContaining('not those of a retarder') });
  });
});
