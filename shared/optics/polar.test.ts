import { describe, expect, it } from 'vitest';
import { jonesRotatedRetarder, jonesToMueller } from './jones.js';
import { mat4Multiply, muellerLinearPolarizer, muellerRetarder, type Mueller } from './mueller.js';
import { polarDecomposition } from './polar.js';
import { expectClose, seededUniform } from './testing.js';

/** Diattenuator with diattenuation vector D: [[1, Dᵀ], [D, m_D]] (Lu & Chipman, eq. for M_D). */
function diattenuator(d: [number, number, number]): Mueller {
  const size = Math.hypot(...d);
  const root = Math.sqrt(1 - size * size);
  const unit = d.map((x) => x / size);
  const m: Mueller = [1, ...d];
  for (let i = 0; i < 3; i++) {
    m.push(d[i], ...[0, 1, 2].map((j) => (i === j ? root : 0) + (1 - root) * unit[i] * unit[j]));
  }
  return m;
}

const unitVector = (v: number[]) => {
  const length = Math.hypot(...v);
  return v.map((x) => x / length) as [number, number, number];
};

describe('polar decomposition (S.-Y. Lu & R. A. Chipman, J. Opt. Soc. Am. A 13, 1106 (1996))', () => {
  it('recovers diattenuator, retarder and depolariser from their product', () => {
    const random = seededUniform(31, -1, 1);
    for (let i = 0; i < 20; i++) {
      const dVector = unitVector([random(), random(), random()]).map((x) => 0.3 * x) as [number, number, number];
      const axis = unitVector([random(), random(), random()]);
      const retardance = 0.2 + 2.7 * Math.abs(random());
      const depolarizer: Mueller = [1, 0, 0, 0, 0.03, 0.9, 0, 0, -0.02, 0, 0.85, 0, 0.01, 0, 0, 0.8];
      const m = mat4Multiply(mat4Multiply(depolarizer, muellerRetarder(retardance, axis)), diattenuator(dVector)).map((x) => 0.6 * x);
      const result = polarDecomposition(m);
      expect(result.ok).toBe(true);
      if (!result.ok) continue;
      const p = result.value;
      expect(p.diattenuation).toBeCloseTo(0.3, 12);
      expectClose(p.diattenuationVector, dVector, 1e-12);
      expect(p.retardance).toBeCloseTo(retardance, 10);
      expectClose(p.retarderAxis, axis, 1e-10);
      expectClose(p.depolarizerMatrix, [0.9, 0, 0, 0, 0.85, 0, 0, 0, 0.8], 1e-10);
      expectClose(p.polarizanceOfDepolarizer, [0.03, -0.02, 0.01], 1e-12);
      // Lu & Chipman: depolarisation power Δ = 1 - |tr(m_Δ)|/3.
      expect(p.depolarization).toBeCloseTo(1 - 2.55 / 3, 10);
    }
  });

  it('finds the retardance and fast axis of pure linear retarders over the whole range, including π', () => {
    for (const d of [1e-4, 0.3, Math.PI / 2, 2.9, Math.PI - 1e-6, Math.PI]) {
      for (const t of [0, 0.2, -0.7, 1.3]) {
        const result = polarDecomposition(jonesToMueller(jonesRotatedRetarder(d, t)));
        expect(result.ok).toBe(true);
        if (!result.ok) continue;
        expect(result.value.retardance).toBeCloseTo(d, 7);
        expect(result.value.diattenuation).toBeLessThan(1e-14);
        expect(result.value.depolarization).toBeLessThan(1e-12);
        const [a1, a2, a3] = result.value.retarderAxis;
        expect(a3).toBeCloseTo(0, 10);
        // The fast-axis direction (cos 2t, sin 2t); at d = π fast and slow are the same element.
        const along = a1 * Math.cos(2 * t) + a2 * Math.sin(2 * t);
        expect(d === Math.PI ? Math.abs(along) : along).toBeCloseTo(1, 6);
      }
    }
  });

  it('reports the circular component of an elliptical retarder', () => {
    const axis = unitVector([0.8, 0, 0.6]);
    const result = polarDecomposition(muellerRetarder(1, axis));
    expect(result.ok && result.value.retarderAxis[2]).toBeCloseTo(0.6, 12);
  });

  it('refuses a polariser, whose diattenuator cannot be inverted', () => {
    const result = polarDecomposition(muellerLinearPolarizer(0.4));
    expect(result).toEqual({ ok: false, reason: expect.stringContaining('that of a polariser') });
  });
});
