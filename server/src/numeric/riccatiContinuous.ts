// Continuous-time algebraic Riccati equation
//   AᵀX + XA − (XB + N)R⁻¹(BᵀX + Nᵀ) + Q = 0
// by the Schur method of Laub, "A Schur method for solving algebraic Riccati equations", IEEE
// Trans. Automat. Control 24(6), 1979: the stable invariant subspace [U11; U21] of the Hamiltonian
// matrix from an ordered real Schur form gives X = U21·U11⁻¹. The matrix sign function (Roberts
// 1980) is the fallback when the Schur route does not converge. The result is refined by
// Newton–Kleinman steps (Kleinman, "On an iterative technique for Riccati equation computations",
// IEEE Trans. Automat. Control 13(1), 1968) in defect-correction form, each a Lyapunov solve on the
// closed loop, for as long as the residual keeps decreasing (at most 10 steps).
// Warm start: given a nearby stabilising solution (the previous edit's, in the editor) the same
// Newton steps start from it instead (numerical continuation); they must reach the cold route's
// residual target within WARM_START_STEPS steps, each a clear quadratic-phase gain, or the cold
// route runs as if no start had been given. Given also the Schur form of a recent closed loop (a
// chord basis, which every Newton step leaves behind), a step first tries that form in place of
// its own iterate's — the chord method (Kelley, "Iterative Methods for Linear and Nonlinear
// Equations", SIAM 1995, §5.4): from a start δ away with a basis δ out of date, the step leaves
// O(δ²) like Newton's, without the n×n Schur form that is most of a Newton step's cost.

import {
  type Dense,
  denseFromRows,
  denseToRows,
  identityDense,
  multiplyDense,
  normFrobeniusDense,
  transposeDense,
  zerosDense,
} from './dense';
import { luFactor, luSolveDense, reciprocalConditionEstimate } from './lu';
import { solveLyapunovContinuousDense } from './lyapunov';
import { matrixSignDense } from './matrixSign';
import { eigenvaluesAndBalancedSchur, eigenvaluesWithStatus } from './eigenvectors';
import { eigenvaluesOfQuasiTriangular, realSchurDense, type RealSchurDense } from './schur';
import { orderedRealSchurDense } from './schurReorder';
import type { Complex, Rows } from './types';
import { countIterations } from './iterationCount';

const EPS = Number.EPSILON;
const MAX_NEWTON_STEPS = 10;
/** Newton steps a warm start may take before the cold route takes over. */
export const WARM_START_STEPS = 3;
/**
 * Each warm-start step must divide the residual by at least this much: Newton's quadratic phase
 * (a step from residual r leaves about c·r²) does far better; a smaller gain means the start is
 * outside that phase and the Schur route is cheaper than many linear-phase steps.
 */
export const WARM_START_MIN_REDUCTION = 100;
/** Chord steps a warm start may take on a caller's basis before Newton steps take over. */
export const CHORD_STEPS = 3;

export type RiccatiFailure =
  | 'not-stabilisable'
  | 'imaginary-axis-eigenvalues'
  | 'unit-circle-eigenvalues'
  | 'r-not-positive-definite'
  | 'no-convergence'
  | 'not-symmetric-solution';

export interface RiccatiSolution {
  X: Rows;
  /** Optimal state-feedback gain (u = −K·x). */
  gain: Rows;
  /** Normalised residual (formula documented at each solver). */
  residual: number;
  closedLoopEigenvalues: Complex[];
  ok: boolean;
  failure?: RiccatiFailure;
  /** Refinement steps actually kept (with a warm start: the steps from the start). */
  newtonSteps: number;
  /** True when the solution was refined from the caller's start rather than solved afresh. */
  warmStarted: boolean;
  /**
   * The real Schur form the last Newton step solved with (or the caller's basis, while chord steps
   * on it still succeed): pass it back with the next start (ContinuousRiccatiOptions.chordBasis).
   * Only the continuous warm route gives one.
   */
  chordBasis?: ChordBasis;
  /** Of `newtonSteps`, those taken as chord steps on the caller's basis (continuous warm route only). */
  chordSteps?: number;
  /**
   * First-order relative condition estimate of X: ‖Ω⁻¹‖·(‖Q̄‖ + 2‖Ā‖‖X‖ + ‖G‖‖X‖²)/‖X‖ for the
   * continuous case, with Ω the closed-loop Lyapunov (resp. Stein) operator; ‖Ω⁻¹‖ = ‖Ω⁻¹(I)‖₂
   * exactly because Ω⁻¹ maps positive semidefinite matrices to positive semidefinite ones
   * (Byers 1985; Kenney & Hewer 1990). Infinity when it cannot be formed.
   */
  conditionEstimate: number;
}

