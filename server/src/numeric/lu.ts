// LU factorisation with partial (row) pivoting, P·A = L·U (Golub & Van Loan, Matrix Computations,
// algorithm 3.4.1), triangular solves, inverse, determinant, and the Hager/Higham estimate of the
// reciprocal 1-norm condition number (Higham, ACM TOMS 14, 1988; LAPACK dlacn2).
//
// Complex systems (frequency response at s = jω) use the same algorithm in complex arithmetic on
// separate real/imaginary Float64Arrays: half the memory and a quarter of the flops of the real
// 2n×2n realification.

import { type Dense, denseFromRows, denseToRows, norm1Dense, zerosDense } from './dense';
import type { ComplexRows, Rows } from './types';

export interface LuFactorization {
  /** Unit-lower L (below the diagonal) and U (on and above), packed in one n×n matrix. */
  lu: Dense;
  /** Row i of P·A is row pivots[i] of A. */
  permutation: Int32Array;
  /** +1 or −1: sign of the permutation, for the determinant. */
  permutationSign: number;
  /** True when some pivot is exactly zero (the matrix is exactly singular in floating point). */
  hasZeroPivot: boolean;
}

export interface LinearSolution {
  X: Rows;
  /** Estimated reciprocal condition number 1 / (‖A‖₁ ‖A⁻¹‖₁); 0 for an exactly singular matrix. */
  rcond: number;
  /** True when a pivot is exactly zero or rcond < n·ε: the solution is not to be trusted. */
  singular: boolean;
}

export interface ComplexLinearSolution {
  X: ComplexRows;
  rcond: number;
  singular: boolean;
}

