// Householder QR factorisation, optionally with column pivoting (Businger & Golub, Numer. Math. 7,
// 1965; Golub & Van Loan, Matrix Computations, algorithm 5.4.1) with the column-norm downdating
// safeguard of LAPACK dlaqp2 (Drmač & Bujanović, 2008).

import { type Dense, denseFromRows, denseToRows, scaledNorm2 } from './dense';
import { generateHouseholder } from './householder';
import type { Rows } from './types';

const EPS = Number.EPSILON;

export interface HouseholderQrDense {
  /** R in and above the diagonal; reflector vectors (without their unit first entry) below. */
  packed: Dense;
  tau: Float64Array;
  /** Column j of the factorised matrix is column permutation[j] of the input. */
  permutation: Int32Array;
}

/** Householder QR of an m×n Dense matrix, A·P = Q·R; the input is not modified. */
export function householderQrDense(matrix: Dense, pivoting: boolean): HouseholderQrDense {
  const m = matrix.rows;
  const n = matrix.cols;
  const a = matrix.data.slice();
  const steps = Math.min(m, n);
  const tau = new Float64Array(steps);
  const permutation = new Int32Array(n);
  for (let j = 0; j < n; j++) permutation[j] = j;
  const partialNorms = new Float64Array(n);
  const referenceNorms = new Float64Array(n);
  if (pivoting) {
    for (let j = 0; j < n; j++) {
      partialNorms[j] = scaledNorm2(a, j, m * n, n);
      referenceNorms[j] = partialNorms[j];
    }
  }
  const v = new Float64Array(m);
  const w = new Float64Array(n);
  const downdateTolerance = Math.sqrt(EPS);
  for (let k = 0; k < steps; k++) {
    if (pivoting) {
      let best = k;
      for (let j = k + 1; j < n; j++) if (partialNorms[j] > partialNorms[best]) best = j;
      if (best !== k) {
        for (let i = 0; i < m; i++) {
          const swap = a[i * n + k];
          a[i * n + k] = a[i * n + best];
          a[i * n + best] = swap;
        }
        const swapIndex = permutation[k];
        permutation[k] = permutation[best];
        permutation[best] = swapIndex;
        partialNorms[best] = partialNorms[k];
        referenceNorms[best] = referenceNorms[k];
      }
    }
    const length = m - k;
    for (let i = 0; i < length; i++) v[i] = a[(k + i) * n + k];
    const { tau: t, beta } = generateHouseholder(v, length);
    tau[k] = t;
    a[k * n + k] = beta;
    for (let i = 1; i < length; i++) a[(k + i) * n + k] = v[i];
    if (t !== 0 && k + 1 < n) {
      w.fill(0, k + 1, n);
      for (let i = 0; i < length; i++) {
        const vi = v[i];
        if (vi === 0) continue;
        const offset = (k + i) * n;
        for (let j = k + 1; j < n; j++) w[j] += vi * a[offset + j];
      }
      for (let i = 0; i < length; i++) {
        const factor = t * v[i];
        if (factor === 0) continue;
        const offset = (k + i) * n;
        for (let j = k + 1; j < n; j++) a[offset + j] -= factor * w[j];
      }
    }
    if (pivoting) {
      for (let j = k + 1; j < n; j++) {
        if (partialNorms[j] === 0) continue;
        const ratio = Math.abs(a[k * n + j]) / partialNorms[j];
        const remaining = Math.max(0, (1 + ratio) * (1 - ratio));
        const drift = remaining * (partialNorms[j] / referenceNorms[j]) ** 2;
        if (drift <= downdateTolerance) {
          partialNorms[j] = k + 1 < m ? scaledNorm2(a, (k + 1) * n + j, m * n, n) : 0;
          referenceNorms[j] = partialNorms[j];
        } else {
          partialNorms[j] *= Math.sqrt(remaining);
        }
      }
    }
  }
  return { packed: { rows: m, cols: n, data: a }, tau, permutation };
}

/** Forms the first `columns` columns of Q = H₀·H₁·…·H_{k−1} (columns = min(m,n) for thin, m for full). */
export function formQ(factor: HouseholderQrDense, columns: number): Dense {
  const { packed, tau } = factor;
  const m = packed.rows;
  const n = packed.cols;
  const q = new Float64Array(m * columns);
  for (let i = 0; i < Math.min(m, columns); i++) q[i * columns + i] = 1;
  const v = new Float64Array(m);
  const w = new Float64Array(columns);
  for (let k = tau.length - 1; k >= 0; k--) {
    const t = tau[k];
    if (t === 0) continue;
    const length = m - k;
    v[0] = 1;
    for (let i = 1; i < length; i++) v[i] = packed.data[(k + i) * n + k];
    w.fill(0);
    for (let i = 0; i < length; i++) {
      const vi = v[i];
      if (vi === 0) continue;
      const offset = (k + i) * columns;
      for (let j = 0; j < columns; j++) w[j] += vi * q[offset + j];
    }
    for (let i = 0; i < length; i++) {
      const factor = t * v[i];
      if (factor === 0) continue;
      const offset = (k + i) * columns;
      for (let j = 0; j < columns; j++) q[offset + j] -= factor * w[j];
    }
  }
  return { rows: m, cols: columns, data: q };
}

