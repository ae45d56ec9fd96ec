// Definiteness checks of weights and noise intensities, before any Riccati equation is solved.
//  • Positive definite: Cholesky factorisation R = LLᵀ (Golub & Van Loan, alg. 4.2.1); a pivot
//    ≤ m·ε·‖R‖_F·c (c = 10) means R is not numerically positive definite.
//  • Positive semidefinite: eigenvalues of the symmetric part (ml-matrix tridiagonal QL,
//    EISPACK tred2/tql2) all ≥ −n·ε·‖M‖_F·c. A Cholesky factorisation of M + (tolerance/2)·I
//    settles the common case first (its success puts every eigenvalue above −tolerance/2 less
//    the factorisation's rounding, well inside the test); the eigenvalues are computed only when it
//    fails, so the verdict and the reported smallest eigenvalue of a failure are unchanged.
// Both also require symmetry to ‖M − Mᵀ‖_F ≤ n·ε·‖M‖_F·c.
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { isPositiveDefiniteShifted } from '../numeric';
import type { Rows } from '../numeric/types';

const SAFETY = 10;

export interface DefinitenessCheck {
  ok: boolean;
  reason?: 'not-square' | 'not-symmetric' | 'not-positive-definite' | 'not-positive-semidefinite' | 'not-finite';
  /**
   * Smallest eigenvalue (semidefinite check; NaN when a passing check settled it by Cholesky) or
   * smallest Cholesky pivot squared (definite check).
   */
  smallest: number;
  tolerance: number;
}

function frobenius(M: Rows): number {
  let sum = 0;
  for (const row of M) for (const value of row) sum += value * value;
  return Math.sqrt(sum);
}

function shapeAndSymmetry(M: Rows): DefinitenessCheck | null {
  const n = M.length;
  if (M.some((row) => row.length !== n)) return { ok: false, reason: 'not-square', smallest: NaN, tolerance: 0 };
  if (M.some((row) => row.some((value) => !Number.isFinite(value)))) {
    return { ok: false, reason: 'not-finite', smallest: NaN, tolerance: 0 };
  }
  const scale = frobenius(M);
  let asymmetry = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) asymmetry += (M[i][j] - M[j][i]) ** 2;
  const tolerance = SAFETY * Math.max(1, n) * Number.EPSILON * scale;
  if (Math.sqrt(2 * asymmetry) > tolerance) return { ok: false, reason: 'not-symmetric', smallest: NaN, tolerance };
  return null;
}

export function checkPositiveDefinite(M: Rows): DefinitenessCheck {
  const shape = shapeAndSymmetry(M);
  if (shape) return shape;
  const n = M.length;
  const tolerance = SAFETY * Math.max(1, n) * Number.EPSILON * frobenius(M);
  const L = new Float64Array(n * n);
  let smallest = Infinity;
  for (let j = 0; j < n; j++) {
    let diagonal = 0.5 * (M[j][j] + M[j][j]);
    for (let k = 0; k < j; k++) diagonal -= L[j * n + k] * L[j * n + k];
    smallest = Math.min(smallest, diagonal);
    if (!(diagonal > tolerance)) return { ok: false, reason: 'not-positive-definite', smallest: diagonal, tolerance };
    const pivot = Math.sqrt(diagonal);
    L[j * n + j] = pivot;
    for (let i = j + 1; i < n; i++) {
      let sum = 0.5 * (M[i][j] + M[j][i]);
      for (let k = 0; k < j; k++) sum -= L[i * n + k] * L[j * n + k];
      L[i * n + j] = sum / pivot;
    }
  }
  return { ok: true, smallest: n === 0 ? Infinity : smallest, tolerance };
}

export function symmetricEigenvalues(M: Rows): number[] {
  const n = M.length;
  if (n === 0) return [];
  // Scaled to a unit largest entry first: entries near the double range overflow inside the
  // tridiagonal QL iteration, which then indexes out of bounds and throws (found by fuzzing).
  let scale = 0;
  for (const row of M) for (const value of row) scale = Math.max(scale, Math.abs(value));
  if (!Number.isFinite(scale)) return new Array<number>(n).fill(NaN);
  if (scale === 0) return new Array<number>(n).fill(0);
  const symmetric = M.map((row, i) => row.map((value, j) => 0.5 * (value / scale + M[j][i] / scale)));
  const decomposition = new EigenvalueDecomposition(new Matrix(symmetric), { assumeSymmetric: true });
  return decomposition.realEigenvalues.map((value) => value * scale).sort((a, b) => a - b);
}

export function checkPositiveSemidefinite(M: Rows): DefinitenessCheck {
  const shape = shapeAndSymmetry(M);
  if (shape) return shape;
  const n = M.length;
  const tolerance = SAFETY * Math.max(1, n) * Number.EPSILON * frobenius(M);
  const symmetric = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) symmetric[i * n + j] = 0.5 * (M[i][j] + M[j][i]);
  if (n > 0 && isPositiveDefiniteShifted(symmetric, n, -tolerance / 2)) return { ok: true, smallest: NaN, tolerance };
  const values = symmetricEigenvalues(M);
  const smallest = values.length === 0 ? Infinity : values[0];
  if (smallest < -tolerance) return { ok: false, reason: 'not-positive-semidefinite', smallest, tolerance };
  return { ok: true, smallest, tolerance };
}
