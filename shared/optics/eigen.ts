/** Eigenvalues of small real symmetric matrices by the cyclic Jacobi method. */

const MAX_SWEEPS = 30;

/**
 * Eigenvalues of the n x n real symmetric matrix `a` (row-major; only read), in ascending order.
 * Jacobi rotations are exact to rounding and never fail on the tiny matrices used here.
 */
export function symmetricEigenvalues(a: ArrayLike<number>, n: number): number[] {
  const m = Float64Array.from(a as ArrayLike<number>);
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let offDiagonal = 0;
    let diagonal = 0;
    for (let p = 0; p < n; p++) {
      diagonal += m[p * n + p] * m[p * n + p];
      for (let q = p + 1; q < n; q++) offDiagonal += m[p * n + q] * m[p * n + q];
    }
    // Off-diagonal mass 1e-24 of the diagonal's: eigenvalues good to ~1e-12 of the largest.
    if (offDiagonal <= 1e-24 * diagonal || diagonal === 0) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = m[p * n + q];
        if (apq === 0) continue;
        const theta = (m[q * n + q] - m[p * n + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = m[k * n + p];
          const akq = m[k * n + q];
          m[k * n + p] = c * akp - s * akq;
          m[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = m[p * n + k];
          const aqk = m[q * n + k];
          m[p * n + k] = c * apk - s * aqk;
          m[q * n + k] = s * apk + c * aqk;
        }
      }
    }
  }
  const values: number[] = [];
  for (let p = 0; p < n; p++) values.push(m[p * n + p]);
  return values.sort((x, y) => x - y);
}

/** Reused by every call up to 8x8 (the engine is synchronous; each entry is written before it is read). */
const CHOLESKY_SCRATCH = new Float64Array(64);

/**
 * Whether the n x n real symmetric matrix `a` plus shift·I is positive definite (Cholesky succeeds):
 * a cheap test that every eigenvalue of `a` is above -shift.
 */
export function isPositiveDefiniteShifted(a: ArrayLike<number>, n: number, shift: number): boolean {
  const l = n * n <= CHOLESKY_SCRATCH.length ? CHOLESKY_SCRATCH : new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let diagonal = a[j * n + j] + shift;
    for (let k = 0; k < j; k++) diagonal -= l[j * n + k] * l[j * n + k];
    if (!(diagonal > 0)) return false;
    const pivot = Math.sqrt(diagonal);
    l[j * n + j] = pivot;
    for (let i = j + 1; i < n; i++) {
      let sum = a[i * n + j];
      for (let k = 0; k < j; k++) sum -= l[i * n + k] * l[j * n + k];
      l[i * n + j] = sum / pivot;
    }
  }
  return true;
}

/**
 * Eigenvalues of a real symmetric 3x3 matrix (row-major), ascending, in closed form from the
 * trigonometric solution of its characteristic cubic (O. K. Smith, Commun. ACM 4, 168 (1961)).
 */
export function symmetric3x3Eigenvalues(a: ArrayLike<number>): [number, number, number] {
  const offDiagonal = a[1] * a[1] + a[2] * a[2] + a[5] * a[5];
  const q = (a[0] + a[4] + a[8]) / 3;
  const p2 = (a[0] - q) ** 2 + (a[4] - q) ** 2 + (a[8] - q) ** 2 + 2 * offDiagonal;
  if (p2 === 0) return [q, q, q];
  if (offDiagonal === 0) {
    const d = [a[0], a[4], a[8]].sort((x, y) => x - y);
    return [d[0], d[1], d[2]];
  }
  const p = Math.sqrt(p2 / 6);
  const b0 = (a[0] - q) / p;
  const b4 = (a[4] - q) / p;
  const b8 = (a[8] - q) / p;
  const b1 = a[1] / p;
  const b2 = a[2] / p;
  const b5 = a[5] / p;
  const halfDet = (b0 * (b4 * b8 - b5 * b5) - b1 * (b1 * b8 - b5 * b2) + b2 * (b1 * b5 - b4 * b2)) / 2;
  const phi = Math.acos(Math.min(1, Math.max(-1, halfDet))) / 3;
  const largest = q + 2 * p * Math.cos(phi);
  const smallest = q + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
  return [smallest, 3 * q - largest - smallest, largest];
}
