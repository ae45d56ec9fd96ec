// Numerical rank and the fundamental subspaces from the singular value decomposition
// (Golub & Van Loan, Matrix Computations, section 5.4.1). The default tolerance is
// max(m, n)·ε·σ_max: singular values below it are indistinguishable from zero after a backward-stable
// perturbation of the data of relative size ε (the same rule NumPy's matrix_rank uses).

import { denseFromRows, denseToRows, zerosDense } from './dense';
import { singularValues, svdDense } from './svd';
import type { Rows } from './types';

const EPS = Number.EPSILON;

function shape(A: Rows): [number, number] {
  return [A.length, A.length === 0 ? 0 : A[0].length];
}

/** Default rank tolerance max(m, n)·ε·σ_max. */
export function defaultRankTolerance(A: Rows, sigmaMax: number): number {
  const [m, n] = shape(A);
  return Math.max(m, n) * EPS * sigmaMax;
}

/** Number of singular values above tol (default max(m, n)·ε·σ_max). */
export function numericalRank(A: Rows, tol?: number): number {
  const s = singularValues(A);
  if (s.length === 0) return 0;
  const tolerance = tol ?? defaultRankTolerance(A, s[0]);
  return s.filter((sigma) => sigma > tolerance).length;
}

/** σ_min of A (the smallest of the min(m, n) singular values; 0 for an empty matrix). */
export function minimumSingularValue(A: Rows): number {
  const s = singularValues(A);
  return s.length === 0 ? 0 : s[s.length - 1];
}

/** Orthonormal basis of the range of A (columns of the result), from the left singular vectors. */
export function orthonormalBasis(A: Rows, tol?: number): Rows {
  const [m, n] = shape(A);
  if (m === 0 || n === 0) return Array.from({ length: m }, () => []);
  const { U, s } = svdDense(denseFromRows(A), true);
  const tolerance = tol ?? defaultRankTolerance(A, s[0]);
  const rank = s.filter((sigma) => sigma > tolerance).length;
  const k = U!.cols;
  return Array.from({ length: m }, (_, i) => Array.from(U!.data.subarray(i * k, i * k + rank)));
}

/** Orthonormal basis of the null space {x : A·x = 0} (columns of the result, n × (n − rank)). */
export function nullSpace(A: Rows, tol?: number): Rows {
  const [m, n] = shape(A);
  if (n === 0) return [];
  // Pad with zero rows to at least n×n so the thin SVD yields a full set of right singular vectors.
  const rows = Math.max(m, n);
  const padded = zerosDense(rows, n);
  if (m > 0) padded.data.set(denseFromRows(A).data);
  const { s, V } = svdDense(padded, true);
  const tolerance = tol ?? defaultRankTolerance(A, s[0]);
  const rank = s.filter((sigma) => sigma > tolerance).length;
  const full = denseToRows(V!);
  return full.map((row) => row.slice(rank));
}
