// Lyapunov equations on the real Schur form A = U·S·Uᵀ:
//  • continuous, A·X + X·Aᵀ + Q = 0: Bartels–Stewart (1972) with op(T) = Sᵀ;
//  • discrete (Stein), A·X·Aᵀ − X + Q = 0: the Schur-form column-block recursion of Kitagawa,
//    "An algorithm for solving the matrix equation X = F X Fᵀ + S", Int. J. Control 25(5), 1977
//    (also Barraud 1977). Direct, no iteration, so no convergence issue; it works for any A with
//    λᵢλⱼ ≠ 1 (not only Schur-stable A).
// Both results are symmetrised, (X + Xᵀ)/2.

import {
  type Dense,
  denseFromRows,
  denseToRows,
  multiplyDense,
  multiplyTransposeSymmetricDense,
  normFrobeniusDense,
  transposeDense,
  transposeMultiplySymmetricDense,
  zerosDense,
} from './dense';
import { realSchurDense, type RealSchurDense } from './schur';
import { kroneckerBlockSystem, quasiTriangularBlocks, solveSmallSystem } from './sylvester';
import type { Rows } from './types';

export interface LyapunovSolution {
  X: Rows;
  /** False when the Schur form did not converge or the operator is singular (λᵢ + λⱼ ≈ 0, resp. λᵢλⱼ ≈ 1). */
  ok: boolean;
}

function symmetrise(X: Dense): void {
  const n = X.rows;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const mean = (X.data[i * n + j] + X.data[j * n + i]) / 2;
      X.data[i * n + j] = mean;
      X.data[j * n + i] = mean;
    }
  }
}

function invalidInput(A: Dense, Q: Dense): boolean {
  const n = A.rows;
  if (A.cols !== n || Q.rows !== n || Q.cols !== n) return true;
  for (let i = 0; i < n * n; i++) if (!Number.isFinite(A.data[i]) || !Number.isFinite(Q.data[i])) return true;
  return false;
}

function nanResult(n: number): { X: Dense; ok: boolean } {
  const X = zerosDense(n, n);
  X.data.fill(NaN);
  return { X, ok: false };
}

/** −Uᵀ·Q·U */
function transformedRightHandSide(U: Dense, Q: Dense): Dense {
  const F = multiplyDense(multiplyDense(transposeDense(U), Q), U);
  for (let i = 0; i < F.data.length; i++) F.data[i] = -F.data[i];
  return F;
}

function isFiniteDense(X: Dense): boolean {
  return X.data.every((value) => Number.isFinite(value));
}

/**
 * A·X + X·Aᵀ + Q = 0 on Dense matrices. `schur`, when given, is the real Schur form of A already
 * computed by the caller (it is not recomputed). Q is taken as (Q + Qᵀ)/2 — by linearity the same
 * as solving with Q and symmetrising X — so only one triangle of each product and of the
 * triangular solve is formed, and X is exactly symmetric.
 */
export function solveLyapunovContinuousDense(A: Dense, Q: Dense, schur?: RealSchurDense): { X: Dense; ok: boolean } {
  const n = A.rows;
  if (invalidInput(A, Q)) return nanResult(A.rows);
  if (n === 0) return { X: zerosDense(0, 0), ok: true };
  const { T: S, Z: U, converged } = schur ?? realSchurDense(A);
  const symmetricQ = zerosDense(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) symmetricQ.data[i * n + j] = -(Q.data[i * n + j] + Q.data[j * n + i]) / 2;
  // F = −Uᵀ·Q·U, then X = U·Y·Uᵀ: symmetric products.
  const F = transposeMultiplySymmetricDense(U, multiplyDense(symmetricQ, U));
  // λᵢ + λⱼ counts as zero within 2n·ε·‖A‖_F (rounding of the Schur form).
  const minimumPivot = 2 * n * Number.EPSILON * normFrobeniusDense(A);
  const solved = solveQuasiTriangularLyapunov(S, F, minimumPivot);
  const X = multiplyTransposeSymmetricDense(multiplyDense(U, F), U);
  return { X, ok: converged && solved && isFiniteDense(X) };
}