/** Reflector k of a packed factorisation as a full-length vector v (v[0] = 1) in `into`. */
function reflectorVector(factor: HouseholderQrDense, k: number, into: Float64Array): number {
  const { packed } = factor;
  const length = packed.rows - k;
  into[0] = 1;
  for (let i = 1; i < length; i++) into[i] = packed.data[(k + i) * packed.cols + k];
  return length;
}

/**
 * Qᵀ·M for the Q of a packed factorisation (M has as many rows as the factorised matrix): the
 * reflectors applied one by one, about 4·r·rows·cols flops for r reflectors instead of forming Q.
 */
export function applyQTranspose(factor: HouseholderQrDense, M: Dense): Dense {
  const rows = factor.packed.rows;
  if (M.rows !== rows) throw new Error(`applyQTranspose: ${M.rows} rows, the factor has ${rows}`);
  const cols = M.cols;
  const data = M.data.slice();
  const v = new Float64Array(rows);
  const w = new Float64Array(cols);
  for (let k = 0; k < factor.tau.length; k++) {
    const t = factor.tau[k];
    if (t === 0) continue;
    const length = reflectorVector(factor, k, v);
    w.fill(0);
    for (let i = 0; i < length; i++) {
      const vi = v[i];
      if (vi === 0) continue;
      for (let j = 0, o = (k + i) * cols; j < cols; j++, o++) w[j] += vi * data[o];
    }
    for (let i = 0; i < length; i++) {
      const f = t * v[i];
      if (f === 0) continue;
      for (let j = 0, o = (k + i) * cols; j < cols; j++, o++) data[o] -= f * w[j];
    }
  }
  return { rows, cols, data };
}

/** M·Q for the Q of a packed factorisation (M has as many columns as the factorised matrix has rows). */
export function applyQFromRight(M: Dense, factor: HouseholderQrDense): Dense {
  const size = factor.packed.rows;
  if (M.cols !== size) throw new Error(`applyQFromRight: ${M.cols} columns, the factor has ${size} rows`);
  const rows = M.rows;
  const data = M.data.slice();
  const v = new Float64Array(size);
  for (let k = 0; k < factor.tau.length; k++) {
    const t = factor.tau[k];
    if (t === 0) continue;
    const length = reflectorVector(factor, k, v);
    for (let i = 0; i < rows; i++) {
      const offset = i * size + k;
      let dot = 0;
      for (let j = 0; j < length; j++) dot += data[offset + j] * v[j];
      const f = t * dot;
      if (f === 0) continue;
      for (let j = 0; j < length; j++) data[offset + j] -= f * v[j];
    }
  }
  return { rows, cols: size, data };
}

/** The upper-trapezoidal R (rows × n) from a packed factorisation. */
export function extractR(factor: HouseholderQrDense, rows: number): Dense {
  const { packed } = factor;
  const n = packed.cols;
  const r = new Float64Array(rows * n);
  for (let i = 0; i < Math.min(rows, packed.rows); i++) {
    for (let j = i; j < n; j++) r[i * n + j] = packed.data[i * n + j];
  }
  return { rows, cols: n, data: r };
}

export interface QrOptions {
  /** Full m×m Q and m×n R instead of the thin m×k, k×n factors (k = min(m, n)). Default false. */
  complete?: boolean;
}

/** A = Q·R with Q having orthonormal columns and R upper trapezoidal. */
export function qrDecomposition(A: Rows, options: QrOptions = {}): { Q: Rows; R: Rows } {
  const matrix = denseFromRows(A);
  const factor = householderQrDense(matrix, false);
  const columns = options.complete ? matrix.rows : Math.min(matrix.rows, matrix.cols);
  return { Q: denseToRows(formQ(factor, columns)), R: denseToRows(extractR(factor, columns)) };
}

export interface PivotedQr {
  Q: Rows;
  R: Rows;
  /** A[:, permutation] = Q·R, i.e. column j of Q·R is column permutation[j] of A. */
  permutation: number[];
  /** Number of diagonal entries of R above the tolerance. */
  rank: number;
}

/**
 * Column-pivoted QR, A·P = Q·R, with |R₁₁| ≥ |R₂₂| ≥ …. The rank counts |R_jj| > tol, default
 * tol = max(m, n)·ε·|R₁₁| (the usual rank-revealing-QR threshold; see numericalRank for the SVD one).
 */
export function qrWithPivoting(A: Rows, options: QrOptions & { tolerance?: number } = {}): PivotedQr {
  const matrix = denseFromRows(A);
  const m = matrix.rows;
  const n = matrix.cols;
  const factor = householderQrDense(matrix, true);
  const columns = options.complete ? m : Math.min(m, n);
  const R = extractR(factor, columns);
  const r11 = Math.min(m, n) > 0 ? Math.abs(R.data[0]) : 0;
  const tolerance = options.tolerance ?? Math.max(m, n) * EPS * r11;
  let rank = 0;
  for (let k = 0; k < Math.min(m, n); k++) if (Math.abs(R.data[k * n + k]) > tolerance) rank++;
  return { Q: denseToRows(formQ(factor, columns)), R: denseToRows(R), permutation: Array.from(factor.permutation), rank };
}