/**
 * A closed loop's transpose (Ā − G·X)ᵀ for some recent stabilising X, with its real Schur form:
 * the operator of a chord step. Plain typed arrays, so it travels between threads.
 */
export interface ChordBasis {
  matrix: Dense;
  schur: RealSchurDense;
}

// ------------------------------------------------------------------ shared helpers (also used by the discrete solver)

export function symmetrisedDense(M: Dense): Dense {
  const n = M.rows;
  const result = zerosDense(n, n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) result.data[i * n + j] = (M.data[i * n + j] + M.data[j * n + i]) / 2;
  }
  return result;
}

/**
 * Cholesky factor test of a symmetric R: positive definite when every pivot exceeds m·ε·‖R‖_F
 * (rounding of the data; a smaller pivot means R is singular or indefinite to working accuracy).
 * Returns R⁻¹ (from LU, used only for products) or null.
 */
export function inverseIfPositiveDefinite(R: Dense): Dense | null {
  const m = R.rows;
  if (m === 0) return zerosDense(0, 0);
  const r = symmetrisedDense(R).data;
  const threshold = m * EPS * normFrobeniusDense(R);
  const l = new Float64Array(m * m);
  for (let j = 0; j < m; j++) {
    let diagonal = r[j * m + j];
    for (let k = 0; k < j; k++) diagonal -= l[j * m + k] * l[j * m + k];
    if (!(diagonal > threshold)) return null;
    const root = Math.sqrt(diagonal);
    l[j * m + j] = root;
    for (let i = j + 1; i < m; i++) {
      let sum = r[i * m + j];
      for (let k = 0; k < j; k++) sum -= l[i * m + k] * l[j * m + k];
      l[i * m + j] = sum / root;
    }
  }
  // R⁻¹ = L⁻ᵀL⁻¹ by forward/back substitution on the identity.
  const inverse = identityDense(m);
  const x = inverse.data;
  for (let col = 0; col < m; col++) {
    for (let i = 0; i < m; i++) {
      let sum = x[i * m + col];
      for (let k = 0; k < i; k++) sum -= l[i * m + k] * x[k * m + col];
      x[i * m + col] = sum / l[i * m + i];
    }
    for (let i = m - 1; i >= 0; i--) {
      let sum = x[i * m + col];
      for (let k = i + 1; k < m; k++) sum -= l[k * m + i] * x[k * m + col];
      x[i * m + col] = sum / l[i * m + i];
    }
  }
  return symmetrisedDense(inverse);
}

export function combine(a: Dense, alpha: number, b: Dense, beta: number): Dense {
  const result = zerosDense(a.rows, a.cols);
  for (let i = 0; i < a.data.length; i++) result.data[i] = alpha * a.data[i] + beta * b.data[i];
  return result;
}

export function allFinite(...matrices: Dense[]): boolean {
  return matrices.every((matrix) => matrix.data.every((value) => Number.isFinite(value)));
}

/** Folds the cross term: Ā = A − B·R⁻¹·Nᵀ, Q̄ = Q − N·R⁻¹·Nᵀ, G = B·R⁻¹·Bᵀ. */
export function foldCrossTerm(A: Dense, B: Dense, Q: Dense, N: Dense, Rinv: Dense): { Abar: Dense; Qbar: Dense; G: Dense } {
  const BRinv = multiplyDense(B, Rinv);
  const NRinv = multiplyDense(N, Rinv);
  const Nt = transposeDense(N);
  const Abar = combine(A, 1, multiplyDense(BRinv, Nt), -1);
  const Qbar = symmetrisedDense(combine(Q, 1, multiplyDense(NRinv, Nt), -1));
  const G = symmetrisedDense(multiplyDense(BRinv, transposeDense(B)));
  return { Abar, Qbar, G };
}

export function failedSolution(n: number, m: number, failure: RiccatiFailure, closedLoopEigenvalues: Complex[] = []): RiccatiSolution {
  return {
    X: Array.from({ length: n }, () => new Array<number>(n).fill(NaN)),
    gain: Array.from({ length: m }, () => new Array<number>(n).fill(NaN)),
    residual: NaN,
    closedLoopEigenvalues,
    ok: false,
    failure,
    newtonSteps: 0,
    warmStarted: false,
    conditionEstimate: Infinity,
  };
}

