// One controller's design, end to end: the design model (continuous, or sampled by zero-order
// hold with an optional computation delay), integral augmentation, gains (pole placement, LQR or
// poles from a specification), set-point gains, observer, step responses, loop margins, sampling
// and single-precision checks, and the implementation record for export. Every number comes
// from a pure analysis in this folder; this file only sequences them and attaches source ranges.
import type { CheckedController, CheckedPlant, Complex, Diagnostic, Range, Rows } from '../model/types';
import { blockDiagonal, denseFromRows, hstack, identity, multiply, realSchurDense, scale, vstack, zeros, type RealSchurDense } from '../numeric';
import { eigenvaluesOf } from './controlLinearAlgebra';
import type { StateSpace } from './combinedClosedLoop';
import { observerController } from './combinedClosedLoop';
import { augmentComputationDelay } from './delayAugment';
import { designDiagnostics as findings } from './diagnostics/designFindings';
import { discretiseZeroOrderHold, mapPolesToContinuous, mapPolesToDiscrete, sampledCostWeights } from './discretise';
import { float32ClosedLoopCheck } from './float32Check';
import { bandwidth, bodeOf, frequencyPoint, logarithmicGrid, transferEvaluator } from './frequencyResponse';
import { analyzeFragility, fragilityParameterPoints, type FragilityInput, type FragilityResult, type PlantMatrices } from './fragility';
import { disturbanceRejection } from './disturbanceRejection';
import { integralActionFeasibility } from './integralAction';
import { steadyStateKalmanGain } from './kalman';
import { designLqr, lqrConditionEstimate, type LqrProblem, type RiccatiStart } from './lqr';
import { loopMargins, outputFeedbackLoop, stateFeedbackLoop, type LoopMarginsResult, type MarginEvaluations } from './margins';
import { compareObserverSpeed, defaultObserverPoles, designObserverByPlacement } from './observer';
import { placePoles } from './placement';
import type { ControllerReport, ImplementationReport, StepResponseReport } from './reportTypes';
import { adviseSamplePeriod } from './samplingAdvice';
import { setpointGains, squareSetpointPrescaler, type SetpointResult } from './setpoint';
import type { AnalysisSettings } from './settings';
import { checkSpec, polesFromSpec } from './specToPoles';
import { MODAL_STEP_FROM_STATES, referenceClosedLoop, simulateStepResponses, type StepResponseProblem } from './stepResponse';
import { measuresAllStates } from './structure';
import { singularValuesOf } from './controlLinearAlgebra';

export interface DesignContext {
  /** Re-checks the plant with parameter overrides (for the fragility study); null when that fails. */
  rebuildPlant?: (overrides: Record<string, number>) => CheckedPlant | null;
  /**
   * Starts the fragility study elsewhere (another thread holding the same document) as soon as
   * the gains and prescaler are known, and returns a function that waits for its result (null:
   * it failed there, so it runs here). Without it the study runs here. Either way the result is
   * the same pure function of the request.
   */
  startFragility?: (request: FragilityRequest) => () => FragilityResult | null;
  /**
   * Hands the LQR design's Riccati condition estimate over (same contract as startFragility: the
   * returned function waits for the value, null meaning "compute it here").
   */
  startRiccatiCondition?: (request: RiccatiConditionRequest) => () => number | null;
  /**
   * The Riccati solutions of this controller's LQR and Kalman designs in an earlier version of the
   * document, to start from (the solvers' warm start: same equations, cheaper route when the model
   * moved little), and where the new ones are kept. Without it every design solves afresh.
   */
  riccatiStart?: RiccatiStartSlot;
  /** false: the LQR design's Riccati condition estimate is left out (NaN in `details.lqr`). */
  riccatiConditionEstimate?: boolean;
}

/** Which of a controller's Riccati equations: the regulator's (LQR) or the estimator's (Kalman). */
export type RiccatiRole = 'regulator' | 'estimator';

/** One controller's place in a store of Riccati solutions kept between document versions. */
export interface RiccatiStartSlot {
  recall(role: RiccatiRole): RiccatiStart | undefined;
  keep(role: RiccatiRole, start: RiccatiStart): void;
}

/** An LQR design's Riccati problem and solution: plain data, cloneable. */
export interface RiccatiConditionRequest {
  problem: LqrProblem;
  X: Rows;
}

/** The Riccati condition estimate of an LQR design, as designLqr would have given it. */
export function riccatiConditionOf(request: RiccatiConditionRequest): number {
  return lqrConditionEstimate(request.problem, request.X);
}

/** Everything the fragility study needs besides the plant rebuild: plain data, cloneable. */
export type FragilityRequest = Omit<FragilityInput, 'rebuild'>;

/**
 * Design-model matrices already rebuilt for parameter vectors (keyed by `rebuiltPlantKey`): the
 * rebuild is a pure function of the values, so a plant prepared early is the plant needed later.
 */
export type RebuiltPlants = Map<string, PlantMatrices | null>;

export function rebuiltPlantKey(values: number[]): string {
  // A number's shortest round-trip form: distinct values, distinct keys (−0 kept apart from 0).
  return values.map((value) => (Object.is(value, -0) ? '-0' : String(value))).join(' ');
}

function designMatricesRebuilder(
  controller: CheckedController,
  plant: CheckedPlant,
  rebuildPlant: NonNullable<DesignContext['rebuildPlant']>,
  prepared?: RebuiltPlants,
): (values: number[]) => PlantMatrices | null {
  const names = plant.parameters.map((parameter) => parameter.name);
  return (values) => {
    const key = rebuiltPlantKey(values);
    if (prepared?.has(key)) return prepared.get(key)!;
    const perturbed = rebuildPlant(Object.fromEntries(names.map((name, i) => [name, values[i]])));
    let matrices: PlantMatrices | null = null;
    if (perturbed && perturbed.usable) {
      const perturbedModel = buildDesignModel(perturbed, controller);
      matrices = { A: perturbedModel.A, B: perturbedModel.B, C: perturbedModel.C, D: perturbedModel.D, E: perturbedModel.E };
    }
    prepared?.set(key, matrices);
    return matrices;
  };
}

