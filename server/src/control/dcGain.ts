// Steady-state (DC) gain of a linear system: G = C(−A)⁻¹B + D (continuous, s = 0) or
// C(I − A)⁻¹B + D (discrete, z = 1). Undefined — not zero — when −A (I − A) is numerically
// singular: its reciprocal 1-norm condition number, estimated from the LU factors (Hager 1984,
// Higham 1988, as LAPACK dgecon), is at most 10·n·ε — a pole at the DC point. One LU serves
// the test and the solve (an SVD for the test cost four times the whole solve at n = 100).
import { solveLinear } from '../numeric';
import type { Rows } from '../numeric/types';
import { EPS } from './controlLinearAlgebra';
import type { Domain } from './structure';

export function steadyStateGain(A: Rows, B: Rows, C: Rows, D: Rows, domain: Domain): Rows | null {
  const n = A.length;
  const m = n > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  const M = A.map((row, i) => row.map((v, j) => (domain === 'discrete' && i === j ? 1 : 0) - v));
  let X: Rows = [];
  if (n > 0) {
    const solution = solveLinear(M, m > 0 ? B : M.map(() => [0]));
    if (solution.singular || !(solution.rcond > 10 * n * EPS)) return null;
    X = solution.X;
  }
  return C.map((row, i) => Array.from({ length: m }, (_, c) => (D[i]?.[c] ?? 0) + row.reduce((sum, v, k) => sum + v * X[k][c], 0)));
}

/** Closed-loop DC gain (C_t − D_tK)(−(A − BK))⁻¹B + D_t, u = −Kx + v; null when undefined. */
export function closedLoopDcGain(A: Rows, B: Rows, Ct: Rows, Dt: Rows, K: Rows, domain: Domain): { gain: Rows | null; defined: boolean } {
  const Acl = A.map((row, i) => row.map((v, j) => v - B[i].reduce((sum, b, c) => sum + b * K[c][j], 0)));
  const Ccl = Ct.map((row, i) => row.map((v, j) => v - Dt[i].reduce((sum, d, c) => sum + d * K[c][j], 0)));
  const gain = steadyStateGain(Acl, B, Ccl, Dt, domain);
  return { gain, defined: gain !== null };
}
