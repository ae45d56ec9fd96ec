// Closed-loop step responses, one tracked set-point stepped at a time.
//
// Control law (deviation variables; the orchestrator converts physical set-points and limits):
//   u = −Kx·x − Ki·ξ + Nr·r,  ξ' = r_I − y_I  (discrete: ξ[k+1] = ξ[k] + T(r_I − y_I[k]))
// With zero initial estimation error an observer does not change the response to a reference
// step (the error dynamics are not excited), so the state-feedback loop is simulated.
//
//  • Linear, unsaturated: EXACT. The closed loop z' = Acl z + Bcl r with z = (x, ξ) is
//    discretised by the zero-order hold on the grid step h (r is constant, so the hold is exact):
//    z[k+1] = e^{Acl h} z[k] + ∫₀ʰ e^{Acl τ}dτ Bcl r (Van Loan block exponential). Discrete
//    designs run their own recursion at T. Loops of 24 states or more form only u and y, by
//    blocks of 16 steps (numeric/linearRecursion.ts); continuous ones first as modal sums on the
//    balanced closed loop's Schur form (numeric/modalStepOutputs.ts, the same samples, n instead
//    of n² work per step), kept where their rounding estimate is below 1e-9 of each signal.
//  • Saturated (actuator limits, u clipped to [low, high]): the loop is nonlinear; continuous
//    designs are integrated by the classical fourth-order Runge–Kutta method with the same fixed
//    step h (the saturation is evaluated at every stage); discrete designs are exact.
//  • Integral action with saturation: shown twice, without anti-windup (the integrator keeps
//    integrating while the input is clipped: windup) and with clamping (conditional
//    integration): integrator j is frozen while some input i is saturated and the integrator's
//    rate would push that input's unclipped command further beyond its limit,
//    i.e. sign(−Ki[i][j]·e_j) equals the side of the violated limit.
//  • Linearised plants: the same controller also drives the nonlinear equations (x = x0 + δx,
//    u = u0 + δu, w = w0), RK4 on the grid (discrete designs: the input is held over each sample
//    and the plant integrated with `substeps` RK4 steps per sample). Signals are returned as
//    deviations from the operating point, comparable with the linear run.
// Grid: duration ≈ 6 slowest closed-loop time constants (6/min(−Re λ)), capped at 10⁴ fastest
// time constants (flagged `truncated`), and for unstable loops at 6 growth time constants of
// the fastest growing mode; settings.simulationPoints points. Returned signals are
// downsampled to at most `maxReturnedPoints` (default 500); metrics use the full grid.
import type { Complex, Rows } from '../numeric/types';
import type { NonlinearModel } from '../model/types';
import { balancedRealSchur, eigenvalues, matrixExponentialIntegral, modalStepOutputs, outputsOfLinearRecursion, solveLinear, type BalancedSchur } from '../numeric';
import { computeStepMetrics, type InputLimit, type StepMetrics } from './stepMetrics';

export interface StepResponseProblem {
  domain: 'continuous' | 'discrete';
  /** Sample period (discrete). */
  samplePeriod?: number;
  /** Plant (continuous A, B) or sampled plant (Φ, Γ) for discrete designs; C, D outputs. */
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
  /** State-feedback gain m × n. */
  K: Rows;
  /** Reference prescaler m × q (q = tracked.length); zero when absent. */
  prescaler?: Rows;
  /** Output indices with set-points (each stepped in turn). */
  tracked: number[];
  /** Integral action on these outputs (a subset of `tracked`), Ki m × qi. */
  integral?: { outputs: number[]; Ki: Rows };
  /** Per-input limits in deviation units (null: unlimited). */
  limits?: (InputLimit | null)[];
  /** Step amplitude per tracked output (deviation units; default 1). */
  stepSizes?: number[];
  nonlinear?: {
    model: NonlinearModel;
    states: number[];
    inputs: number[];
    disturbances: number[];
    outputs: number[];
    /** RK4 steps per sample for discrete designs (default 10). */
    substeps?: number;
  };
  /** Grid points (settings.simulationPoints). */
  points: number;
  /** Override of the simulated duration (s); by default chosen from the closed-loop poles. */
  duration?: number;
  maxReturnedPoints?: number;
  includeStates?: boolean;
}

