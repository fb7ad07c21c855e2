import { eigs, inv, multiply, pinv } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { isPositiveDefiniteShifted, symmetric3x3Eigenvalues, symmetricEigenvalues } from './eigen.js';
import { jonesRotatedRetarder, jonesToMueller } from './jones.js';
import {
  coherencyEigenvalues,
  coherencyViolation,
  depolarizationIndex,
  mat4Apply,
  mat4Inverse,
  mat4Multiply,
  mat4Transpose,
  muellerFromMeasurements,
  muellerLinearPolarizer,
  muellerLinearRetarder,
  muellerRetarder,
  type Mueller,
} from './mueller.js';
import type { Stokes } from './stokes.js';
import { expectClose, seededNormal, seededUniform } from './testing.js';

const rows = (m: Mueller) => [0, 1, 2, 3].map((i) => m.slice(4 * i, 4 * i + 4));
const randomMatrix = (random: () => number, n = 16) => Array.from({ length: n }, random);
const symmetric = (random: () => number, n: number) => {
  const a = randomMatrix(random, n * n);
  return a.map((_, e) => (a[e] + a[(e % n) * n + Math.floor(e / n)]) / 2);
};
const sortedValues = (matrix: number[][]) => (eigs(matrix).values as unknown as number[]).map(Number).sort((x, y) => x - y);

describe('real 4x4 algebra against mathjs', () => {
  const random = seededUniform(21, -1, 1);

  it('multiplies, transposes and inverts like mathjs', () => {
    for (let i = 0; i < 25; i++) {
      const a = randomMatrix(random);
      const b = randomMatrix(random);
      expectClose(mat4Multiply(a, b), (multiply(rows(a), rows(b)) as number[][]).flat(), 1e-14);
      expectClose(
        mat4Transpose(a),
        rows(a)[0]
          .map((_, j) => rows(a).map((r) => r[j]))
          .flat(),
        0,
      );
      expectClose(mat4Inverse(a)!, (inv(rows(a)) as number[][]).flat(), 1e-9);
    }
  });

  it('reports a singular matrix as having no inverse', () => {
    const a = randomMatrix(random);
    const singular = [...a.slice(0, 12), ...a.slice(0, 4)];
    expect(mat4Inverse(singular)).toBeNull();
  });

  it('fits a Mueller matrix by least squares as the pseudo-inverse of mathjs does', () => {
    const noise = seededNormal(22);
    const truth = randomMatrix(random);
    const inputs: Stokes[] = Array.from({ length: 9 }, () => [1, random(), random(), random()]);
    const outputs: Stokes[] = inputs.map((s) => mat4Apply(truth, s).map((x) => x + 0.01 * noise()) as unknown as Stokes);
    const fit = muellerFromMeasurements(inputs, outputs.flat());
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    const x = [0, 1, 2, 3].map((i) => inputs.map((s) => s[i]));
    const y = [0, 1, 2, 3].map((i) => outputs.map((s) => s[i]));
    expectClose(fit.mueller, (multiply(y, pinv(x)) as number[][]).flat(), 1e-10);
    expect(fit.residualRms).toBeGreaterThan(0.002);
    expect(fit.residualRms).toBeLessThan(0.02);
  });

  it('refuses inputs that do not span the Stokes space', () => {
    const linearOnly: Stokes[] = [
      [1, 1, 0, 0],
      [1, -1, 0, 0],
      [1, 0, 1, 0],
      [1, 0, -1, 0],
    ];
    const fit = muellerFromMeasurements(linearOnly, linearOnly.flat());
    expect(fit).toEqual({ ok: false, reason: expect.stringContaining('do not span the Stokes space') });
    expect(muellerFromMeasurements(linearOnly.slice(0, 3), linearOnly.slice(0, 3).flat())).toEqual({
      ok: false,
      reason: 'too few inputs: 3 input states, at least 4 are needed',
    });
  });
});