export interface RiccatiInputs {
  A: Dense;
  B: Dense;
  Q: Dense;
  R: Dense;
  N: Dense;
  n: number;
  m: number;
}

/** Shapes and finiteness; null when the data cannot form a Riccati equation. */
export function readRiccatiInputs(A: Rows, B: Rows, Q: Rows, R: Rows, N?: Rows): RiccatiInputs | null {
  const n = A.length;
  const m = R.length;
  const shapeOk =
    A.every((row) => row.length === n) &&
    B.length === n &&
    B.every((row) => row.length === m) &&
    Q.length === n &&
    Q.every((row) => row.length === n) &&
    R.every((row) => row.length === m) &&
    (N === undefined || (N.length === n && N.every((row) => row.length === m)));
  if (!shapeOk) return null;
  const inputs: RiccatiInputs = {
    A: denseFromRows(A),
    B: n === 0 ? zerosDense(0, m) : denseFromRows(B),
    Q: symmetrisedDense(denseFromRows(Q)),
    R: denseFromRows(R),
    N: N === undefined || n === 0 ? zerosDense(n, m) : denseFromRows(N),
    n,
    m,
  };
  return allFinite(inputs.A, inputs.B, inputs.Q, inputs.R, inputs.N) ? inputs : null;
}

// ------------------------------------------------------------------ continuous-time specifics

/**
 * The folded equation ĀᵀX + XĀ − XGX + Q̄ = 0 with G = B·R⁻¹·Bᵀ also kept as its factors: every
 * product with G is then formed through B (n×m), n²m work instead of n³.
 */
interface ContinuousEquation {
  Abar: Dense;
  Qbar: Dense;
  G: Dense;
  B: Dense;
  Rinv: Dense;
  normAbar: number;
  normQbar: number;
  normG: number;
}

function continuousEquation(Abar: Dense, Qbar: Dense, G: Dense, B: Dense, Rinv: Dense): ContinuousEquation {
  return { Abar, Qbar, G, B, Rinv, normAbar: normFrobeniusDense(Abar), normQbar: normFrobeniusDense(Qbar), normG: normFrobeniusDense(G) };
}

interface ContinuousResidual {
  /** ĀᵀX + XĀ − XGX + Q̄ (symmetrised). */
  matrix: Dense;
  /**
   * ‖ĀᵀX + XĀ − XGX + Q̄‖_F / (‖Q̄‖_F + 2‖Ā‖_F‖X‖_F + ‖X‖_F²‖G‖_F), with G = BR⁻¹Bᵀ and the cross
   * term folded into Ā, Q̄ (algebraically the same residual as the unfolded equation).
   */
  normalised: number;
  /** G·X = B·R⁻¹·BᵀX, for the closed loop Ā − GX. */
  GX: Dense;
}

/** The residual of a symmetric X, with XGX = (XB)·R⁻¹·(XB)ᵀ and GX = B·R⁻¹·(XB)ᵀ. */
function continuousResidual(equation: ContinuousEquation, X: Dense): ContinuousResidual {
  const { Abar, Qbar, B, Rinv } = equation;
  const XA = multiplyDense(X, Abar);
  const XB = multiplyDense(X, B);
  const feedback = multiplyDense(Rinv, transposeDense(XB)); // R⁻¹·BᵀX (X symmetric)
  const XGX = multiplyDense(XB, feedback);
  const n = X.rows;
  const result = zerosDense(n, n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      result.data[i * n + j] = XA.data[j * n + i] + XA.data[i * n + j] - XGX.data[i * n + j] + Qbar.data[i * n + j];
    }
  }
  const matrix = symmetrisedDense(result);
  const numerator = normFrobeniusDense(matrix);
  const normX = normFrobeniusDense(X);
  const denominator = equation.normQbar + 2 * equation.normAbar * normX + normX * normX * equation.normG;
  return { matrix, normalised: denominator === 0 ? numerator : numerator / denominator, GX: multiplyDense(B, feedback) };
}