export interface StepRun {
  time: number[];
  /** outputs[i][k]: output i at time[k] (deviation). */
  outputs: number[][];
  inputs: number[][];
  states?: number[][];
  integrators?: number[][];
  metrics: StepMetrics;
  /** First time a signal became non-finite (nonlinear runs), else null. */
  divergedAt: number | null;
}

export interface WindupSummary {
  overshootWithoutPercent: number | null;
  overshootWithPercent: number | null;
  settlingWithout: number | null;
  settlingWith: number | null;
  /** True when clamping shortens settling or reduces overshoot noticeably. */
  windupSignificant: boolean;
}

export interface StepExperiment {
  /** Output index of the stepped set-point. */
  steppedOutput: number;
  amplitude: number;
  linear: StepRun;
  saturated?: StepRun;
  antiWindup?: StepRun;
  windup?: WindupSummary;
  nonlinear?: StepRun;
}

export interface StepResponseResult {
  ok: boolean;
  failure?: 'dimension-mismatch' | 'no-sample-period' | 'no-tracked-output';
  closedLoopPoles: Complex[];
  closedLoopStable: boolean;
  duration: number;
  step: number;
  truncated: boolean;
  methods: { linear: string; saturated: string; nonlinear: string };
  experiments: StepExperiment[];
}

interface ClosedLoop {
  Acl: Rows;
  Bcl: Rows;
  /** u = Fz z + Fr r. */
  Fz: Rows;
  Fr: Rows;
  n: number;
  qi: number;
}

function zeros(rows: number, cols: number): Rows {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
}

function matVec(M: Rows, v: ArrayLike<number>): number[] {
  return M.map((row) => {
    let sum = 0;
    for (let j = 0; j < row.length; j++) sum += row[j] * v[j];
    return sum;
  });
}

function buildClosedLoop(problem: StepResponseProblem, T: number): ClosedLoop {
  const { A, B, C, D, K, tracked } = problem;
  const n = A.length;
  const m = K.length;
  const q = tracked.length;
  const integralOutputs = problem.integral?.outputs ?? [];
  const qi = integralOutputs.length;
  const Ki = problem.integral?.Ki ?? zeros(m, 0);
  const Nr = problem.prescaler ?? zeros(m, q);
  const size = n + qi;
  const Fz = K.map((row, i) => [...row.map((v) => -v), ...Ki[i].map((v) => -v)]);
  const Fr = Nr.map((row) => row.slice());
  const discrete = problem.domain === 'discrete';
  const integratorScale = discrete ? T : 1;
  // Open part [[A, 0], [−s·C_I, I (discrete) / 0]] and input part [[B], [−s·D_I]].
  const Acl = zeros(size, size);
  const Bu = zeros(size, m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) Acl[i][j] = A[i][j];
    for (let j = 0; j < m; j++) Bu[i][j] = B[i][j];
  }
  integralOutputs.forEach((output, k) => {
    for (let j = 0; j < n; j++) Acl[n + k][j] = -integratorScale * C[output][j];
    for (let j = 0; j < m; j++) Bu[n + k][j] = -integratorScale * (D[output]?.[j] ?? 0);
    if (discrete) Acl[n + k][n + k] = 1;
  });
  for (let i = 0; i < size; i++) {
    for (let j = 0; j < size; j++) {
      let sum = 0;
      for (let l = 0; l < m; l++) sum += Bu[i][l] * Fz[l][j];
      Acl[i][j] += sum;
    }
  }
  const Bcl = zeros(size, q);
  for (let i = 0; i < size; i++) {
    for (let j = 0; j < q; j++) {
      let sum = 0;
      for (let l = 0; l < m; l++) sum += Bu[i][l] * Fr[l][j];
      Bcl[i][j] = sum;
    }
  }
  integralOutputs.forEach((output, k) => {
    const column = tracked.indexOf(output);
    if (column >= 0) Bcl[n + k][column] += integratorScale;
  });
  return { Acl, Bcl, Fz, Fr, n, qi };
}

/**
 * The linear closed loop from the set-points to the outputs, as simulated: state z = (x, ξ),
 * z' = Acl z + Bcl r (discrete: z[k+1]), y = (C_z + D·Fz) z + D·Fr r with C_z = [C, 0].
 */