/** Bit for bit equal (−0 apart from 0): the same numbers, not merely close ones. */
function sameEntries(a: Rows, b: Rows): boolean {
  return a.length === b.length && a.every((row, i) => row.length === b[i].length && row.every((value, j) => Object.is(value, b[i][j])));
}

/** The fragility study of a controller on its plant, re-checking the plant with parameters moved. */
export function runFragility(
  controller: CheckedController,
  plant: CheckedPlant,
  rebuildPlant: NonNullable<DesignContext['rebuildPlant']>,
  request: FragilityRequest,
  prepared?: RebuiltPlants,
): FragilityResult {
  return analyzeFragility({ rebuild: designMatricesRebuilder(controller, plant, rebuildPlant, prepared), ...request });
}

/** The parameter points a controller's fragility study will use: known before its gains are. */
function fragilityPointsOf(plant: CheckedPlant, order: number, settings: AnalysisSettings): Pick<FragilityRequest, 'nominal' | 'percent' | 'samples' | 'maxVertexParameters'> {
  return { nominal: plant.parameters.map((parameter) => parameter.value), percent: settings.parameterErrorPercent, ...fragilityBoxBudget(order, settings) };
}

/**
 * Rebuilds, ahead of the gains, the plants a controller's fragility study will need (at most
 * `limit` of them), so the study itself only has to evaluate closed loops.
 */
export function prepareFragilityPlants(
  controller: CheckedController,
  plant: CheckedPlant,
  rebuildPlant: NonNullable<DesignContext['rebuildPlant']>,
  settings: AnalysisSettings,
  prepared: RebuiltPlants,
  limit: number,
): void {
  if (!controller.track?.outputs.length || plant.parameters.length === 0) return;
  const order = buildDesignModel(plant, controller).A.length + (controller.integral?.outputs ?? []).length;
  const rebuild = designMatricesRebuilder(controller, plant, rebuildPlant, prepared);
  for (const values of fragilityParameterPoints(fragilityPointsOf(plant, order, settings)).slice(0, limit)) rebuild(values);
}

/** The matrices the gains are computed for (continuous plant, or its sampled model). */
export interface DesignModel {
  domain: 'continuous' | 'discrete';
  T: number | null;
  /** Plant part (n_d states: plant states, plus m per sample of computation delay). */
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
  /** Disturbance input of the design model. */
  E: Rows;
  delayStates: number;
}

export function emptyControllerReport(controller: CheckedController): ControllerReport {
  return {
    name: controller.name,
    plant: controller.plantName,
    designed: false,
    diagnostics: [],
    method: controller.poles ? 'poles' : controller.lqr ? 'lqr' : controller.spec ? 'spec' : null,
    domain: controller.sample ? 'discrete' : 'continuous',
    samplePeriod: controller.sample?.period ?? null,
    K: null,
    Ki: null,
    closedLoopPoles: [],
    trackedOutputs: [],
    dcGain: null,
    prescaler: null,
    Nx: null,
    Nu: null,
    details: {},
    step: [],
    implementation: null,
  };
}

/** The design model: the plant as is, or sampled by zero-order hold (Van Loan) with delay states. */
export function buildDesignModel(plant: CheckedPlant, controller: CheckedController): DesignModel {
  const { A, B, C, D, E } = plant;
  if (!controller.sample) return { domain: 'continuous', T: null, A, B, C, D, E, delayStates: 0 };
  const T = controller.sample.period;
  const held = discretiseZeroOrderHold(A, B, T, E);
  let model: DesignModel = { domain: 'discrete', T, A: held.Phi, B: held.Gamma, C, D, E: held.GammaDisturbance, delayStates: 0 };
  for (let k = 0; k < (controller.delay?.samples ?? 0); k++) model = withComputationDelay(model);
  return model;
}

/**
 * The parameter-box study costs one plant rebuild and one eigenvalue problem (≈ 10·n³ flops) per
 * point. Its size is bounded by an operation budget (settings.iterationBudget scales it) so that
 * live analysis stays fast on large models: all vertices while 2^k fits, seeded samples beyond.
 */
export const FRAGILITY_FLOP_BUDGET = 2e8;
function fragilityBoxBudget(order: number, settings: AnalysisSettings): { samples: number; maxVertexParameters: number } {
  const perPoint = 10 * Math.max(1, order) ** 3;
  const points = Math.max(16, Math.floor((FRAGILITY_FLOP_BUDGET * settings.iterationBudget) / perPoint));
  return { samples: Math.min(points, 1024), maxVertexParameters: Math.min(10, Math.floor(Math.log2(points))) };
}

/** One more sample of computation delay: the previous inputs become states (delayAugment.ts). */
function withComputationDelay(model: DesignModel): DesignModel {
  const augmented = augmentComputationDelay(model.A, model.B, model.C, model.D, model.E);
  return { ...model, A: augmented.Phi, B: augmented.Gamma, C: augmented.C, D: augmented.D, E: augmented.GammaDisturbance, delayStates: model.delayStates + augmented.addedStates };
}

