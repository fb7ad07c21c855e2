/**
 * Polar decomposition of a Mueller matrix, M = M_Δ · M_R · M_D
 * (S.-Y. Lu & R. A. Chipman, J. Opt. Soc. Am. A 13, 1106 (1996)):
 * a diattenuator M_D, then a retarder M_R, then a depolariser M_Δ.
 */
import { symmetric3x3Eigenvalues } from './eigen.js';
import type { Mueller } from './mueller.js';

type Vec3 = [number, number, number];
/** Row-major 3x3. */
type Mat3 = number[];

/** Length of a 3-vector (Math.hypot is several times slower on this hot path). */
const norm3 = (v: readonly number[]) => Math.sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2]);

function mat3Multiply(a: Mat3, b: Mat3): Mat3 {
  const out: Mat3 = new Array(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) out[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
  }
  return out;
}

function mat3Determinant(a: Mat3): number {
  return a[0] * (a[4] * a[8] - a[5] * a[7]) - a[1] * (a[3] * a[8] - a[5] * a[6]) + a[2] * (a[3] * a[7] - a[4] * a[6]);
}

function mat3Inverse(a: Mat3): Mat3 | null {
  const det = mat3Determinant(a);
  if (!Number.isFinite(det) || Math.abs(det) < 1e-14) return null;
  const k = 1 / det;
  return [
    (a[4] * a[8] - a[5] * a[7]) * k,
    (a[2] * a[7] - a[1] * a[8]) * k,
    (a[1] * a[5] - a[2] * a[4]) * k,
    (a[5] * a[6] - a[3] * a[8]) * k,
    (a[0] * a[8] - a[2] * a[6]) * k,
    (a[2] * a[3] - a[0] * a[5]) * k,
    (a[3] * a[7] - a[4] * a[6]) * k,
    (a[1] * a[6] - a[0] * a[7]) * k,
    (a[0] * a[4] - a[1] * a[3]) * k,
  ];
}

const mat3MultiplyTransposed = (a: Mat3): Mat3 => {
  const out: Mat3 = new Array(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) out[3 * i + j] = a[3 * i] * a[3 * j] + a[3 * i + 1] * a[3 * j + 1] + a[3 * i + 2] * a[3 * j + 2];
  }
  return out;
};

export interface PolarDecomposition {
  /** |D|, from the first row of the normalised matrix. */
  diattenuation: number;
  diattenuationVector: Vec3;
  /** Total retardance in [0, π] (rad). */
  retardance: number;
  /**
   * Unit Stokes direction of the fast eigenpolarisation of the retarder; M_R rotates (S1, S2, S3)
   * right-handedly by `retardance` about it. Components (H, 45°, circular) as in Lu & Chipman.
   */
  retarderAxis: Vec3;
  /** Lower-right 3x3 of M_R, row-major. */
  retarderMatrix: Mat3;
  /** Depolarisation power Δ = 1 - |tr(m_Δ)|/3: 0 for a non-depolarising element. */
  depolarization: number;
  /** Lower-right 3x3 of M_Δ, row-major. */
  depolarizerMatrix: Mat3;
  polarizanceOfDepolarizer: Vec3;
}

export type PolarResult = { ok: true; value: PolarDecomposition } | { ok: false; reason: string };

/** Above this diattenuation the diattenuator is too close to a polariser to be inverted reliably. */
const MAX_DIATTENUATION = 0.999;

