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
    for (let i = 0; i < length; i++) {
      const vi = v[i];
      if (vi === 0) continue;
      const rowOffset = (k + 1 + i) * n;
      for (let j = k + 1; j < n; j++) w[j] += vi * a[rowOffset + j];
    }
    for (let i = 0; i < length; i++) {
      const factor = tau * v[i];
      if (factor === 0) continue;
      const rowOffset = (k + 1 + i) * n;
      for (let j = k + 1; j < n; j++) a[rowOffset + j] -= factor * w[j];
    }
    a[(k + 1) * n + k] = beta;
    for (let i = 1; i < length; i++) a[(k + 1 + i) * n + k] = 0;
    // Right: columns k+1.. of every row become A·(I − τ v vᵀ).
    for (let i = 0; i < n; i++) {
      const rowOffset = i * n + k + 1;
      let sum = 0;
      for (let j = 0; j < length; j++) sum += a[rowOffset + j] * v[j];
      if (sum === 0) continue;
      sum *= tau;
      for (let j = 0; j < length; j++) a[rowOffset + j] -= sum * v[j];
    }
    if (Q) {
      const q = Q.data;
      for (let i = 0; i < n; i++) {
        const rowOffset = i * n + k + 1;
        let sum = 0;
        for (let j = 0; j < length; j++) sum += q[rowOffset + j] * v[j];
        if (sum === 0) continue;
        sum *= tau;
        for (let j = 0; j < length; j++) q[rowOffset + j] -= sum * v[j];
      }
    }
  }
  return { H: { rows: n, cols: n, data: a }, Q };
}

/** A = Q·H·Qᵀ with H upper Hessenberg and Q orthogonal. */
export function hessenbergDecomposition(A: Rows): { H: Rows; Q: Rows } {
  const { H, Q } = hessenbergDense(denseFromRows(A), true);
  return { H: denseToRows(H), Q: denseToRows(Q!) };
}