/** X from an orthonormal basis [U11; U21] (2n×n, the first n columns of Z) of the stable subspace: X = U21·U11⁻¹. */
function graphSolution(Z: Dense, n: number): { X: Dense; rcond: number } | null {
  const size = 2 * n;
  const U11t = zerosDense(n, n);
  const U21t = zerosDense(n, n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      U11t.data[j * n + i] = Z.data[i * size + j];
      U21t.data[j * n + i] = Z.data[(n + i) * size + j];
    }
  }
  // U11ᵀ·Xᵀ = U21ᵀ
  const factor = luFactor(U11t);
  if (factor.hasZeroPivot) return null;
  let norm1 = 0;
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += Math.abs(U11t.data[i * n + j]);
    norm1 = Math.max(norm1, sum);
  }
  const rcond = reciprocalConditionEstimate(factor, norm1);
  const Xt = luSolveDense(factor, U21t);
  return { X: transposeDense(Xt), rcond };
}

function hamiltonian(Abar: Dense, G: Dense, Qbar: Dense, scaling: number): Dense {
  const n = Abar.rows;
  const size = 2 * n;
  const H = zerosDense(size, size);
  const h = H.data;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      h[i * size + j] = Abar.data[i * n + j];
      h[i * size + n + j] = -G.data[i * n + j] * scaling;
      h[(n + i) * size + j] = -Qbar.data[i * n + j] / scaling;
      h[(n + i) * size + n + j] = -Abar.data[j * n + i];
    }
  }
  return H;
}

/**
 * Stable-subspace solution via the sign function: with W = sign(H), X solves the overdetermined
 * [W12; W22 + I]·X = −[W11 + I; W21] (Byers 1987), taken here through the normal equations; the
 * Newton refinement that follows recovers full accuracy.
 */
function signFunctionSolution(H: Dense, n: number): Dense | null {
  const sign = matrixSignDense(H);
  if (!sign.converged) return null;
  const size = 2 * n;
  const w = sign.S.data;
  const M = zerosDense(size, n);
  const rhs = zerosDense(size, n);
  for (let i = 0; i < size; i++) {
    for (let j = 0; j < n; j++) {
      M.data[i * n + j] = w[i * size + n + j] + (i >= n && i - n === j ? 1 : 0);
      rhs.data[i * n + j] = -(w[i * size + j] + (i < n && i === j ? 1 : 0));
    }
  }
  const Mt = transposeDense(M);
  const factor = luFactor(multiplyDense(Mt, M));
  if (factor.hasZeroPivot) return null;
  return symmetrisedDense(luSolveDense(factor, multiplyDense(Mt, rhs)));
}

/**
 * Solves AᵀX + XA − (XB + N)R⁻¹(BᵀX + Nᵀ) + Q = 0 for the stabilising X; gain K = R⁻¹(BᵀX + Nᵀ).
 * Never throws; every failure is reported in `failure`.
 */
export interface ContinuousRiccatiOptions {
  /** 'schur' (default, sign function only as fallback) or 'sign' to use the sign function directly. */
  method?: 'schur' | 'sign';
  /**
   * false: leave the condition estimate out (NaN) and take the closed-loop eigenvalues from an
   * eigenvalue-only QR, so the estimate can be computed elsewhere or later by
   * `continuousRiccatiConditionEstimate` (same value) while the gain is already in use.
   */
  conditionEstimate?: boolean;
  /**
   * A nearby stabilising solution to refine from (see the warm start above); ignored when its
   * shape differs or Newton from it does not converge fast, so it never changes what is solved,
   * only the route (results agree with the cold route to the residual target n·ε).
   */
  start?: Rows;
  /** With `start`: the chord basis a previous solve returned (RiccatiSolution.chordBasis). */
  chordBasis?: ChordBasis;
  /**
   * With conditionEstimate false: the closed-loop eigenvalues (the same numbers) come with the
   * balanced closed loop's Schur vectors, left in balancedRealSchur's memo for a caller that
   * needs that form next (the step response).
   */
  keepClosedLoopSchur?: boolean;
}

/**
 * Newton steps from a caller's start X₀ (the warm start): each closed loop Ā − GXⱼ must be stable
 * (read off the Schur form the Lyapunov solve uses), each step must divide the residual by
 * WARM_START_MIN_REDUCTION, and the residual must reach n·ε within WARM_START_STEPS; else null.
 * With a chord basis, up to CHORD_STEPS chord steps come first: one is kept when it at least
 * halves the residual, and the chord steps go on while each divides it by
 * WARM_START_MIN_REDUCTION; then Newton steps (under the rules above) finish the job.
 */