/** P·A = L·U of a square matrix; the input is not modified. */
export function luFactor(matrix: Dense): LuFactorization {
  if (matrix.rows !== matrix.cols) throw new Error(`luFactor: matrix is ${matrix.rows}×${matrix.cols}, not square`);
  const n = matrix.rows;
  const a = matrix.data.slice();
  const permutation = new Int32Array(n);
  for (let i = 0; i < n; i++) permutation[i] = i;
  let permutationSign = 1;
  let hasZeroPivot = false;
  for (let k = 0; k < n; k++) {
    let pivotRow = k;
    let pivotMagnitude = Math.abs(a[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const magnitude = Math.abs(a[i * n + k]);
      if (magnitude > pivotMagnitude) {
        pivotMagnitude = magnitude;
        pivotRow = i;
      }
    }
    if (pivotRow !== k) {
      for (let j = 0; j < n; j++) {
        const swap = a[k * n + j];
        a[k * n + j] = a[pivotRow * n + j];
        a[pivotRow * n + j] = swap;
      }
      const swapIndex = permutation[k];
      permutation[k] = permutation[pivotRow];
      permutation[pivotRow] = swapIndex;
      permutationSign = -permutationSign;
    }
    const pivot = a[k * n + k];
    if (pivot === 0) {
      hasZeroPivot = true;
      continue;
    }
    for (let i = k + 1; i < n; i++) {
      const multiplier = a[i * n + k] / pivot;
      a[i * n + k] = multiplier;
      if (multiplier === 0) continue;
      for (let j = k + 1; j < n; j++) a[i * n + j] -= multiplier * a[k * n + j];
    }
  }
  return { lu: { rows: n, cols: n, data: a }, permutation, permutationSign, hasZeroPivot };
}

/** Solves A·X = B from the factorisation of A. */
export function luSolveDense(factor: LuFactorization, rhs: Dense): Dense {
  const n = factor.lu.rows;
  const m = rhs.cols;
  if (rhs.rows !== n) throw new Error(`luSolveDense: right-hand side has ${rhs.rows} rows, expected ${n}`);
  const lu = factor.lu.data;
  const x = zerosDense(n, m);
  const xd = x.data;
  for (let i = 0; i < n; i++) xd.set(rhs.data.subarray(factor.permutation[i] * m, (factor.permutation[i] + 1) * m), i * m);
  // Forward substitution with unit-lower L, row-oriented so the inner loop runs along rows of X.
  for (let i = 1; i < n; i++) {
    for (let k = 0; k < i; k++) {
      const lik = lu[i * n + k];
      if (lik === 0) continue;
      for (let j = 0; j < m; j++) xd[i * m + j] -= lik * xd[k * m + j];
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    for (let k = i + 1; k < n; k++) {
      const uik = lu[i * n + k];
      if (uik === 0) continue;
      for (let j = 0; j < m; j++) xd[i * m + j] -= uik * xd[k * m + j];
    }
    const diagonal = lu[i * n + i];
    for (let j = 0; j < m; j++) xd[i * m + j] /= diagonal;
  }
  return x;
}

/** Solves Aᵀ·x = b for one vector b from the factorisation of A (needed by the condition estimator). */
export function luSolveTransposeVector(factor: LuFactorization, rhs: Float64Array): Float64Array {
  const n = factor.lu.rows;
  const lu = factor.lu.data;
  // Aᵀ = Uᵀ Lᵀ P, so solve Uᵀ w = b, Lᵀ v = w, x = Pᵀ v. Both by rows of the factors (each solved
  // entry updates the later ones, column-oriented substitution on Uᵀ and Lᵀ): the stored rows are
  // read contiguously instead of down columns.
  const w = rhs.slice();
  for (let k = 0; k < n; k++) {
    const value = w[k] / lu[k * n + k];
    w[k] = value;
    if (value === 0) continue;
    for (let i = k + 1; i < n; i++) w[i] -= lu[k * n + i] * value;
  }
  for (let k = n - 1; k > 0; k--) {
    const value = w[k];
    if (value === 0) continue;
    for (let i = 0; i < k; i++) w[i] -= lu[k * n + i] * value;
  }
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[factor.permutation[i]] = w[i];
  return x;
}

function luSolveVector(factor: LuFactorization, rhs: Float64Array): Float64Array {
  return luSolveDense(factor, { rows: rhs.length, cols: 1, data: rhs }).data;
}

/**
 * Estimate of ‖A⁻¹‖₁ by Hager's method with Higham's refinements (at most five iterations plus
 * the alternating-sign test vector), as in LAPACK dlacn2.
 */
function estimateInverseNorm1(
  n: number,
  solve: (x: Float64Array) => Float64Array,
  solveTranspose: (x: Float64Array) => Float64Array,
): number {
  let x = new Float64Array(n).fill(1 / n);
  let estimate = 0;
  let previousSigns: Float64Array | null = null;
  for (let iteration = 0; iteration < 5; iteration++) {
    const y = solve(x);
    let norm = 0;
    for (let i = 0; i < n; i++) norm += Math.abs(y[i]);
    if (!Number.isFinite(norm)) return Infinity;
    if (iteration > 0 && norm <= estimate) break;
    estimate = norm;
    const signs = new Float64Array(n);
    for (let i = 0; i < n; i++) signs[i] = y[i] >= 0 ? 1 : -1;
    if (previousSigns !== null && signs.every((value, i) => value === previousSigns![i])) break;
    previousSigns = signs;
    const z = solveTranspose(signs);
    let largest = 0;
    let largestIndex = 0;
    let zDotX = 0;
    for (let i = 0; i < n; i++) {
      zDotX += z[i] * x[i];
      if (Math.abs(z[i]) > largest) {
        largest = Math.abs(z[i]);
        largestIndex = i;
      }
    }
    if (iteration > 0 && largest <= zDotX) break;
    x = new Float64Array(n);
    x[largestIndex] = 1;
  }
  // Higham's extra test vector guards against the estimator's known worst cases.
  const alternating = new Float64Array(n);
  for (let i = 0; i < n; i++) alternating[i] = (i % 2 === 0 ? 1 : -1) * (1 + (n > 1 ? i / (n - 1) : 0));
  const y = solve(alternating);
  let norm = 0;
  for (let i = 0; i < n; i++) norm += Math.abs(y[i]);
  return Math.max(estimate, (2 * norm) / (3 * n));
}

/** Reciprocal 1-norm condition estimate of A from its LU factorisation. */
export function reciprocalConditionEstimate(factor: LuFactorization, normA1: number): number {
  const n = factor.lu.rows;
  if (n === 0) return 1;
  if (factor.hasZeroPivot || normA1 === 0) return 0;
  if (!Number.isFinite(normA1)) return 0;
  const inverseNorm = estimateInverseNorm1(
    n,
    (x) => luSolveVector(factor, x),
    (x) => luSolveTransposeVector(factor, x),
  );
  if (!Number.isFinite(inverseNorm) || inverseNorm === 0) return 0;
  return 1 / (normA1 * inverseNorm);
}

function isNumericallySingular(n: number, hasZeroPivot: boolean, rcond: number): boolean {
  return hasZeroPivot || !(rcond >= n * Number.EPSILON);
}

function nanRows(rows: number, cols: number): Rows {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(NaN));
}

/** Solves A·X = B (A square); never throws on a singular A, reports it instead. */
export function solveLinear(A: Rows, B: Rows): LinearSolution {
  const n = A.length;
  const matrix = denseFromRows(A);
  const rhs = denseFromRows(B);
  if (n === 0) return { X: [], rcond: 1, singular: false };
  const factor = luFactor(matrix);
  const rcond = reciprocalConditionEstimate(factor, norm1Dense(matrix));
  if (factor.hasZeroPivot) return { X: nanRows(n, rhs.cols), rcond: 0, singular: true };
  const X = denseToRows(luSolveDense(factor, rhs));
  return { X, rcond, singular: isNumericallySingular(n, false, rcond) };
}

export function inverse(A: Rows): LinearSolution {
  const n = A.length;
  const identityRows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
  return solveLinear(A, identityRows);
}

export function determinantDense(matrix: Dense): number {
  const n = matrix.rows;
  if (n === 0) return 1;
  const factor = luFactor(matrix);
  let product = factor.permutationSign;
  for (let i = 0; i < n; i++) product *= factor.lu.data[i * n + i];
  return product === 0 ? 0 : product; // no negative zero
}

export function determinant(A: Rows): number {
  return determinantDense(denseFromRows(A));
}

// ---------------------------------------------------------------- complex systems

interface ComplexLuFactorization {
  n: number;
  re: Float64Array;
  im: Float64Array;
  permutation: Int32Array;
  hasZeroPivot: boolean;
}

function complexLuFactor(re: Float64Array, im: Float64Array, n: number): ComplexLuFactorization {
  const permutation = new Int32Array(n);
  for (let i = 0; i < n; i++) permutation[i] = i;
  let hasZeroPivot = false;
  for (let k = 0; k < n; k++) {
    let pivotRow = k;
    let pivotMagnitude = Math.hypot(re[k * n + k], im[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const magnitude = Math.hypot(re[i * n + k], im[i * n + k]);
      if (magnitude > pivotMagnitude) {
        pivotMagnitude = magnitude;
        pivotRow = i;
      }
    }
    if (pivotRow !== k) {
      for (let j = 0; j < n; j++) {
        let swap = re[k * n + j];
        re[k * n + j] = re[pivotRow * n + j];
        re[pivotRow * n + j] = swap;
        swap = im[k * n + j];
        im[k * n + j] = im[pivotRow * n + j];
        im[pivotRow * n + j] = swap;
      }
      const swapIndex = permutation[k];
      permutation[k] = permutation[pivotRow];
      permutation[pivotRow] = swapIndex;
    }
    const pr = re[k * n + k];
    const pi = im[k * n + k];
    if (pr === 0 && pi === 0) {
      hasZeroPivot = true;
      continue;
    }
    for (let i = k + 1; i < n; i++) {
      const [mr, mi] = complexDivide(re[i * n + k], im[i * n + k], pr, pi);
      re[i * n + k] = mr;
      im[i * n + k] = mi;
      if (mr === 0 && mi === 0) continue;
      for (let j = k + 1; j < n; j++) {
        const ur = re[k * n + j];
        const ui = im[k * n + j];
        re[i * n + j] -= mr * ur - mi * ui;
        im[i * n + j] -= mr * ui + mi * ur;
      }
    }
  }
  return { n, re, im, permutation, hasZeroPivot };
}

/** Smith's algorithm for (a + ib)/(c + id), avoiding needless overflow. */
export function complexDivide(a: number, b: number, c: number, d: number): [number, number] {
  if (Math.abs(c) >= Math.abs(d)) {
    const ratio = d / c;
    const denominator = c + d * ratio;
    return [(a + b * ratio) / denominator, (b - a * ratio) / denominator];
  }
  const ratio = c / d;
  const denominator = c * ratio + d;
  return [(a * ratio + b) / denominator, (b * ratio - a) / denominator];
}

/** Solves A x = b (conjugateTranspose false) or Aᴴ x = b (true) for one complex vector. */
function complexLuSolveVector(
  factor: ComplexLuFactorization,
  bRe: Float64Array,
  bIm: Float64Array,
  conjugateTranspose: boolean,
): [Float64Array, Float64Array] {
  const { n, re, im, permutation } = factor;
  if (!conjugateTranspose) {
    const xr = new Float64Array(n);
    const xi = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      xr[i] = bRe[permutation[i]];
      xi[i] = bIm[permutation[i]];
    }
    for (let i = 0; i < n; i++) {
      let sr = xr[i];
      let si = xi[i];
      for (let k = 0; k < i; k++) {
        const lr = re[i * n + k];
        const li = im[i * n + k];
        sr -= lr * xr[k] - li * xi[k];
        si -= lr * xi[k] + li * xr[k];
      }
      xr[i] = sr;
      xi[i] = si;
    }
    for (let i = n - 1; i >= 0; i--) {
      let sr = xr[i];
      let si = xi[i];
      for (let k = i + 1; k < n; k++) {
        const ur = re[i * n + k];
        const ui = im[i * n + k];
        sr -= ur * xr[k] - ui * xi[k];
        si -= ur * xi[k] + ui * xr[k];
      }
      [xr[i], xi[i]] = complexDivide(sr, si, re[i * n + i], im[i * n + i]);
    }
    return [xr, xi];
  }
  // Aᴴ = Uᴴ Lᴴ P: solve Uᴴ w = b, Lᴴ v = w, x = Pᵀ v.
  const wr = bRe.slice();
  const wi = bIm.slice();
  for (let i = 0; i < n; i++) {
    let sr = wr[i];
    let si = wi[i];
    for (let k = 0; k < i; k++) {
      const ur = re[k * n + i];
      const ui = -im[k * n + i];
      sr -= ur * wr[k] - ui * wi[k];
      si -= ur * wi[k] + ui * wr[k];
    }
    [wr[i], wi[i]] = complexDivide(sr, si, re[i * n + i], -im[i * n + i]);
  }
  for (let i = n - 1; i >= 0; i--) {
    let sr = wr[i];
    let si = wi[i];
    for (let k = i + 1; k < n; k++) {
      const lr = re[k * n + i];
      const li = -im[k * n + i];
      sr -= lr * wr[k] - li * wi[k];
      si -= lr * wi[k] + li * wr[k];
    }
    wr[i] = sr;
    wi[i] = si;
  }
  const xr = new Float64Array(n);
  const xi = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    xr[permutation[i]] = wr[i];
    xi[permutation[i]] = wi[i];
  }
  return [xr, xi];
}

