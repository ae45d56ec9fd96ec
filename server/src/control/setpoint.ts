// Reference tracking by a prescaler: u = −K·x + N·r with N = Nu + K·Nx, where the steady state
// (Nx·r, Nu·r) solves [A B; C_t D_t]·[Nx; Nu] = [0; I] (discrete: [A − I, B; C_t D_t]).
// Whether a constant set-point can be held is a RANK question about that Rosenbrock matrix at
// s = 0 / z = 1 (an invariant zero there, possibly cancelled in the transfer function), decided
// with a scaled tolerance on its singular values — never from a small computed DC gain.
import type { Rows } from '../numeric/types';
import type { AnalysisSettings } from './settings';
import { defaultSettings } from './settings';
import { EPS, frobenius, singularValuesOf, solveRows, solveRowsWithCondition, thinSvd, transposeRows } from './controlLinearAlgebra';
import type { Domain } from './structure';
import { closedLoopDcGain } from './dcGain';

export { closedLoopDcGain };

export type SetpointFeasibility = 'unique' | 'minimum-norm' | 'infeasible' | 'zero-at-dc';

export interface SetpointResult {
  feasibility: SetpointFeasibility;
  /** n × q steady state per unit set-point (null when infeasible). */
  Nx: Rows | null;
  /** m × q steady input per unit set-point. */
  Nu: Rows | null;
  /** m × q prescaler N = Nu + K·Nx. */
  prescaler: Rows | null;
  /** q × m closed-loop DC gain (C_t − D_t K)(−(A − BK))⁻¹B + D_t (discrete: (I − (A − BK))⁻¹). */
  closedLoopDcGain: Rows | null;
  /** False when A − BK (discrete: I − (A − BK)) is singular: the DC gain is undefined, not zero. */
  dcGainDefined: boolean;
  /** Inverse of the closed-loop DC gain when it is square and defined (equals the prescaler). */
  prescalerFromDcGain: Rows | null;
  rankInfo: { rank: number; expected: number; smallestSingularValue: number; tolerance: number };
  /** σ_max / σ_min (of the retained singular values) of the Rosenbrock matrix. */
  conditionNumber: number;
  /**
   * conditionNumber > settings.setpointGainLimit, or ‖N‖·‖B‖·‖C_t − D_tK‖ / ‖A − BK‖ (discrete:
   * ‖I − (A − BK)‖) > settings.setpointGainLimit: the set-point needs a gain far beyond the model's
   * natural scale.
   */
  illConditioned: boolean;
  /** Output weights (over the tracked outputs) of the combination that cannot be held. */
  singularCombination?: number[];
}

/** M⁺·rhs with M⁺ the pseudo-inverse on the leading `rank` singular values. */
function minimumNormSolution(M: Rows, rhs: Rows, rank: number): Rows {
  const { U, s, V } = thinSvd(M);
  const q = rhs[0]?.length ?? 0;
  const UtR = Array.from({ length: rank }, (_, c) => Array.from({ length: q }, (_, j) => rhs.reduce((sum, row, i) => sum + U[i][c] * row[j], 0) / s[c]));
  return V.map((row) => Array.from({ length: q }, (_, j) => row.slice(0, rank).reduce((sum, v, c) => sum + v * UtR[c][j], 0)));
}

function rosenbrockAtDc(A: Rows, B: Rows, Ct: Rows, Dt: Rows, domain: Domain): Rows {
  const top = A.map((row, i) => [...row.map((v, j) => (domain === 'discrete' && i === j ? v - 1 : v)), ...B[i]]);
  const bottom = Ct.map((row, i) => [...row, ...Dt[i]]);
  return [...top, ...bottom];
}

/** Rank tolerance max(rows, cols)·ε·σ_max·10 for the Rosenbrock matrix. */
function rankTolerance(s: number[], rows: number, cols: number): number {
  return 10 * Math.max(rows, cols) * EPS * (s[0] ?? 0);
}

/** Numerical rank of the top n rows [A B] of the Rosenbrock matrix, with the tolerance of rankTolerance. */
function topRowRank(top: Rows, n: number, m: number): number {
  const s = singularValuesOf(top);
  return s.filter((v) => v > rankTolerance(s, n, n + m)).length;
}

/** [0; I]: the right-hand side of the set-point equations, (n + q) × q. */
function outputSelector(n: number, q: number): Rows {
  return Array.from({ length: n + q }, (_, i) => Array.from({ length: q }, (_, j) => (i === n + j ? 1 : 0)));
}

/** N = Nu + K·Nx. */
function prescalerOf(Nx: Rows, Nu: Rows, K: Rows): Rows {
  return Nu.map((row, i) => row.map((v, j) => v + K[i].reduce((sum, k, c) => sum + k * Nx[c][j], 0)));
}

/**
 * The prescaler setpointGains returns when the square set-point equations (q = m) have full rank,
 * by the same LU solve, before their rank is decided (which takes two SVDs): a caller may start
 * work on it early and keep that work only if setpointGains then returns exactly this N. Null
 * when q ≠ m or M is singular or nearly so.
 */
export function squareSetpointPrescaler(A: Rows, B: Rows, C: Rows, D: Rows, trackedOutputs: number[], K: Rows, domain: Domain): Rows | null {
  const n = A.length;
  const m = n > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  const q = trackedOutputs.length;
  if (q === 0 || q !== m) return null;
  const Ct = trackedOutputs.map((i) => C[i].slice());
  const Dt = trackedOutputs.map((i) => (D[i] ?? new Array<number>(m).fill(0)).slice());
  const square = solveRowsWithCondition(rosenbrockAtDc(A, B, Ct, Dt, domain), outputSelector(n, q));
  // Only well away from the rank decision's threshold (σ_min ≤ 10·max(rows, cols)·ε·σ_max; the
  // 1-norm estimate is within a factor n of that ratio): a matrix the set-point analysis will call
  // rank deficient (a zero at s = 0) never gets a speculative study.
  if (square.singular || !(square.rcond >= 1e3 * 10 * (n + q) * EPS)) return null;
  return prescalerOf(square.X.slice(0, n), square.X.slice(n), K);
}