describe('Mueller matrices of retarders', () => {
  // Goldstein, Polarized Light, 3rd ed.: a quarter-wave plate with its fast axis along x (our signs,
  // readings.md) maps +45° light to right circular S3 = +1, and R to -45°.
  it('gives the quarter-wave plate along x', () => {
    const qwp = muellerLinearRetarder(Math.PI / 2, 0);
    expectClose(mat4Apply(qwp, [1, 0, 1, 0]), [1, 0, 0, 1], 1e-15);
    expectClose(mat4Apply(qwp, [1, 0, 0, 1]), [1, 0, -1, 0], 1e-15);
    expectClose(mat4Apply(qwp, [1, 1, 0, 0]), [1, 1, 0, 0], 1e-15);
  });

  it('is an orthogonal rotation that keeps the fast eigenpolarisation', () => {
    const random = seededUniform(23, -1, 1);
    for (let i = 0; i < 10; i++) {
      const axis = [random(), random(), random()];
      const length = Math.hypot(...axis);
      const unit = axis.map((a) => a / length) as [number, number, number];
      const m = muellerRetarder(2 * Math.PI * Math.abs(random()), unit);
      expectClose(mat4Multiply(m, mat4Transpose(m)), [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1], 1e-14);
      expectClose(mat4Apply(m, [1, ...unit]), [1, ...unit], 1e-14);
    }
  });

  // Goldstein, 3rd ed.: ideal linear polariser at t, ½[[1, c, s, 0], [c, c², cs, 0], [s, cs, s², 0], 0].
  it('gives the ideal linear polariser', () => {
    const t = 0.3;
    const c = Math.cos(2 * t);
    const s = Math.sin(2 * t);
    expectClose(
      muellerLinearPolarizer(t),
      [1, c, s, 0, c, c * c, c * s, 0, s, c * s, s * s, 0, 0, 0, 0, 0].map((x) => x / 2),
      1e-15,
    );
  });
});

describe('coherency matrix and depolarisation', () => {
  // Cloude: the coherency matrix of a pure (Jones) element has rank 1 and trace m00.
  it('has one eigenvalue m00 and three zeros for a pure element', () => {
    const m = jonesToMueller(jonesRotatedRetarder(1.1, 0.4)).map((x) => 0.8 * x);
    expectClose(coherencyEigenvalues(m), [0, 0, 0, 0.8], 1e-12);
    expect(coherencyViolation(m, 0.02)).toBeNull();
    // Gil & Bernabeu: the depolarisation index of a pure element is 1, of the ideal depolariser 0.
    expect(depolarizationIndex(m)).toBeCloseTo(1, 12);
    expect(depolarizationIndex([1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0])).toBe(0);
  });

  it('has four equal eigenvalues for the ideal depolariser', () => {
    expectClose(coherencyEigenvalues([2, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]), [0.5, 0.5, 0.5, 0.5], 1e-14);
  });

  it('finds a negative eigenvalue in a matrix no element can have', () => {
    // A "retarder" that turns S1 up by 10 %: beyond any physical element.
    const m = muellerLinearRetarder(1, 0.2);
    m[5] *= 1.1;
    const lowest = coherencyViolation(m, 0.02);
    expect(lowest).not.toBeNull();
    expect(lowest!).toBeLessThan(-0.02);
    expect(lowest!).toBeCloseTo(coherencyEigenvalues(m)[0], 12);
  });
});

describe('small symmetric eigenvalue solvers against mathjs', () => {
  const random = seededUniform(24, -1, 1);

  it('match mathjs for random symmetric 3x3 and 8x8 matrices', () => {
    for (let i = 0; i < 20; i++) {
      const a3 = symmetric(random, 3);
      const expected3 = sortedValues(rows3(a3));
      expectClose(symmetric3x3Eigenvalues(a3), expected3, 1e-10);
      expectClose(symmetricEigenvalues(a3, 3), expected3, 1e-12);
      const a8 = symmetric(random, 8);
      const matrix8 = Array.from({ length: 8 }, (_, r) => a8.slice(8 * r, 8 * r + 8));
      expectClose(symmetricEigenvalues(a8, 8), sortedValues(matrix8), 1e-12);
    }
  });

  it('handles repeated and diagonal cases in closed form', () => {
    expectClose(symmetric3x3Eigenvalues([2, 0, 0, 0, 2, 0, 0, 0, 2]), [2, 2, 2], 0);
    expectClose(symmetric3x3Eigenvalues([3, 0, 0, 0, 1, 0, 0, 0, 2]), [1, 2, 3], 0);
  });

  it('says a shifted matrix is positive definite exactly when its lowest eigenvalue is above -shift', () => {
    for (let i = 0; i < 40; i++) {
      const a8 = symmetric(random, 8);
      const lowest = symmetricEigenvalues(a8, 8)[0];
      expect(isPositiveDefiniteShifted(a8, 8, -lowest + 1e-9)).toBe(true);
      expect(isPositiveDefiniteShifted(a8, 8, -lowest - 1e-9)).toBe(false);
    }
  });
});

function rows3(a: number[]) {
  return [a.slice(0, 3), a.slice(3, 6), a.slice(6, 9)];
}