export function polarDecomposition(mueller: Readonly<Mueller>): PolarResult {
  const m00 = mueller[0];
  if (!(m00 > 0)) return { ok: false, reason: 'the Mueller matrix has m00 <= 0' };
  // The parts of the matrix normalised by m00, read straight from it: this runs once per piece of large files.
  const dVector: Vec3 = [mueller[1] / m00, mueller[2] / m00, mueller[3] / m00];
  const pVector: Vec3 = [mueller[4] / m00, mueller[8] / m00, mueller[12] / m00];
  const lower: Mat3 = [
    mueller[5] / m00,
    mueller[6] / m00,
    mueller[7] / m00,
    mueller[9] / m00,
    mueller[10] / m00,
    mueller[11] / m00,
    mueller[13] / m00,
    mueller[14] / m00,
    mueller[15] / m00,
  ];
  const diattenuation = norm3(dVector);
  if (diattenuation > MAX_DIATTENUATION) {
    return { ok: false, reason: `diattenuation ${diattenuation.toFixed(4)} is that of a polariser, not a retarder` };
  }

  // M = M' · M_D with M' = [[1, 0], [P_Δ, m']] and M_D = [[1, Dᵀ], [D, m_D]], m_D·D = D, gives
  // P_Δ = (P - m·D)/(1 - D²) and m' = (m - P_Δ·Dᵀ)·m_D⁻¹; m_D⁻¹ is 1 along D̂ and 1/sqrt(1 - D²) across it.
  const root = Math.sqrt(1 - diattenuation * diattenuation);
  const unit: Vec3 = diattenuation > 0 ? [dVector[0] / diattenuation, dVector[1] / diattenuation, dVector[2] / diattenuation] : [0, 0, 0];
  const across = 1 / root;
  const mDInverse: Mat3 = new Array(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) mDInverse[3 * i + j] = (i === j ? across : 0) + (1 - across) * unit[i] * unit[j];
  }
  const polarizanceOfDepolarizer: Vec3 = [0, 0, 0];
  for (let i = 0; i < 3; i++) {
    polarizanceOfDepolarizer[i] =
      (pVector[i] - (lower[3 * i] * dVector[0] + lower[3 * i + 1] * dVector[1] + lower[3 * i + 2] * dVector[2])) / (1 - diattenuation * diattenuation);
  }
  const shifted: Mat3 = new Array(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) shifted[3 * i + j] = lower[3 * i + j] - polarizanceOfDepolarizer[i] * dVector[j];
  }
  const mPrime = mat3Multiply(shifted, mDInverse);

  const product = mat3MultiplyTransposed(mPrime);
  const eigenvalues = symmetric3x3Eigenvalues(product);
  const l1 = Math.sqrt(Math.max(0, eigenvalues[0]));
  const l2 = Math.sqrt(Math.max(0, eigenvalues[1]));
  const l3 = Math.sqrt(Math.max(0, eigenvalues[2]));
  const determinant = mat3Determinant(mPrime);
  if (determinant === 0 || !Number.isFinite(determinant)) {
    return { ok: false, reason: 'the Mueller matrix is singular (a total depolariser or polariser)' };
  }
  const sign = determinant > 0 ? 1 : -1;
  const k2 = l1 * l2 + l2 * l3 + l3 * l1;
  const left: Mat3 = new Array(9);
  const right: Mat3 = new Array(9);
  for (let e = 0; e < 9; e++) {
    // Indices 0, 4 and 8 are the diagonal of a row-major 3x3.
    const diagonal = e % 4 === 0;
    left[e] = product[e] + (diagonal ? k2 : 0);
    right[e] = (l1 + l2 + l3) * product[e] + (diagonal ? l1 * l2 * l3 : 0);
  }
  const leftInverse = mat3Inverse(left);
  if (!leftInverse) return { ok: false, reason: 'the depolariser of the Mueller matrix could not be separated' };
  const depolarizerMatrix = mat3Multiply(leftInverse, right);
  for (let e = 0; e < 9; e++) depolarizerMatrix[e] *= sign;
  const depolarizerInverse = mat3Inverse(depolarizerMatrix);
  if (!depolarizerInverse) return { ok: false, reason: 'the depolariser of the Mueller matrix is singular' };
  const r = mat3Multiply(depolarizerInverse, mPrime);

  const cosine = Math.min(1, Math.max(-1, (r[0] + r[4] + r[8] - 1) / 2));
  const retardance = Math.acos(cosine);
  return {
    ok: true,
    value: {
      diattenuation,
      diattenuationVector: dVector,
      retardance,
      retarderAxis: rotationAxis(r, cosine),
      retarderMatrix: r,
      // Rounding in the readings can push |tr| a hair above 3.
      depolarization: Math.max(0, 1 - Math.abs(depolarizerMatrix[0] + depolarizerMatrix[4] + depolarizerMatrix[8]) / 3),
      depolarizerMatrix,
      polarizanceOfDepolarizer,
    },
  };
}

/**
 * Unit axis of the rotation r (angle with cosine `cosine`). Its antisymmetric part is 2 sin(d)·[a]×,
 * which fades near d = π; there the symmetric part (1 - cos d)·a·aᵀ gives the axis and the
 * antisymmetric part only its sign.
 */
/** Entry (i, j) of the symmetric part of r less cosine·I, read where needed rather than built as a matrix (no closure per piece). */
function symmetricEntry(r: Mat3, cosine: number, i: number, j: number): number {
  return (r[3 * i + j] + r[3 * j + i]) / 2 - (i === j ? cosine : 0);
}

function rotationAxis(r: Mat3, cosine: number): Vec3 {
  const antisymmetric: Vec3 = [r[7] - r[5], r[2] - r[6], r[3] - r[1]];
  const length = norm3(antisymmetric);
  if (cosine >= 0) {
    return length > 0 ? [antisymmetric[0] / length, antisymmetric[1] / length, antisymmetric[2] / length] : [1, 0, 0];
  }
  let column = 0;
  for (let j = 1; j < 3; j++) if (symmetricEntry(r, cosine, j, j) > symmetricEntry(r, cosine, column, column)) column = j;
  const axis: Vec3 = [symmetricEntry(r, cosine, 0, column), symmetricEntry(r, cosine, 1, column), symmetricEntry(r, cosine, 2, column)];
  const norm = norm3(axis);
  const dot = axis[0] * antisymmetric[0] + axis[1] * antisymmetric[1] + axis[2] * antisymmetric[2];
  const orientation = dot < 0 ? -1 : 1;
  return [(orientation * axis[0]) / norm, (orientation * axis[1]) / norm, (orientation * axis[2]) / norm];
}