/** Integrator augmentation: ξ' = r − y (continuous) or ξ[k+1] = ξ[k] + T(r − y[k]) (discrete). */
export function integralAugmentation(model: DesignModel, outputs: number[]): { A: Rows; B: Rows } {
  const n = model.A.length;
  const q = outputs.length;
  const Ci = outputs.map((i) => model.C[i]);
  const Di = outputs.map((i) => model.D[i]);
  const step = model.domain === 'discrete' ? (model.T as number) : 1;
  const integratorBlock = model.domain === 'discrete' ? identity(q) : zeros(q, q);
  return {
    A: vstack(hstack(model.A, zeros(n, q)), hstack(scale(Ci, -step), integratorBlock)),
    B: vstack(model.B, scale(Di, -step)),
  };
}

function anchor(controller: CheckedController): Range {
  return controller.poles?.range ?? controller.lqr?.range ?? controller.spec?.range ?? controller.nameRange;
}

function splitColumns(K: Rows, at: number): { left: Rows; right: Rows } {
  return { left: K.map((row) => row.slice(0, at)), right: K.map((row) => row.slice(at)) };
}

interface Gains {
  K: Rows; // m × (n_d + q)
  closedLoopPoles: Complex[];
  /** The requested poles in s (placement and spec designs), before any z = e^{sT} map. */
  requestedContinuousPoles?: Complex[];
  /** LQR: the Riccati solution X, a Lyapunov (Stein) function of the closed loop A − B·K. */
  riccatiSolution?: Rows;
  /** LQR: where the next version's design starts (LqrResult.nextStart). */
  riccatiNextStart?: RiccatiStart;
  /** LQR: the problem solved, for the condition estimate computed after the gains are in use. */
  lqrProblem?: LqrProblem;
  details: Record<string, unknown>;
}

/** Gains by placement, LQR, or poles from a specification; null (with diagnostics) when impossible. */
function computeGains(
  controller: CheckedController,
  plant: CheckedPlant,
  model: DesignModel,
  augmented: { A: Rows; B: Rows },
  integratedCount: number,
  settings: AnalysisSettings,
  out: Diagnostic[],
  riccatiStart?: RiccatiStart,
): Gains | null {
  const n = plant.states.length;
  const total = augmented.A.length;
  if (controller.lqr) {
    const { Q, R, N } = controller.lqr;
    if (Q.length !== n + integratedCount) {
      out.push(findings.weightShape.create(controller.lqr.range, ['Q', n + integratedCount, Q.length]));
      return null;
    }
    let problem = { A: augmented.A, B: augmented.B, Q, R, N };
    let weightsNote = 'continuous cost';
    if (model.domain === 'discrete') {
      // Weights that make the sampled design minimise the continuous cost (Van Loan 1978).
      const continuousModel = integralAugmentation({ ...model, domain: 'continuous', A: plant.A, B: plant.B, C: plant.C, D: plant.D, delayStates: 0 }, controller.integral?.outputs ?? []);
      const weights = sampledCostWeights(continuousModel.A, continuousModel.B, Q, R, model.T as number, N);
      const pad = model.delayStates;
      const Qd = pad ? blockDiagonal(weights.Qd, zeros(pad, pad)) : weights.Qd;
      const Nd = pad ? insertRows(weights.Nd, n, zeros(pad, R.length)) : weights.Nd;
      problem = { A: augmented.A, B: augmented.B, Q: pad ? reorderForDelay(Qd, n, pad, integratedCount) : Qd, R: weights.Rd, N: Nd };
      weightsNote = 'sampled continuous cost (Van Loan 1978), so the gains change little with T';
    }
    // The condition estimate (two more n×n Schur-form solves) is left for later: the gains are
    // needed first, and the estimate can be computed beside the rest of the design.
    // A tracking design's step response sums modes on the closed loop's Schur form from
    // MODAL_STEP_FROM_STATES states on: the Riccati solver leaves that form behind.
    const keepClosedLoopSchur = model.domain === 'continuous' && problem.A.length >= MODAL_STEP_FROM_STATES && (controller.track?.outputs.length ?? 0) > 0;
    const lqr = designLqr(problem.A, problem.B, problem.Q, problem.R, problem.N, model.domain, { conditionEstimate: false, start: riccatiStart, keepClosedLoopSchur });
    if (!lqr.ok || !lqr.K) {
      out.push(findings.lqrFailure(controller.lqr.range, lqr));
      return null;
    }
    return {
      K: lqr.K,
      closedLoopPoles: lqr.closedLoopPoles,
      riccatiSolution: lqr.X ?? undefined,
      ...(lqr.nextStart ? { riccatiNextStart: lqr.nextStart } : {}),
      lqrProblem: { ...problem, domain: model.domain },
      details: {
        lqr: {
          riccatiResidual: lqr.residual,
          conditionEstimate: lqr.conditionEstimate,
          warmStarted: lqr.warmStarted,
          weights: weightsNote,
          classicalMarginsApply: lqr.classicalMarginsApply && !controller.observer,
        },
      },
    };
  }

  let requested: Complex[];
  let specDetails: Record<string, unknown> | undefined;
  if (controller.poles) {
    requested = [...controller.poles.values, ...(controller.integral?.poles?.values ?? [])];
  } else if (controller.spec) {
    const spec = {
      settlingSeconds: controller.spec.settling?.seconds,
      overshootPercent: controller.spec.overshoot?.percent,
      riseSeconds: controller.spec.rise?.seconds,
    };
    const chosen = polesFromSpec(spec, n + integratedCount, { fastPoleFactor: settings.fastPoleFactor, domain: 'continuous' });
    if (!chosen.ok) {
      out.push(findings.specUnusable.create(controller.spec.range, [chosen.failure ?? 'no-time-requirement']));
      return null;
    }
    requested = chosen.poles;
    specDetails = { dampingRatio: chosen.dampingRatio, naturalFrequency: chosen.naturalFrequency, formulas: chosen.formulas, chosenPoles: chosen.poles };
  } else {
    return null; // the model layer already reported the missing design line
  }
  if (requested.length !== n + integratedCount) return null; // pole count reported by the model layer
  let target = requested;
  if (model.domain === 'discrete') {
    target = mapPolesToDiscrete(requested, model.T as number);
    // Computation-delay states are placed at z = 0 (dead-beat), stated in the report.
    const delayPoles = Array.from({ length: model.delayStates }, () => ({ re: 0, im: 0 }));
    target = [...target.slice(0, n), ...delayPoles, ...target.slice(n)];
  }
  if (target.length !== total) return null;
  const placement = placePoles(augmented.A, augmented.B, target, settings);
  if (!placement.ok) {
    out.push(findings.placementFailure(controller, placement, model.domain, plant));
    return null;
  }
  out.push(...findings.placementWarnings(controller, placement, model.domain));
  return {
    K: placement.K,
    closedLoopPoles: placement.achievedPoles,
    requestedContinuousPoles: requested,
    details: {
      placement: {
        method: placement.method,
        gainNorm: placement.gainNorm,
        eigenvectorCondition: placement.eigenvectorCondition,
        backwardError: placement.backwardError,
        maxRelativePoleError: placement.maxRelativePoleError,
        fragile: placement.fragile,
        warnings: placement.warnings,
        requestedPoles: target,
      },
      ...(specDetails ? { spec: specDetails } : {}),
    },
  };
}

