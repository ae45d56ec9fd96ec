// Swapping two adjacent diagonal blocks (1×1 or 2×2) of a real Schur form by an orthogonal
// similarity: the direct swapping method of Bai & Demmel (Linear Algebra Appl. 186, 1993), as in
// LAPACK dlaexc. The small Sylvester equation T11·X − X·T22 = T12 gives the invariant subspace
// [−X; I]; the swap is rejected when the transformed block would not be block upper triangular
// to working accuracy.

import { generateHouseholder } from './householder';
import { standardizeBlockInPlace } from './twoByTwoStandardForm';

const EPS = Number.EPSILON;
const SAFE_MIN = 2.2250738585072014e-308;

/**
 * Solves T11·X − X·T22 = T12 for the small blocks (n1, n2 ∈ {1, 2}) of the nd×nd matrix d by
 * Gaussian elimination with complete pivoting on the Kronecker form; pivots smaller than `minimumPivot`
 * are raised to it, as LAPACK dlasy2 does for (nearly) common eigenvalues.
 */
function solveSmallSylvester(d: Float64Array, nd: number, n1: number, n2: number, minimumPivot: number): Float64Array {
  const size = n1 * n2;
  const k = new Float64Array(size * size);
  const rhs = new Float64Array(size);
  for (let p = 0; p < n1; p++) {
    for (let q = 0; q < n2; q++) {
      const row = p * n2 + q;
      rhs[row] = d[p * nd + n1 + q];
      for (let r = 0; r < n1; r++) k[row * size + r * n2 + q] += d[p * nd + r];
      for (let s = 0; s < n2; s++) k[row * size + p * n2 + s] -= d[(n1 + s) * nd + n1 + q];
    }
  }
  const columnOrder = Array.from({ length: size }, (_, i) => i);
  for (let step = 0; step < size; step++) {
    let bestRow = step;
    let bestColumn = step;
    let best = -1;
    for (let i = step; i < size; i++) {
      for (let j = step; j < size; j++) {
        const magnitude = Math.abs(k[i * size + j]);
        if (magnitude > best) {
          best = magnitude;
          bestRow = i;
          bestColumn = j;
        }
      }
    }
    if (bestRow !== step) {
      for (let j = 0; j < size; j++) {
        const swap = k[step * size + j];
        k[step * size + j] = k[bestRow * size + j];
        k[bestRow * size + j] = swap;
      }
      const swap = rhs[step];
      rhs[step] = rhs[bestRow];
      rhs[bestRow] = swap;
    }
    if (bestColumn !== step) {
      for (let i = 0; i < size; i++) {
        const swap = k[i * size + step];
        k[i * size + step] = k[i * size + bestColumn];
        k[i * size + bestColumn] = swap;
      }
      const swap = columnOrder[step];
      columnOrder[step] = columnOrder[bestColumn];
      columnOrder[bestColumn] = swap;
    }
    if (Math.abs(k[step * size + step]) < minimumPivot) k[step * size + step] = minimumPivot;
    const pivot = k[step * size + step];
    for (let i = step + 1; i < size; i++) {
      const factor = k[i * size + step] / pivot;
      if (factor === 0) continue;
      for (let j = step; j < size; j++) k[i * size + j] -= factor * k[step * size + j];
      rhs[i] -= factor * rhs[step];
    }
  }
  const solution = new Float64Array(size);
  for (let i = size - 1; i >= 0; i--) {
    let sum = rhs[i];
    for (let j = i + 1; j < size; j++) sum -= k[i * size + j] * solution[j];
    solution[i] = sum / k[i * size + i];
  }
  const x = new Float64Array(size);
  for (let i = 0; i < size; i++) x[columnOrder[i]] = solution[i];
  return x;
}

/** q ← qᵀ·m·q for nd×nd matrices (helper for the swap test). */
function similarity(q: Float64Array, m: Float64Array, nd: number): Float64Array {
  const temp = new Float64Array(nd * nd);
  for (let i = 0; i < nd; i++)
    for (let j = 0; j < nd; j++) {
      let sum = 0;
      for (let p = 0; p < nd; p++) sum += m[i * nd + p] * q[p * nd + j];
      temp[i * nd + j] = sum;
    }
  const result = new Float64Array(nd * nd);
  for (let i = 0; i < nd; i++)
    for (let j = 0; j < nd; j++) {
      let sum = 0;
      for (let p = 0; p < nd; p++) sum += q[p * nd + i] * temp[p * nd + j];
      result[i * nd + j] = sum;
    }
  return result;
}

/**
 * Swaps two adjacent 1×1 blocks by one Givens rotation (LAPACK dlaexc, n1 = n2 = 1): the rotation
 * taking [t12, t22 − t11] to [r, 0] is applied to rows j1, j1+1 right of the block, to columns
 * j1, j1+1 above it and to Z's columns. This swap is always stable, so no test is needed; it is
 * the common case (real spectra) and costs O(n) with no allocation.
 */
function swapOneByOne(t: Float64Array, n: number, z: Float64Array | null, j1: number): void {
  const j2 = j1 + 1;
  const t11 = t[j1 * n + j1];
  const t22 = t[j2 * n + j2];
  const f = t[j1 * n + j2];
  const g = t22 - t11;
  const r = Math.hypot(f, g);
  const cs = r === 0 ? 1 : f / r;
  const sn = r === 0 ? 0 : g / r;
  for (let j = j2 + 1; j < n; j++) {
    const x = t[j1 * n + j];
    const y = t[j2 * n + j];
    t[j1 * n + j] = cs * x + sn * y;
    t[j2 * n + j] = cs * y - sn * x;
  }
  for (let i = 0; i < j1; i++) {
    const x = t[i * n + j1];
    const y = t[i * n + j2];
    t[i * n + j1] = cs * x + sn * y;
    t[i * n + j2] = cs * y - sn * x;
  }
  t[j1 * n + j1] = t22;
  t[j2 * n + j2] = t11;
  t[j2 * n + j1] = 0;
  if (z) {
    for (let i = 0; i < n; i++) {
      const x = z[i * n + j1];
      const y = z[i * n + j2];
      z[i * n + j1] = cs * x + sn * y;
      z[i * n + j2] = cs * y - sn * x;
    }
  }
}

