// Discrete-time algebraic Riccati equation
//   X = AᵀXA − (AᵀXB + N)(R + BᵀXB)⁻¹(BᵀXA + Nᵀ) + Q
// by the structure-preserving doubling algorithm (SDA) of Chu, Fan, Lin & Wang, "Structure-
// preserving algorithms for periodic discrete-time algebraic Riccati equations", Int. J. Control
// 77(8), 2004, in the form of Lin & Xu, SIAM J. Matrix Anal. Appl. 28(1), 2006. After folding the
// cross term (Ā = A − BR⁻¹Nᵀ, Q̄ = Q − NR⁻¹Nᵀ, G = BR⁻¹Bᵀ) the equation is X = ĀᵀX(I + GX)⁻¹Ā + Q̄,
// and the doubling
//   W = I + G_k H_k,  A_{k+1} = A_k W⁻¹ A_k,  G_{k+1} = G_k + A_k W⁻¹ G_k A_kᵀ,  H_{k+1} = H_k + A_kᵀ H_k W⁻¹ A_k
// converges quadratically, H_k → X. A is never inverted, so a singular state-transition matrix
// (e.g. a computation-delay state) is fine. R itself must be positive definite here (the true
// condition is R + BᵀXB > 0; requiring R > 0 keeps the folding and G well defined). The result is
// refined by Newton (Hewer 1971) steps, each a Stein equation on the closed loop. With a warm
// start (a nearby stabilising solution, as riccatiContinuous.ts explains) the same Newton steps
// start from it and the doubling is skipped when they converge fast.

import {
  type Dense,
  denseFromRows,
  identityDense,
  multiplyDense,
  multiplyTransposeSymmetricDense,
  normFrobeniusDense,
  transposeDense,
  transposeMultiplySymmetricDense,
  denseToRows,
} from './dense';
import { luFactor, luSolveDense, reciprocalConditionEstimate } from './lu';
import { solveLyapunovDiscreteDense } from './lyapunov';
import {
  type RiccatiInputs,
  type RiccatiSolution,
  allFinite,
  combine,
  failedSolution,
  foldCrossTerm,
  inverseIfPositiveDefinite,
  readRiccatiInputs,
  riccatiSolutionData,
  symmetrisedDense,
  WARM_START_MIN_REDUCTION,
  WARM_START_STEPS,
} from './riccatiContinuous';
import { eigenvaluesWithStatus } from './eigenvectors';
import { realSchurDense } from './schur';
import type { Rows } from './types';
import { countIterations, noteNonConvergence } from './iterationCount';

const EPS = Number.EPSILON;
const MAX_DOUBLINGS = 60;
const MAX_NEWTON_STEPS = 10;

interface DiscreteTerms {
  residual: Dense;
  /** Ā − B(R + BᵀXB)⁻¹BᵀXĀ */
  closedLoop: Dense;
  denominator: number;
}

/**
 * Res = ĀᵀXĀ − X − ĀᵀXB(R + BᵀXB)⁻¹BᵀXĀ + Q̄ and the closed loop. The normalised residual is
 * ‖Res‖_F / (‖Q̄‖_F + ‖X‖_F + ‖ĀᵀXĀ‖_F + ‖ĀᵀXB(R + BᵀXB)⁻¹BᵀXĀ‖_F): the size of the residual
 * relative to the terms that cancel in it.
 */
function discreteTerms(Abar: Dense, B: Dense, R: Dense, Qbar: Dense, X: Dense): DiscreteTerms | null {
  const XA = multiplyDense(X, Abar);
  const BtXA = multiplyDense(transposeDense(B), XA);
  const S = combine(R, 1, multiplyDense(multiplyDense(transposeDense(B), X), B), 1);
  const factor = luFactor(S);
  if (factor.hasZeroPivot) return null;
  const feedback = luSolveDense(factor, BtXA); // (R + BᵀXB)⁻¹BᵀXĀ
  const AtXA = multiplyDense(transposeDense(Abar), XA);
  const correction = multiplyDense(transposeDense(BtXA), feedback);
  const residual = symmetrisedDense(combine(combine(AtXA, 1, X, -1), 1, combine(correction, -1, Qbar, 1), 1));
  const closedLoop = combine(Abar, 1, multiplyDense(B, feedback), -1);
  const denominator =
    normFrobeniusDense(Qbar) + normFrobeniusDense(X) + normFrobeniusDense(AtXA) + normFrobeniusDense(correction);
  return { residual, closedLoop, denominator };
}

