// Singular value decomposition, two methods:
// - 'bidiagonal-qr' (the default): Golub–Kahan–Reinsch in bidiagonalSvd.ts. Fast (O(mn²) with a
//   small constant); singular values accurate to O(ε·σ_max) in absolute terms, which is what rank
//   decisions, norms and condition numbers need.
// - 'jacobi': below. About ten times slower, but small singular values of matrices with graded
//   rows or columns come out to high RELATIVE accuracy; ask for it when the size of a tiny σ matters.
//
// One-sided Jacobi rotations (Hestenes 1958) applied to the
// triangular factor of a column-pivoted QR, the preconditioned scheme of Drmač & Veselić (SIAM J.
// Matrix Anal. Appl. 29, 2008). One-sided Jacobi computes singular values to high relative accuracy
// for matrices whose columns are well scaled (Demmel & Veselić, SIAM J. Matrix Anal. Appl. 13, 1992).
// Rotations stop when every pair of columns is orthogonal to n·ε relative to their norms; sweeps are
// bounded.

import { type Dense, denseFromRows, denseToRows, scaledNorm2, transposeDense } from './dense';
import { extractR, formQ, householderQrDense } from './qr';
import type { Rows } from './types';
import { countIterations, noteNonConvergence } from './iterationCount';
import { bidiagonalSvdDense } from './bidiagonalSvd';

const EPS = Number.EPSILON;
const MAX_SWEEPS = 60;

export interface SvdDense {
  /** m×k with orthonormal columns (k = min(m, n)), or null when not requested. */
  U: Dense | null;
  /** Singular values, descending. */
  s: Float64Array;
  /** n×k with orthonormal columns, or null when not requested. */
  V: Dense | null;
  converged: boolean;
}

export type SvdMethod = 'bidiagonal-qr' | 'jacobi';

export interface SvdOptions {
  /** 'bidiagonal-qr' (default, fast) or 'jacobi' (high relative accuracy of small σ). */
  method?: SvdMethod;
}

/**
 * One-sided Jacobi on the columns of the k×k matrix whose transpose is stored row-major in
 * `columns` (so each column is contiguous). Optionally rotates the rows of `rotations` alike.
 */
function jacobiOrthogonaliseColumns(columns: Float64Array, k: number, rotations: Float64Array | null): boolean {
  const tolerance = k * EPS;
  const norms = new Float64Array(k);
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    countIterations();
    let rotated = false;
    for (let j = 0; j < k; j++) {
      let sum = 0;
      const offset = j * k;
      for (let i = 0; i < k; i++) sum += columns[offset + i] * columns[offset + i];
      norms[j] = sum;
    }
    for (let p = 0; p < k - 1; p++) {
      for (let q = p + 1; q < k; q++) {
        const alpha = norms[p];
        const beta = norms[q];
        if (alpha === 0 || beta === 0) continue;
        const po = p * k;
        const qo = q * k;
        let gamma = 0;
        for (let i = 0; i < k; i++) gamma += columns[po + i] * columns[qo + i];
        if (!(Math.abs(gamma) > tolerance * Math.sqrt(alpha) * Math.sqrt(beta))) continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.hypot(1, zeta));
        const c = 1 / Math.hypot(1, t);
        const s = c * t;
        for (let i = 0; i < k; i++) {
          const x = columns[po + i];
          const y = columns[qo + i];
          columns[po + i] = c * x - s * y;
          columns[qo + i] = s * x + c * y;
        }
        if (rotations) {
          for (let i = 0; i < k; i++) {
            const x = rotations[po + i];
            const y = rotations[qo + i];
            rotations[po + i] = c * x - s * y;
            rotations[qo + i] = s * x + c * y;
          }
        }
        norms[p] = alpha - t * gamma;
        norms[q] = beta + t * gamma;
      }
    }
    if (!rotated) return true;
  }
  noteNonConvergence('svd-jacobi');
  return false;
}

/** Thin SVD A = U·diag(s)·Vᵀ of an m×n Dense matrix. */
export function svdDense(matrix: Dense, wantVectors: boolean, options: SvdOptions = {}): SvdDense {
  if ((options.method ?? 'bidiagonal-qr') === 'bidiagonal-qr') return bidiagonalSvdDense(matrix, wantVectors);
  return jacobiSvdDense(matrix, wantVectors);
}