/**
 * Swaps the adjacent diagonal blocks of sizes n1 (at j1) and n2 (at j1 + n1) of the n×n
 * quasi-triangular t, updating z. Returns false (and leaves t, z untouched) when the swap is rejected.
 */
export function swapAdjacentBlocks(
  t: Float64Array,
  n: number,
  z: Float64Array | null,
  j1: number,
  n1: number,
  n2: number,
): boolean {
  if (n1 === 1 && n2 === 1) {
    swapOneByOne(t, n, z, j1);
    return true;
  }
  const nd = n1 + n2;
  const d = new Float64Array(nd * nd);
  for (let i = 0; i < nd; i++) for (let j = 0; j < nd; j++) d[i * nd + j] = t[(j1 + i) * n + j1 + j];
  let dNormSquared = 0;
  let dMax = 0;
  for (const value of d) {
    dNormSquared += value * value;
    dMax = Math.max(dMax, Math.abs(value));
  }
  const dNorm = Math.sqrt(dNormSquared);
  const smallNumber = SAFE_MIN / EPS;
  const threshold = Math.max(20 * EPS * dNorm, smallNumber);
  const x = solveSmallSylvester(d, nd, n1, n2, Math.max(EPS * dMax, smallNumber));

  // Orthonormal basis of range [−X; I] (the invariant subspace of T22's eigenvalues): Q = H1·…·Hn2.
  const basis = new Float64Array(nd * n2);
  for (let p = 0; p < n1; p++) for (let q = 0; q < n2; q++) basis[p * n2 + q] = -x[p * n2 + q];
  for (let q = 0; q < n2; q++) basis[(n1 + q) * n2 + q] = 1;
  const q = new Float64Array(nd * nd);
  for (let i = 0; i < nd; i++) q[i * nd + i] = 1;
  const v = new Float64Array(nd);
  for (let column = 0; column < n2; column++) {
    const length = nd - column;
    for (let i = 0; i < length; i++) v[i] = basis[(column + i) * n2 + column];
    const { tau } = generateHouseholder(v, length);
    if (tau === 0) continue;
    for (let j = column + 1; j < n2; j++) {
      let sum = 0;
      for (let i = 0; i < length; i++) sum += v[i] * basis[(column + i) * n2 + j];
      sum *= tau;
      for (let i = 0; i < length; i++) basis[(column + i) * n2 + j] -= sum * v[i];
    }
    for (let i = 0; i < nd; i++) {
      let sum = 0;
      for (let p = 0; p < length; p++) sum += q[i * nd + column + p] * v[p];
      sum *= tau;
      for (let p = 0; p < length; p++) q[i * nd + column + p] -= sum * v[p];
    }
  }

  // Weak stability test: the swapped-out block must vanish to working accuracy.
  const swapped = similarity(q, d, nd);
  let lowerLeft = 0;
  for (let i = n2; i < nd; i++) for (let j = 0; j < n2; j++) lowerLeft = Math.max(lowerLeft, Math.abs(swapped[i * nd + j]));
  if (!(lowerLeft <= threshold)) return false;
  // Strong stability test: with that block zeroed, transforming back must reproduce D.
  for (let i = n2; i < nd; i++) for (let j = 0; j < n2; j++) swapped[i * nd + j] = 0;
  const qt = new Float64Array(nd * nd);
  for (let i = 0; i < nd; i++) for (let j = 0; j < nd; j++) qt[i * nd + j] = q[j * nd + i];
  const back = similarity(qt, swapped, nd);
  let backError = 0;
  for (let i = 0; i < nd * nd; i++) backError += (back[i] - d[i]) ** 2;
  if (!(Math.sqrt(backError) <= threshold)) return false;

  // Accept: rows j1.. ← Qᵀ·rows, columns j1.. ← columns·Q, Z ← Z·Q.
  const rowBlock = new Float64Array(nd);
  for (let j = j1; j < n; j++) {
    for (let i = 0; i < nd; i++) rowBlock[i] = t[(j1 + i) * n + j];
    for (let i = 0; i < nd; i++) {
      let sum = 0;
      for (let p = 0; p < nd; p++) sum += q[p * nd + i] * rowBlock[p];
      t[(j1 + i) * n + j] = sum;
    }
  }
  const applyRight = (m: Float64Array, rowCount: number) => {
    for (let i = 0; i < rowCount; i++) {
      const offset = i * n + j1;
      for (let p = 0; p < nd; p++) rowBlock[p] = m[offset + p];
      for (let j = 0; j < nd; j++) {
        let sum = 0;
        for (let p = 0; p < nd; p++) sum += rowBlock[p] * q[p * nd + j];
        m[offset + j] = sum;
      }
    }
  };
  applyRight(t, j1 + nd);
  if (z) applyRight(z, n);
  for (let i = n2; i < nd; i++) for (let j = 0; j < n2; j++) t[(j1 + i) * n + j1 + j] = 0;
  if (n1 === 1 && n2 === 1) t[(j1 + 1) * n + j1] = 0;
  // Restore the standard form of the moved 2×2 blocks.
  if (n2 === 2) standardizeBlockInPlace(t, n, j1, z);
  if (n1 === 2) standardizeBlockInPlace(t, n, j1 + n2, z);
  return true;
}
