// Sylvester equation A·X + X·B = C by the Bartels–Stewart method (Bartels & Stewart, "Solution of
// the matrix equation AX + XB = C", Comm. ACM 15(9), 1972): reduce A and B to real Schur form,
// solve the quasi-triangular equation block by block (blocks of size 1 or 2, each a Kronecker
// system of size ≤ 4 solved with complete pivoting), and transform back.

import {
  type Dense,
  denseFromRows,
  denseToRows,
  multiplyDense,
  normFrobeniusDense,
  transposeDense,
  zerosDense,
} from './dense';
import { realSchurDense } from './schur';
import type { Rows } from './types';

export interface SylvesterSolution {
  X: Rows;
  /** False when a Schur form did not converge or the operator is (numerically) singular, e.g. λᵢ(A) + λⱼ(B) ≈ 0. */
  ok: boolean;
}

/** Start indices and sizes of the 1×1 / 2×2 diagonal blocks of an upper quasi-triangular matrix. */
export function quasiTriangularBlocks(s: Dense): Array<[number, number]> {
  const n = s.rows;
  const blocks: Array<[number, number]> = [];
  for (let k = 0; k < n; ) {
    const size = k + 1 < n && s.data[(k + 1) * n + k] !== 0 ? 2 : 1;
    blocks.push([k, size]);
    k += size;
  }
  return blocks;
}

/**
 * Fills `small` (size iSize·jSize squared) with the Kronecker matrix of the block equation
 * S(I,I)·Y + Y·op(T)(J,J) = R, unknowns ordered y[p][q] → p·jSize + q: row (p, q) holds S(I)[p][r]
 * at (r, q) and op(T)(J)[r][q] at (p, r). T is m×m, stored row-major; op is the transpose when
 * `transposeT` (the Lyapunov case S·Y + Y·Sᵀ passes T = S, transposed).
 */
export function kroneckerBlockSystem(
  small: Float64Array,
  s: Float64Array,
  n: number,
  i0: number,
  iSize: number,
  t: Float64Array,
  m: number,
  j0: number,
  jSize: number,
  transposeT: boolean,
): void {
  const size = iSize * jSize;
  small.fill(0, 0, size * size);
  for (let p = 0; p < iSize; p++) {
    for (let q = 0; q < jSize; q++) {
      const row = (p * jSize + q) * size;
      for (let r = 0; r < iSize; r++) small[row + r * jSize + q] += s[(i0 + p) * n + i0 + r];
      for (let r = 0; r < jSize; r++) small[row + p * jSize + r] += transposeT ? t[(j0 + q) * m + j0 + r] : t[(j0 + r) * m + j0 + q];
    }
  }
}

/**
 * Solves the small dense system M·x = r (size ≤ 4) by Gaussian elimination with complete pivoting.
 * Pivots below `minimumPivot` are raised to it (as LAPACK dlasy2 does) so the result stays finite;
 * the return value says whether that happened.
 */
export function solveSmallSystem(matrix: Float64Array, rhs: Float64Array, size: number, minimumPivot: number): boolean {
  const columnOrder = [0, 1, 2, 3].slice(0, size);
  let perturbed = false;
  for (let k = 0; k < size; k++) {
    let pivotRow = k;
    let pivotColumn = k;
    let best = -1;
    for (let i = k; i < size; i++) {
      for (let j = k; j < size; j++) {
        const magnitude = Math.abs(matrix[i * size + j]);
        if (magnitude > best) {
          best = magnitude;
          pivotRow = i;
          pivotColumn = j;
        }
      }
    }
    if (pivotRow !== k) {
      for (let j = 0; j < size; j++) {
        const swap = matrix[k * size + j];
        matrix[k * size + j] = matrix[pivotRow * size + j];
        matrix[pivotRow * size + j] = swap;
      }
      const swap = rhs[k];
      rhs[k] = rhs[pivotRow];
      rhs[pivotRow] = swap;
    }
    if (pivotColumn !== k) {
      for (let i = 0; i < size; i++) {
        const swap = matrix[i * size + k];
        matrix[i * size + k] = matrix[i * size + pivotColumn];
        matrix[i * size + pivotColumn] = swap;
      }
      const swap = columnOrder[k];
      columnOrder[k] = columnOrder[pivotColumn];
      columnOrder[pivotColumn] = swap;
    }
    if (!(Math.abs(matrix[k * size + k]) > minimumPivot)) {
      matrix[k * size + k] = minimumPivot > 0 ? minimumPivot : Number.MIN_VALUE;
      perturbed = true;
    }
    const pivot = matrix[k * size + k];
    for (let i = k + 1; i < size; i++) {
      const factor = matrix[i * size + k] / pivot;
      if (factor === 0) continue;
      for (let j = k; j < size; j++) matrix[i * size + j] -= factor * matrix[k * size + j];
      rhs[i] -= factor * rhs[k];
    }
  }
  const solution = new Float64Array(size);
  for (let i = size - 1; i >= 0; i--) {
    let sum = rhs[i];
    for (let j = i + 1; j < size; j++) sum -= matrix[i * size + j] * solution[j];
    solution[i] = sum / matrix[i * size + i];
  }
  for (let k = 0; k < size; k++) rhs[columnOrder[k]] = solution[k];
  return !perturbed;
}