/** Thin SVD by one-sided Jacobi on the triangular factor of a column-pivoted QR. */
function jacobiSvdDense(matrix: Dense, wantVectors: boolean): SvdDense {
  const m = matrix.rows;
  const n = matrix.cols;
  if (m < n) {
    const transposed = jacobiSvdDense(transposeDense(matrix), wantVectors);
    return { U: transposed.V, s: transposed.s, V: transposed.U, converged: transposed.converged };
  }
  const k = n;
  if (k === 0) {
    return { U: wantVectors ? { rows: m, cols: 0, data: new Float64Array(0) } : null, s: new Float64Array(0), V: wantVectors ? { rows: 0, cols: 0, data: new Float64Array(0) } : null, converged: true };
  }
  if (!matrix.data.every(Number.isFinite)) {
    const nanDense = (rows: number, cols: number): Dense => ({ rows, cols, data: new Float64Array(rows * cols).fill(NaN) });
    return { U: wantVectors ? nanDense(m, k) : null, s: new Float64Array(k).fill(NaN), V: wantVectors ? nanDense(n, k) : null, converged: false };
  }
  // A·P = Q·R, then Jacobi on the columns of X = Rᵀ (the rows of R, contiguous in row-major storage):
  // X·J = W with orthogonal columns. Drmač & Veselić: the transposed triangular factor of a pivoted
  // QR converges in few sweeps. Then Rᵀ = W·Jᵀ, so A·P = (Q·J)·Σ·(W·Σ⁻¹)ᵀ.
  const factor = householderQrDense(matrix, true);
  const columns = extractR(factor, k).data; // row j of R = column j of X
  const rotations = wantVectors ? new Float64Array(k * k) : null; // row j = column j of J
  if (rotations) for (let i = 0; i < k; i++) rotations[i * k + i] = 1;
  const converged = jacobiOrthogonaliseColumns(columns, k, rotations);
  const singular = new Float64Array(k);
  for (let j = 0; j < k; j++) singular[j] = scaledNorm2(columns, j * k, (j + 1) * k);
  const order = Array.from({ length: k }, (_, j) => j).sort((x, y) => singular[y] - singular[x]);
  const s = Float64Array.from(order, (j) => singular[j]);
  if (!wantVectors) return { U: null, s, V: null, converged };

  // V = P·W·Σ⁻¹ (null columns completed to an orthonormal set), U = Q·J, both reordered.
  const basis = new Float64Array(k * k); // row-major k×k: columns W_j / σ_j
  const negligible = s[0] * k * EPS;
  const missing: number[] = [];
  for (let newColumn = 0; newColumn < k; newColumn++) {
    const j = order[newColumn];
    const sigma = singular[j];
    if (sigma > negligible && sigma > 0) {
      for (let i = 0; i < k; i++) basis[i * k + newColumn] = columns[j * k + i] / sigma;
    } else {
      missing.push(newColumn);
    }
  }
  completeOrthonormalColumns(basis, k, missing);
  const V: Dense = { rows: n, cols: k, data: new Float64Array(n * k) };
  for (let i = 0; i < k; i++) V.data.set(basis.subarray(i * k, (i + 1) * k), factor.permutation[i] * k);
  const orderedRotations = new Float64Array(k * k); // row-major k×k: J with reordered columns
  for (let newColumn = 0; newColumn < k; newColumn++) {
    const j = order[newColumn];
    for (let i = 0; i < k; i++) orderedRotations[i * k + newColumn] = rotations![j * k + i];
  }
  const Q = formQ(factor, k);
  const U: Dense = { rows: m, cols: k, data: new Float64Array(m * k) };
  for (let i = 0; i < m; i++) {
    for (let p = 0; p < k; p++) {
      const qip = Q.data[i * k + p];
      if (qip === 0) continue;
      for (let j = 0; j < k; j++) U.data[i * k + j] += qip * orderedRotations[p * k + j];
    }
  }
  return { U, s, V, converged };
}

/**
 * Fills the listed columns of the k×k row-major basis with unit vectors orthogonal to all other
 * columns (modified Gram–Schmidt, twice, over the standard basis vectors).
 */
function completeOrthonormalColumns(basis: Float64Array, k: number, missing: number[]): void {
  if (missing.length === 0) return;
  const missingSet = new Set(missing);
  const filled = Array.from({ length: k }, (_, j) => j).filter((j) => !missingSet.has(j));
  const candidate = new Float64Array(k);
  let unit = 0;
  for (const column of missing) {
    for (; unit < k; unit++) {
      candidate.fill(0);
      candidate[unit] = 1;
      for (let pass = 0; pass < 2; pass++) {
        for (const other of filled) {
          let dot = 0;
          for (let i = 0; i < k; i++) dot += basis[i * k + other] * candidate[i];
          for (let i = 0; i < k; i++) candidate[i] -= dot * basis[i * k + other];
        }
      }
      const norm = scaledNorm2(candidate);
      if (norm > 0.5) {
        for (let i = 0; i < k; i++) basis[i * k + column] = candidate[i] / norm;
        filled.push(column);
        unit++;
        break;
      }
    }
  }
}

/** Singular values of A, descending. */
export function singularValues(A: Rows, options: SvdOptions = {}): number[] {
  const matrix = denseFromRows(A);
  return Array.from(svdDense(matrix, false, options).s);
}

/** Thin SVD A = U·diag(s)·Vᵀ: U is m×k, V is n×k (k = min(m, n)), s descending. */
export function svd(A: Rows, options: SvdOptions = {}): { U: Rows; s: number[]; V: Rows; converged: boolean } {
  const result = svdDense(denseFromRows(A), true, options);
  return { U: denseToRows(result.U!), s: Array.from(result.s), V: denseToRows(result.V!), converged: result.converged };
}

/** Spectral norm σ_max(A) (0 for an empty matrix). */
export function norm2(A: Rows): number {
  const s = singularValues(A);
  return s.length === 0 ? 0 : s[0];
}

/** 2-norm condition number σ_max/σ_min of A (Infinity when σ_min = 0). */
export function conditionNumber2(A: Rows): number {
  const s = singularValues(A);
  if (s.length === 0) return 1;
  const smallest = s[s.length - 1];
  return smallest === 0 ? Infinity : s[0] / smallest;
}
