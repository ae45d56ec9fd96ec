// Steady-state Kalman filter gain by duality with the LQR Riccati equation.
//   Process noise enters as G w (G = I when the noise is given on the states), so its intensity on
//   the states is G W Gᵀ; measurement noise intensity V (p × p) must be positive definite.
//   Continuous (W, V spectral densities): P solves the dual CARE
//       A P + P Aᵀ − P Cᵀ V⁻¹ C P + G W Gᵀ = 0,       L = P Cᵀ V⁻¹.
//   Discrete (W, V covariances): P = P(k|k−1) solves the dual DARE
//       P = A P Aᵀ − A P Cᵀ (C P Cᵀ + V)⁻¹ C P Aᵀ + G W Gᵀ,
//     predictor form   x̂[k+1|k] = A x̂[k|k−1] + B u + L_p (y − C x̂ − D u),  L_p = A P Cᵀ (C P Cᵀ + V)⁻¹,
//     current form     x̂[k|k] = x̂[k|k−1] + M (y − C x̂[k|k−1] − D u),      M = P Cᵀ (C P Cᵀ + V)⁻¹.
//   The dual of "stabilisable" is "(A, C) detectable"; the dual of "detectable on the boundary" is
//   "every boundary mode excited by the process noise".
import type { Complex, Rows } from '../numeric/types';
import { eigenvalues, solveLinear } from '../numeric';
import { designLqr, type RiccatiStart } from './lqr';
import { checkPositiveSemidefinite } from './weightChecks';
import { transposeRows as transpose, multiplyRows as multiply } from './controlLinearAlgebra';

export type KalmanFailure =
  | 'dimension-mismatch'
  | 'v-not-positive-definite'
  | 'w-not-positive-semidefinite'
  | 'not-detectable'
  | 'noise-misses-boundary-mode'
  | 'no-stabilising-solution'
  | 'no-convergence';

export interface KalmanResult {
  ok: boolean;
  form: 'continuous' | 'predictor' | 'current';
  /** The gain for the stated form: L (continuous), L_p (predictor) or M (current); n × p. */
  gain: Rows | null;
  /** Discrete only: both forms, for the record. */
  predictorGain: Rows | null;
  currentGain: Rows | null;
  /** Steady-state error covariance (P(k|k−1) for discrete). */
  P: Rows | null;
  /** Eigenvalues of A − L C (continuous) or A − L_p C (discrete; equal to those of A − A M C). */
  observerPoles: Complex[];
  residual: number;
  conditionEstimate: number;
  /** The dual Riccati solve started from `start` (see KalmanProblem.start). */
  warmStarted: boolean;
  /** What to start the next nearby design from (KalmanProblem.start). */
  nextStart?: RiccatiStart;
  failure?: KalmanFailure;
  mode?: Complex;
}



export interface KalmanProblem {
  A: Rows;
  C: Rows;
  /** Process noise intensity: n × n on the states when G is absent, else d × d on G's columns. */
  W: Rows;
  V: Rows;
  G?: Rows;
  domain: 'continuous' | 'discrete';
  /** Discrete only (default 'predictor'). */
  form?: 'predictor' | 'current';
  /** A nearby problem's P (and chord basis) to start the dual Riccati solve from (the solvers' warm start). */
  start?: RiccatiStart;
  /** false: the dual Riccati's condition estimate is left out (NaN in the result). */
  conditionEstimate?: boolean;
}

export function steadyStateKalmanGain(problem: KalmanProblem): KalmanResult {
  const { A, C, W, V, G, domain } = problem;
  const n = A.length;
  const p = C.length;
  const form: KalmanResult['form'] = domain === 'continuous' ? 'continuous' : (problem.form ?? 'predictor');
  const fail = (failure: KalmanFailure, extra: Partial<KalmanResult> = {}): KalmanResult => ({
    ok: false,
    form,
    gain: null,
    predictorGain: null,
    currentGain: null,
    P: null,
    observerPoles: [],
    residual: NaN,
    conditionEstimate: NaN,
    warmStarted: false,
    failure,
    ...extra,
  });
  const d = G ? (G[0]?.length ?? 0) : n;
  if (p === 0 || C.some((row) => row.length !== n) || W.length !== d || (G && G.length !== n)) {
    return fail('dimension-mismatch');
  }
  const wCheck = checkPositiveSemidefinite(W);
  if (!wCheck.ok) return fail('w-not-positive-semidefinite');
  const processOnStates = G ? multiply(multiply(G, W), transpose(G)) : W;

  const dual = designLqr(transpose(A), transpose(C), processOnStates, V, undefined, domain, { start: problem.start, conditionEstimate: problem.conditionEstimate });
  if (!dual.ok || !dual.X || !dual.K) {
    const map: Record<string, KalmanFailure> = {
      'dimension-mismatch': 'dimension-mismatch',
      'r-not-positive-definite': 'v-not-positive-definite',
      'q-not-positive-semidefinite': 'w-not-positive-semidefinite',
      'not-stabilisable': 'not-detectable',
      'not-detectable-on-axis': 'noise-misses-boundary-mode',
      'no-stabilising-solution': 'no-stabilising-solution',
      'no-convergence': 'no-convergence',
    };
    return fail(map[dual.failure ?? 'no-stabilising-solution'], {
      residual: dual.residual,
      conditionEstimate: dual.conditionEstimate,
      ...(dual.mode ? { mode: dual.mode } : {}),
    });
  }
  const P = dual.X;
  const dualGainTransposed = transpose(dual.K); // n × p: P Cᵀ V⁻¹ or A P Cᵀ (C P Cᵀ + V)⁻¹
  let predictorGain: Rows | null = null;
  let currentGain: Rows | null = null;
  let gain = dualGainTransposed;
  if (domain === 'discrete') {
    predictorGain = dualGainTransposed;
    // M = P Cᵀ S⁻¹ with S = C P Cᵀ + V symmetric: M = (S⁻¹ C P)ᵀ.
    const CP = multiply(C, P);
    const S = multiply(CP, transpose(C)).map((row, i) => row.map((value, j) => value + V[i][j]));
    currentGain = transpose(solveLinear(S, CP).X);
    gain = form === 'current' ? currentGain : predictorGain;
  }
  const LpC = multiply(dualGainTransposed, C);
  const observerPoles = eigenvalues(A.map((row, i) => row.map((value, j) => value - LpC[i][j])));
  return {
    ok: true,
    form,
    gain,
    predictorGain,
    currentGain,
    P,
    observerPoles,
    residual: dual.residual,
    conditionEstimate: dual.conditionEstimate,
    warmStarted: dual.warmStarted,
    ...(dual.nextStart ? { nextStart: dual.nextStart } : {}),
  };
}