/** Inserts rows into a matrix at `at` (used to pad the sampled cross weight for delay states). */
function insertRows(matrix: Rows, at: number, rows: Rows): Rows {
  return [...matrix.slice(0, at), ...rows, ...matrix.slice(at)];
}

/** Moves the zero delay-state weights between the plant states and the integrators. */
function reorderForDelay(Q: Rows, n: number, pad: number, q: number): Rows {
  // Q arrives as blockdiag(Q_(x,ξ), 0_pad); the augmented state order is (x, delay, ξ).
  const order = [...Array.from({ length: n }, (_, i) => i), ...Array.from({ length: pad }, (_, i) => n + q + i), ...Array.from({ length: q }, (_, i) => n + i)];
  return order.map((i) => order.map((j) => Q[i][j]));
}

function stepReport(
  plant: CheckedPlant,
  problem: StepResponseProblem,
  limits: ([number, number] | null)[],
  y0: number[],
): { reports: StepResponseReport[]; raw: ReturnType<typeof simulateStepResponses> } {
  const raw = simulateStepResponses(problem);
  const outputNames = plant.outputs.map((s) => s.name);
  const inputNames = plant.inputs.map((s) => s.name);
  const trace = (names: string[], series: number[][], offset: number[]) =>
    names.map((name, i) => ({ name, values: (series[i] ?? []).map((v) => v + (offset[i] ?? 0)) }));
  const u0 = plant.operatingPoint?.inputs ?? plant.inputs.map(() => 0);
  const reports = raw.experiments.map((experiment): StepResponseReport => {
    const linear = experiment.linear;
    const output = experiment.steppedOutput;
    const metrics = linear.metrics;
    return {
      steppedOutput: outputNames[output],
      time: linear.time,
      outputs: trace(outputNames, linear.outputs, y0),
      inputs: trace(inputNames, linear.inputs, u0).map((entry, i) => ({ ...entry, limit: limits[i] ?? null })),
      ...(experiment.saturated ? { saturated: { outputs: trace(outputNames, experiment.saturated.outputs, y0), inputs: trace(inputNames, experiment.saturated.inputs, u0) } } : {}),
      ...(experiment.antiWindup ? { antiWindup: { outputs: trace(outputNames, experiment.antiWindup.outputs, y0), inputs: trace(inputNames, experiment.antiWindup.inputs, u0) } } : {}),
      ...(experiment.nonlinear ? { nonlinear: { outputs: trace(outputNames, experiment.nonlinear.outputs, y0), inputs: trace(inputNames, experiment.nonlinear.inputs, u0) } } : {}),
      metrics: {
        output: outputNames[output],
        setpoint: metrics.setPoint + (y0[output] ?? 0),
        finalValue: metrics.finalValue + (y0[output] ?? 0),
        riseTime: metrics.riseTime,
        settlingTime: metrics.settlingTime,
        overshootPercent: metrics.overshootPercent,
        undershootPercent: metrics.undershootPercent,
        steadyStateError: metrics.steadyStateError,
        peakInput: metrics.inputs.map((peak) => {
          // Physical extremes: the exact largest excursion from u0 plus the sampled trace's range.
          const trace = (linear.inputs[peak.input] ?? []).map((v) => v + (u0[peak.input] ?? 0));
          const exact = peak.peak + (u0[peak.input] ?? 0);
          return {
            input: inputNames[peak.input],
            value: exact,
            min: Math.min(exact, ...trace),
            max: Math.max(exact, ...trace),
            limit: limits[peak.input] ?? null,
          };
        }),
      },
    };
  });
  return { reports, raw };
}

