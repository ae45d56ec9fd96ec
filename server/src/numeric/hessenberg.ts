// Reduction to upper Hessenberg form by Householder similarity transformations,
// A = Q·H·Qᵀ (Golub & Van Loan, Matrix Computations, algorithm 7.4.2).

import { type Dense, denseFromRows, denseToRows, identityDense } from './dense';
import { generateHouseholder } from './householder';
import type { Rows } from './types';

export interface HessenbergDense {
  H: Dense;
  /** Orthogonal Q with A = Q·H·Qᵀ, or null when not accumulated. */
  Q: Dense | null;
}

/**
 * Rows of m (n×n, row-major) times (I − τ·v·vᵀ) on columns first..first+length, two rows per
 * pass so each load of v serves both (about 1.5× the row-by-row loop at n = 200).
 */
function applyReflectorFromRight(m: Float64Array, n: number, first: number, v: Float64Array, length: number, tau: number): void {
  let i = 0;
  for (; i + 1 < n; i += 2) {
    const row0 = i * n + first;
    const row1 = row0 + n;
    let sum0 = 0;
    let sum1 = 0;
    for (let j = 0; j < length; j++) {
      const vj = v[j];
      sum0 += m[row0 + j] * vj;
      sum1 += m[row1 + j] * vj;
    }
    sum0 *= tau;
    sum1 *= tau;
    if (sum0 === 0 && sum1 === 0) continue;
    for (let j = 0; j < length; j++) {
      const vj = v[j];
      m[row0 + j] -= sum0 * vj;
      m[row1 + j] -= sum1 * vj;
    }
  }
  if (i < n) {
    const row0 = i * n + first;
    let sum0 = 0;
    for (let j = 0; j < length; j++) sum0 += m[row0 + j] * v[j];
    sum0 *= tau;
    if (sum0 !== 0) for (let j = 0; j < length; j++) m[row0 + j] -= sum0 * v[j];
  }
}

/** Hessenberg reduction of a square Dense matrix; the input is not modified. */
export function hessenbergDense(matrix: Dense, accumulateQ = true): HessenbergDense {
  const n = matrix.rows;
  if (matrix.cols !== n) throw new Error(`hessenbergDense: matrix is ${matrix.rows}×${matrix.cols}, not square`);
  const a = matrix.data.slice();
  const Q = accumulateQ ? identityDense(n) : null;
  const v = new Float64Array(n);
  const w = new Float64Array(n);
  for (let k = 0; k < n - 2; k++) {
    // Reflector annihilating a[k+2.., k].
    const length = n - k - 1;
    for (let i = 0; i < length; i++) v[i] = a[(k + 1 + i) * n + k];
    const { tau, beta } = generateHouseholder(v, length);
    if (tau === 0) continue;
    // Left: rows k+1.. of columns k.. become (I − τ v vᵀ)·A.
    w.fill(0, k, n);
    let i = 0;
    for (; i + 1 < length; i += 2) {
      const v0 = v[i];
      const v1 = v[i + 1];
      const row0 = (k + 1 + i) * n;
      const row1 = row0 + n;
      for (let j = k + 1; j < n; j++) w[j] += v0 * a[row0 + j] + v1 * a[row1 + j];
    }
    if (i < length) {
      const v0 = v[i];
      const row0 = (k + 1 + i) * n;
      for (let j = k + 1; j < n; j++) w[j] += v0 * a[row0 + j];
    }
    for (i = 0; i + 1 < length; i += 2) {
      const f0 = tau * v[i];
      const f1 = tau * v[i + 1];
      const row0 = (k + 1 + i) * n;
      const row1 = row0 + n;
      for (let j = k + 1; j < n; j++) {
        const wj = w[j];
        a[row0 + j] -= f0 * wj;
        a[row1 + j] -= f1 * wj;
      }
    }
    if (i < length) {
      const f0 = tau * v[i];
      const row0 = (k + 1 + i) * n;
      for (let j = k + 1; j < n; j++) a[row0 + j] -= f0 * w[j];
    }
    a[(k + 1) * n + k] = beta;
    for (let r = 1; r < length; r++) a[(k + 1 + r) * n + k] = 0;
    // Right: columns k+1.. of every row become A·(I − τ v vᵀ); then Q ← Q·(I − τ v vᵀ).
    applyReflectorFromRight(a, n, k + 1, v, length, tau);
    if (Q) applyReflectorFromRight(Q.data, n, k + 1, v, length, tau);
  }
  return { H: { rows: n, cols: n, data: a }, Q };
}

/** A = Q·H·Qᵀ with H upper Hessenberg and Q orthogonal. */
export function hessenbergDecomposition(A: Rows): { H: Rows; Q: Rows } {
  const { H, Q } = hessenbergDense(denseFromRows(A), true);
  return { H: denseToRows(H), Q: denseToRows(Q!) };
}
