// Small dense kernels the control analyses share: eigenvalues, singular values, solves, and a
// Householder QR that returns an orthonormal basis of a null space. Eigen- and singular-value
// decompositions come from ml-matrix (Hessenberg–QR and Golub–Kahan, the classic EISPACK/JAMA
// algorithms); the Householder kernels work on flat row-major Float64Array for the hot paths of
// pole placement. Kept private to control/ so the numeric layer can replace them later.
import { EigenvalueDecomposition, Matrix, SingularValueDecomposition, LuDecomposition } from 'ml-matrix';
import type { Complex, Rows } from '../numeric/types';
import { eigenvaluesWithStatus } from '../numeric';

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
  if (!allFinite(A)) {
    const nan = Array.from({ length: n }, () => new Array<number>(n).fill(NaN));
    return { values: Array.from({ length: n }, () => ({ re: NaN, im: NaN })), V: nan, blockD: nan };
  }
  const evd = new EigenvalueDecomposition(new Matrix(A), { assumeSymmetric: false });
  const re = evd.realEigenvalues;
  const im = evd.imaginaryEigenvalues;
  return {
    values: re.map((value, i) => ({ re: value, im: im[i] })),
    V: n === 0 ? [] : evd.eigenvectorMatrix.to2DArray(),
    blockD: n === 0 ? [] : evd.diagonalMatrix.to2DArray(),
  };
}

/** Singular values, descending. Works for wide and tall matrices. */
export function singularValuesOf(M: Rows): number[] {
  if (M.length === 0 || M[0].length === 0) return [];
  if (!allFinite(M)) return new Array<number>(Math.min(M.length, M[0].length)).fill(NaN);
  const tall = M.length >= M[0].length ? M : transposeRows(M);
  const svd = new SingularValueDecomposition(new Matrix(tall), {
    computeLeftSingularVectors: false,
    computeRightSingularVectors: false,
    autoTranspose: false,
  });
  return Array.from(svd.diagonal).sort((a, b) => b - a);
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
  const wide = p < q;
  const svd = new SingularValueDecomposition(new Matrix(wide ? transposeRows(M) : M), {
    computeLeftSingularVectors: true,
    computeRightSingularVectors: true,
    autoTranspose: false,
  });
  const s = Array.from(svd.diagonal);
  let U = svd.leftSingularVectors.to2DArray();
  let V = svd.rightSingularVectors.to2DArray();
  if (wide) [U, V] = [V, U];
  const k = Math.min(p, q);
  const order = s.map((_, i) => i).sort((a, b) => s[b] - s[a]).slice(0, k);
  return {
    U: U.map((row) => order.map((j) => row[j])),
    s: order.map((j) => s[j]),
    V: V.map((row) => order.map((j) => row[j])),
  };
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
  if (A.length === 0) return { X: [], singular: false };
  if (B.length === 0 || B[0].length === 0) return { X: A.map(() => []), singular: false };
  const lu = new LuDecomposition(new Matrix(A));
  if (lu.isSingular()) return { X: zerosRows(A.length, B[0]?.length ?? 0), singular: true };
  return { X: lu.solve(new Matrix(B)).to2DArray(), singular: false };
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