export function referenceClosedLoop(problem: StepResponseProblem): { A: Rows; B: Rows; C: Rows; D: Rows } {
  const loop = buildClosedLoop(problem, problem.samplePeriod ?? 0);
  const { C, D } = problem;
  const m = loop.Fz.length;
  const outputRow = (i: number, F: Rows, base: (j: number) => number, width: number): number[] =>
    Array.from({ length: width }, (_, j) => {
      let sum = base(j);
      for (let l = 0; l < m; l++) sum += (D[i]?.[l] ?? 0) * F[l][j];
      return sum;
    });
  const size = loop.n + loop.qi;
  const q = loop.Fr[0]?.length ?? problem.tracked.length;
  return {
    A: loop.Acl,
    B: loop.Bcl,
    C: C.map((row, i) => outputRow(i, loop.Fz, (j) => (j < loop.n ? row[j] : 0), size)),
    D: C.map((_, i) => outputRow(i, loop.Fr, () => 0, q)),
  };
}

function clip(value: number, limit: InputLimit | null | undefined): number {
  if (!limit) return value;
  return Math.min(limit.high, Math.max(limit.low, value));
}

function chooseGrid(
  poles: Complex[],
  domain: 'continuous' | 'discrete',
  T: number,
  points: number,
): { duration: number; step: number; count: number; truncated: boolean } {
  const rates = poles.map((pole) => {
    if (domain === 'continuous') return { decay: -pole.re, magnitude: Math.hypot(pole.re, pole.im) };
    const magnitude = Math.hypot(pole.re, pole.im);
    if (magnitude === 0) return { decay: Infinity, magnitude: Infinity };
    const s = { re: Math.log(magnitude) / T, im: Math.atan2(pole.im, pole.re) / T };
    return { decay: -s.re, magnitude: Math.hypot(s.re, s.im) };
  });
  const finiteMagnitudes = rates.map((r) => r.magnitude).filter((v) => Number.isFinite(v) && v > 0);
  const fastest = finiteMagnitudes.length ? Math.max(...finiteMagnitudes) : domain === 'discrete' ? 1 / T : 1;
  const slowestMagnitude = finiteMagnitudes.length ? Math.min(...finiteMagnitudes) : fastest;
  const decays = rates.map((r) => r.decay);
  const allDecay = decays.every((d) => d > 0);
  const slowestDecay = allDecay ? Math.min(...decays) : slowestMagnitude;
  let duration = 6 / (Number.isFinite(slowestDecay) && slowestDecay > 0 ? slowestDecay : fastest);
  // Unstable loops: stop once the fastest growing mode has grown by e⁶ (≈ 400×), so the record
  // shows the divergence without overflowing.
  const growth = Math.max(0, ...decays.filter((d) => Number.isFinite(d)).map((d) => -d));
  if (growth > 0) duration = Math.min(duration, 6 / growth);
  const cap = 6e4 / fastest;
  let truncated = false;
  if (duration > cap) {
    duration = cap;
    truncated = true;
  }
  if (domain === 'discrete') {
    const samples = Math.min(Math.max(Math.ceil(duration / T), 20), Math.max(points, 20));
    if (samples * T < duration) truncated = true;
    return { duration: samples * T, step: T, count: samples + 1, truncated };
  }
  const count = Math.max(points, 10);
  return { duration, step: duration / (count - 1), count, truncated };
}

function downsampleIndices(count: number, maximum: number): number[] {
  if (count <= maximum) return Array.from({ length: count }, (_, k) => k);
  const indices: number[] = [];
  for (let k = 0; k < maximum; k++) indices.push(Math.round((k * (count - 1)) / (maximum - 1)));
  return indices;
}

/**
 * x_{k+1} = Φ·x_k + f from x_0 = 0 for count points, on flat row-major Φ (size×size); returns
 * the states one after another. Four rows of Φ share each load of x_k (36 → 30 ms for 2,000 steps
 * at n = 101, standalone, against 2 rows; row by row 36), and every array is a local.
 */