export function designController(
  controller: CheckedController,
  plant: CheckedPlant | undefined,
  settings: AnalysisSettings,
  context: DesignContext = {},
): ControllerReport {
  const report = emptyControllerReport(controller);
  if (!plant || !plant.usable || !controller.usable || plant.states.length === 0) return report;
  const out: Diagnostic[] = [];
  report.diagnostics = out;
  const n = plant.states.length;
  const m = plant.inputs.length;
  if (m === 0) {
    out.push(findings.noInputs.create(controller.nameRange, [plant.name]));
    return report;
  }
  const model = buildDesignModel(plant, controller);
  const nd = model.A.length;
  const integrated = controller.integral?.outputs ?? [];
  const tracked = controller.track?.outputs ?? [];
  report.trackedOutputs = tracked.map((i) => plant.outputs[i]?.name ?? String(i));

  // Integral action is offered only when it can work: stabilisable pair and no zero at DC.
  if (integrated.length) {
    const feasibility = integralActionFeasibility(model.A, model.B, model.C, model.D, integrated, model.domain);
    if (!feasibility.feasible) {
      out.push(findings.integralInfeasible(controller, plant, feasibility, model.domain));
      return report;
    }
  }
  const augmented = integrated.length ? integralAugmentation(model, integrated) : { A: model.A, B: model.B };
  const gains = computeGains(controller, plant, model, augmented, integrated.length, settings, out, context.riccatiStart?.recall('regulator'));
  if (!gains) return report;
  if (gains.riccatiNextStart) context.riccatiStart?.keep('regulator', gains.riccatiNextStart);
  if (!gains.K.every((row) => row.every(Number.isFinite))) {
    // Poles or weights beyond the double range: no gain to show, whatever the method said.
    out.push(findings.gainOverflow.create(anchor(controller), [plant.name]));
    return report;
  }
  const { left: Kx, right: Ki } = splitColumns(gains.K, nd);
  report.K = Kx;
  report.Ki = integrated.length ? Ki : null;
  report.closedLoopPoles = gains.closedLoopPoles;
  // The LQR condition estimate needs only the problem and X: hand it over before anything else.
  const conditionRequest: RiccatiConditionRequest | null =
    gains.lqrProblem && gains.riccatiSolution && context.riccatiConditionEstimate !== false ? { problem: gains.lqrProblem, X: gains.riccatiSolution } : null;
  const pendingCondition = conditionRequest && context.startRiccatiCondition ? context.startRiccatiCondition(conditionRequest) : null;
  Object.assign(report.details, gains.details, {
    designModel: model.domain === 'discrete' ? { Phi: model.A, Gamma: model.B, delayStates: model.delayStates } : undefined,
  });
  report.designed = true;

  // The fragility study needs the gains and the prescaler. With a helper thread it starts before
  // the set-point analysis decides the rank (two SVDs), on the prescaler of the square solve
  // (squareSetpointPrescaler, the same LU solve setpointGains uses), and is kept only if
  // setpointGains then returns exactly that prescaler.
  const integral = integrated.length ? { Kx, Ki, outputs: integrated } : undefined;
  const fragilityRequestFor = (N: Rows): FragilityRequest => ({
    ...fragilityPointsOf(plant, nd + integrated.length, settings),
    K: Kx,
    N,
    trackedOutputs: tracked,
    domain: model.domain,
    samplePeriod: model.T ?? undefined,
    integral,
    // Without integral states the study's nominal loop is the LQR closed loop itself.
    lyapunovMatrix: integrated.length ? undefined : gains.riccatiSolution,
  });
  const speculativePrescaler =
    tracked.length && context.rebuildPlant && context.startFragility
      ? squareSetpointPrescaler(model.A, model.B, model.C, model.D, tracked, Kx, model.domain)
      : null;
  const speculativeFragility = speculativePrescaler && context.startFragility ? context.startFragility(fragilityRequestFor(speculativePrescaler)) : null;

  // Set-point gains and the closed-loop DC gain, decided by the rank of the Rosenbrock matrix.
  let setpoint: SetpointResult | null = null;
  if (tracked.length) {
    setpoint = setpointGains(model.A, model.B, model.C, model.D, tracked, Kx, model.domain, settings);
    report.details.setpointFeasibility = setpoint.feasibility;
    report.details.setpointCondition = setpoint.conditionNumber;
    out.push(...findings.trackingFindings(controller, plant, setpoint, integrated, gains.closedLoopPoles, model.domain));
    const usable = setpoint.feasibility === 'unique' || setpoint.feasibility === 'minimum-norm';
    report.prescaler = usable ? setpoint.prescaler : null;
    report.Nx = usable ? setpoint.Nx : null;
    report.Nu = usable ? setpoint.Nu : null;
    report.dcGain = setpoint.dcGainDefined ? setpoint.closedLoopDcGain : null;
  }

  // The fragility study runs alongside the rest of the design (its verdict joins the diagnostics
  // at the end, as always): the speculative one when its prescaler is the one decided, else now.
  const fragilityRequest: FragilityRequest | null = tracked.length && report.prescaler && context.rebuildPlant ? fragilityRequestFor(report.prescaler) : null;
  const pendingFragility =
    fragilityRequest && speculativeFragility && speculativePrescaler && sameEntries(speculativePrescaler, fragilityRequest.N)
      ? speculativeFragility
      : fragilityRequest && context.startFragility
        ? context.startFragility(fragilityRequest)
        : null;

  // Observer (estimator) and the full-state warning.
  const observerInfo = designEstimator(controller, plant, model, gains.closedLoopPoles, settings, out, context.riccatiStart);
  if (observerInfo) report.details.observer = observerInfo.details;
  else if (!measuresAllStates(plant.C, n)) {
    out.push(findings.fullStateWithoutObserver(controller, plant, measuredRank(plant.C), suggestedObserverPoles(gains.closedLoopPoles, model, settings)));
  }

  // Step responses, one set-point at a time, with saturation and the nonlinear plant where known.
  const x0 = plant.operatingPoint?.states ?? plant.states.map(() => 0);
  const u0 = plant.operatingPoint?.inputs ?? plant.inputs.map(() => 0);
  const y0 = plant.operatingPoint?.outputs ?? plant.outputs.map(() => 0);
  const limits: ([number, number] | null)[] = plant.inputs.map((_, i) => {
    const limit = controller.limits.find((entry) => entry.input === i);
    return limit ? [limit.low, limit.high] : null;
  });
  const stepped = tracked.length ? tracked : integrated;
  // Sampled designs: the closed loop from the first set-point to its output (bandwidth rule on T).
  let referenceLoop: { model: StateSpace; output: number } | null = null;
  if (stepped.length && setpoint?.feasibility !== 'zero-at-dc') {
    const stepSizes = stepped.map((output) => {
      const line = controller.steps.find((s) => s.output === output);
      return line ? line.value - (y0[output] ?? 0) : 1;
    });
    const problem: StepResponseProblem = {
      domain: model.domain,
      samplePeriod: model.T ?? undefined,
      A: model.A,
      B: model.B,
      C: model.C,
      D: model.D,
      K: Kx,
      prescaler: report.prescaler ?? undefined,
      tracked: stepped,
      integral: integrated.length ? { outputs: integrated, Ki } : undefined,
      limits: limits.map((limit, i) => (limit ? { low: limit[0] - u0[i], high: limit[1] - u0[i] } : null)),
      stepSizes,
      nonlinear:
        plant.nonlinear && plant.operatingPoint && model.delayStates === 0
          ? { model: plant.nonlinear, states: x0, inputs: u0, disturbances: plant.operatingPoint.disturbances, outputs: y0 }
          : undefined,
      points: settings.simulationPoints,
    };
    if (model.domain === 'discrete') referenceLoop = { model: referenceClosedLoop(problem), output: stepped[0] };
    const { reports, raw } = stepReport(plant, problem, limits, y0);
    report.step = reports;
    report.details.simulation = { methods: raw.methods, duration: raw.duration, step: raw.step, truncated: raw.truncated };
    out.push(...findings.responseFindings(controller, plant, raw, reports));
    if (controller.spec && (controller.poles || controller.lqr || controller.spec)) {
      for (const response of reports) {
        const violations = checkSpec(response.metrics, {
          settlingSeconds: controller.spec.settling?.seconds,
          overshootPercent: controller.spec.overshoot?.percent,
          riseSeconds: controller.spec.rise?.seconds,
        });
        for (const violation of violations) out.push(findings.specViolation.create(controller.spec.range, [violation.kind, violation.required, violation.achieved]));
      }
    }
  }

  // Margins of the loop as implemented, broken at the plant input.
  const loop = implementedLoop(model, gains.K, augmented, observerInfo, integrated);
  // One Schur form of the loop serves the margins and the plotted response.
  const loopSchur = loop.A.length ? realSchurDense(denseFromRows(loop.A)) : undefined;
  const marginEvaluations: MarginEvaluations = { values: new Map(), logarithmicGrid: [] };
  const margins = loopMargins(loop, model.domain, model.T ?? 1, loopSchur, marginEvaluations);
  report.details.margins = margins;
  out.push(...findings.marginFindings(controller, plant, margins));
  report.details.frequencyResponse = openLoopFrequencyResponse(model, loop, margins, loopSchur, marginEvaluations);

  // Sampling advice and single-precision check for sampled designs.
  if (model.domain === 'discrete') {
    const T = model.T as number;
    // The advice on T concerns the continuous closed-loop poles the design asks for: the requested
    // s-poles for placement and spec designs; for LQR the achieved z-poles mapped back, leaving
    // out the computation-delay states' poles (the ones nearest z = 0).
    const continuousPoles =
      gains.requestedContinuousPoles ??
      mapPolesToContinuous(
        [...gains.closedLoopPoles]
          .sort((a, b) => Math.hypot(a.re, a.im) - Math.hypot(b.re, b.im))
          .slice(model.delayStates)
          .filter((z) => Math.hypot(z.re, z.im) > 0),
        T,
      );
    const closedLoopBandwidth = referenceLoop ? referenceBandwidth(referenceLoop, T) : null;
    const advice = adviseSamplePeriod(T, continuousPoles, eigenvaluesOf(plant.A), {
      samplesPerTimeConstant: settings.samplesPerTimeConstant,
      ...(closedLoopBandwidth !== null ? { closedLoopBandwidth } : {}),
    });
    report.details.sampling = advice;
    out.push(...findings.samplingFindings(controller, advice));
    const single = float32ClosedLoopCheck(augmented.A, augmented.B, gains.K, 'discrete');
    report.details.float32 = { ok: single.ok, bound: single.bound, largestRelativeMove: single.largestRelativeMove };
    if (!single.ok) out.push(findings.float32Finding(controller, single));
  }

  // Fragility of the tracking design under parameter error, and disturbance rejection.
  if (tracked.length && report.prescaler) {
    if (context.rebuildPlant && fragilityRequest) {
      const names = plant.parameters.map((parameter) => parameter.name);
      const fragility = pendingFragility?.() ?? runFragility(controller, plant, context.rebuildPlant, fragilityRequest);
      report.details.fragility = { ...fragility, parameterNames: [...names, 'B (input gain)'] };
      // Integral action on the tracked outputs is feasible exactly when the set-point equations
      // have full rank (no zero at DC, q ≤ m — already decided above) and the pair is stabilisable
      // (the design just stabilised it), so the full feasibility test need not run again.
      const integralFeasible = !integrated.length && (setpoint?.feasibility === 'unique' || setpoint?.feasibility === 'minimum-norm');
      const verdict = findings.fragilityFindings(
        controller,
        plant,
        fragility,
        names,
        settings.fragilityTolerancePercent / 100,
        integrated.length > 0,
        integralFeasible,
        gains.closedLoopPoles,
        model.domain,
      );
      out.push(...verdict.diagnostics);
      out.push(...findings.parameterBoxFindings(controller, plant, fragility, names, integrated.length > 0, model.domain));
    }
    if (plant.disturbances.length) {
      report.details.disturbanceRejection = disturbanceRejection(
        { A: model.A, B: model.B, C: model.C, D: model.D, E: model.E, F: plant.F },
        Kx,
        tracked,
        model.domain,
        integral,
        model.T ?? 1,
      );
    }
  }

  if (conditionRequest) {
    const lqrDetails = report.details.lqr as { conditionEstimate: number } | undefined;
    const estimate = pendingCondition?.() ?? riccatiConditionOf(conditionRequest);
    if (lqrDetails) lqrDetails.conditionEstimate = estimate;
  }

  report.implementation = implementationRecord(plant, model, report, observerInfo, x0, u0, y0, integrated, tracked);
  return report;
}

