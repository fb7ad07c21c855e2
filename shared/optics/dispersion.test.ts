import { describe, expect, it } from 'vitest';
import { MATERIALS, estimateOrder, type FractionAtWavelength } from './dispersion.js';
import { seededNormal } from './testing.js';
import { modulo } from './units.js';

const quartz = MATERIALS.quartz!;
const mgf2 = MATERIALS.mgf2!;
const WAVELENGTHS = [532, 632.8, 780];

/** Fractions of a plate of thickness giving `totalAtDesign` waves at 632.8 nm. */
function fractions(material: typeof quartz, totalAtDesign: number, noise = () => 0): FractionAtWavelength[] {
  const thicknessMm = (totalAtDesign * 632.8e-6) / material.birefringence(632.8);
  return WAVELENGTHS.map((nm) => ({
    wavelengthNm: nm,
    waves: modulo((thicknessMm * material.birefringence(nm)) / (nm * 1e-6) + noise(), 1),
    folded: false,
  }));
}

describe('birefringence dispersion', () => {
  // G. Ghosh, Opt. Commun. 163, 95 (1999): quartz n_e - n_o about 0.0091 at 632.8 nm (from memory, ±0.0002).
  it('gives the birefringence of crystal quartz at 632.8 nm', () => {
    expect(Math.abs(quartz.birefringence(632.8) - 0.0091)).toBeLessThan(0.0002);
  });

  // M. J. Dodge, Appl. Opt. 23, 1980 (1984): MgF2 n_e - n_o about 0.0118 at 632.8 nm (from memory, ±0.0003).
  it('gives the birefringence of MgF2 at 632.8 nm', () => {
    expect(Math.abs(mgf2.birefringence(632.8) - 0.0118)).toBeLessThan(0.0003);
  });

  // Common practice: both crystals are positive uniaxial with normal dispersion of the birefringence.
  it('is positive and falls with wavelength across the visible', () => {
    for (const material of [quartz, mgf2]) {
      expect(material.birefringence(400)).toBeGreaterThan(material.birefringence(700));
      expect(material.birefringence(700)).toBeGreaterThan(0);
    }
  });
});

describe('order and thickness from several wavelengths', () => {
  it('finds the order and thickness of zero-order and multi-order quartz plates', () => {
    for (const [total, order] of [
      [0.25, 0],
      [6.25, 6],
      [12.25, 12],
    ]) {
      const result = estimateOrder(fractions(quartz, total), 'quartz', 632.8, 0.25);
      expect(result.ok).toBe(true);
      if (!result.ok) continue;
      expect(result.value.order).toBe(order);
      expect(result.value.ambiguous).toBe(false);
      expect(result.value.totalWaves).toBeCloseTo(total, 6);
      expect(result.value.thicknessMm).toBeCloseTo((total * 632.8e-6) / quartz.birefringence(632.8), 8);
    }
  });

  it('finds the order of an MgF2 plate and of one measured along its slow axis', () => {
    const mgf2Plate = estimateOrder(fractions(mgf2, 4.25), 'mgf2', 632.8, 0.25);
    expect(mgf2Plate.ok && mgf2Plate.value.order).toBe(4);
    const alongSlow = fractions(quartz, 6.25).map((p) => ({ ...p, waves: modulo(1 - p.waves, 1) }));
    const slow = estimateOrder(alongSlow, 'quartz', 632.8, 0.75);
    expect(slow.ok && slow.value.thicknessMm).toBeCloseTo((6.25 * 632.8e-6) / quartz.birefringence(632.8), 8);
  });

  it('keeps the order with 0.001 wave of noise (seeded)', () => {
    const noise = seededNormal(51);
    for (let i = 0; i < 10; i++) {
      const result = estimateOrder(
        fractions(quartz, 6.25, () => 0.001 * noise()),
        'quartz',
        632.8,
        0.25,
      );
      expect(result.ok && result.value.order).toBe(6);
    }
  });

  it('calls the order ambiguous when two wavelengths cannot separate the candidates', () => {
    const two = fractions(quartz, 6.25).filter((p) => p.wavelengthNm !== 532);
    const result = estimateOrder(two, 'quartz', 632.8, 0.25);
    expect(result.ok && result.value.ambiguous).toBe(true);
  });

  it('says why it cannot estimate', () => {
    expect(estimateOrder(fractions(quartz, 0.25), 'polymer', 632.8, 0.25)).toEqual({
      ok: false,
      reason: 'no birefringence dispersion is known for polymer',
    });
    expect(estimateOrder(fractions(quartz, 0.25).slice(0, 1), 'quartz', 632.8, 0.25)).toEqual({
      ok: false,
      reason: 'the order needs readings at two or more wavelengths',
    });
    const scattered = fractions(quartz, 0.25).map((p, i) => ({ ...p, waves: [0.1, 0.6, 0.3][i] }));
    expect(estimateOrder(scattered, 'quartz', 632.8, 0.25)).toEqual({ ok: false, reason: expect.stringContaining('do not fit one plate') });
  });
});