function normalised(terms: DiscreteTerms): number {
  const numerator = normFrobeniusDense(terms.residual);
  return terms.denominator === 0 ? numerator : numerator / terms.denominator;
}

/** SDA iteration; null when I + G_k H_k becomes singular or the iterates overflow. */
function structurePreservingDoubling(
  Abar: Dense,
  G: Dense,
  Qbar: Dense,
): { X: Dense; converged: boolean } | null {
  const n = Abar.rows;
  let Ak = Abar;
  let Gk = G;
  let Hk = Qbar;
  const identity = identityDense(n);
  for (let k = 0; k < MAX_DOUBLINGS; k++) {
    countIterations();
    const W = combine(identity, 1, multiplyDense(Gk, Hk), 1);
    const factor = luFactor(W);
    if (factor.hasZeroPivot) return null;
    let norm1 = 0;
    for (let j = 0; j < n; j++) {
      let sum = 0;
      for (let i = 0; i < n; i++) sum += Math.abs(W.data[i * n + j]);
      norm1 = Math.max(norm1, sum);
    }
    if (!(reciprocalConditionEstimate(factor, norm1) > n * EPS)) return null;
    const WinvA = luSolveDense(factor, Ak);
    const WinvG = luSolveDense(factor, Gk);
    const nextA = multiplyDense(Ak, WinvA);
    // A_k·(W⁻¹G_k)·A_kᵀ and A_kᵀ·(H_k·W⁻¹)·A_k are symmetric (W⁻¹G_k = G_k(I + H_kG_k)⁻¹ and
    // H_kW⁻¹ are), so their last products need only one triangle.
    const nextG = symmetrisedDense(combine(Gk, 1, multiplyTransposeSymmetricDense(multiplyDense(Ak, WinvG), Ak), 1));
    const nextH = symmetrisedDense(combine(Hk, 1, transposeMultiplySymmetricDense(Ak, multiplyDense(Hk, WinvA)), 1));
    if (!allFinite(nextA, nextG, nextH)) return null;
    const change = normFrobeniusDense(combine(nextH, 1, Hk, -1));
    Ak = nextA;
    Gk = nextG;
    Hk = nextH;
    // Quadratic convergence: once the update is at rounding level of H the iteration is done.
    if (change <= n * EPS * normFrobeniusDense(Hk)) return { X: Hk, converged: true };
  }
  noteNonConvergence('riccati-doubling');
  return { X: Hk, converged: false };
}

export interface DiscreteRiccatiOptions {
  /** Refinement steps allowed after the doubling (default 10; 0 reports the raw SDA result). */
  maxNewtonSteps?: number;
  /**
   * false: leave the condition estimate out (NaN) and take the closed-loop eigenvalues from an
   * eigenvalue-only QR; `discreteRiccatiConditionEstimate` gives the same estimate apart.
   */
  conditionEstimate?: boolean;
  /** A nearby stabilising solution to refine from (the continuous solver's `start`, same rules). */
  start?: Rows;
}

/**
 * Hewer's Newton steps from a caller's start X₀: each closed loop must be Schur stable (read off
 * the Schur form its Stein solve uses), each step must divide the residual by
 * WARM_START_MIN_REDUCTION, and the residual must reach n·ε within WARM_START_STEPS; else null.
 */
function discreteNewtonFromStart(
  Abar: Dense,
  B: Dense,
  Rsym: Dense,
  Qbar: Dense,
  start: Rows,
): { X: Dense; terms: DiscreteTerms; residual: number; steps: number } | null {
  const n = Abar.rows;
  if (start.length !== n || !start.every((row) => row.length === n)) return null;
  let X = symmetrisedDense(denseFromRows(start));
  if (!allFinite(X)) return null;
  let terms = discreteTerms(Abar, B, Rsym, Qbar, X);
  if (terms === null) return null;
  let residual = normalised(terms);
  const target = n * EPS;
  let steps = 0;
  while (!(residual <= target)) {
    if (steps === WARM_START_STEPS || !Number.isFinite(residual)) return null;
    countIterations();
    const closedLoopTransposed = transposeDense(terms.closedLoop);
    const schur = realSchurDense(closedLoopTransposed);
    if (!schur.converged || !schur.eigenvalues.every((lambda) => Math.hypot(lambda.re, lambda.im) < 1)) return null;
    const correction = solveLyapunovDiscreteDense(closedLoopTransposed, terms.residual, schur);
    if (!correction.ok) return null;
    const candidate = symmetrisedDense(combine(X, 1, correction.X, 1));
    const candidateTerms = discreteTerms(Abar, B, Rsym, Qbar, candidate);
    if (candidateTerms === null) return null;
    const candidateResidual = normalised(candidateTerms);
    if (!(candidateResidual <= target || candidateResidual * WARM_START_MIN_REDUCTION <= residual)) return null;
    X = candidate;
    terms = candidateTerms;
    residual = candidateResidual;
    steps++;
  }
  return { X, terms, residual, steps };
}