/** Complex Hager/Higham estimate of ‖A⁻¹‖₁ (Higham 1988, complex variant: signs become unit phases). */
function estimateComplexInverseNorm1(factor: ComplexLuFactorization): number {
  const n = factor.n;
  let xr = new Float64Array(n).fill(1 / n);
  let xi = new Float64Array(n);
  let estimate = 0;
  for (let iteration = 0; iteration < 5; iteration++) {
    const [yr, yi] = complexLuSolveVector(factor, xr, xi, false);
    let norm = 0;
    for (let i = 0; i < n; i++) norm += Math.hypot(yr[i], yi[i]);
    if (!Number.isFinite(norm)) return Infinity;
    if (iteration > 0 && norm <= estimate) break;
    estimate = norm;
    const sr = new Float64Array(n);
    const si = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const magnitude = Math.hypot(yr[i], yi[i]);
      if (magnitude === 0) sr[i] = 1;
      else {
        sr[i] = yr[i] / magnitude;
        si[i] = yi[i] / magnitude;
      }
    }
    const [zr, zi] = complexLuSolveVector(factor, sr, si, true);
    let largest = 0;
    let largestIndex = 0;
    let realZx = 0;
    for (let i = 0; i < n; i++) {
      realZx += zr[i] * xr[i] + zi[i] * xi[i];
      const magnitude = Math.hypot(zr[i], zi[i]);
      if (magnitude > largest) {
        largest = magnitude;
        largestIndex = i;
      }
    }
    if (iteration > 0 && largest <= realZx) break;
    xr = new Float64Array(n);
    xi = new Float64Array(n);
    xr[largestIndex] = 1;
  }
  const alternating = new Float64Array(n);
  for (let i = 0; i < n; i++) alternating[i] = (i % 2 === 0 ? 1 : -1) * (1 + (n > 1 ? i / (n - 1) : 0));
  const [yr, yi] = complexLuSolveVector(factor, alternating, new Float64Array(n), false);
  let norm = 0;
  for (let i = 0; i < n; i++) norm += Math.hypot(yr[i], yi[i]);
  return Math.max(estimate, (2 * norm) / (3 * n));
}

