/**
 * Complex 2x2 Jones algebra in Phaselot's convention (readings.md):
 * Jones vectors (Ex, Ey) in the lab frame, angles from x toward y,
 * a retarder with its fast axis along x is W = diag(1, e^{i d}),
 * R(t) = [[cos t, sin t], [-sin t, cos t]] and an element rotated to t is R(-t) · W · R(t).
 */
import type { Mueller } from './mueller.js';
import type { Stokes } from './stokes.js';

export interface Complex {
  readonly re: number;
  readonly im: number;
}

export const complex = (re: number, im = 0): Complex => ({ re, im });
export const cAdd = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
export const cMul = (a: Complex, b: Complex): Complex => ({
  re: a.re * b.re - a.im * b.im,
  im: a.re * b.im + a.im * b.re,
});
export const cConj = (a: Complex): Complex => ({ re: a.re, im: -a.im });
export const cScale = (a: Complex, k: number): Complex => ({ re: a.re * k, im: a.im * k });
export const cAbs2 = (a: Complex): number => a.re * a.re + a.im * a.im;
/** e^{i phi} */
export const cExpI = (phi: number): Complex => ({ re: Math.cos(phi), im: Math.sin(phi) });

export type JonesVector = readonly [Complex, Complex];
/** Row-major [[j00, j01], [j10, j11]]. */
export type JonesMatrix = readonly [Complex, Complex, Complex, Complex];

export function jonesMultiply(a: JonesMatrix, b: JonesMatrix): JonesMatrix {
  return [
    cAdd(cMul(a[0], b[0]), cMul(a[1], b[2])),
    cAdd(cMul(a[0], b[1]), cMul(a[1], b[3])),
    cAdd(cMul(a[2], b[0]), cMul(a[3], b[2])),
    cAdd(cMul(a[2], b[1]), cMul(a[3], b[3])),
  ];
}

export function jonesApply(j: JonesMatrix, v: JonesVector): JonesVector {
  return [cAdd(cMul(j[0], v[0]), cMul(j[1], v[1])), cAdd(cMul(j[2], v[0]), cMul(j[3], v[1]))];
}

/** Conjugate transpose. */
export function jonesAdjoint(j: JonesMatrix): JonesMatrix {
  return [cConj(j[0]), cConj(j[2]), cConj(j[1]), cConj(j[3])];
}

/** R(t) = [[cos t, sin t], [-sin t, cos t]]. */
export function jonesRotation(t: number): JonesMatrix {
  const c = Math.cos(t);
  const s = Math.sin(t);
  return [complex(c), complex(s), complex(-s), complex(c)];
}

/** W = diag(1, e^{i d}): retardance d (rad), fast axis along x, global phase dropped. */
export function jonesRetarder(d: number): JonesMatrix {
  return [complex(1), complex(0), complex(0), cExpI(d)];
}

/** J(t) = R(-t) · W · R(t): retardance d with its fast axis at t (rad). */
export function jonesRotatedRetarder(d: number, t: number): JonesMatrix {
  return jonesMultiply(jonesMultiply(jonesRotation(-t), jonesRetarder(d)), jonesRotation(t));
}

/** Ideal linear polariser with its transmission axis at t (rad). */
export function jonesLinearPolarizer(t: number): JonesMatrix {
  const c = Math.cos(t);
  const s = Math.sin(t);
  return [complex(c * c), complex(c * s), complex(c * s), complex(s * s)];
}

/** Unit-intensity linear polarisation at angle a (rad). */
export function jonesLinear(a: number): JonesVector {
  return [complex(Math.cos(a)), complex(Math.sin(a))];
}

/** S0 = |Ex|²+|Ey|², S1 = |Ex|²-|Ey|², S2 = 2 Re(Ex* Ey), S3 = 2 Im(Ex* Ey). */
export function jonesToStokes(v: JonesVector): Stokes {
  const ix = cAbs2(v[0]);
  const iy = cAbs2(v[1]);
  const cross = cMul(cConj(v[0]), v[1]);
  return [ix + iy, ix - iy, 2 * cross.re, 2 * cross.im];
}

/**
 * The Pauli matrices that give our Stokes parameters as S_k = E† σ_k E,
 * ordered (σ0, σ1, σ2, σ3) for (S0, S1, S2, S3).
 */
export const STOKES_PAULI: readonly JonesMatrix[] = [
  [complex(1), complex(0), complex(0), complex(1)],
  [complex(1), complex(0), complex(0), complex(-1)],
  [complex(0), complex(1), complex(1), complex(0)],
  [complex(0), complex(0, -1), complex(0, 1), complex(0)],
];

const trace = (j: JonesMatrix): Complex => cAdd(j[0], j[3]);

/**
 * Mueller matrix of a Jones matrix in our Stokes convention:
 * m_ij = ½ tr(σ_j J† σ_i J), so that S'_i = Σ_j m_ij S_j.
 */
export function jonesToMueller(j: JonesMatrix): Mueller {
  const adjoint = jonesAdjoint(j);
  const m: number[] = new Array(16);
  for (let i = 0; i < 4; i++) {
    const sandwich = jonesMultiply(jonesMultiply(adjoint, STOKES_PAULI[i]), j);
    for (let k = 0; k < 4; k++) {
      m[4 * i + k] = 0.5 * trace(jonesMultiply(STOKES_PAULI[k], sandwich)).re;
    }
  }
  return m;
}