function recurseLinear(transitionFlat: Float64Array, forcing: Float64Array, size: number, count: number): Float64Array {
  const phi = transitionFlat;
  const states = new Float64Array(count * size);
  for (let k = 1; k < count; k++) {
    const previous = (k - 1) * size;
    const next = k * size;
    let i = 0;
    for (; i + 3 < size; i += 4) {
      const row0 = i * size;
      const row1 = row0 + size;
      const row2 = row1 + size;
      const row3 = row2 + size;
      let sum0 = forcing[i];
      let sum1 = forcing[i + 1];
      let sum2 = forcing[i + 2];
      let sum3 = forcing[i + 3];
      for (let j = 0; j < size; j++) {
        const x = states[previous + j];
        sum0 += phi[row0 + j] * x;
        sum1 += phi[row1 + j] * x;
        sum2 += phi[row2 + j] * x;
        sum3 += phi[row3 + j] * x;
      }
      states[next + i] = sum0;
      states[next + i + 1] = sum1;
      states[next + i + 2] = sum2;
      states[next + i + 3] = sum3;
    }
    for (; i < size; i++) {
      const row = i * size;
      let sum = forcing[i];
      for (let j = 0; j < size; j++) sum += phi[row + j] * states[previous + j];
      states[next + i] = sum;
    }
  }
  return states;
}

/** Steps per block of the linear recursion by blocks, and the smallest loop it is used for. */
const BLOCK_STEPS = 16;
const BLOCK_MIN_STATES = 24;
/** Continuous loops of this many states and more (with a long enough grid) are summed modally first. */
export const MODAL_STEP_FROM_STATES = BLOCK_MIN_STATES;
/** A modal step response is kept only when its rounding estimate is below this fraction of each signal's size. */
const MODAL_STEP_ACCURACY = 1e-9;
const TRANSITION_METHOD = 'exact zero-order-hold transition of the closed loop';
const MODAL_METHOD = "exact modal sum on the balanced closed loop's Schur form";
const DISCRETE_METHOD = 'exact discrete recursion';

interface RawRun {
  z: ArrayLike<number>[]; // per time
  u: number[][];
  y: number[][];
  divergedAt: number | null;
  time: number[];
}

