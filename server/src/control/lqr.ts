// Linear-quadratic regulator: u = −K x minimising ∫ xᵀQx + 2xᵀNu + uᵀRu dt (continuous) or
// Σ xᵀQx + 2xᵀNu + uᵀRu (discrete), from the stabilising solution X of the algebraic Riccati
// equation (solveContinuousRiccati / solveDiscreteRiccati in the numeric layer):
//   continuous  K = R⁻¹(BᵀX + Nᵀ)
//   discrete    K = (R + BᵀXB)⁻¹(BᵀXA + Nᵀ)
// Before solving, the data are checked so failures carry a reason an engineer can act on:
//   R symmetric positive definite (Cholesky), Q − N R⁻¹ Nᵀ positive semidefinite (eigenvalues),
//   (A, B) stabilisable (staircase + PBH), and no mode of (A − B R⁻¹ Nᵀ) on the stability
//   boundary unobservable through Q − N R⁻¹ Nᵀ (otherwise the Hamiltonian / symplectic pencil has
//   eigenvalues on the boundary and no stabilising solution exists).
// Guaranteed margins: for continuous full-state LQR with diagonal R and N = 0, each input loop
// has gain margin [½, ∞) and phase margin ≥ 60° (Safonov & Athans 1977, from the return
// difference inequality). Nowhere else (discrete, cross weights, observers) do they hold; there
// the engine computes the actual margins (margins.ts).
import {
  continuousRiccatiConditionEstimate,
  discreteRiccatiConditionEstimate,
  eigenvalues,
  solveContinuousRiccati,
  solveDiscreteRiccati,
  solveLinear,
  sortComplex,
} from '../numeric';
import type { Complex, Rows } from '../numeric/types';
import type { ChordBasis } from '../numeric';
import { analyzeControllability, analyzeObservability, classifyEigenvalue, eigenvalueTolerance } from './structure';
import { checkPositiveDefinite, checkPositiveSemidefinite } from './weightChecks';
import { transposeRows as transpose, multiplyRows as multiply } from './controlLinearAlgebra';

export type LqrFailure =
  | 'dimension-mismatch'
  | 'r-not-positive-definite'
  | 'q-not-positive-semidefinite'
  | 'not-stabilisable'
  | 'not-detectable-on-axis'
  | 'no-stabilising-solution'
  | 'no-convergence';

export interface LqrResult {
  ok: boolean;
  K: Rows | null;
  X: Rows | null;
  closedLoopPoles: Complex[];
  /** Relative Riccati residual reported by the solver. */
  residual: number;
  conditionEstimate: number;
  /** The Riccati solution was refined from the caller's `start` (see LqrOptions.start). */
  warmStarted: boolean;
  /** What to start the next nearby design from (LqrOptions.start): X and, when known, a chord basis. */
  nextStart?: RiccatiStart;
  failure?: LqrFailure;
  /** The offending mode for 'not-stabilisable' / 'not-detectable-on-axis'. */
  mode?: Complex;
  /** Smallest eigenvalue / pivot that failed a definiteness check. */
  smallest?: number;
  classicalMarginsApply: boolean;
}



function isDiagonal(M: Rows): boolean {
  return M.every((row, i) => row.every((value, j) => i === j || value === 0));
}

function isZero(M: Rows | undefined): boolean {
  return !M || M.every((row) => row.every((value) => value === 0));
}

export interface LqrOptions {
  /**
   * false: the result's conditionEstimate is NaN, to be computed later by
   * `lqrConditionEstimate` (same value) once the gain is in use elsewhere.
   */
  conditionEstimate?: boolean;
  /**
   * A stabilising Riccati solution of a nearby problem (the previous edit's) to refine from: the
   * solvers' warm start, which changes the route and not the equation solved.
   */
  start?: RiccatiStart;
  /** Continuous designs: leave the closed loop's balanced Schur form in the numeric memo (for the step response). */
  keepClosedLoopSchur?: boolean;
}

/**
 * Where a warm-started Riccati solve begins: a nearby stabilising solution X and, for continuous
 * designs, the chord basis the solve that produced it left (ChordBasis in numeric/riccatiContinuous).
 * Plain data and typed arrays: it travels between threads.
 */
export interface RiccatiStart {
  X: Rows;
  chordBasis?: ChordBasis;
}

/** The LQR problem data, plain and cloneable (for computing the condition estimate apart). */
export interface LqrProblem {
  A: Rows;
  B: Rows;
  Q: Rows;
  R: Rows;
  N?: Rows;
  domain: 'continuous' | 'discrete';
}

/** The Riccati condition estimate designLqr leaves out with `conditionEstimate: false`. */
export function lqrConditionEstimate(problem: LqrProblem, X: Rows): number {
  const { A, B, Q, R, N, domain } = problem;
  return domain === 'continuous' ? continuousRiccatiConditionEstimate(A, B, Q, R, N, X) : discreteRiccatiConditionEstimate(A, B, Q, R, N, X);
}