/** Number of independent measured directions: rank of C with the tolerance max(p, n)·ε·σ_max. */
function measuredRank(C: Rows): number {
  const s = singularValuesOf(C);
  const tolerance = Math.max(C.length, C[0]?.length ?? 0) * Number.EPSILON * (s[0] ?? 0);
  return s.filter((value) => value > tolerance).length;
}

interface EstimatorInfo {
  L: Rows;
  form: 'predictor' | 'current';
  poles: Complex[];
  details: Record<string, unknown>;
}

function suggestedObserverPoles(controllerPoles: Complex[], model: DesignModel, settings: AnalysisSettings): string {
  const n = model.A.length;
  const base = model.domain === 'discrete' ? mapPolesToContinuous(controllerPoles.filter((z) => Math.hypot(z.re, z.im) > 0), model.T as number) : controllerPoles;
  const poles = defaultObserverPoles(base.slice(0, n), settings.observerSpeedFactor, 'continuous');
  return `[${poles.map((p) => (Math.abs(p.im) > 0 ? `${+p.re.toPrecision(4)} ${p.im < 0 ? '-' : '+'} ${+Math.abs(p.im).toPrecision(4)}j` : `${+p.re.toPrecision(4)}`)).join(', ')}]`;
}

function designEstimator(
  controller: CheckedController,
  plant: CheckedPlant,
  model: DesignModel,
  controllerPoles: Complex[],
  settings: AnalysisSettings,
  out: Diagnostic[],
  riccatiStart?: RiccatiStartSlot,
): EstimatorInfo | null {
  const spec = controller.observer;
  if (!spec) return null;
  const form = model.domain === 'discrete' ? spec.form : 'predictor';
  if (form === 'current' && plant.D.some((row) => row.some((v) => v !== 0))) {
    out.push(findings.currentFormFeedthrough.create(spec.range, [plant.name]));
    return null;
  }
  let L: Rows;
  let poles: Complex[];
  let details: Record<string, unknown>;
  if (spec.kind === 'poles') {
    let requested = spec.poles.values;
    if (model.domain === 'discrete') {
      requested = mapPolesToDiscrete(requested, model.T as number);
      requested = [...requested, ...Array.from({ length: model.delayStates }, () => ({ re: 0, im: 0 }))];
    }
    if (requested.length !== model.A.length) {
      out.push(findings.observerPoleCount.create(spec.poles.range, [model.A.length - model.delayStates, spec.poles.values.length]));
      return null;
    }
    const placed = designObserverByPlacement(model.A, model.C, requested, settings);
    if (!placed.ok || !placed.L) {
      out.push(findings.observerFailure(spec.range, placed.failure?.mode));
      return null;
    }
    let gain = placed.L;
    let quality = { eigenvectorCondition: placed.eigenvectorCondition, backwardError: placed.backwardError, achievedPoles: placed.achievedPoles };
    // Current form: x̂ = x̄ + M(y − C x̄) with M chosen so that A − A·M·C has the requested poles: M = A⁻¹L
    // would need A invertible, so M is placed directly on the pair (Aᵀ, (C A)ᵀ) instead.
    if (form === 'current') {
      const currentPlaced = designObserverByPlacement(model.A, multiply(model.C, model.A), requested, settings);
      if (!currentPlaced.ok || !currentPlaced.L) {
        out.push(findings.observerFailure(spec.range, currentPlaced.failure?.mode));
        return null;
      }
      gain = currentPlaced.L;
      quality = { eigenvectorCondition: currentPlaced.eigenvectorCondition, backwardError: currentPlaced.backwardError, achievedPoles: currentPlaced.achievedPoles };
    }
    L = gain;
    // Current form: the placed matrix Φ − Φ·M·C has the same spectrum as Φ − M·C·Φ (used above).
    poles = quality.achievedPoles;
    details = { method: 'placement', L, poles, form, eigenvectorCondition: quality.eigenvectorCondition, backwardError: quality.backwardError };
  } else {
    const onDisturbances = spec.enters === 'disturbances';
    const kalman = steadyStateKalmanGain({
      A: model.A,
      C: model.C,
      // W acts on the disturbance inputs when its size is theirs, else on the plant states
      // (padded with zeros for computation-delay states, which carry no process noise).
      W: onDisturbances ? spec.W : blockDiagonal(spec.W, zeros(model.delayStates, model.delayStates)),
      V: spec.V,
      G: onDisturbances ? model.E : undefined,
      domain: model.domain,
      form,
      start: riccatiStart?.recall('estimator'),
      // Not reported (the regulator's estimate is): two n × n Schur-form solves saved.
      conditionEstimate: false,
    });
    if (!kalman.ok || !kalman.gain) {
      out.push(findings.kalmanFailure(spec.range, kalman));
      return null;
    }
    if (kalman.nextStart) riccatiStart?.keep('estimator', kalman.nextStart);
    L = kalman.gain;
    poles = kalman.observerPoles;
    details = { method: 'kalman', L, poles, form, riccatiResidual: kalman.residual, warmStarted: kalman.warmStarted, noiseMeaning: model.domain === 'discrete' ? 'covariances per sample' : 'spectral densities' };
  }
  const speed = compareObserverSpeed(controllerPoles, poles, model.domain, model.T ?? 1);
  if (speed.observerSlower) out.push(findings.observerSlower.create(spec.range, [speed.slowestObserverRate, speed.slowestControllerRate]));
  return { L, form, poles, details };
}