export function setpointGains(
  A: Rows,
  B: Rows,
  C: Rows,
  D: Rows,
  trackedOutputs: number[],
  K: Rows,
  domain: Domain,
  settings: AnalysisSettings = defaultSettings,
): SetpointResult {
  const n = A.length;
  const m = n > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  const q = trackedOutputs.length;
  const Ct = trackedOutputs.map((i) => C[i].slice());
  const Dt = trackedOutputs.map((i) => (D[i] ?? new Array<number>(m).fill(0)).slice());
  const M = rosenbrockAtDc(A, B, Ct, Dt, domain);
  // The rank decision needs only the singular values; the vectors are formed below only where the
  // solve needs them (a wide M, or a rank loss to explain).
  const s = singularValuesOf(M);
  const tolerance = rankTolerance(s, n + q, n + m);
  const rank = s.filter((v) => v > tolerance).length;
  // rank [A B] (A − I for sampled plants) is n whenever M has full row rank n + q: deleting q rows
  // interlaces the singular values, σ_n(top) ≥ σ_(n+q)(M) (interlacing theorem, from memory), and
  // top's tolerance is never the larger one (σ_1(top) ≤ σ_1(M), fewer rows). So the second
  // decomposition is needed only when M loses rank.
  const rankTop = n === 0 ? 0 : rank === n + q ? n : topRowRank(M.slice(0, n), n, m);
  const expected = rankTop + q;
  const smallest = s.length === 0 ? 0 : s[Math.min(s.length, n + q) - 1] ?? 0;
  const conditionNumber = rank === 0 ? Infinity : s[0] / s[rank - 1];
  const dc = closedLoopDcGain(A, B, Ct, Dt, K, domain);
  const base: Omit<SetpointResult, 'feasibility' | 'Nx' | 'Nu' | 'prescaler' | 'illConditioned' | 'prescalerFromDcGain'> = {
    closedLoopDcGain: dc.gain,
    dcGainDefined: dc.defined,
    rankInfo: { rank, expected, smallestSingularValue: smallest, tolerance },
    conditionNumber,
  };
  const none = { Nx: null, Nu: null, prescaler: null, prescalerFromDcGain: null, illConditioned: false };
  if (q > m) return { ...base, ...none, feasibility: 'infeasible' };
  if (rank < expected) {
    // Left null vectors of M with a non-zero output part name the combination that cannot be held.
    // Left singular vectors of M are the right ones of Mᵀ; with q ≤ m, Mᵀ is tall so all n + q exist.
    const full = thinSvd(transposeRows(M));
    let best: number[] | undefined;
    let bestNorm = 0;
    const leftVectors = full.V; // (n+q) × k
    const k = full.s.length;
    const candidates: number[][] = [];
    for (let c = 0; c < k; c++) if (!(full.s[c] > tolerance)) candidates.push(leftVectors.map((row) => row[c]));
    for (const vector of candidates) {
      const outputPart = vector.slice(n);
      const norm = Math.hypot(...outputPart);
      if (norm > bestNorm) {
        bestNorm = norm;
        best = outputPart.map((v) => v / norm);
      }
    }
    if (best) {
      const index = best.reduce((bi, v, i) => (Math.abs(v) > Math.abs(best![bi]) ? i : bi), 0);
      if (best[index] < 0) best = best.map((v) => -v);
    }
    return { ...base, ...none, feasibility: 'zero-at-dc', singularCombination: best };
  }
  // [Nx; Nu] = M⁺·[0; I]: for a square M of full rank that is M⁻¹·[0; I], by LU with partial
  // pivoting (backward stable; M is well enough conditioned here, or illConditioned says so);
  // otherwise on the retained singular values of the thin SVD.
  const rhs = outputSelector(n, q);
  const square = q === m && rank === n + q ? solveRows(M, rhs) : null;
  const X = square && !square.singular ? square.X : minimumNormSolution(M, rhs, rank);
  const Nx = X.slice(0, n);
  const Nu = X.slice(n);
  const prescaler = prescalerOf(Nx, Nu, K);
  const feasibility: SetpointFeasibility = q === m && rankTop === n ? 'unique' : 'minimum-norm';
  let prescalerFromDcGain: Rows | null = null;
  if (dc.gain && q === m && q > 0) {
    const inv = solveRows(dc.gain, Array.from({ length: q }, (_, i) => Array.from({ length: q }, (_, j) => (i === j ? 1 : 0))));
    if (!inv.singular) prescalerFromDcGain = inv.X;
  }
  const BK = A.map((_, i) => A.map((__, j) => B[i].reduce((sum, b, c) => sum + b * K[c][j], 0)));
  const loop = A.map((row, i) => row.map((v, j) => (domain === 'discrete' && i === j ? 1 : 0) - (v - BK[i][j])));
  const Ccl = Ct.map((row, i) => row.map((v, j) => v - Dt[i].reduce((sum, d, c) => sum + d * K[c][j], 0)));
  const naturalScale = (frobenius(B) * frobenius(Ccl)) / Math.max(frobenius(loop), Number.MIN_VALUE) + frobenius(Dt);
  const relativeGain = frobenius(prescaler) * naturalScale;
  const illConditioned = conditionNumber > settings.setpointGainLimit || relativeGain > settings.setpointGainLimit;
  return { ...base, feasibility, Nx, Nu, prescaler, prescalerFromDcGain, illConditioned };
}