/**
 * Solves the complex system A·X = B (A square) by complex LU with partial pivoting.
 * Reports an estimated reciprocal 1-norm condition number like solveLinear.
 */
export function solveComplexLinear(A: ComplexRows, B: ComplexRows): ComplexLinearSolution {
  const n = A.re.length;
  const m = n === 0 ? (B.re[0]?.length ?? 0) : B.re[0].length;
  if (n === 0) return { X: { re: [], im: [] }, rcond: 1, singular: false };
  const re = denseFromRows(A.re).data;
  const im = denseFromRows(A.im).data;
  let normA1 = 0;
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += Math.hypot(re[i * n + j], im[i * n + j]);
    normA1 = Math.max(normA1, sum);
  }
  const factor = complexLuFactor(re, im, n);
  const nanResult = (): ComplexRows => ({ re: nanRows(n, m), im: nanRows(n, m) });
  if (factor.hasZeroPivot || normA1 === 0 || !Number.isFinite(normA1)) {
    return { X: nanResult(), rcond: 0, singular: true };
  }
  const inverseNorm = estimateComplexInverseNorm1(factor);
  const rcond = Number.isFinite(inverseNorm) && inverseNorm > 0 ? 1 / (normA1 * inverseNorm) : 0;
  const Xre = nanRows(n, m);
  const Xim = nanRows(n, m);
  for (let j = 0; j < m; j++) {
    const bRe = new Float64Array(n);
    const bIm = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      bRe[i] = B.re[i][j];
      bIm[i] = B.im[i][j];
    }
    const [xr, xi] = complexLuSolveVector(factor, bRe, bIm, false);
    for (let i = 0; i < n; i++) {
      Xre[i][j] = xr[i];
      Xim[i][j] = xi[i];
    }
  }
  return { X: { re: Xre, im: Xim }, rcond, singular: isNumericallySingular(n, false, rcond) };
}
