// Multi-input robust eigenstructure assignment (Kautsky, Nichols & Van Dooren 1985, method 0),
// with complex pairs in the real representation of Tits & Yang (1996): a pair a ± ib owns two real
// columns (x, y) of V with (A − BK)[x y] = [x y]·[[a, b], [−b, a]].
// Each column is confined to its admissible subspace S_j = null(U₁ᵀ(A − λ_j I)) (U₁ ⊥ range B) and
// is replaced in turn by the projection onto S_j of the vector orthogonal to all other columns —
// row j of V⁻¹ — which makes the eigenvectors as orthogonal as the subspaces allow. V⁻¹ is kept by
// Sherman–Morrison / Woodbury updates (O(n²) per column, O(n³) per sweep) and refactored by LU at
// the start of each sweep. Requires every pole's multiplicity ≤ rank B (else the closed loop is
// necessarily defective; the caller falls back).
import { Matrix, inverse } from 'ml-matrix';
import type { Rows } from '../numeric/types';
import { countIterations } from '../numeric/iterationCount';
import { EPS, orthogonalComplement, solveRows, thinSvd, transposeRows } from './controlLinearAlgebra';
import { slotWidth, type PoleSlot } from './poleSlots';

export interface RobustPlacement {
  K: Rows;
  /** Assigned eigenvectors (real representation, columns in slot order, unit norm per slot). */
  V: Rows;
  /** Real block-diagonal Λ with (A − BK)·V = V·Λ. */
  Lambda: Rows;
  sweeps: number;
  converged: boolean;
  ok: boolean;
}

/** Deterministic pseudo-random numbers (mulberry32) so placements are reproducible. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296 - 0.5;
  };
}

/**
 * B must have full column rank r ≥ 1 (the caller compresses inputs). Poles as slots whose widths
 * sum to n.
 */
