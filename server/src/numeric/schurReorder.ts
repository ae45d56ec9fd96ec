// Reordering of a real Schur form: selected eigenvalues are moved to the top-left of T by
// swapping adjacent 1×1/2×2 diagonal blocks with orthogonal similarity transformations, by the
// direct swapping method of Bai & Demmel (Linear Algebra Appl. 186, 1993), as in LAPACK
// dtrexc/dlaexc/dtrsen. Each swap solves the small Sylvester equation T11·X − X·T22 = T12, takes
// an orthonormal basis of range [−X; I] by Householder QR, and is rejected (the reordering stops and
// reports it) when the transformed block would not be upper block-triangular to working accuracy.

import { type Dense, copyDense, denseFromRows, denseToRows } from './dense';
import { realSchurDense, type RealSchurOptions } from './schur';
import { swapAdjacentBlocks } from './schurBlockSwap';
import { standardizeTwoByTwo } from './twoByTwoStandardForm';
import type { Complex, Rows } from './types';

export { swapAdjacentBlocks } from './schurBlockSwap';

export interface OrderedRealSchurResult {
  /** Quasi-triangular T with the selected eigenvalues in its leading selectedCount diagonal positions. */
  T: Rows;
  /** Orthogonal, A = Z·T·Zᵀ; the first selectedCount columns span the selected invariant subspace. */
  Z: Rows;
  /** Number of selected eigenvalues (a complex pair counts two). */
  selectedCount: number;
  /** False when the QR iteration did not converge (T, Z are then not a Schur form). */
  converged: boolean;
  /**
   * False when a block swap was rejected because the two blocks' eigenvalues are too close for a
   * stable swap; the selected eigenvalues are then not all in front and the result is fragile.
   */
  reordered: boolean;
}

function blockSizeAt(t: Float64Array, n: number, k: number): number {
  return k + 1 < n && t[(k + 1) * n + k] !== 0 ? 2 : 1;
}

function blockEigenvalue(t: Float64Array, n: number, k: number, size: number): Complex {
  if (size === 1) return { re: t[k * n + k], im: 0 };
  const form = standardizeTwoByTwo(t[k * n + k], t[k * n + k + 1], t[(k + 1) * n + k], t[(k + 1) * n + k + 1]);
  return form.eigenvalue1.im >= 0 ? form.eigenvalue1 : form.eigenvalue2;
}

/**
 * Reorders a real Schur form in place so the blocks whose eigenvalue satisfies selectFirst come
 * first (a complex pair is judged by its member with positive imaginary part).
 */
export function reorderRealSchurDense(
  T: Dense,
  Z: Dense | null,
  selectFirst: (lambda: Complex) => boolean,
): { selectedCount: number; reordered: boolean } {
  const n = T.rows;
  const t = T.data;
  const z = Z ? Z.data : null;
  let selectedCount = 0;
  let reordered = true;
  for (let k = 0; k < n; ) {
    const size = blockSizeAt(t, n, k);
    if (selectFirst(blockEigenvalue(t, n, k, size))) {
      let here = k;
      while (here > selectedCount) {
        const previous = here - 2 >= selectedCount && t[(here - 1) * n + here - 2] !== 0 ? 2 : 1;
        if (!swapAdjacentBlocks(t, n, z, here - previous, previous, size)) {
          reordered = false;
          break;
        }
        here -= previous;
      }
      if (!reordered) {
        // Count what really sits in front so the caller sees a consistent selectedCount.
        return { selectedCount, reordered };
      }
      selectedCount += size;
    }
    k += size;
  }
  return { selectedCount, reordered };
}

/** Reorders a given real Schur pair (T, Z) without modifying the inputs. */
export function reorderRealSchur(
  T: Rows,
  Z: Rows,
  selectFirst: (lambda: Complex) => boolean,
): { T: Rows; Z: Rows; selectedCount: number; reordered: boolean } {
  const tDense = denseFromRows(T);
  const zDense = denseFromRows(Z);
  const outcome = reorderRealSchurDense(tDense, zDense, selectFirst);
  return { T: denseToRows(tDense), Z: denseToRows(zDense), ...outcome };
}

/**
 * Real Schur form A = Z·T·Zᵀ with the eigenvalues satisfying selectFirst (e.g. Re λ < 0) in the
 * leading block, so the first selectedCount columns of Z are an orthonormal basis of the
 * corresponding invariant subspace.
 */
export function orderedRealSchurDense(
  A: Dense,
  selectFirst: (lambda: Complex) => boolean,
  options: RealSchurOptions = {},
): { T: Dense; Z: Dense; selectedCount: number; converged: boolean; reordered: boolean } {
  const schur = realSchurDense(copyDense(A), options);
  if (!schur.converged) {
    return { T: schur.T, Z: schur.Z, selectedCount: 0, converged: false, reordered: false };
  }
  const outcome = reorderRealSchurDense(schur.T, schur.Z, selectFirst);
  return { T: schur.T, Z: schur.Z, converged: true, ...outcome };
}

export function orderedRealSchur(
  A: Rows,
  selectFirst: (lambda: Complex) => boolean,
  options: RealSchurOptions = {},
): OrderedRealSchurResult {
  const result = orderedRealSchurDense(denseFromRows(A), selectFirst, options);
  return {
    T: denseToRows(result.T),
    Z: denseToRows(result.Z),
    selectedCount: result.selectedCount,
    converged: result.converged,
    reordered: result.reordered,
  };
}
