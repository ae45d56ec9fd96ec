// Small dense kernels the control analyses share: eigenvalues, singular values, solves, and a
// Householder QR that returns an orthonormal basis of a null space. All decompositions come from the
// numeric layer on flat row-major Float64Array (balanced Hessenberg–QR with dtrevc-style
// eigenvectors, Golub–Kahan–Reinsch SVD, LU with partial pivoting); this file keeps the Rows-based
// signatures the control analyses were written against.
import type { Complex, Rows } from '../numeric/types';
import {
  type Dense,
  balanceDense,
  denseFromRows,
  denseToRows,
  eigenvaluesWithStatus,
  eigenvectorsFromSchur,
  luFactor,
  luSolveDense,
  norm1Dense,
  realSchurDense,
  reciprocalConditionEstimate,
  svdDense,
} from '../numeric';

export const EPS = Number.EPSILON;

export function sortEigenvalues(values: Complex[]): Complex[] {
  return values.slice().sort((a, b) => (a.re !== b.re ? a.re - b.re : a.im - b.im));
}

function allFinite(M: Rows): boolean {
  return M.every((row) => row.every(Number.isFinite));
}

/**
 * Eigenvalues sorted by real then imaginary part, from the numeric layer's balanced Hessenberg–QR
 * with a bounded sweep budget (NaN entries when it does not converge, never a hang).
 */
export function eigenvaluesOf(A: Rows): Complex[] {
  const n = A.length;
  if (n === 0) return [];
  if (!allFinite(A)) return Array.from({ length: n }, () => ({ re: NaN, im: NaN }));
  return sortEigenvalues(eigenvaluesWithStatus(A).values);
}

/**
 * Real eigenvector matrix in block form: A·V = V·Dblock with 2×2 blocks [[a, b], [−b, a]] for a
 * complex pair (a ± ib), columns (x, y) the real and imaginary parts. Values listed in the order
 * of the columns.
 */
export function realEigenvectors(A: Rows): { values: Complex[]; V: Rows; blockD: Rows } {
  const n = A.length;
  const nanResult = () => {
    const nan = Array.from({ length: n }, () => new Array<number>(n).fill(NaN));
    return { values: Array.from({ length: n }, () => ({ re: NaN, im: NaN })), V: nan, blockD: nan.map((row) => row.slice()) };
  };
  if (n === 0) return { values: [], V: [], blockD: [] };
  if (!allFinite(A)) return nanResult();
  const { scaled, scaling } = balanceDense(denseFromRows(A));
  const schur = realSchurDense(scaled);
  if (!schur.converged) return nanResult();
  // Schur order: a complex pair comes as (a + iω, a − iω) with ω > 0 in adjacent columns, the
  // eigenvector of a + iω = x + iy in the first; the real block form uses columns (x, y).
  const { values, re, im } = eigenvectorsFromSchur(schur.T, schur.Z, scaling);
  const V = zerosRows(n, n);
  const blockD = zerosRows(n, n);
  for (let j = 0; j < n; ) {
    if (values[j].im !== 0 && j + 1 < n) {
      const { re: a, im: omega } = values[j];
      for (let i = 0; i < n; i++) {
        V[i][j] = re[i * n + j];
        V[i][j + 1] = im[i * n + j];
      }
      blockD[j][j] = a;
      blockD[j][j + 1] = omega;
      blockD[j + 1][j] = -omega;
      blockD[j + 1][j + 1] = a;
      j += 2;
    } else {
      for (let i = 0; i < n; i++) V[i][j] = re[i * n + j];
      blockD[j][j] = values[j].re;
      j += 1;
    }
  }
  return { values, V, blockD };
}

/** Singular values, descending. Works for wide and tall matrices. */
export function singularValuesOf(M: Rows): number[] {
  if (M.length === 0 || M[0].length === 0) return [];
  if (!allFinite(M)) return new Array<number>(Math.min(M.length, M[0].length)).fill(NaN);
  return Array.from(svdDense(denseFromRows(M), false).s);
}

/** Thin SVD M = U·diag(s)·Vᵀ with s descending (U p×k, V q×k, k = min(p, q)). */
export function thinSvd(M: Rows): { U: Rows; s: number[]; V: Rows } {
  const p = M.length;
  const q = p === 0 ? 0 : M[0].length;
  if (p === 0 || q === 0) return { U: zerosRows(p, 0), s: [], V: zerosRows(q, 0) };
  if (!allFinite(M)) {
    const k = Math.min(p, q);
    return { U: zerosRows(p, k), s: new Array<number>(k).fill(NaN), V: zerosRows(q, k) };
  }
  const result = svdDense(denseFromRows(M), true);
  return { U: denseToRows(result.U as Dense), s: Array.from(result.s), V: denseToRows(result.V as Dense) };
}

export function norm2(M: Rows): number {
  const s = singularValuesOf(M);
  return s.length === 0 ? 0 : s[0];
}

export function conditionNumber2(M: Rows): number {
  const s = singularValuesOf(M);
  if (s.length === 0) return 1;
  const smallest = s[s.length - 1];
  return smallest === 0 ? Infinity : s[0] / smallest;
}