export function simulateStepResponses(problem: StepResponseProblem): StepResponseResult {
  const { A, B, C, D, K, tracked, domain } = problem;
  const n = A.length;
  const m = K.length;
  const p = C.length;
  const empty = (failure: StepResponseResult['failure']): StepResponseResult => ({
    ok: false,
    failure,
    closedLoopPoles: [],
    closedLoopStable: false,
    duration: 0,
    step: 0,
    truncated: false,
    methods: { linear: '', saturated: '', nonlinear: '' },
    experiments: [],
  });
  if (B.length !== n || K.some((row) => row.length !== n) || C.some((row) => row.length !== n)) return empty('dimension-mismatch');
  if (tracked.length === 0) return empty('no-tracked-output');
  const T = problem.samplePeriod ?? 0;
  if (domain === 'discrete' && !(T > 0)) return empty('no-sample-period');

  const loop = buildClosedLoop(problem, T);
  const closedLoopPoles = eigenvalues(loop.Acl);
  const closedLoopStable = closedLoopPoles.every((pole) =>
    domain === 'continuous' ? pole.re < 0 : Math.hypot(pole.re, pole.im) < 1,
  );
  const grid =
    problem.duration !== undefined && problem.duration > 0
      ? domain === 'continuous'
        ? { duration: problem.duration, step: problem.duration / (Math.max(problem.points, 10) - 1), count: Math.max(problem.points, 10), truncated: false }
        : { duration: Math.ceil(problem.duration / T) * T, step: T, count: Math.ceil(problem.duration / T) + 1, truncated: false }
      : chooseGrid(closedLoopPoles, domain, T, problem.points);
  const h = grid.step;
  const time = Array.from({ length: grid.count }, (_, k) => k * h);
  const size = n + loop.qi;
  const integralOutputs = problem.integral?.outputs ?? [];
  const Ki = problem.integral?.Ki ?? zeros(m, 0);
  const limits = problem.limits ?? [];
  const hasLimits = limits.some((limit) => limit !== null && limit !== undefined);
  const maxReturned = problem.maxReturnedPoints ?? 500;

  const outputOf = (x: ArrayLike<number>, u: number[]): number[] =>
    C.map((row, i) => {
      let sum = 0;
      for (let j = 0; j < n; j++) sum += row[j] * x[j];
      for (let j = 0; j < m; j++) sum += (D[i]?.[j] ?? 0) * u[j];
      return sum;
    });
  const commandOf = (z: ArrayLike<number>, r: number[]): number[] => {
    const fromState = matVec(loop.Fz, z);
    const fromReference = matVec(loop.Fr, r);
    return fromState.map((v, i) => v + fromReference[i]);
  };

  // Exact transition for the linear run (formed when a run steps the state).
  let transitionMemo: { Phi: Rows; Gamma: Rows; flat: Float64Array } | null = null;
  const transition = () => {
    if (!transitionMemo) {
      const exact = domain === 'continuous' ? matrixExponentialIntegral(loop.Acl, loop.Bcl, h) : { Phi: loop.Acl, Gamma: loop.Bcl };
      // The recursion on one flat row-major Φ and one flat state record (views per time step):
      // n² multiply-adds per step with no per-step allocation.
      const flat = new Float64Array(size * size);
      exact.Phi.forEach((row, i) => flat.set(row, i * size));
      transitionMemo = { Phi: exact.Phi, Gamma: exact.Gamma, flat };
    }
    return transitionMemo;
  };
  const commandFlat = loop.Fz.map((row) => Float64Array.from(row));
  // Larger loops form only the input and output rows: continuous ones as modal sums on the closed
  // loop's Schur form (numeric/modalStepOutputs.ts) where their rounding estimate allows, else by
  // blocks of BLOCK_STEPS steps (numeric/linearRecursion.ts), about a quarter of the work of
  // stepping the state at 100 states. The states themselves are stepped one by one when they are
  // asked for, and for small loops, where that is cheap.
  const byBlocks = !problem.includeStates && size >= BLOCK_MIN_STATES && grid.count >= 4 * BLOCK_STEPS;
  // The balanced closed loop's Schur form, D⁻¹·Acl·D = Z·T·Zᵀ (an LQR design's Riccati solver
  // usually left it in the numeric memo): z = D·w turns f into D⁻¹f and the output rows O into O·D.
  let closedLoopSchur: BalancedSchur | null | undefined;
  const modalSchur = () => {
    if (closedLoopSchur === undefined) {
      const schur = balancedRealSchur(loop.Acl);
      closedLoopSchur = schur.converged ? schur : null;
    }
    return closedLoopSchur;
  };
  const balancedRows = (schur: BalancedSchur): Float64Array => {
    const rows = signalRows.slice();
    for (let r = 0; r < m + p; r++) for (let j = 0; j < size; j++) rows[r * size + j] *= schur.scaling[j];
    return rows;
  };
  const balancedForcing = (schur: BalancedSchur, r: number[]): Float64Array => Float64Array.from(matVec(loop.Bcl, r), (value, i) => value / schur.scaling[i]);
  const signalRows = new Float64Array((m + p) * size);
  commandFlat.forEach((row, i) => signalRows.set(row, i * size));
  C.forEach((row, i) => signalRows.set(row, (m + i) * size));
  const linearMethods = new Set<string>();
  const runLinear = (r: number[]): RawRun => {
    const count = grid.count;
    const fromReference = matVec(loop.Fr, r);
    const u: number[][] = new Array(count);
    const y: number[][] = new Array(count);
    if (byBlocks) {
      const rows = m + p;
      const schur = domain === 'continuous' ? modalSchur() : null;
      const modal = schur ? modalStepOutputs(schur.T, schur.Z, balancedForcing(schur, r), balancedRows(schur), rows, h, count, MODAL_STEP_ACCURACY) : null;
      linearMethods.add(modal ? MODAL_METHOD : domain === 'continuous' ? TRANSITION_METHOD : DISCRETE_METHOD);
      const signals = modal ?? outputsOfLinearRecursion(transition().flat, Float64Array.from(matVec(transition().Gamma, r)), size, count, signalRows, rows, BLOCK_STEPS);
      for (let k = 0; k < count; k++) {
        const base = k * rows;
        const command = new Array<number>(m);
        for (let i = 0; i < m; i++) command[i] = signals[base + i] + fromReference[i];
        const output = new Array<number>(p);
        for (let i = 0; i < p; i++) {
          let sum = signals[base + m + i];
          for (let j = 0; j < m; j++) sum += (D[i]?.[j] ?? 0) * command[j];
          output[i] = sum;
        }
        u[k] = command;
        y[k] = output;
      }
      return { z: [], u, y, divergedAt: null, time };
    }
    linearMethods.add(domain === 'continuous' ? TRANSITION_METHOD : DISCRETE_METHOD);
    const states = recurseLinear(transition().flat, Float64Array.from(matVec(transition().Gamma, r)), size, count);
    // Per-step views of the state only when the states are returned (2,000 views otherwise unused).
    const z = problem.includeStates ? Array.from({ length: count }, (_, k) => states.subarray(k * size, (k + 1) * size)) : [];
    // u_k = Fz·z_k + Fr·r and y_k = C·x_k + D·u_k on the flat record, in the same summation order
    // as commandOf/outputOf (so the numbers are the same), without two arrays per product.
    for (let k = 0; k < count; k++) {
      const base = k * size;
      const command = new Array<number>(m);
      for (let i = 0; i < m; i++) {
        const row = commandFlat[i];
        let sum = 0;
        for (let j = 0; j < size; j++) sum += row[j] * states[base + j];
        command[i] = sum + fromReference[i];
      }
      const output = new Array<number>(p);
      for (let i = 0; i < p; i++) {
        const row = C[i];
        let sum = 0;
        for (let j = 0; j < n; j++) sum += row[j] * states[base + j];
        for (let j = 0; j < m; j++) sum += (D[i]?.[j] ?? 0) * command[j];
        output[i] = sum;
      }
      u[k] = command;
      y[k] = output;
    }
    return { z, u, y, divergedAt: null, time };
  };

  // Right-hand side with saturation (and optional clamping) for continuous designs.
  const integratorRates = (x: ArrayLike<number>, u: number[], r: number[]): number[] => {
    const y = outputOf(x, u);
    return integralOutputs.map((output) => {
      const column = tracked.indexOf(output);
      return (column >= 0 ? r[column] : 0) - y[output];
    });
  };
  const clampMask = (unclipped: number[], rates: number[]): boolean[] =>
    rates.map((rate, j) => {
      for (let i = 0; i < m; i++) {
        const limit = limits[i];
        if (!limit) continue;
        const side = unclipped[i] > limit.high ? 1 : unclipped[i] < limit.low ? -1 : 0;
        if (side !== 0 && side * (-Ki[i][j] * rate) > 0) return true;
      }
      return false;
    });

  const runSaturated = (r: number[], antiWindup: boolean): RawRun => {
    const z: number[][] = [new Array<number>(size).fill(0)];
    const u: number[][] = [];
    const derivative = (state: number[]): number[] => {
      const unclipped = commandOf(state, r);
      const applied = unclipped.map((v, i) => clip(v, limits[i]));
      const xdot = matVec(A, state.slice(0, n)).map((v, i) => {
        let sum = v;
        for (let j = 0; j < m; j++) sum += B[i][j] * applied[j];
        return sum;
      });
      let rates = integratorRates(state, applied, r);
      if (antiWindup) {
        const frozen = clampMask(unclipped, rates);
        rates = rates.map((rate, j) => (frozen[j] ? 0 : rate));
      }
      return [...xdot, ...rates];
    };
    for (let k = 0; k < grid.count; k++) {
      const state = z[k];
      const unclipped = commandOf(state, r);
      const applied = unclipped.map((v, i) => clip(v, limits[i]));
      u.push(applied);
      if (k === grid.count - 1) break;
      let next: number[];
      if (domain === 'discrete') {
        const x = state.slice(0, n);
        const xNext = matVec(A, x).map((v, i) => {
          let sum = v;
          for (let j = 0; j < m; j++) sum += B[i][j] * applied[j];
          return sum;
        });
        let rates = integratorRates(x, applied, r);
        if (antiWindup) {
          const frozen = clampMask(unclipped, rates);
          rates = rates.map((rate, j) => (frozen[j] ? 0 : rate));
        }
        next = [...xNext, ...rates.map((rate, j) => state[n + j] + T * rate)];
      } else {
        const k1 = derivative(state);
        const k2 = derivative(state.map((v, i) => v + 0.5 * h * k1[i]));
        const k3 = derivative(state.map((v, i) => v + 0.5 * h * k2[i]));
        const k4 = derivative(state.map((v, i) => v + h * k3[i]));
        next = state.map((v, i) => v + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
      }
      z.push(next);
    }
    const y = z.map((state, k) => outputOf(state, u[k]));
    return { z, u, y, divergedAt: null, time };
  };

  const runNonlinear = (r: number[], antiWindup: boolean): RawRun | null => {
    const plant = problem.nonlinear;
    if (!plant) return null;
    const { model, states: x0, inputs: u0, disturbances: w0, outputs: y0 } = plant;
    const physicalOutputs = (dx: number[], du: number[]): number[] => {
      const y = model.outputs(dx.map((v, i) => v + x0[i]), du.map((v, i) => v + u0[i]), w0);
      return y.map((v, i) => v - y0[i]);
    };
    const derivative = (state: number[], heldInput: number[] | null): number[] => {
      const dx = state.slice(0, n);
      const unclipped = heldInput ?? commandOf(state, r);
      const applied = heldInput ?? unclipped.map((v, i) => clip(v, limits[i]));
      const f = model.derivatives(dx.map((v, i) => v + x0[i]), applied.map((v, i) => v + u0[i]), w0);
      const y = physicalOutputs(dx, applied);
      let rates = integralOutputs.map((output) => {
        const column = tracked.indexOf(output);
        return (column >= 0 ? r[column] : 0) - y[output];
      });
      if (antiWindup && heldInput === null) {
        const frozen = clampMask(unclipped, rates);
        rates = rates.map((rate, j) => (frozen[j] ? 0 : rate));
      }
      return [...f, ...(heldInput === null ? rates : rates.map(() => 0))];
    };
    const rk4 = (state: number[], step: number, held: number[] | null): number[] => {
      const k1 = derivative(state, held);
      const k2 = derivative(state.map((v, i) => v + 0.5 * step * k1[i]), held);
      const k3 = derivative(state.map((v, i) => v + 0.5 * step * k2[i]), held);
      const k4 = derivative(state.map((v, i) => v + step * k3[i]), held);
      return state.map((v, i) => v + (step / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
    };
    const z: number[][] = [new Array<number>(size).fill(0)];
    const u: number[][] = [];
    const y: number[][] = [];
    let divergedAt: number | null = null;
    for (let k = 0; k < grid.count; k++) {
      const state = z[k];
      const unclipped = commandOf(state, r);
      const applied = unclipped.map((v, i) => clip(v, limits[i]));
      u.push(applied);
      y.push(physicalOutputs(state.slice(0, n), applied));
      if (k === grid.count - 1) break;
      let next: number[];
      if (domain === 'continuous') {
        next = rk4(state, h, null);
      } else {
        // Input held over the sample; the integrator is discrete.
        const substeps = Math.max(1, Math.floor(plant.substeps ?? 10));
        let x = state.slice(0, n).concat(new Array<number>(loop.qi).fill(0));
        for (let s = 0; s < substeps; s++) x = rk4(x, h / substeps, applied);
        let rates = integralOutputs.map((output) => {
          const column = tracked.indexOf(output);
          return (column >= 0 ? r[column] : 0) - y[k][output];
        });
        if (antiWindup) {
          const frozen = clampMask(unclipped, rates);
          rates = rates.map((rate, j) => (frozen[j] ? 0 : rate));
        }
        next = [...x.slice(0, n), ...rates.map((rate, j) => state[n + j] + T * rate)];
      }
      if (next.some((v) => !Number.isFinite(v))) {
        divergedAt = time[k + 1];
        // Hold the last finite state so the record stays plottable.
        for (let rest = k + 1; rest < grid.count; rest++) {
          z.push(state);
          u.push(applied);
          y.push(y[k]);
        }
        break;
      }
      z.push(next);
    }
    return { z: z.slice(0, grid.count), u: u.slice(0, grid.count), y: y.slice(0, grid.count), divergedAt, time };
  };

  // Exact final value of the linear loop (stable loops): z∞ = −Acl⁻¹ Bcl r, or (I − Acl)⁻¹ Bcl r.
  const linearFinal = (r: number[]): number[] | null => {
    if (!closedLoopStable) return null;
    const M = domain === 'continuous' ? loop.Acl.map((row) => row.map((v) => -v)) : loop.Acl.map((row, i) => row.map((v, j) => (i === j ? 1 : 0) - v));
    const solution = solveLinear(M, loop.Bcl.map((row) => [matVec([row], r)[0]]));
    if (solution.singular) return null;
    const zf = solution.X.map((row) => row[0]);
    return outputOf(zf, commandOf(zf, r));
  };

  const keep = downsampleIndices(grid.count, maxReturned);
  const toRun = (raw: RawRun, output: number, amplitude: number, finalValue?: number): StepRun => {
    const metrics = computeStepMetrics(
      raw.time,
      raw.y.map((values) => values[output]),
      amplitude,
      {
        initialValue: 0,
        ...(finalValue !== undefined ? { finalValue } : {}),
        inputs: Array.from({ length: m }, (_, i) => raw.u.map((values) => values[i])),
        limits: Array.from({ length: m }, (_, i) => limits[i] ?? null),
      },
    );
    const run: StepRun = {
      time: keep.map((k) => raw.time[k]),
      outputs: Array.from({ length: p }, (_, i) => keep.map((k) => raw.y[k][i])),
      inputs: Array.from({ length: m }, (_, i) => keep.map((k) => raw.u[k][i])),
      metrics,
      divergedAt: raw.divergedAt,
    };
    if (problem.includeStates) {
      run.states = Array.from({ length: n }, (_, i) => keep.map((k) => raw.z[k][i]));
      if (loop.qi > 0) run.integrators = Array.from({ length: loop.qi }, (_, i) => keep.map((k) => raw.z[k][n + i]));
    }
    return run;
  };

  const experiments: StepExperiment[] = tracked.map((output, column) => {
    const amplitude = problem.stepSizes?.[column] ?? 1;
    const r = tracked.map((_, j) => (j === column ? amplitude : 0));
    const final = linearFinal(r);
    const experiment: StepExperiment = {
      steppedOutput: output,
      amplitude,
      linear: toRun(runLinear(r), output, amplitude, final ? final[output] : undefined),
    };
    if (hasLimits) {
      experiment.saturated = toRun(runSaturated(r, false), output, amplitude);
      if (loop.qi > 0) {
        experiment.antiWindup = toRun(runSaturated(r, true), output, amplitude);
        const without = experiment.saturated.metrics;
        const withClamp = experiment.antiWindup.metrics;
        const overshootGain = (without.overshootPercent ?? 0) - (withClamp.overshootPercent ?? 0);
        const settlingGain =
          without.settlingTime === null ? (withClamp.settlingTime === null ? 0 : Infinity) : without.settlingTime - (withClamp.settlingTime ?? Infinity);
        experiment.windup = {
          overshootWithoutPercent: without.overshootPercent,
          overshootWithPercent: withClamp.overshootPercent,
          settlingWithout: without.settlingTime,
          settlingWith: withClamp.settlingTime,
          // "Noticeably" (our thresholds): 5 percentage points of overshoot or 10 % of the settling time.
          windupSignificant:
            overshootGain > 5 || settlingGain > 0.1 * (withClamp.settlingTime ?? without.settlingTime ?? Infinity),
        };
      }
    }
    const nonlinear = runNonlinear(r, loop.qi > 0 && hasLimits);
    if (nonlinear) experiment.nonlinear = toRun(nonlinear, output, amplitude);
    return experiment;
  });

  return {
    ok: true,
    closedLoopPoles,
    closedLoopStable,
    duration: grid.duration,
    step: h,
    truncated: grid.truncated,
    methods: {
      linear: linearMethods.size ? [...linearMethods].join('; ') : domain === 'continuous' ? TRANSITION_METHOD : DISCRETE_METHOD,
      saturated: domain === 'continuous' ? 'fixed-step fourth-order Runge-Kutta on the same grid' : 'exact discrete recursion with clipped inputs',
      nonlinear:
        domain === 'continuous'
          ? 'fixed-step fourth-order Runge-Kutta on the same grid'
          : 'input held per sample, plant by fixed-step fourth-order Runge-Kutta substeps',
    },
    experiments,
  };
}
