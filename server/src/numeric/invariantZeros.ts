// Invariant zeros of a state-space system (A, B, C, D) — the finite values s where the Rosenbrock
// system matrix [A − sI, B; C, D] loses rank below its normal rank — by the reduction of
// Emami-Naeini & Van Dooren, "Computation of zeros of linear multivariable systems", Automatica
// 18(4), 1982: orthogonal row and column compressions remove the infinite zeros and the
// left/right null structure until D is square and invertible (size = normal rank r), then the zeros
// are the generalised eigenvalues of the square pencil obtained by restricting [A B] − s[I 0] to
// the null space of [C D] (QZ, qz.ts). Rank decisions use column-pivoted Householder QR with the
// tolerance max(n + p, n + m)·ε·‖[A B; C D]‖_F.

import { type Dense, multiplyDense, normFrobeniusDense, transposeDense, zerosDense } from './dense';
import { applyQFromRight, applyQTranspose, formQ, householderQrDense, type HouseholderQrDense } from './qr';
import { finiteGeneralizedEigenvalues } from './qz';
import type { Complex, Rows } from './types';

const EPS = Number.EPSILON;

interface StateSpace {
  A: Dense;
  B: Dense;
  C: Dense;
  D: Dense;
}

export interface InvariantZerosResult {
  zeros: Complex[];
  /** Normal rank of the transfer matrix D + C(sI − A)⁻¹B. */
  normalRank: number;
}

/** Orthogonal Q (rows × rows) whose first `rank` columns span the range of M, by pivoted QR. */
function rangeBasis(M: Dense, tolerance: number): { Q: Dense; rank: number } {
  const rows = M.rows;
  if (rows === 0 || M.cols === 0) {
    const Q = zerosDense(rows, rows);
    for (let i = 0; i < rows; i++) Q.data[i * rows + i] = 1;
    return { Q, rank: 0 };
  }
  const { factor, rank } = rangeFactor(M, tolerance);
  return { Q: formQ(factor, rows), rank };
}

/** The pivoted QR of a non-empty M and its numerical rank (|R_jj| above the tolerance). */
function rangeFactor(M: Dense, tolerance: number): { factor: HouseholderQrDense; rank: number } {
  const factor = householderQrDense(M, true);
  let rank = 0;
  const steps = Math.min(M.rows, M.cols);
  while (rank < steps && Math.abs(factor.packed.data[rank * M.cols + rank]) > tolerance) rank++;
  return { factor, rank };
}

/** M's entries at the given rows and columns: (M[rows[i]][columns[j]]). */
function gather(M: Dense, rows: number[], columns: number[]): Dense {
  const width = columns.length;
  const result = zerosDense(rows.length, width);
  const from = M.data;
  const to = result.data;
  for (let i = 0; i < rows.length; i++) {
    const sourceRow = rows[i] * M.cols;
    const targetRow = i * width;
    for (let j = 0; j < width; j++) to[targetRow + j] = from[sourceRow + columns[j]];
  }
  return result;
}

function block(M: Dense, r0: number, r1: number, c0: number, c1: number): Dense {
  const width = c1 - c0;
  const result = zerosDense(r1 - r0, width);
  for (let i = r0; i < r1; i++) result.data.set(M.data.subarray(i * M.cols + c0, i * M.cols + c1), (i - r0) * width);
  return result;
}

function stackRows(top: Dense, bottom: Dense): Dense {
  const cols = top.rows > 0 ? top.cols : bottom.cols;
  const result = zerosDense(top.rows + bottom.rows, cols);
  result.data.set(top.data, 0);
  result.data.set(bottom.data, top.rows * cols);
  return result;
}

/** Columns of Q in the order [from..to) — used to put complement before range. */
function reorderColumns(Q: Dense, order: number[]): Dense {
  const width = order.length;
  const result = zerosDense(Q.rows, width);
  const from = Q.data;
  const to = result.data;
  for (let i = 0; i < Q.rows; i++) {
    const sourceRow = i * Q.cols;
    const targetRow = i * width;
    for (let j = 0; j < width; j++) to[targetRow + j] = from[sourceRow + order[j]];
  }
  return result;
}

/**
 * One pass of the reduction (paper, section 3): repeat { compress the rows of D to [0; D̄];
 * compress the columns of the rows C₁ that D does not reach, C₁·W = [0 Ĉ] with Ĉ of full column
 * rank τ; the τ states behind Ĉ are removed: A ← A₁₁, B ← B₁, C ← [C₂₁; A₂₁], D ← [D̄; B₂] }
 * until D has full row rank.
 */