function continuousNewtonFromStart(
  equation: ContinuousEquation,
  start: Rows,
  chordBasis: ChordBasis | undefined,
): { X: Dense; residual: number; steps: number; chordSteps: number; chordBasis?: ChordBasis } | null {
  const { Abar } = equation;
  const n = Abar.rows;
  if (start.length !== n || !start.every((row) => row.length === n)) return null;
  let X = symmetrisedDense(denseFromRows(start));
  if (!allFinite(X)) return null;
  let residual = continuousResidual(equation, X);
  const target = n * EPS;
  let basis = chordBasis && usableChordBasis(chordBasis, n) ? chordBasis : undefined;
  let steps = 0;
  let chordSteps = 0;
  for (let attempts = 0; basis && attempts < CHORD_STEPS && !(residual.normalised <= target); attempts++) {
    if (!Number.isFinite(residual.normalised)) return null;
    countIterations();
    const correction = solveLyapunovContinuousDense(basis.matrix, residual.matrix, basis.schur);
    if (!correction.ok) break;
    const candidate = symmetrisedDense(combine(X, 1, correction.X, 1));
    const candidateResidual = continuousResidual(equation, candidate);
    if (!(candidateResidual.normalised <= residual.normalised / 2)) break; // the basis is out of date
    const reduction = residual.normalised / candidateResidual.normalised;
    X = candidate;
    residual = candidateResidual;
    steps++;
    chordSteps++;
    if (!(reduction >= WARM_START_MIN_REDUCTION)) break; // linear phase: a Newton step does better
  }
  let newtonSteps = 0;
  while (!(residual.normalised <= target)) {
    if (newtonSteps === WARM_START_STEPS || !Number.isFinite(residual.normalised)) return null;
    countIterations();
    const closedLoopTransposed = transposeDense(combine(Abar, 1, residual.GX, -1));
    const schur = realSchurDense(closedLoopTransposed);
    if (!schur.converged || !schur.eigenvalues.every((lambda) => lambda.re < 0)) return null;
    const correction = solveLyapunovContinuousDense(closedLoopTransposed, residual.matrix, schur);
    if (!correction.ok) return null;
    const candidate = symmetrisedDense(combine(X, 1, correction.X, 1));
    const candidateResidual = continuousResidual(equation, candidate);
    if (!(candidateResidual.normalised <= target || candidateResidual.normalised * WARM_START_MIN_REDUCTION <= residual.normalised)) return null;
    X = candidate;
    residual = candidateResidual;
    steps++;
    newtonSteps++;
    basis = { matrix: closedLoopTransposed, schur };
  }
  return { X, residual: residual.normalised, steps, chordSteps, ...(basis ? { chordBasis: basis } : {}) };
}

/**
 * A chord basis fit for an n-state equation: converged, stable (its Lyapunov operator is then
 * regular), finite, and of the right shape — it may come from another thread or an old version.
 */
function usableChordBasis(basis: ChordBasis, n: number): boolean {
  const { matrix, schur } = basis;
  const square = (M: Dense | undefined) => !!M && M.rows === n && M.cols === n && M.data instanceof Float64Array && M.data.length === n * n;
  return (
    square(matrix) &&
    square(schur?.T) &&
    square(schur?.Z) &&
    schur.converged === true &&
    Array.isArray(schur.eigenvalues) &&
    schur.eigenvalues.length === n &&
    schur.eigenvalues.every((lambda) => lambda.re < 0) &&
    allFinite(matrix, schur.T, schur.Z)
  );
}