/**
 * Solves S·Y + Y·op(T) = F in place (F becomes Y) for upper quasi-triangular S (n×n) and T (m×m),
 * op(T) = T or Tᵀ. Returns false when some diagonal block system was singular to working precision.
 */
export function solveQuasiTriangularSylvester(
  S: Dense,
  T: Dense,
  transposeT: boolean,
  F: Dense,
  minimumPivot: number,
): boolean {
  const n = S.rows;
  const m = T.rows;
  const s = S.data;
  const t = T.data;
  const y = F.data;
  const rowBlocks = quasiTriangularBlocks(S);
  const columnBlocks = quasiTriangularBlocks(T);
  if (transposeT) columnBlocks.reverse();
  // opT(k, j) = entry (k, j) of op(T).
  const opT = transposeT ? (k: number, j: number) => t[j * m + k] : (k: number, j: number) => t[k * m + j];
  let ok = true;
  const small = new Float64Array(16);
  const rhs = new Float64Array(4);
  const done = new Uint8Array(m);
  for (const [j0, jSize] of columnBlocks) {
    // F(:, J) −= Σ over already solved columns k of Y(:, k)·op(T)(k, J).
    for (let k = 0; k < m; k++) {
      if (!done[k]) continue;
      for (let q = 0; q < jSize; q++) {
        const coefficient = opT(k, j0 + q);
        if (coefficient === 0) continue;
        for (let i = 0; i < n; i++) y[i * m + j0 + q] -= y[i * m + k] * coefficient;
      }
    }
    for (let b = rowBlocks.length - 1; b >= 0; b--) {
      const [i0, iSize] = rowBlocks[b];
      // R(I, J) = F(I, J) − Σ_{k > I} S(I, k)·Y(k, J)
      for (let p = 0; p < iSize; p++) {
        for (let q = 0; q < jSize; q++) {
          let sum = y[(i0 + p) * m + j0 + q];
          for (let k = i0 + iSize; k < n; k++) sum -= s[(i0 + p) * n + k] * y[k * m + j0 + q];
          rhs[p * jSize + q] = sum;
        }
      }
      kroneckerBlockSystem(small, s, n, i0, iSize, t, m, j0, jSize, transposeT);
      if (!solveSmallSystem(small, rhs, iSize * jSize, minimumPivot)) ok = false;
      for (let p = 0; p < iSize; p++) for (let q = 0; q < jSize; q++) y[(i0 + p) * m + j0 + q] = rhs[p * jSize + q];
    }
    for (let q = 0; q < jSize; q++) done[j0 + q] = 1;
  }
  return ok;
}

function allFinite(matrix: Dense): boolean {
  for (let i = 0; i < matrix.data.length; i++) if (!Number.isFinite(matrix.data[i])) return false;
  return true;
}

/** A·X + X·B = C on Dense matrices (A n×n, B m×m, C n×m). */
export function solveSylvesterDense(A: Dense, B: Dense, C: Dense): { X: Dense; ok: boolean } {
  const n = A.rows;
  const m = B.rows;
  if (A.cols !== n || B.cols !== m || C.rows !== n || C.cols !== m || !allFinite(A) || !allFinite(B) || !allFinite(C)) {
    const X = zerosDense(C.rows, C.cols);
    X.data.fill(NaN);
    return { X, ok: false };
  }
  if (n === 0 || m === 0) return { X: zerosDense(n, m), ok: true };
  const schurA = realSchurDense(A);
  const schurB = realSchurDense(B);
  // F = Uᵀ·C·V, then X = U·Y·Vᵀ.
  const F = multiplyDense(multiplyDense(transposeDense(schurA.Z), C), schurB.Z);
  // A block is singular when λᵢ(A) + λⱼ(B) is within rounding of the data: (n + m)·ε·(‖A‖ + ‖B‖).
  const minimumPivot = (n + m) * Number.EPSILON * (normFrobeniusDense(A) + normFrobeniusDense(B));
  const solved = solveQuasiTriangularSylvester(schurA.T, schurB.T, false, F, minimumPivot);
  const X = multiplyDense(multiplyDense(schurA.Z, F), transposeDense(schurB.Z));
  return { X, ok: solved && schurA.converged && schurB.converged && allFinite(X) };
}

/** Solves A·X + X·B = C (Bartels–Stewart). */
export function solveSylvester(A: Rows, B: Rows, C: Rows): SylvesterSolution {
  const { X, ok } = solveSylvesterDense(denseFromRows(A), denseFromRows(B), denseFromRows(C));
  return { X: denseToRows(X), ok };
}