/**
 * Solves X = AᵀXA − (AᵀXB + N)(R + BᵀXB)⁻¹(BᵀXA + Nᵀ) + Q for the stabilising X; gain
 * K = (R + BᵀXB)⁻¹(BᵀXA + Nᵀ), closed loop A − BK inside the unit circle. Never throws.
 */
export function solveDiscreteRiccati(
  A: Rows,
  B: Rows,
  Q: Rows,
  R: Rows,
  N?: Rows,
  options: DiscreteRiccatiOptions = {},
): RiccatiSolution {
  const inputs = readRiccatiInputs(A, B, Q, R, N);
  const n = A.length;
  const m = R.length;
  if (inputs === null) return failedSolution(n, m, 'no-convergence');
  const Rinv = inverseIfPositiveDefinite(inputs.R);
  if (Rinv === null) return failedSolution(n, m, 'r-not-positive-definite');
  if (n === 0) {
    return { X: [], gain: Array.from({ length: m }, () => []), residual: 0, closedLoopEigenvalues: [], ok: true, newtonSteps: 0, warmStarted: false, conditionEstimate: 0 };
  }
  const Rsym = symmetrisedDense(inputs.R);
  const { Abar, Qbar, G } = foldCrossTerm(inputs.A, inputs.B, inputs.Q, inputs.N, Rinv);
  if (options.start) {
    const warm = discreteNewtonFromStart(Abar, inputs.B, Rsym, Qbar, options.start);
    if (warm) {
      const solution = finishDiscrete(inputs, Rsym, Abar, G, Qbar, warm.X, warm.terms, warm.residual, warm.steps, true, options);
      if (solution.ok) return { ...solution, warmStarted: true };
    }
  }
  const doubling = structurePreservingDoubling(Abar, G, Qbar);
  if (doubling === null) return failedSolution(n, m, 'not-stabilisable');
  let X = doubling.X;
  let terms = discreteTerms(Abar, inputs.B, Rsym, Qbar, X);
  if (terms === null) return failedSolution(n, m, 'no-convergence');
  let residual = normalised(terms);

  let newtonSteps = 0;
  const maxNewtonSteps = options.maxNewtonSteps ?? MAX_NEWTON_STEPS;
  for (let step = 0; step < maxNewtonSteps && residual > n * EPS; step++) {
    countIterations();
    // Acᵀ Δ Ac − Δ + Res = 0
    const correction = solveLyapunovDiscreteDense(transposeDense(terms.closedLoop), terms.residual);
    if (!correction.ok) break;
    const candidate = symmetrisedDense(combine(X, 1, correction.X, 1));
    const candidateTerms = discreteTerms(Abar, inputs.B, Rsym, Qbar, candidate);
    if (candidateTerms === null) break;
    const candidateResidual = normalised(candidateTerms);
    if (!(candidateResidual < residual)) break;
    X = candidate;
    terms = candidateTerms;
    residual = candidateResidual;
    newtonSteps++;
  }

  return finishDiscrete(inputs, Rsym, Abar, G, Qbar, X, terms, residual, newtonSteps, doubling.converged, options);
}