export function solveContinuousRiccati(
  A: Rows,
  B: Rows,
  Q: Rows,
  R: Rows,
  N?: Rows,
  options: ContinuousRiccatiOptions = {},
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
  const { Abar, Qbar, G } = foldCrossTerm(inputs.A, inputs.B, inputs.Q, inputs.N, Rinv);

  const equation = continuousEquation(Abar, Qbar, G, inputs.B, Rinv);
  if (options.start) {
    const warm = continuousNewtonFromStart(equation, options.start, options.chordBasis);
    if (warm) {
      const solution = finishContinuous(inputs, Rinv, Abar, G, Qbar, warm.X, warm.residual, warm.steps, options);
      if (solution.ok) return { ...solution, warmStarted: true, chordSteps: warm.chordSteps, ...(warm.chordBasis ? { chordBasis: warm.chordBasis } : {}) };
    }
  }

  // Scaling X = σ·Y balances the off-diagonal blocks: ‖σG‖ = ‖Q̄/σ‖ (common practice).
  const normG = normFrobeniusDense(G);
  const normQ = normFrobeniusDense(Qbar);
  const sigma = normG > 0 && normQ > 0 ? Math.sqrt(normQ / normG) : 1;
  const H = hamiltonian(Abar, G, Qbar, sigma);
  const normH = normFrobeniusDense(H);
  // Eigenvalues within this distance of the imaginary axis are treated as on it: Hamiltonian
  // eigenvalues are perturbed by about ε‖H‖ when simple and √ε‖H‖ in 2×2 Jordan blocks, which
  // uncontrollable or unobservable modes on the axis produce. A genuine optimal closed-loop pole
  // closer to the axis than √ε‖H‖ is therefore reported as a failure (fragile by construction).
  const axisTolerance = Math.sqrt(EPS) * normH;

  let X: Dense | null = null;
  let failure: RiccatiFailure | undefined;
  const schur =
    options.method === 'sign'
      ? { converged: false, T: H, Z: H, selectedCount: 0, reordered: false }
      : orderedRealSchurDense(H, (lambda) => lambda.re < 0);
  if (schur.converged) {
    const values = eigenvaluesOfQuasiTriangular(schur.T);
    const nearAxis = values.some((lambda) => Math.abs(lambda.re) <= axisTolerance);
    if (nearAxis || schur.selectedCount !== n) return failedSolution(n, m, 'imaginary-axis-eigenvalues');
    if (schur.reordered) {
      const graph = graphSolution(schur.Z, n);
      if (graph === null || !(graph.rcond > n * EPS)) return failedSolution(n, m, 'not-stabilisable');
      X = graph.X;
    }
  }
  if (X === null) {
    // Schur route unavailable (no convergence, or a rejected block swap): sign function.
    X = signFunctionSolution(H, n);
    if (X === null) failure = 'no-convergence';
  }
  if (X === null) return failedSolution(n, m, failure ?? 'no-convergence');
  for (let i = 0; i < X.data.length; i++) X.data[i] *= sigma;

  // Symmetry of the subspace solution: X = Xᵀ up to the conditioning of U11.
  let asymmetry = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) asymmetry = Math.hypot(asymmetry, X.data[i * n + j] - X.data[j * n + i]);
  if (!(asymmetry <= Math.sqrt(EPS) * normFrobeniusDense(X)) && allFinite(X)) {
    return failedSolution(n, m, 'not-symmetric-solution');
  }
  X = symmetrisedDense(X);
  if (!allFinite(X)) return failedSolution(n, m, 'no-convergence');

  // Newton–Kleinman refinement in defect-correction form: (Ā − GX)ᵀΔ + Δ(Ā − GX) = −Res(X).
  let residual = continuousResidual(equation, X);
  let newtonSteps = 0;
  for (let step = 0; step < MAX_NEWTON_STEPS && residual.normalised > n * EPS; step++) {
    countIterations();
    const closedLoop = combine(Abar, 1, residual.GX, -1);
    const correction = solveLyapunovContinuousDense(transposeDense(closedLoop), residual.matrix);
    if (!correction.ok) break;
    const candidate = symmetrisedDense(combine(X, 1, correction.X, 1));
    const candidateResidual = continuousResidual(equation, candidate);
    if (!(candidateResidual.normalised < residual.normalised)) break;
    X = candidate;
    residual = candidateResidual;
    newtonSteps++;
  }

  return finishContinuous(inputs, Rinv, Abar, G, Qbar, X, residual.normalised, newtonSteps, options);
}