function reduceToFullRowRankD(system: StateSpace, tolerance: number): StateSpace {
  let { A, B, C, D } = system;
  const bound = A.rows + C.rows + 1;
  for (let pass = 0; pass < bound; pass++) {
    const n = A.rows;
    const p = C.rows;
    const m = B.cols;
    if (p === 0) break;
    const { Q: Qd, rank: rho } = m === 0 ? rangeBasis(zerosDense(p, 0), tolerance) : rangeBasis(D, tolerance);
    const sigma = p - rho;
    if (sigma === 0) break;
    // U = [complement of range(D); range(D)]ᵀ
    const order = [...Array.from({ length: sigma }, (_, i) => rho + i), ...Array.from({ length: rho }, (_, i) => i)];
    const Ut = transposeDense(reorderColumns(Qd, order));
    const UC = multiplyDense(Ut, C);
    const UD = multiplyDense(Ut, D);
    const C1 = block(UC, 0, sigma, 0, n);
    const C2 = block(UC, sigma, p, 0, n);
    const Dbar = block(UD, sigma, p, 0, m);
    if (n === 0) {
      C = C2;
      D = Dbar;
      break;
    }
    const { factor: columnFactor, rank: tau } = rangeFactor(transposeDense(C1), tolerance);
    if (tau === 0) {
      // Those σ output rows are zero: drop them.
      C = C2;
      D = Dbar;
      break;
    }
    const keep = n - tau;
    // W = Q·P (Q from the reflectors of C₁ᵀ's QR, P putting the complement of its range first):
    // WᵀAW, WᵀB and C₂W by applying the σ reflectors, O(σ·n²) instead of O(n³) per pass — a
    // single-output plant of relative degree n takes n passes.
    const stateOrder = [...Array.from({ length: keep }, (_, i) => tau + i), ...Array.from({ length: tau }, (_, i) => i)];
    // The blocks of the reordered QᵀAQ, QᵀB and C₂Q are gathered straight from them (one copy each).
    const transformedA = applyQTranspose(columnFactor, applyQFromRight(A, columnFactor));
    const transformedB = applyQTranspose(columnFactor, B);
    const kept = stateOrder.slice(0, keep);
    const removed = stateOrder.slice(keep);
    const allInputs = Array.from({ length: m }, (_, j) => j);
    const A21 = gather(transformedA, removed, kept);
    C = stackRows(gather(applyQFromRight(C2, columnFactor), Array.from({ length: rho }, (_, i) => i), kept), A21);
    D = stackRows(Dbar, gather(transformedB, removed, allInputs));
    A = gather(transformedA, kept, kept);
    B = gather(transformedB, kept, allInputs);
  }
  return { A, B, C, D };
}

function dual(system: StateSpace): StateSpace {
  return {
    A: transposeDense(system.A),
    B: transposeDense(system.C),
    C: transposeDense(system.B),
    D: transposeDense(system.D),
  };
}

function fromRows(M: Rows, rows: number, cols: number): Dense {
  const result = zerosDense(rows, cols);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) result.data[i * cols + j] = M[i][j];
  return result;
}

/**
 * Invariant zeros and normal rank of (A, B, C, D) for any numbers of inputs and outputs. When the
 * reduction does not end with a square invertible D (it should, by the paper's theorem, unless the
 * rank decisions are ambiguous), `zeros` is empty and normalRank is −1.
 */
export function invariantZeros(A: Rows, B: Rows, C: Rows, D: Rows): InvariantZerosResult {
  const n = A.length;
  const m = n > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  const p = C.length > 0 ? C.length : D.length;
  const shapeOk =
    A.every((row) => row.length === n) &&
    B.length === n &&
    B.every((row) => row.length === m) &&
    C.every((row) => row.length === n) &&
    D.length === p &&
    D.every((row) => row.length === m);
  if (!shapeOk || ![A, B, C, D].every((M) => M.every((row) => row.every(Number.isFinite)))) {
    return { zeros: [], normalRank: -1 };
  }
  const system: StateSpace = { A: fromRows(A, n, n), B: fromRows(B, n, m), C: fromRows(C, p, n), D: fromRows(D, p, m) };
  const scale = Math.hypot(
    normFrobeniusDense(system.A),
    normFrobeniusDense(system.B),
    normFrobeniusDense(system.C),
    normFrobeniusDense(system.D),
  );
  const tolerance = Math.max(n + p, n + m, 1) * EPS * (scale > 0 ? scale : 1);
  const first = reduceToFullRowRankD(system, tolerance);
  const reduced = dual(reduceToFullRowRankD(dual(first), tolerance));
  const r = reduced.D.rows;
  if (reduced.D.cols !== r) return { zeros: [], normalRank: -1 };
  const nf = reduced.A.rows;
  if (nf === 0) return { zeros: [], normalRank: r };
  // Null space of [C D] (rank r): the last nf columns of the full Q of [C D]ᵀ.
  const CD = zerosDense(r, nf + r);
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < nf; j++) CD.data[i * (nf + r) + j] = reduced.C.data[i * nf + j];
    for (let j = 0; j < r; j++) CD.data[i * (nf + r) + nf + j] = reduced.D.data[i * r + j];
  }
  const { Q } = rangeBasis(transposeDense(CD), tolerance);
  const nullSpace = block(Q, 0, nf + r, r, nf + r);
  const AB = zerosDense(nf, nf + r);
  const I0 = zerosDense(nf, nf + r);
  for (let i = 0; i < nf; i++) {
    for (let j = 0; j < nf; j++) AB.data[i * (nf + r) + j] = reduced.A.data[i * nf + j];
    for (let j = 0; j < r; j++) AB.data[i * (nf + r) + nf + j] = reduced.B.data[i * r + j];
    I0.data[i * (nf + r) + i] = 1;
  }
  const pencilA = multiplyDense(AB, nullSpace);
  const pencilB = multiplyDense(I0, nullSpace);
  const toRows = (M: Dense): Rows => Array.from({ length: M.rows }, (_, i) => Array.from(M.data.subarray(i * M.cols, (i + 1) * M.cols)));
  return { zeros: finiteGeneralizedEigenvalues(toRows(pencilA), toRows(pencilB)), normalRank: r };
}
