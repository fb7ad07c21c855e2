import { describe, expect, it } from 'vitest';
import { fromWaves, modulo, parseRetardanceUnit, toWaves, wavesToNm, wrapDeg, wrapWaves } from './units.js';

describe('retardance units', () => {
  // Common practice: one wave is λ in nm, 360° or 2π rad.
  it('converts a quarter wave at 632.8 nm into nm, degrees and radians and back', () => {
    expect(wavesToNm(0.25, 632.8)).toBeCloseTo(158.2, 12);
    expect(fromWaves(0.25, 'deg', 632.8)).toBeCloseTo(90, 12);
    expect(fromWaves(0.25, 'rad', 632.8)).toBeCloseTo(Math.PI / 2, 12);
    for (const unit of ['nm', 'waves', 'deg', 'rad'] as const) {
      expect(toWaves(fromWaves(0.2493, unit, 532), unit, 532)).toBeCloseTo(0.2493, 12);
    }
  });

  it('reads unit names in any case and refuses others', () => {
    expect(parseRetardanceUnit(' NM ')).toBe('nm');
    expect(parseRetardanceUnit('Waves')).toBe('waves');
    expect(parseRetardanceUnit('microns')).toBeNull();
  });
});

describe('wrapping', () => {
  it('wraps axis angles into (-90°, 90°] and (-45°, 45°]', () => {
    expect(wrapDeg(90, 90)).toBe(90);
    expect(wrapDeg(-90, 90)).toBe(90);
    expect(wrapDeg(179.7, 90)).toBeCloseTo(-0.3, 12);
    expect(wrapDeg(-45, 45)).toBe(45);
    expect(wrapDeg(50, 45)).toBeCloseTo(-40, 12);
  });

  it('gives the signed distance between retardances modulo one wave', () => {
    expect(wrapWaves(0.998 - 0)).toBeCloseTo(-0.002, 12);
    expect(wrapWaves(0.2493 - 0.25)).toBeCloseTo(-0.0007, 12);
    expect(wrapWaves(0.5)).toBe(-0.5);
    expect(modulo(-0.25, 1)).toBe(0.75);
  });
});
