/**
 * Real 4x4 Mueller algebra in Phaselot's Stokes convention (see jones.ts and stokes.ts).
 * Matrices are plain row-major arrays of 16 numbers: m[4 * row + column].
 */
import { STOKES_PAULI, jonesLinearPolarizer, jonesToMueller } from './jones.js';
import { isPositiveDefiniteShifted, symmetricEigenvalues } from './eigen.js';
import type { Stokes } from './stokes.js';

export type Mueller = number[];

export const MUELLER_IDENTITY: Readonly<Mueller> = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];

export function mat4Multiply(a: Readonly<Mueller>, b: Readonly<Mueller>): Mueller {
  const out: Mueller = new Array(16);
  for (let i = 0; i < 4; i++) {
    for (let j = 0; j < 4; j++) {
      out[4 * i + j] = a[4 * i] * b[j] + a[4 * i + 1] * b[4 + j] + a[4 * i + 2] * b[8 + j] + a[4 * i + 3] * b[12 + j];
    }
  }
  return out;
}

export function mat4Apply(m: Readonly<Mueller>, s: Stokes): Stokes {
  return [
    m[0] * s[0] + m[1] * s[1] + m[2] * s[2] + m[3] * s[3],
    m[4] * s[0] + m[5] * s[1] + m[6] * s[2] + m[7] * s[3],
    m[8] * s[0] + m[9] * s[1] + m[10] * s[2] + m[11] * s[3],
    m[12] * s[0] + m[13] * s[1] + m[14] * s[2] + m[15] * s[3],
  ];
}

export function mat4Transpose(m: Readonly<Mueller>): Mueller {
  const out: Mueller = new Array(16);
  for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) out[4 * j + i] = m[4 * i + j];
  return out;
}

/** Inverse by Gauss-Jordan elimination with partial pivoting; null when singular. */
export function mat4Inverse(m: Readonly<Mueller>): Mueller | null {
  const a = m.slice();
  const inv: Mueller = MUELLER_IDENTITY.slice();
  let scale = 0;
  for (const x of a) scale = Math.max(scale, Math.abs(x));
  if (scale === 0) return null;
  for (let col = 0; col < 4; col++) {
    let pivot = col;
    for (let r = col + 1; r < 4; r++) if (Math.abs(a[4 * r + col]) > Math.abs(a[4 * pivot + col])) pivot = r;
    const p = a[4 * pivot + col];
    if (Math.abs(p) <= 1e-14 * scale) return null;
    if (pivot !== col) {
      for (let k = 0; k < 4; k++) {
        [a[4 * col + k], a[4 * pivot + k]] = [a[4 * pivot + k], a[4 * col + k]];
        [inv[4 * col + k], inv[4 * pivot + k]] = [inv[4 * pivot + k], inv[4 * col + k]];
      }
    }
    for (let k = 0; k < 4; k++) {
      a[4 * col + k] /= p;
      inv[4 * col + k] /= p;
    }
    for (let r = 0; r < 4; r++) {
      if (r === col) continue;
      const f = a[4 * r + col];
      if (f === 0) continue;
      for (let k = 0; k < 4; k++) {
        a[4 * r + k] -= f * a[4 * col + k];
        inv[4 * r + k] -= f * inv[4 * col + k];
      }
    }
  }
  return inv;
}

function frobenius(m: Readonly<Mueller>): number {
  let sum = 0;
  for (let i = 0; i < m.length; i++) sum += m[i] * m[i];
  return Math.sqrt(sum);
}

/**
 * Pure retarder: identity on S0, and on (S1, S2, S3) the right-handed rotation by d (rad) about
 * the unit Stokes direction `axis` of its fast eigenpolarisation (Rodrigues' rotation formula).
 */
export function muellerRetarder(d: number, axis: readonly [number, number, number]): Mueller {
  const [x, y, z] = axis;
  const c = Math.cos(d);
  const s = Math.sin(d);
  const k = 1 - c;
  return [
    1,
    0,
    0,
    0,
    0,
    c + k * x * x,
    k * x * y - s * z,
    k * x * z + s * y,
    0,
    k * x * y + s * z,
    c + k * y * y,
    k * y * z - s * x,
    0,
    k * x * z - s * y,
    k * y * z + s * x,
    c + k * z * z,
  ];
}

/** Linear retarder, retardance d, fast axis at t (rad): Stokes axis (cos 2t, sin 2t, 0). */
export function muellerLinearRetarder(d: number, t: number): Mueller {
  return muellerRetarder(d, [Math.cos(2 * t), Math.sin(2 * t), 0]);
}

/** Ideal linear polariser with its transmission axis at t (rad). */
export function muellerLinearPolarizer(t: number): Mueller {
  return jonesToMueller(jonesLinearPolarizer(t));
}

export type MuellerFit = { ok: true; mueller: Mueller; residualRms: number } | { ok: false; reason: string };

/** Above this Frobenius condition number of Σ s sᵀ the inputs do not span the Stokes space. */
const MAX_INPUT_CONDITION = 1e6;

/** Σ in·inᵀ and Σ out·inᵀ of muellerFromMeasurements, reused by every call (the engine is synchronous; neither leaves the call). */
const GRAM_SCRATCH: Mueller = new Array<number>(16).fill(0);
const CROSS_SCRATCH: Mueller = new Array<number>(16).fill(0);