/**
 * −3 dB bandwidth (rad/s) of the sampled closed loop from the first set-point to its output,
 * searched up to π/T; null when the loop is unstable or the response does not fall 3 dB there.
 */
function referenceBandwidth(reference: { model: StateSpace; output: number }, T: number): number | null {
  const { A, B, C, D } = reference.model;
  if (!eigenvaluesOf(A).every((z) => Math.hypot(z.re, z.im) < 1)) return null;
  const nyquist = Math.PI / T;
  const omegas = logarithmicGrid(nyquist * 1e-6, nyquist, 60);
  const column = (rows: Rows) => rows.map((row) => [row[0] ?? 0]);
  return bandwidth(A, column(B), [C[reference.output]], [[D[reference.output]?.[0] ?? 0]], omegas, 'discrete', T);
}

/** The loop as implemented, broken at the plant input (state feedback, or controller + observer). */
function implementedLoop(model: DesignModel, K: Rows, augmented: { A: Rows; B: Rows }, observer: EstimatorInfo | null, integrated: number[]): StateSpace {
  if (!observer) {
    // Full-state feedback (integrators are part of the fed-back state): L = K (λI − A_aug)⁻¹ B_aug.
    return stateFeedbackLoop(augmented.A, augmented.B, K);
  }
  // Observer-based: the controller from the measured outputs (with its integrators) in series
  // with the plant, so the margins are those of the loop as built, not of full-state feedback.
  const plantModel = { A: model.A, B: model.B, C: model.C, D: model.D };
  const n = model.A.length;
  const { left: Kx, right: Ki } = splitColumns(K, n);
  const integrators = integrated.length ? { Ki, outputs: integrated } : undefined;
  const controller = observerController(plantModel, Kx, observer.L, model.domain, observer.form, integrators, model.T ?? 1);
  return outputFeedbackLoop(plantModel, controller);
}