/** Gain, closed-loop eigenvalues, condition estimate and the final checks of a solution X. */
function finishDiscrete(
  inputs: RiccatiInputs,
  Rsym: Dense,
  Abar: Dense,
  G: Dense,
  Qbar: Dense,
  X: Dense,
  terms: DiscreteTerms,
  residual: number,
  newtonSteps: number,
  iterationConverged: boolean,
  options: DiscreteRiccatiOptions,
): RiccatiSolution {
  const { gain, closedLoop } = gainAndClosedLoop(inputs, Rsym, X);
  let closedLoopEigenvalues;
  let converged: boolean;
  if (options.conditionEstimate === false) {
    const outcome = eigenvaluesWithStatus(denseToRows(closedLoop));
    closedLoopEigenvalues = outcome.values;
    converged = outcome.converged;
  } else {
    const closedLoopSchur = realSchurDense(closedLoop);
    closedLoopEigenvalues = closedLoopSchur.eigenvalues;
    converged = closedLoopSchur.converged;
  }
  const result: RiccatiSolution = {
    X: denseToRows(X),
    gain: denseToRows(gain),
    residual,
    closedLoopEigenvalues,
    ok: true,
    newtonSteps,
    warmStarted: false,
    conditionEstimate: options.conditionEstimate === false ? NaN : discreteConditionEstimate(terms.closedLoop, Abar, G, Qbar, X),
  };
  if (!allFinite(X, gain)) return { ...result, ok: false, failure: 'no-convergence' };
  // Eigenvalues within √ε·max(1, ‖A‖_F) of the unit circle count as on it (a double eigenvalue
  // there, as uncontrollable or unobservable modes on the circle produce, moves by about that much).
  const circleTolerance = Math.sqrt(EPS) * Math.max(1, normFrobeniusDense(inputs.A));
  const radius = Math.max(...closedLoopEigenvalues.map((lambda) => Math.hypot(lambda.re, lambda.im)));
  if (Math.abs(radius - 1) <= circleTolerance) return { ...result, ok: false, failure: 'unit-circle-eigenvalues' };
  if (!(radius < 1)) return { ...result, ok: false, failure: 'not-stabilisable' };
  if (!converged || !iterationConverged) return { ...result, ok: false, failure: 'no-convergence' };
  return result;
}

/** K = (R + BᵀXB)⁻¹(BᵀXA + Nᵀ) and the closed loop A − BK. */
function gainAndClosedLoop(inputs: RiccatiInputs, Rsym: Dense, X: Dense): { gain: Dense; closedLoop: Dense } {
  const Bt = transposeDense(inputs.B);
  const S = combine(Rsym, 1, multiplyDense(multiplyDense(Bt, X), inputs.B), 1);
  const gain = luSolveDense(luFactor(S), combine(multiplyDense(multiplyDense(Bt, X), inputs.A), 1, transposeDense(inputs.N), 1));
  return { gain, closedLoop: combine(inputs.A, 1, multiplyDense(inputs.B, gain), -1) };
}

/**
 * The condition estimate `solveDiscreteRiccati` gives, for a solution X it returned with
 * `conditionEstimate: false`: the same value, computed apart.
 */
export function discreteRiccatiConditionEstimate(A: Rows, B: Rows, Q: Rows, R: Rows, N: Rows | undefined, X: Rows): number {
  const data = riccatiSolutionData(A, B, Q, R, N, X);
  if (typeof data === 'number') return data;
  const terms = discreteTerms(data.Abar, data.inputs.B, symmetrisedDense(data.inputs.R), data.Qbar, data.solution);
  return terms === null ? Infinity : discreteConditionEstimate(terms.closedLoop, data.Abar, data.G, data.Qbar, data.solution);
}

/**
 * ‖Ω⁻¹(I)‖·(‖Q̄‖ + ‖Ā‖²‖X‖ + ‖Ā‖²‖G‖‖X‖²)/‖X‖ with Ω(Z) = Z − AcᵀZAc (Stein operator of the
 * closed loop; Ω⁻¹ is positive, so its norm is attained at I). First-order estimate, common practice.
 */
function discreteConditionEstimate(closedLoop: Dense, Abar: Dense, G: Dense, Qbar: Dense, X: Dense): number {
  const n = X.rows;
  const atIdentity = solveLyapunovDiscreteDense(transposeDense(closedLoop), identityDense(n));
  if (!atIdentity.ok) return Infinity;
  const normX = normFrobeniusDense(X);
  const normA = normFrobeniusDense(Abar);
  const data = normFrobeniusDense(Qbar) + normA * normA * normX * (1 + normFrobeniusDense(G) * normX);
  return (normFrobeniusDense(atIdentity.X) * data) / (normX > 0 ? normX : 1);
}
