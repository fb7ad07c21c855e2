import { complex as mComplex, multiply, type Complex as MComplex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  cAbs2,
  jonesApply,
  jonesLinear,
  jonesLinearPolarizer,
  jonesMultiply,
  jonesRetarder,
  jonesRotatedRetarder,
  jonesRotation,
  jonesToMueller,
  jonesToStokes,
  type Complex,
  type JonesMatrix,
} from './jones.js';
import { mat4Apply, muellerLinearRetarder } from './mueller.js';
import { expectClose, seededUniform } from './testing.js';
import { DEG } from './units.js';

const flatten = (j: JonesMatrix) => j.flatMap((z) => [z.re, z.im]);
const toMath = (j: JonesMatrix) => [
  [mComplex(j[0].re, j[0].im), mComplex(j[1].re, j[1].im)],
  [mComplex(j[2].re, j[2].im), mComplex(j[3].re, j[3].im)],
];
const fromMath = (m: MComplex[][]): number[] => m.flat().flatMap((z) => [z.re, z.im]);
const diag = (a: Complex, b: Complex): JonesMatrix => [a, { re: 0, im: 0 }, { re: 0, im: 0 }, b];

describe('Jones matrices of retarders', () => {
  // Common practice; Hecht, Optics, 5th ed., ch. 8: half-wave diag(1, -1), quarter-wave diag(1, i).
  it('gives the half-wave and quarter-wave plates with the fast axis along x', () => {
    expectClose(flatten(jonesRetarder(Math.PI)), flatten(diag({ re: 1, im: 0 }, { re: -1, im: 0 })), 1e-15);
    expectClose(flatten(jonesRetarder(Math.PI / 2)), flatten(diag({ re: 1, im: 0 }, { re: 0, im: 1 })), 1e-15);
  });

  // R. C. Jones, J. Opt. Soc. Am. 31, 488 (1941): a rotated element is R(-t) · W · R(t).
  it('builds the rotated element as R(-t) W R(t), checked against mathjs', () => {
    const d = 1.234;
    const t = 0.4;
    const expected = multiply(multiply(toMath(jonesRotation(-t)), toMath(jonesRetarder(d))), toMath(jonesRotation(t))) as unknown as MComplex[][];
    expectClose(flatten(jonesRotatedRetarder(d, t)), fromMath(expected), 1e-15);
  });

  // Common practice: a retarder is lossless, its Jones matrix unitary (J† J = I).
  it('is unitary for any retardance and axis', () => {
    const random = seededUniform(11, -Math.PI, Math.PI);
    for (let i = 0; i < 20; i++) {
      const j = jonesRotatedRetarder(random(), random());
      const adjoint: JonesMatrix = [
        { re: j[0].re, im: -j[0].im },
        { re: j[2].re, im: -j[2].im },
        { re: j[1].re, im: -j[1].im },
        { re: j[3].re, im: -j[3].im },
      ];
      expectClose(flatten(jonesMultiply(adjoint, j)), [1, 0, 0, 0, 0, 0, 1, 0], 1e-14);
    }
  });

  // Hecht ch. 8: a half-wave plate at t turns linear light at a into linear light at 2t - a.
  it('turns linear light at a into 2t - a through a half-wave plate at t', () => {
    for (const [t, a] of [
      [10, 0],
      [22.5, 0],
      [30, 75],
      [-40, 12],
      [100, 33],
    ]) {
      const out = jonesToStokes(jonesApply(jonesRotatedRetarder(Math.PI, t * DEG), jonesLinear(a * DEG)));
      const expected = jonesToStokes(jonesLinear((2 * t - a) * DEG));
      expectClose(out, expected, 1e-14);
    }
  });

  // Hecht ch. 8: a quarter-wave plate at 45° turns linear (horizontal) light into circular light.
  it('makes circular light from horizontal light with a quarter-wave plate at 45°', () => {
    const out = jonesToStokes(jonesApply(jonesRotatedRetarder(Math.PI / 2, 45 * DEG), jonesLinear(0)));
    expect(Math.abs(out[3])).toBeCloseTo(1, 14);
    expectClose(out.slice(0, 3), [1, 0, 0], 1e-14);
  });

  // readings.md, the operational check of our sign: QWP fast axis along x, +45° in, S = (1, 0, 0, +1) out.
  it('turns +45° light into S = (1, 0, 0, +1) with a quarter-wave plate along x', () => {
    const out = jonesToStokes(jonesApply(jonesRetarder(Math.PI / 2), jonesLinear(45 * DEG)));
    expectClose(out, [1, 0, 0, 1], 1e-15);
  });

  // Common practice: a lossless element keeps the intensity S0 of any input.
  it('keeps S0 for any polarisation and any retarder', () => {
    const random = seededUniform(12, -3, 3);
    for (let i = 0; i < 20; i++) {
      const input = [
        { re: random(), im: random() },
        { re: random(), im: random() },
      ] as const;
      const before = jonesToStokes(input)[0];
      const after = jonesToStokes(jonesApply(jonesRotatedRetarder(random(), random()), input))[0];
      expect(after).toBeCloseTo(before, 12);
    }
  });

  // Born & Wolf, Principles of Optics, crystal optics chapter (from memory): between crossed
  // polarisers, I = I0 sin²(2t) sin²(d/2).
  it('follows the crossed-polariser law', () => {
    const random = seededUniform(13, 0, Math.PI);
    for (let i = 0; i < 20; i++) {
      const d = random();
      const t = random();
      const analyser = jonesLinearPolarizer(Math.PI / 2);
      const out = jonesApply(jonesMultiply(analyser, jonesRotatedRetarder(d, t)), jonesLinear(0));
      expect(cAbs2(out[0]) + cAbs2(out[1])).toBeCloseTo(Math.sin(2 * t) ** 2 * Math.sin(d / 2) ** 2, 14);
    }
  });

  it('multiplies random complex 2x2 matrices as mathjs does', () => {
    const random = seededUniform(14, -2, 2);
    const randomMatrix = (): JonesMatrix => [0, 1, 2, 3].map(() => ({ re: random(), im: random() })) as unknown as JonesMatrix;
    for (let i = 0; i < 25; i++) {
      const a = randomMatrix();
      const b = randomMatrix();
      const expected = multiply(toMath(a), toMath(b)) as unknown as MComplex[][];
      expectClose(flatten(jonesMultiply(a, b)), fromMath(expected), 1e-13);
    }
  });

  it('converts products of Jones matrices into products of Mueller matrices', () => {
    // Goldstein, Polarized Light, 3rd ed.: the Mueller matrix of a cascade is the product of the
    // Mueller matrices; ours follow the convention of readings.md.
    const a = jonesRotatedRetarder(0.7, 0.2);
    const b = jonesRotatedRetarder(2.1, -0.9);
    const input = [1, 0.3, -0.4, 0.5] as const;
    const viaJones = mat4Apply(jonesToMueller(jonesMultiply(a, b)), input);
    const viaMueller = mat4Apply(jonesToMueller(a), mat4Apply(jonesToMueller(b), input));
    expectClose(viaJones, viaMueller, 1e-14);
  });

  // readings.md: a pure retarder rotates (S1, S2, S3) right-handedly by d about the Stokes
  // direction of its fast axis, (cos 2t, sin 2t, 0) for a linear one.
  it('gives Mueller matrices that rotate the Poincaré sphere about the fast axis', () => {
    const random = seededUniform(15, -Math.PI, Math.PI);
    for (let i = 0; i < 20; i++) {
      const d = Math.abs(random());
      const t = random();
      expectClose(jonesToMueller(jonesRotatedRetarder(d, t)), muellerLinearRetarder(d, t), 1e-14);
    }
  });

  // Common practice: the global phase dropped from W changes no Stokes vector.
  it('gives the same Mueller matrix for a Jones matrix times a global phase', () => {
    const j = jonesRotatedRetarder(1, 0.3);
    const shifted = j.map((z) => ({
      re: z.re * Math.cos(0.8) - z.im * Math.sin(0.8),
      im: z.re * Math.sin(0.8) + z.im * Math.cos(0.8),
    })) as unknown as JonesMatrix;
    expectClose(jonesToMueller(shifted), jonesToMueller(j), 1e-14);
  });
});