/** Points of the plotted open-loop response, at most. */
const PLOTTED_RESPONSE_POINTS = 400;

/**
 * The first input's loop for a plot: the margin grid's logarithmic points (every k-th when there
 * are more than PLOTTED_RESPONSE_POINTS, the last always kept), whose values the margins already
 * computed; evaluated afresh only where one is missing.
 */
function openLoopFrequencyResponse(model: DesignModel, loop: StateSpace, margins: LoopMarginsResult, loopSchur: RealSchurDense | undefined, evaluations: MarginEvaluations) {
  const low = margins.lowestFrequency;
  const high = model.domain === 'discrete' ? Math.min(margins.highestFrequency, Math.PI / (model.T as number)) : margins.highestFrequency;
  if (!(low > 0 && high > low)) return undefined;
  const base = evaluations.logarithmicGrid.filter((omega) => omega >= low && omega <= high);
  const stride = Math.max(1, Math.ceil(base.length / PLOTTED_RESPONSE_POINTS));
  const omega = base.filter((_, k) => k % stride === 0 || k === base.length - 1);
  if (omega.length < 2 || (loop.B[0]?.length ?? 0) === 0 || loop.C.length === 0) return undefined;
  const known = omega.map((point) => evaluations.values.get(point));
  const evaluate = known.every((value) => value !== undefined)
    ? null
    : transferEvaluator(loop.A, loop.B.map((row) => row.slice(0, 1)), loop.C.slice(0, 1), [[loop.D[0]?.[0] ?? 0]], loopSchur);
  const values = omega.map((point, k) => {
    const value = known[k] ?? evaluate!(frequencyPoint(point, model.domain, model.T ?? 1)).value;
    return { re: value.re[0][0], im: value.im[0][0] };
  });
  return { omega, ...bodeOf(values), brokenAt: 'first plant input, other loops open' };
}

function implementationRecord(
  plant: CheckedPlant,
  model: DesignModel,
  report: ControllerReport,
  observer: EstimatorInfo | null,
  x0: number[],
  u0: number[],
  y0: number[],
  integrated: number[],
  tracked: number[],
): ImplementationReport | null {
  if (!report.K) return null;
  const delayNames = Array.from({ length: model.delayStates }, (_, i) => `${plant.inputs[i % plant.inputs.length].name}_previous${model.delayStates > plant.inputs.length ? Math.floor(i / plant.inputs.length) + 1 : ''}`);
  return {
    domain: model.domain,
    samplePeriod: model.T,
    states: [...plant.states.map((s) => s.name), ...delayNames],
    inputs: plant.inputs.map((s) => s.name),
    outputs: plant.outputs.map((s) => s.name),
    trackedOutputs: tracked.map((i) => plant.outputs[i].name),
    integratedOutputs: integrated.map((i) => plant.outputs[i].name),
    K: report.K,
    Ki: report.Ki,
    N: report.prescaler,
    Nx: report.Nx,
    Nu: report.Nu,
    observer: observer ? { form: observer.form, L: observer.L, Phi: model.A, Gamma: model.B, C: model.C, D: model.D } : null,
    x0: [...x0, ...Array.from({ length: model.delayStates }, () => 0)],
    u0,
    y0,
  };
}