/**
 * Solves S·Y + Y·Sᵀ = F in place (F becomes Y) for upper quasi-triangular S and symmetric F: the
 * Bartels–Stewart recursion with op(T) = Sᵀ, on the upper triangle only (Y is symmetric). Column
 * blocks J from the right; within one, row blocks I ≤ J from the bottom:
 *   S(I,I)·Y(I,J) + Y(I,J)·S(J,J)ᵀ = F(I,J) − Σ_{k after I} S(I,k)·Y(k,J) − Σ_{l after J} Y(I,l)·S(J,l)ᵀ,
 * where Y(k,J) = Y(J,k)ᵀ for k after J, so every sum runs along rows: about n³/2 multiply-adds
 * on contiguous memory. Returns false when a diagonal block system was singular to working
 * precision (its pivot raised to `minimumPivot`, as solveSmallSystem does).
 */
export function solveQuasiTriangularLyapunov(S: Dense, F: Dense, minimumPivot: number): boolean {
  const n = S.rows;
  const s = S.data;
  const y = F.data;
  const blocks = quasiTriangularBlocks(S);
  // column[q·n + i]: first the reduced right-hand side of entry (i, j0 + q), then its solution.
  const column = new Float64Array(2 * n);
  const small = new Float64Array(16);
  const rhs = new Float64Array(4);
  let ok = true;
  for (let bj = blocks.length - 1; bj >= 0; bj--) {
    const [j0, jSize] = blocks[bj];
    const afterJ = j0 + jSize;
    for (let q = 0; q < jSize; q++) {
      const jRow = (j0 + q) * n;
      for (let i = 0; i < afterJ; i++) {
        const iRow = i * n;
        let sum = y[iRow + j0 + q];
        for (let l = afterJ; l < n; l++) sum -= y[iRow + l] * s[jRow + l] + s[iRow + l] * y[jRow + l];
        column[q * n + i] = sum;
      }
    }
    for (let bi = bj; bi >= 0; bi--) {
      const [i0, iSize] = blocks[bi];
      const afterI = i0 + iSize;
      for (let p = 0; p < iSize; p++) {
        const iRow = (i0 + p) * n;
        for (let q = 0; q < jSize; q++) {
          const offset = q * n;
          let sum = column[offset + i0 + p];
          for (let k = afterI; k < afterJ; k++) sum -= s[iRow + k] * column[offset + k];
          rhs[p * jSize + q] = sum;
        }
      }
      if (iSize === 1 && jSize === 1) {
        let pivot = s[i0 * n + i0] + s[j0 * n + j0];
        if (!(Math.abs(pivot) > minimumPivot)) {
          pivot = minimumPivot > 0 ? minimumPivot : Number.MIN_VALUE;
          ok = false;
        }
        column[i0] = rhs[0] / pivot;
        continue;
      }
      // S(I)·Y + Y·S(J)ᵀ = rhs: the Sylvester block system with T = S transposed.
      kroneckerBlockSystem(small, s, n, i0, iSize, s, n, j0, jSize, true);
      if (!solveSmallSystem(small, rhs, iSize * jSize, minimumPivot)) ok = false;
      for (let p = 0; p < iSize; p++) for (let q = 0; q < jSize; q++) column[q * n + i0 + p] = rhs[p * jSize + q];
    }
    // Store column block J and its mirror row block; the diagonal block is made exactly symmetric.
    for (let q = 0; q < jSize; q++) {
      for (let i = 0; i < j0; i++) {
        const value = column[q * n + i];
        y[i * n + j0 + q] = value;
        y[(j0 + q) * n + i] = value;
      }
    }
    if (jSize === 1) {
      y[j0 * n + j0] = column[j0];
    } else {
      const offDiagonal = (column[j0 + 1] + column[n + j0]) / 2;
      y[j0 * n + j0] = column[j0];
      y[(j0 + 1) * n + j0 + 1] = column[n + j0 + 1];
      y[j0 * n + j0 + 1] = offDiagonal;
      y[(j0 + 1) * n + j0] = offDiagonal;
    }
  }
  return ok;
}

/** A·X·Aᵀ − X + Q = 0 on Dense matrices (`schur`: A's real Schur form, when the caller has it). */
export function solveLyapunovDiscreteDense(A: Dense, Q: Dense, schur?: RealSchurDense): { X: Dense; ok: boolean } {
  const n = A.rows;
  if (invalidInput(A, Q)) return nanResult(A.rows);
  if (n === 0) return { X: zerosDense(0, 0), ok: true };
  const { T: S, Z: U, converged } = schur ?? realSchurDense(A);
  const F = transformedRightHandSide(U, Q);
  const normA = normFrobeniusDense(A);
  const minimumPivot = 2 * n * Number.EPSILON * Math.max(1, normA * normA);
  const solved = solveQuasiTriangularStein(S, F, minimumPivot);
  const X = multiplyDense(multiplyDense(U, F), transposeDense(U));
  symmetrise(X);
  return { X, ok: converged && solved && isFiniteDense(X) };
}

