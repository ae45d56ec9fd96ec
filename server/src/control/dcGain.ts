// Steady-state (DC) gain of a linear system: G = C(−A)⁻¹B + D (continuous, s = 0) or
// C(I − A)⁻¹B + D (discrete, z = 1). Undefined — not zero — when −A (I − A) is singular within a
// tolerance 10·n·ε·σ_max on its singular values: a pole at the DC point.
import type { Rows } from '../numeric/types';
import { EPS, singularValuesOf, solveRows } from './controlLinearAlgebra';
import type { Domain } from './structure';

export function steadyStateGain(A: Rows, B: Rows, C: Rows, D: Rows, domain: Domain): Rows | null {
  const n = A.length;
  const m = n > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  const M = A.map((row, i) => row.map((v, j) => (domain === 'discrete' && i === j ? 1 : 0) - v));
  if (n > 0) {
    const s = singularValuesOf(M);
    if (!(s[n - 1] > 10 * n * EPS * s[0])) return null;
  }
  const X = n === 0 ? [] : solveRows(M, B).X;
  return C.map((row, i) => Array.from({ length: m }, (_, c) => (D[i]?.[c] ?? 0) + row.reduce((sum, v, k) => sum + v * X[k][c], 0)));
}

/** Closed-loop DC gain (C_t − D_tK)(−(A − BK))⁻¹B + D_t, u = −Kx + v; null when undefined. */
export function closedLoopDcGain(A: Rows, B: Rows, Ct: Rows, Dt: Rows, K: Rows, domain: Domain): { gain: Rows | null; defined: boolean } {
  const Acl = A.map((row, i) => row.map((v, j) => v - B[i].reduce((sum, b, c) => sum + b * K[c][j], 0)));
  const Ccl = Ct.map((row, i) => row.map((v, j) => v - Dt[i].reduce((sum, d, c) => sum + d * K[c][j], 0)));
  const gain = steadyStateGain(Acl, B, Ccl, Dt, domain);
  return { gain, defined: gain !== null };
}
