// Diagonal balancing A' = D⁻¹·A·D with D a diagonal of powers of two, so that each row and the
// matching column have comparable 2-norms (Parlett & Reinsch, Numer. Math. 13, 1969; LAPACK dgebal
// with job 'S', 2-norm variant). Powers of two make the scaling exact: eigenvalues are unchanged
// and eigenvectors of A are D times those of A'. The permutation step of dgebal is not performed.

import { type Dense, denseFromRows, denseToRows, scaledNorm2 } from './dense';
import type { Rows } from './types';
import { countIterations } from './iterationCount';

const RADIX = 2;
const SAFE_MIN = 2.2250738585072014e-308;
/** A sweep must reduce a row+column norm sum below this fraction of its old value to count. */
const SUFFICIENT_REDUCTION = 0.95;
const MAX_SWEEPS = 100;

export interface BalancedDense {
  scaled: Dense;
  /** Diagonal of D, A' = D⁻¹·A·D. */
  scaling: Float64Array;
}

export function balanceDense(matrix: Dense): BalancedDense {
  const n = matrix.rows;
  const a = matrix.data.slice();
  const scaling = new Float64Array(n).fill(1);
  const safeMin1 = SAFE_MIN / Number.EPSILON;
  const safeMax1 = 1 / safeMin1;
  const safeMin2 = safeMin1 * RADIX;
  const safeMax2 = 1 / safeMin2;
  const column = new Float64Array(n);
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    countIterations();
    let changed = false;
    for (let i = 0; i < n; i++) {
      for (let k = 0; k < n; k++) column[k] = a[k * n + i];
      let c = scaledNorm2(column);
      let r = scaledNorm2(a, i * n, (i + 1) * n);
      let ca = 0;
      let ra = 0;
      for (let k = 0; k < n; k++) {
        ca = Math.max(ca, Math.abs(column[k]));
        ra = Math.max(ra, Math.abs(a[i * n + k]));
      }
      if (c === 0 || r === 0 || !Number.isFinite(c + r)) continue;
      let g = r / RADIX;
      let f = 1;
      const s = c + r;
      while (c < g && Math.max(f, c, ca) < safeMax2 && Math.min(r, g, ra) > safeMin2) {
        f *= RADIX;
        c *= RADIX;
        ca *= RADIX;
        r /= RADIX;
        g /= RADIX;
        ra /= RADIX;
      }
      g = c / RADIX;
      while (g >= r && Math.max(r, ra) < safeMax2 && Math.min(f, c, g, ca) > safeMin2) {
        f /= RADIX;
        c /= RADIX;
        g /= RADIX;
        ca /= RADIX;
        r *= RADIX;
        ra *= RADIX;
      }
      if (c + r >= SUFFICIENT_REDUCTION * s) continue;
      if (f < 1 && scaling[i] < 1 && f * scaling[i] <= safeMin1) continue;
      if (f > 1 && scaling[i] > 1 && scaling[i] >= safeMax1 / f) continue;
      scaling[i] *= f;
      changed = true;
      const inverseF = 1 / f;
      for (let k = 0; k < n; k++) a[i * n + k] *= inverseF;
      for (let k = 0; k < n; k++) a[k * n + i] *= f;
    }
    if (!changed) break;
  }
  return { scaled: { rows: n, cols: n, data: a }, scaling };
}

/** Balanced A' = D⁻¹·A·D and the diagonal of D. */
export function balance(A: Rows): { scaled: Rows; scaling: number[] } {
  const { scaled, scaling } = balanceDense(denseFromRows(A));
  return { scaled: denseToRows(scaled), scaling: Array.from(scaling) };
}