/**
 * Solves S·Y·Sᵀ − Y = F in place (F becomes Y) for upper quasi-triangular S: column blocks J from
 * the right, using Y·Sᵀ(:, J) = Σ_{L ≥ J} Y(:, L)·S(J, L)ᵀ, then row blocks from the bottom.
 */
function solveQuasiTriangularStein(S: Dense, F: Dense, minimumPivot: number): boolean {
  const n = S.rows;
  const s = S.data;
  const y = F.data;
  const blocks = quasiTriangularBlocks(S);
  let ok = true;
  const g = new Float64Array(n * 2);
  const r = new Float64Array(n * 2);
  const small = new Float64Array(16);
  const rhs = new Float64Array(4);
  const partial = new Float64Array(4);
  for (let bj = blocks.length - 1; bj >= 0; bj--) {
    const [j0, jSize] = blocks[bj];
    const afterJ = j0 + jSize;
    // G = Σ_{l ≥ afterJ} Y(:, l)·S(J, l)ᵀ
    g.fill(0);
    for (let i = 0; i < n; i++) {
      for (let q = 0; q < jSize; q++) {
        let sum = 0;
        for (let l = afterJ; l < n; l++) sum += y[i * n + l] * s[(j0 + q) * n + l];
        g[i * 2 + q] = sum;
      }
    }
    // R = F(:, J) − S·G
    for (let i = 0; i < n; i++) {
      for (let q = 0; q < jSize; q++) {
        let sum = y[i * n + j0 + q];
        for (let k = Math.max(0, i - 1); k < n; k++) sum -= s[i * n + k] * g[k * 2 + q];
        r[i * 2 + q] = sum;
      }
    }
    // S·Y_J·S_JJᵀ − Y_J = R, row blocks from the bottom.
    for (let bi = blocks.length - 1; bi >= 0; bi--) {
      const [i0, iSize] = blocks[bi];
      // P = Σ_{k after I} S(I, k)·Y(k, J); rhs = R_I − P·S_JJᵀ
      for (let p = 0; p < iSize; p++) {
        for (let q = 0; q < jSize; q++) {
          let sum = 0;
          for (let k = i0 + iSize; k < n; k++) sum += s[(i0 + p) * n + k] * y[k * n + j0 + q];
          partial[p * 2 + q] = sum;
        }
      }
      for (let p = 0; p < iSize; p++) {
        for (let q = 0; q < jSize; q++) {
          let sum = r[(i0 + p) * 2 + q];
          for (let t = 0; t < jSize; t++) sum -= partial[p * 2 + t] * s[(j0 + q) * n + j0 + t];
          rhs[p * jSize + q] = sum;
        }
      }
      const size = iSize * jSize;
      small.fill(0);
      for (let p = 0; p < iSize; p++) {
        for (let q = 0; q < jSize; q++) {
          const row = (p * jSize + q) * size;
          for (let rr = 0; rr < iSize; rr++) {
            for (let ss = 0; ss < jSize; ss++) {
              small[row + rr * jSize + ss] += s[(i0 + p) * n + i0 + rr] * s[(j0 + q) * n + j0 + ss];
            }
          }
          small[row + p * jSize + q] -= 1;
        }
      }
      if (!solveSmallSystem(small, rhs, size, minimumPivot)) ok = false;
      for (let p = 0; p < iSize; p++) for (let q = 0; q < jSize; q++) y[(i0 + p) * n + j0 + q] = rhs[p * jSize + q];
    }
  }
  return ok;
}

/** Solves A·X + X·Aᵀ + Q = 0 (Bartels–Stewart on the real Schur form); X symmetrised. */
export function solveLyapunovContinuous(A: Rows, Q: Rows): LyapunovSolution {
  const { X, ok } = solveLyapunovContinuousDense(denseFromRows(A), denseFromRows(Q));
  return { X: denseToRows(X), ok };
}

/** Solves A·X·Aᵀ − X + Q = 0 (Kitagawa's Schur-form recursion, direct); X symmetrised. */
export function solveLyapunovDiscrete(A: Rows, Q: Rows): LyapunovSolution {
  const { X, ok } = solveLyapunovDiscreteDense(denseFromRows(A), denseFromRows(Q));
  return { X: denseToRows(X), ok };
}