export function designLqr(
  A: Rows,
  B: Rows,
  Q: Rows,
  R: Rows,
  N: Rows | undefined,
  domain: 'continuous' | 'discrete',
  options: LqrOptions = {},
): LqrResult {
  const n = A.length;
  const m = n === 0 ? 0 : (B[0]?.length ?? 0);
  const result = (fields: Partial<LqrResult>): LqrResult => ({
    ok: false,
    K: null,
    X: null,
    closedLoopPoles: [],
    residual: NaN,
    conditionEstimate: NaN,
    warmStarted: false,
    classicalMarginsApply: false,
    ...fields,
  });
  const shapeOk =
    B.length === n &&
    Q.length === n &&
    Q.every((row) => row.length === n) &&
    R.length === m &&
    R.every((row) => row.length === m) &&
    (!N || (N.length === n && N.every((row) => row.length === m)));
  if (!shapeOk || m === 0) return result({ failure: 'dimension-mismatch' });

  const rCheck = checkPositiveDefinite(R);
  if (!rCheck.ok) return result({ failure: 'r-not-positive-definite', smallest: rCheck.smallest });

  // Q̃ = Q − N R⁻¹ Nᵀ and Ã = A − B R⁻¹ Nᵀ: the cross term removed (the standard change u = v − R⁻¹Nᵀx).
  let Qtilde = Q;
  let Atilde = A;
  if (N && !isZero(N)) {
    const RinvNt = solveLinear(R, transpose(N)).X; // m × n
    const NRinvNt = multiply(N, RinvNt);
    Qtilde = Q.map((row, i) => row.map((value, j) => value - NRinvNt[i][j]));
    const BRinvNt = multiply(B, RinvNt);
    Atilde = A.map((row, i) => row.map((value, j) => value - BRinvNt[i][j]));
  }
  const qCheck = checkPositiveSemidefinite(Qtilde);
  if (!qCheck.ok) return result({ failure: 'q-not-positive-semidefinite', smallest: qCheck.smallest });

  // The structural conditions for a stabilising solution (stabilisable (A, B); no unobservable
  // mode of (Q̃, Ã) on the stability boundary) name the mode at fault. They are checked when the
  // solver fails or its closed loop is not stable: a stabilising solution proves them, so a
  // successful design does not pay for two staircases.
  const structuralFailure = (): LqrResult | null => {
    const controllability = analyzeControllability(A, B, domain, { computeMargin: false });
    const unstabilisable = controllability.uncontrollableModes.find((mode) => !mode.stable);
    if (unstabilisable) return result({ failure: 'not-stabilisable', mode: unstabilisable.value });
    const observability = analyzeObservability(Atilde, Qtilde, domain, { computeMargin: false });
    const axisTolerance = eigenvalueTolerance(Atilde, domain);
    const onAxis = observability.unobservableModes.find(
      (mode) => classifyEigenvalue(mode.value, domain, axisTolerance) === 'marginal',
    );
    return onAxis ? result({ failure: 'not-detectable-on-axis', mode: onAxis.value }) : null;
  };

  const solution =
    domain === 'continuous'
      ? solveContinuousRiccati(A, B, Q, R, N, {
          conditionEstimate: options.conditionEstimate,
          start: options.start?.X,
          chordBasis: options.start?.chordBasis,
          keepClosedLoopSchur: options.keepClosedLoopSchur,
        })
      : solveDiscreteRiccati(A, B, Q, R, N, { conditionEstimate: options.conditionEstimate, start: options.start?.X });
  const classicalMarginsApply = domain === 'continuous' && isDiagonal(R) && isZero(N);
  if (!solution.ok || !solution.X) {
    const structural = structuralFailure();
    if (structural) return structural;
    const failure: LqrFailure = solution.failure === 'no-convergence' ? 'no-convergence' : 'no-stabilising-solution';
    return result({ failure, residual: solution.residual, conditionEstimate: solution.conditionEstimate });
  }
  const X = solution.X;
  let K: Rows;
  if (solution.gain && solution.gain.length === m) {
    K = solution.gain;
  } else if (domain === 'continuous') {
    const rhs = multiply(transpose(B), X).map((row, i) => row.map((value, j) => value + (N ? N[j][i] : 0)));
    K = solveLinear(R, rhs).X;
  } else {
    const BtX = multiply(transpose(B), X);
    const H = multiply(BtX, B).map((row, i) => row.map((value, j) => value + R[i][j]));
    const rhs = multiply(BtX, A).map((row, i) => row.map((value, j) => value + (N ? N[j][i] : 0)));
    K = solveLinear(H, rhs).X;
  }
  // The solver already has the eigenvalues of A − B·K for its own gain (in Schur order: sorted
  // here as `eigenvalues` sorts them).
  const closedLoopPoles =
    K === solution.gain && solution.closedLoopEigenvalues.length === n
      ? sortComplex(solution.closedLoopEigenvalues)
      : closedLoopEigenvalues(A, B, K);
  const tolerance = eigenvalueTolerance(A, domain);
  const stable = closedLoopPoles.every((pole) => classifyEigenvalue(pole, domain, tolerance) === 'stable');
  if (!stable) {
    const structural = structuralFailure();
    if (structural) return structural;
    return result({
      failure: 'no-stabilising-solution',
      K,
      X,
      closedLoopPoles,
      residual: solution.residual,
      conditionEstimate: solution.conditionEstimate,
    });
  }
  return {
    ok: true,
    K,
    X,
    closedLoopPoles,
    residual: solution.residual,
    conditionEstimate: solution.conditionEstimate,
    warmStarted: solution.warmStarted,
    nextStart: { X, ...(solution.chordBasis ? { chordBasis: solution.chordBasis } : {}) },
    classicalMarginsApply,
  };
}

function closedLoopEigenvalues(A: Rows, B: Rows, K: Rows) {
  const BK = multiply(B, K);
  return eigenvalues(A.map((row, i) => row.map((value, j) => value - BK[i][j])));
}