/** Solve A·X = B by LU with partial pivoting; `singular` when a pivot vanishes exactly. */
export function solveRows(A: Rows, B: Rows): { X: Rows; singular: boolean } {
  const { X, singular } = solveRowsWithCondition(A, B, false);
  return { X, singular };
}

/**
 * solveRows (the same X, by the same LU solve) with the reciprocal 1-norm condition estimate of A
 * (Hager/Higham, numeric/lu.ts); NaN when `estimate` is false, 0 when A is exactly singular.
 */
export function solveRowsWithCondition(A: Rows, B: Rows, estimate = true): { X: Rows; singular: boolean; rcond: number } {
  if (A.length === 0) return { X: [], singular: false, rcond: 1 };
  if (B.length === 0 || B[0].length === 0) return { X: A.map(() => []), singular: false, rcond: NaN };
  const matrix = denseFromRows(A);
  const factor = luFactor(matrix);
  if (factor.hasZeroPivot) return { X: zerosRows(A.length, B[0]?.length ?? 0), singular: true, rcond: 0 };
  const rcond = estimate ? reciprocalConditionEstimate(factor, norm1Dense(matrix)) : NaN;
  return { X: denseToRows(luSolveDense(factor, denseFromRows(B))), singular: false, rcond };
}

export function transposeRows(M: Rows): Rows {
  const p = M.length;
  const q = p === 0 ? 0 : M[0].length;
  const result = zerosRows(q, p);
  for (let i = 0; i < p; i++) for (let j = 0; j < q; j++) result[j][i] = M[i][j];
  return result;
}

export function zerosRows(p: number, q: number): Rows {
  return Array.from({ length: p }, () => new Array<number>(q).fill(0));
}

export function identityRows(n: number): Rows {
  const result = zerosRows(n, n);
  for (let i = 0; i < n; i++) result[i][i] = 1;
  return result;
}

export function multiplyRows(a: Rows, b: Rows): Rows {
  const p = a.length;
  const inner = b.length;
  const q = inner === 0 ? (p === 0 ? 0 : 0) : b[0].length;
  const result = zerosRows(p, q);
  for (let i = 0; i < p; i++) {
    const row = result[i];
    for (let k = 0; k < inner; k++) {
      const aik = a[i][k];
      if (aik === 0) continue;
      const bk = b[k];
      for (let j = 0; j < q; j++) row[j] += aik * bk[j];
    }
  }
  return result;
}

export function frobenius(M: Rows): number {
  let scale = 0;
  let sum = 1;
  for (const row of M) {
    for (const value of row) {
      if (value === 0) continue;
      const magnitude = Math.abs(value);
      if (scale < magnitude) {
        sum = 1 + sum * (scale / magnitude) ** 2;
        scale = magnitude;
      } else sum += (magnitude / scale) ** 2;
    }
  }
  return scale * Math.sqrt(sum);
}

/**
 * Orthonormal basis (n × (n − k) columns, returned column-major as k-th..n-th columns of Q) of the
 * orthogonal complement of the column space of the tall matrix M (n × k, row-major flat), by
 * Householder QR: M = Q·R, complement = Q[:, k:]. Only the needed columns of Q are formed.
 */
export function orthogonalComplement(M: Float64Array, n: number, k: number): Float64Array {
  const work = M.slice();
  const reflectors: Float64Array[] = [];
  const betas: number[] = [];
  const steps = Math.min(k, n);
  for (let j = 0; j < steps; j++) {
    const v = new Float64Array(n);
    let normSq = 0;
    for (let i = j; i < n; i++) {
      v[i] = work[i * k + j];
      normSq += v[i] * v[i];
    }
    const norm = Math.sqrt(normSq);
    if (norm === 0) {
      reflectors.push(v);
      betas.push(0);
      continue;
    }
    const alpha = v[j] >= 0 ? -norm : norm;
    v[j] -= alpha;
    const vNormSq = normSq - 2 * alpha * work[j * k + j] + alpha * alpha;
    const beta = vNormSq === 0 ? 0 : 2 / vNormSq;
    for (let c = j; c < k; c++) {
      let dot = 0;
      for (let i = j; i < n; i++) dot += v[i] * work[i * k + c];
      const f = beta * dot;
      for (let i = j; i < n; i++) work[i * k + c] -= f * v[i];
    }
    reflectors.push(v);
    betas.push(beta);
  }
  const cols = n - steps;
  // Q[:, steps:] = H_0 H_1 … H_{steps−1} [0; I]; stored column-major (column c at c·n).
  const basis = new Float64Array(n * cols);
  for (let c = 0; c < cols; c++) basis[c * n + steps + c] = 1;
  for (let j = steps - 1; j >= 0; j--) {
    const v = reflectors[j];
    const beta = betas[j];
    if (beta === 0) continue;
    for (let c = 0; c < cols; c++) {
      const offset = c * n;
      let dot = 0;
      for (let i = j; i < n; i++) dot += v[i] * basis[offset + i];
      const f = beta * dot;
      for (let i = j; i < n; i++) basis[offset + i] -= f * v[i];
    }
  }
  return basis;
}