export function placeRobustEigenstructure(A: Rows, B: Rows, slots: PoleSlot[], maxSweeps: number): RobustPlacement {
  const n = A.length;
  const r = B[0].length;
  const q = n - r; // rows of U₁ᵀ
  // U₁: orthonormal complement of range(B), column-major n × q.
  const Bflat = new Float64Array(n * r);
  for (let i = 0; i < n; i++) for (let j = 0; j < r; j++) Bflat[i * r + j] = B[i][j];
  const U1 = orthogonalComplement(Bflat, n, r);
  // G = U₁ᵀ·A (q × n, row-major).
  const G = new Float64Array(q * n);
  for (let k = 0; k < q; k++) {
    for (let i = 0; i < n; i++) {
      const u = U1[k * n + i];
      if (u === 0) continue;
      for (let j = 0; j < n; j++) G[k * n + j] += u * A[i][j];
    }
  }

  // Admissible subspaces, column-major bases: real slot n × r, pair 2n × 2r.
  const bases: Float64Array[] = [];
  for (const slot of slots) {
    if (slot.kind === 'real') {
      // Mᵀ = (G − λU₁ᵀ)ᵀ, n × q row-major.
      const Mt = new Float64Array(n * q);
      for (let i = 0; i < n; i++) for (let k = 0; k < q; k++) Mt[i * q + k] = G[k * n + i] - slot.value * U1[k * n + i];
      bases.push(orthogonalComplement(Mt, n, q));
    } else {
      // M = [[G − aU₁ᵀ, bU₁ᵀ], [−bU₁ᵀ, G − aU₁ᵀ]] (2q × 2n); Mᵀ is 2n × 2q row-major.
      const width = 2 * q;
      const Mt = new Float64Array(2 * n * width);
      for (let i = 0; i < n; i++) {
        for (let k = 0; k < q; k++) {
          const shifted = G[k * n + i] - slot.re * U1[k * n + i];
          const cross = slot.im * U1[k * n + i];
          Mt[i * width + k] = shifted; // (x-part, first block row)
          Mt[(n + i) * width + k] = cross;
          Mt[i * width + q + k] = -cross;
          Mt[(n + i) * width + q + k] = shifted;
        }
      }
      bases.push(orthogonalComplement(Mt, 2 * n, width));
    }
  }

  // Columns of V (column-major n × n) and their slot offsets.
  const offsets: number[] = [];
  let offset = 0;
  for (const slot of slots) {
    offsets.push(offset);
    offset += slotWidth(slot);
  }
  const V = new Float64Array(n * n);
  const random = seededRandom(20261202);
  slots.forEach((slot, s) => {
    const dim = slot.kind === 'real' ? n : 2 * n;
    const cols = slot.kind === 'real' ? r : 2 * r;
    const basis = bases[s];
    const vector = new Float64Array(dim);
    for (let c = 0; c < cols; c++) {
      const weight = random();
      for (let i = 0; i < dim; i++) vector[i] += weight * basis[c * dim + i];
    }
    let norm = 0;
    for (let i = 0; i < dim; i++) norm += vector[i] * vector[i];
    norm = Math.sqrt(norm) || 1;
    for (let i = 0; i < dim; i++) V[offsets[s] * n + i] = vector[i] / norm; // x then y contiguous
  });

  const toRows = (flatColumnMajor: Float64Array): Rows => {
    const rows: Rows = [];
    for (let i = 0; i < n; i++) {
      const row = new Array<number>(n);
      for (let j = 0; j < n; j++) row[j] = flatColumnMajor[j * n + i];
      rows.push(row);
    }
    return rows;
  };
  const invert = (): Float64Array | null => {
    let inv: Matrix;
    try {
      inv = inverse(new Matrix(toRows(V)));
    } catch {
      return null;
    }
    const flat = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) flat[i * n + j] = inv.get(i, j);
    for (const value of flat) if (!Number.isFinite(value)) return null;
    return flat;
  };

  let sweeps = 0;
  let converged = false;
  // Sweeps stop when no unit column moves by more than ε^¼, or when a sweep raises log|det V| (the
  // KNV objective for unit columns; each update multiplies det V by its Sherman–Morrison
  // denominator) by less than ε^¼. The assignment is exact after any sweep; only the conditioning
  // improves.
  const changeTolerance = Math.sqrt(Math.sqrt(EPS));
  const pivotTolerance = Math.sqrt(EPS);
  const z = new Float64Array(n);
  const z2 = new Float64Array(n);
  const rowCopy = new Float64Array(n);
  const rowCopy2 = new Float64Array(n);
  while (sweeps < maxSweeps) {
    countIterations();
    const Vinv = invert();
    if (!Vinv) break;
    sweeps += 1;
    let largestChange = 0;
    let logDeterminantGain = 0;
    slots.forEach((slot, s) => {
      const j = offsets[s];
      const basis = bases[s];
      if (slot.kind === 'real') {
        // Target w = row j of V⁻¹; new column = S·Sᵀ·w normalised.
        const coeff = new Float64Array(r);
        for (let c = 0; c < r; c++) {
          let dot = 0;
          for (let i = 0; i < n; i++) dot += basis[c * n + i] * Vinv[j * n + i];
          coeff[c] = dot;
        }
        const v = new Float64Array(n);
        for (let c = 0; c < r; c++) for (let i = 0; i < n; i++) v[i] += coeff[c] * basis[c * n + i];
        let norm = 0;
        for (let i = 0; i < n; i++) norm += v[i] * v[i];
        norm = Math.sqrt(norm);
        if (!(norm > 0)) return;
        let change = 0;
        const u = new Float64Array(n);
        for (let i = 0; i < n; i++) {
          v[i] /= norm;
          u[i] = v[i] - V[j * n + i];
          change += u[i] * u[i];
        }
        // Sherman–Morrison: V⁻¹ ← V⁻¹ − (V⁻¹u)(e_jᵀV⁻¹)/(1 + e_jᵀV⁻¹u).
        for (let i = 0; i < n; i++) {
          let dot = 0;
          for (let k = 0; k < n; k++) dot += Vinv[i * n + k] * u[k];
          z[i] = dot;
        }
        const denominator = 1 + z[j];
        if (Math.abs(denominator) < pivotTolerance) return;
        logDeterminantGain += Math.log(Math.abs(denominator));
        for (let k = 0; k < n; k++) rowCopy[k] = Vinv[j * n + k] / denominator;
        for (let i = 0; i < n; i++) {
          const zi = z[i];
          if (zi === 0) continue;
          for (let k = 0; k < n; k++) Vinv[i * n + k] -= zi * rowCopy[k];
        }
        for (let i = 0; i < n; i++) V[j * n + i] = v[i];
        largestChange = Math.max(largestChange, Math.sqrt(change));
      } else {
        const dim = 2 * n;
        const cols = 2 * r;
        const target = new Float64Array(dim);
        for (let i = 0; i < n; i++) {
          target[i] = Vinv[j * n + i];
          target[n + i] = Vinv[(j + 1) * n + i];
        }
        const v = new Float64Array(dim);
        for (let c = 0; c < cols; c++) {
          let dot = 0;
          for (let i = 0; i < dim; i++) dot += basis[c * dim + i] * target[i];
          for (let i = 0; i < dim; i++) v[i] += dot * basis[c * dim + i];
        }
        let norm = 0;
        for (let i = 0; i < dim; i++) norm += v[i] * v[i];
        norm = Math.sqrt(norm);
        if (!(norm > 0)) return;
        let change = 0;
        const u1 = new Float64Array(n);
        const u2 = new Float64Array(n);
        for (let i = 0; i < dim; i++) v[i] /= norm;
        for (let i = 0; i < n; i++) {
          u1[i] = v[i] - V[j * n + i];
          u2[i] = v[n + i] - V[(j + 1) * n + i];
          change += u1[i] * u1[i] + u2[i] * u2[i];
        }
        // Woodbury for two replaced columns: V⁻¹ ← V⁻¹ − Z·(I + EᵀZ)⁻¹·EᵀV⁻¹, Z = V⁻¹[u₁ u₂].
        for (let i = 0; i < n; i++) {
          let d1 = 0;
          let d2 = 0;
          for (let k = 0; k < n; k++) {
            d1 += Vinv[i * n + k] * u1[k];
            d2 += Vinv[i * n + k] * u2[k];
          }
          z[i] = d1;
          z2[i] = d2;
        }
        const c11 = 1 + z[j];
        const c12 = z2[j];
        const c21 = z[j + 1];
        const c22 = 1 + z2[j + 1];
        const det = c11 * c22 - c12 * c21;
        if (Math.abs(det) < pivotTolerance) return;
        logDeterminantGain += Math.log(Math.abs(det));
        // (I + EᵀZ)⁻¹·EᵀV⁻¹ as two rows.
        for (let k = 0; k < n; k++) {
          const a = Vinv[j * n + k];
          const b = Vinv[(j + 1) * n + k];
          rowCopy[k] = (c22 * a - c12 * b) / det;
          rowCopy2[k] = (-c21 * a + c11 * b) / det;
        }
        for (let i = 0; i < n; i++) {
          const zi = z[i];
          const wi = z2[i];
          for (let k = 0; k < n; k++) Vinv[i * n + k] -= zi * rowCopy[k] + wi * rowCopy2[k];
        }
        for (let i = 0; i < n; i++) {
          V[j * n + i] = v[i];
          V[(j + 1) * n + i] = v[n + i];
        }
        largestChange = Math.max(largestChange, Math.sqrt(change));
      }
    });
    if (largestChange < changeTolerance || (sweeps > 1 && logDeterminantGain < changeTolerance)) {
      converged = true;
      break;
    }
  }

  // Λ in real block form and K from B·K = A − V·Λ·V⁻¹ (least squares on range B).
  const Lambda: Rows = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  slots.forEach((slot, s) => {
    const j = offsets[s];
    if (slot.kind === 'real') Lambda[j][j] = slot.value;
    else {
      Lambda[j][j] = slot.re;
      Lambda[j + 1][j + 1] = slot.re;
      Lambda[j][j + 1] = slot.im;
      Lambda[j + 1][j] = -slot.im;
    }
  });
  const Vrows = toRows(V);
  const VLambda = Vrows.map((row) => Lambda[0].map((_, c) => row.reduce((sum, value, k) => sum + value * Lambda[k][c], 0)));
  // X = V·Λ·V⁻¹ solves Vᵀ·Xᵀ = (V·Λ)ᵀ.
  const solved = solveRows(transposeRows(Vrows), transposeRows(VLambda));
  if (solved.singular) return { K: [], V: Vrows, Lambda, sweeps, converged, ok: false };
  const closedLoop = transposeRows(solved.X);
  const difference = A.map((row, i) => row.map((value, j) => value - closedLoop[i][j]));
  const { U, s, V: W } = thinSvd(B);
  // K = W·Σ⁻¹·Uᵀ·(A − VΛV⁻¹)
  const UtD = U[0].map((_, c) => difference[0].map((__, j) => difference.reduce((sum, row, i) => sum + U[i][c] * row[j], 0) / s[c]));
  const K = W.map((wRow) => difference[0].map((_, j) => wRow.reduce((sum, value, c) => sum + value * UtD[c][j], 0)));
  return { K, V: Vrows, Lambda, sweeps, converged, ok: true };
}