/** Gain, closed-loop eigenvalues, condition estimate and the final checks of a solution X. */
function finishContinuous(
  inputs: RiccatiInputs,
  Rinv: Dense,
  Abar: Dense,
  G: Dense,
  Qbar: Dense,
  X: Dense,
  residual: number,
  newtonSteps: number,
  options: ContinuousRiccatiOptions,
): RiccatiSolution {
  // K = R⁻¹(BᵀX + Nᵀ); closed loop A − BK.
  const { gain, closedLoop } = gainAndClosedLoop(inputs, Rinv, X);
  let closedLoopEigenvalues: Complex[];
  let converged: boolean;
  let conditionEstimate = NaN;
  if (options.conditionEstimate === false) {
    const outcome = options.keepClosedLoopSchur ? eigenvaluesAndBalancedSchur(denseToRows(closedLoop)) : eigenvaluesWithStatus(denseToRows(closedLoop));
    closedLoopEigenvalues = outcome.values;
    converged = outcome.converged;
  } else {
    // One Schur form of the closed loop's transpose serves both its eigenvalues and the condition
    // estimate's Lyapunov solve.
    const closedLoopSchur = realSchurDense(transposeDense(closedLoop));
    closedLoopEigenvalues = closedLoopSchur.eigenvalues;
    converged = closedLoopSchur.converged;
    conditionEstimate = continuousConditionEstimate(closedLoop, Abar, G, Qbar, X, closedLoopSchur);
  }
  const result: RiccatiSolution = {
    X: denseToRows(X),
    gain: denseToRows(gain),
    residual,
    closedLoopEigenvalues,
    ok: true,
    newtonSteps,
    warmStarted: false,
    conditionEstimate,
  };
  if (!converged) return { ...result, ok: false, failure: 'no-convergence' };
  if (!closedLoopEigenvalues.every((lambda) => lambda.re < 0)) return { ...result, ok: false, failure: 'not-stabilisable' };
  return result;
}

function gainAndClosedLoop(inputs: RiccatiInputs, Rinv: Dense, X: Dense): { gain: Dense; closedLoop: Dense } {
  const gain = multiplyDense(Rinv, combine(multiplyDense(transposeDense(inputs.B), X), 1, transposeDense(inputs.N), 1));
  return { gain, closedLoop: combine(inputs.A, 1, multiplyDense(inputs.B, gain), -1) };
}

/**
 * The condition estimate `solveContinuousRiccati` gives (see RiccatiSolution.conditionEstimate),
 * for a solution X it returned with `conditionEstimate: false`: the same value, computed apart.
 */
export function continuousRiccatiConditionEstimate(A: Rows, B: Rows, Q: Rows, R: Rows, N: Rows | undefined, X: Rows): number {
  const data = riccatiSolutionData(A, B, Q, R, N, X);
  if (typeof data === 'number') return data;
  const { closedLoop } = gainAndClosedLoop(data.inputs, data.Rinv, data.solution);
  return continuousConditionEstimate(closedLoop, data.Abar, data.G, data.Qbar, data.solution, realSchurDense(transposeDense(closedLoop)));
}

/**
 * The data of a Riccati equation and a solution X of it, as the solvers form them (for computing
 * a solution's condition estimate apart); a number when that is already the estimate (invalid
 * data: Infinity; no states: 0).
 */
export function riccatiSolutionData(
  A: Rows,
  B: Rows,
  Q: Rows,
  R: Rows,
  N: Rows | undefined,
  X: Rows,
): number | { inputs: RiccatiInputs; Rinv: Dense; Abar: Dense; Qbar: Dense; G: Dense; solution: Dense } {
  const inputs = readRiccatiInputs(A, B, Q, R, N);
  if (inputs === null || X.length !== inputs.n) return Infinity;
  const Rinv = inverseIfPositiveDefinite(inputs.R);
  if (Rinv === null) return Infinity;
  if (inputs.n === 0) return 0;
  return { inputs, Rinv, ...foldCrossTerm(inputs.A, inputs.B, inputs.Q, inputs.N, Rinv), solution: denseFromRows(X) };
}

function continuousConditionEstimate(closedLoop: Dense, Abar: Dense, G: Dense, Qbar: Dense, X: Dense, transposedSchur: RealSchurDense): number {
  const n = X.rows;
  // Ω(Z) = AcᵀZ + Z·Ac; Ω⁻¹(I) from one more Lyapunov solve (on the Schur form of Acᵀ).
  const inverseAtIdentity = solveLyapunovContinuousDense(transposeDense(closedLoop), identityDense(n), transposedSchur);
  if (!inverseAtIdentity.ok) return Infinity;
  const omegaInverseNorm = normFrobeniusDense(inverseAtIdentity.X);
  const normX = normFrobeniusDense(X);
  const data = normFrobeniusDense(Qbar) + 2 * normFrobeniusDense(Abar) * normX + normFrobeniusDense(G) * normX * normX;
  return (omegaInverseNorm * data) / (normX > 0 ? normX : 1);
}