/**
 * Mueller matrix from n >= 4 known input states and the measured output states, by least squares:
 * M = (Σ out·inᵀ)(Σ in·inᵀ)⁻¹. residualRms is the rms of the fit residual per Stokes component.
 * `outputs` is flat, four numbers per input (the engine keeps them so, one array per piece).
 */
export function muellerFromMeasurements(inputs: readonly Stokes[], outputs: ArrayLike<number>): MuellerFit {
  if (inputs.length < 4) {
    return { ok: false, reason: `too few inputs: ${inputs.length} input states, at least 4 are needed` };
  }
  const gram = GRAM_SCRATCH.fill(0);
  const cross = CROSS_SCRATCH.fill(0);
  for (let n = 0; n < inputs.length; n++) {
    const x = inputs[n];
    for (let i = 0; i < 4; i++) {
      const y = outputs[4 * n + i];
      for (let j = 0; j < 4; j++) {
        gram[4 * i + j] += x[i] * x[j];
        cross[4 * i + j] += y * x[j];
      }
    }
  }
  const gramInverse = mat4Inverse(gram);
  if (!gramInverse || frobenius(gram) * frobenius(gramInverse) > MAX_INPUT_CONDITION) {
    return { ok: false, reason: 'the input states do not span the Stokes space (add a circular or a diagonal state)' };
  }
  const mueller = mat4Multiply(cross, gramInverse);
  let squares = 0;
  for (let n = 0; n < inputs.length; n++) {
    const s = inputs[n];
    for (let i = 0; i < 4; i++) {
      // mat4Apply's row i, without an array per reading.
      const predicted = mueller[4 * i] * s[0] + mueller[4 * i + 1] * s[1] + mueller[4 * i + 2] * s[2] + mueller[4 * i + 3] * s[3];
      squares += (predicted - outputs[4 * n + i]) ** 2;
    }
  }
  return { ok: true, mueller, residualRms: Math.sqrt(squares / (4 * inputs.length)) };
}

/**
 * The nonzero entries of σ_i ⊗ conj(σ_j), k = 4i + j (each has four): the coherency matrix
 * H = ¼ Σ m_ij σ_i ⊗ conj(σ_j) (Cloude) is their weighted sum. Kronecker indices: row 2a + c,
 * column 2b + d holds σ_i[a][b] · conj(σ_j[c][d]).
 */
const COHERENCY_TERMS = (() => {
  const k: number[] = [];
  const entry: number[] = [];
  const re: number[] = [];
  const im: number[] = [];
  for (let i = 0; i < 4; i++) {
    for (let j = 0; j < 4; j++) {
      for (let r = 0; r < 4; r++) {
        for (let c = 0; c < 4; c++) {
          const x = STOKES_PAULI[i][2 * (r >> 1) + (c >> 1)];
          const y = STOKES_PAULI[j][2 * (r & 1) + (c & 1)];
          const real = x.re * y.re + x.im * y.im;
          const imaginary = x.im * y.re - x.re * y.im;
          if (real === 0 && imaginary === 0) continue;
          k.push(4 * i + j);
          // Offset of the entry (r, c) in the top-left block of the 8x8 real form.
          entry.push(8 * r + c);
          re.push(real / 4);
          im.push(imaginary / 4);
        }
      }
    }
  }
  return { k: Int32Array.from(k), entry: Int32Array.from(entry), re: Float64Array.from(re), im: Float64Array.from(im) };
})();

/** Reused by every call (the engine is synchronous): one allocation less per piece. */
const COHERENCY_SCRATCH = new Float64Array(64);

/**
 * H in its real symmetric 8x8 form [[Re H, -Im H], [Im H, Re H]], which has every eigenvalue of the
 * Hermitian H twice. A physical Mueller matrix has H positive semidefinite (trace m00); a pure
 * (non-depolarising) one has rank 1. The result is overwritten by the next call.
 */
function coherencyReal8(m: Readonly<Mueller>): Float64Array {
  const real = COHERENCY_SCRATCH.fill(0);
  const { k, entry, re, im } = COHERENCY_TERMS;
  for (let t = 0; t < k.length; t++) {
    const x = m[k[t]];
    const e = entry[t];
    real[e] += x * re[t];
    real[e + 36] += x * re[t];
    real[e + 4] -= x * im[t];
    real[e + 32] += x * im[t];
  }
  return real;
}

/** Eigenvalues (ascending) of the coherency matrix of m. */
export function coherencyEigenvalues(m: Readonly<Mueller>): number[] {
  const doubled = symmetricEigenvalues(coherencyReal8(m), 8);
  return [doubled[0], doubled[2], doubled[4], doubled[6]];
}

/**
 * The lowest coherency eigenvalue over m00 when it is below -limit (the matrix is non-physical
 * beyond noise), else null. A Cholesky test settles the common, physical case without eigenvalues.
 */
export function coherencyViolation(m: Readonly<Mueller>, limit: number): number | null {
  if (isPositiveDefiniteShifted(coherencyReal8(m), 8, limit * m[0])) return null;
  const lowest = coherencyEigenvalues(m)[0] / m[0];
  return lowest < -limit ? lowest : null;
}

/** Depolarisation index sqrt(Σ m_ij² - m00²) / (√3 m00) (Gil & Bernabeu): 1 for a pure element. */
export function depolarizationIndex(m: Readonly<Mueller>): number {
  let sum = 0;
  for (const x of m) sum += x * x;
  return Math.sqrt(Math.max(0, sum - m[0] * m[0])) / (Math.sqrt(3) * m[0]);
}
