// Fragility of a tracking design under parameter error: the prescaler N is computed for the
// nominal plant, so any error in the plant's DC gain shows up one-for-one as a steady-state
// tracking error; integral action removes it whenever the loop stays stable. Here each parameter
// is moved by ±p % one at a time (and B scaled by ±p %), and stability is checked over the whole
// parameter box: all 2^k vertices for k ≤ 10, seeded uniform samples beyond (vertices are where
// an affine dependence is worst; not a proof for nonlinear dependence — sampling says so).
import type { Complex, Rows } from '../numeric/types';
import { eigenvaluesOf } from './controlLinearAlgebra';
import { steadyStateGain } from './dcGain';
import { seededRandom } from './placementRobust';
import type { Domain } from './structure';
import { multiplyRows as multiply } from './controlLinearAlgebra';
import { certifiesStability, lyapunovCertificate, type LyapunovCertificate } from './lyapunovCertificate';

export interface PlantMatrices {
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
  E: Rows;
}

export interface FragilityInput {
  /** The plant as a function of its parameters; null when the values are outside the model's domain. */
  rebuild: (parameterValues: number[]) => PlantMatrices | null;
  nominal: number[];
  K: Rows;
  /** m × q nominal prescaler. */
  N: Rows;
  trackedOutputs: number[];
  percent: number;
  domain: Domain;
  samplePeriod?: number;
  integral?: { Kx: Rows; Ki: Rows; outputs: number[] };
  /** Samples of the box when there are more than `maxVertexParameters` parameters (default 1024). */
  samples?: number;
  maxVertexParameters?: number;
  /**
   * X ≻ 0 with a Lyapunov (continuous) or Stein (discrete) decrease along the nominal loop
   * A − B·K (an LQR design's Riccati solution). Where X still proves a perturbed loop stable, its
   * eigenvalues are not computed: the verdicts are the same; the box's worst pole then covers only
   * the points X did not settle (`box.certified` counts the others).
   */
  lyapunovMatrix?: Rows;
}

export interface PerturbedOutcome {
  /** ‖I − G·N‖∞ with the nominal prescaler: worst output error per unit set-point; null if unstable/undefined. */
  trackingError: number | null;
  /** Same with integral action (should be ≈ 0 when stable); null without integral design or unstable. */
  integralError: number | null;
  stable: boolean;
  integralStable: boolean | null;
}

export interface ParameterFragility {
  index: number;
  minus: PerturbedOutcome | null;
  plus: PerturbedOutcome | null;
  /** Largest tracking error over ±p % (Infinity when a perturbation destabilises the loop). */
  worstTrackingError: number;
}

export interface FragilityResult {
  percent: number;
  nominal: PerturbedOutcome;
  parameters: ParameterFragility[];
  inputScale: ParameterFragility;
  /** Parameter indices ordered by worst tracking error, largest first (at most 3). */
  worstParameters: number[];
  worstTrackingError: number;
  worstIntegralError: number | null;
  box: {
    method: 'vertices' | 'sampled';
    points: number;
    allStable: boolean;
    integralAllStable: boolean | null;
    /**
     * Closed-loop pole nearest to (or beyond) the stability boundary over the points whose
     * eigenvalues were computed — every point, except those `certified` settled without them;
     * null when the certificate settled them all.
     */
    worstPole: Complex | null;
    worstPoint: number[] | null;
    /** Points proved stable by the design's Lyapunov certificate (`lyapunovMatrix`), eigenvalues not computed. */
    certified: number;
    rebuildFailures: number;
  };
}


function stabilityMeasure(value: Complex, domain: Domain): number {
  return domain === 'continuous' ? value.re : Math.hypot(value.re, value.im) - 1;
}

/** Closed loop with prescaler: (A − BK, B·N, C_t − D_tK, D_t·N). */
function prescalerLoop(plant: PlantMatrices, K: Rows, N: Rows, outputs: number[]) {
  const Ct = outputs.map((o) => plant.C[o]);
  const Dt = outputs.map((o) => plant.D[o]);
  const BK = multiply(plant.B, K);
  const A = plant.A.map((row, i) => row.map((v, j) => v - BK[i][j]));
  const DK = multiply(Dt, K);
  const C = Ct.map((row, i) => row.map((v, j) => v - DK[i][j]));
  return { A, B: multiply(plant.B, N), C, D: multiply(Dt, N) };
}

/** Closed loop with integral action, states [x; ξ], input r (and, for disturbances, w). */
export function integralLoop(plant: PlantMatrices & { F?: Rows }, Kx: Rows, Ki: Rows, outputs: number[], domain: Domain, samplePeriod = 1) {
  const n = plant.A.length;
  const q = outputs.length;
  const step = domain === 'discrete' ? samplePeriod : 1;
  const Ct = outputs.map((o) => plant.C[o]);
  const Dt = outputs.map((o) => plant.D[o]);
  const BKx = multiply(plant.B, Kx);
  const BKi = multiply(plant.B, Ki);
  const DKx = multiply(Dt, Kx);
  const DKi = multiply(Dt, Ki);
  const Cy = Ct.map((row, i) => row.map((v, j) => v - DKx[i][j])); // y = Cy·x − D_tKi·ξ
  const A: Rows = [
    ...plant.A.map((row, i) => [...row.map((v, j) => v - BKx[i][j]), ...BKi[i].map((v) => -v)]),
    ...Cy.map((row, i) => [...row.map((v) => -step * v), ...DKi[i].map((v, j) => step * v + (domain === 'discrete' && i === j ? 1 : 0))]),
  ];
  const B: Rows = [...plant.A.map(() => new Array<number>(q).fill(0)), ...Array.from({ length: q }, (_, i) => Array.from({ length: q }, (_, j) => (i === j ? step : 0)))];
  const C: Rows = Cy.map((row, i) => [...row, ...DKi[i].map((v) => -v)]);
  const D: Rows = Array.from({ length: q }, () => new Array<number>(q).fill(0));
  const d = plant.E[0]?.length ?? 0;
  const F = plant.F ?? outputs.map(() => new Array<number>(d).fill(0));
  const Ft = outputs.map((o) => F[o] ?? new Array<number>(d).fill(0));
  const Bw: Rows = [...plant.E.map((row) => row.slice()), ...Ft.map((row) => row.map((v) => -step * v))];
  void n;
  return { A, B, C, D, Bw, Dw: Ft };
}

function trackingError(gain: Rows | null): number | null {
  if (!gain) return null;
  return Math.max(0, ...gain.map((row, i) => row.reduce((sum, v, j) => sum + Math.abs((i === j ? 1 : 0) - v), 0)));
}

function isStable(A: Rows, domain: Domain): { stable: boolean; worst: Complex | null } {
  const values = eigenvaluesOf(A);
  let worst: Complex | null = null;
  for (const value of values) if (!worst || stabilityMeasure(value, domain) > stabilityMeasure(worst, domain)) worst = value;
  return { stable: worst === null || stabilityMeasure(worst, domain) < 0, worst };
}

function evaluate(plant: PlantMatrices | null, input: FragilityInput, certificate: LyapunovCertificate | null): PerturbedOutcome | null {
  if (!plant) return null;
  const loop = prescalerLoop(plant, input.K, input.N, input.trackedOutputs);
  const stability = certificate && certifiesStability(certificate, loop.A, input.domain) ? { stable: true } : isStable(loop.A, input.domain);
  const outcome: PerturbedOutcome = {
    trackingError: stability.stable ? trackingError(steadyStateGain(loop.A, loop.B, loop.C, loop.D, input.domain)) : null,
    integralError: null,
    stable: stability.stable,
    integralStable: null,
  };
  if (input.integral) {
    const iLoop = integralLoop(plant, input.integral.Kx, input.integral.Ki, input.integral.outputs, input.domain, input.samplePeriod);
    const iStability = isStable(iLoop.A, input.domain);
    outcome.integralStable = iStability.stable;
    outcome.integralError = iStability.stable ? trackingError(steadyStateGain(iLoop.A, iLoop.B, iLoop.C, iLoop.D, input.domain)) : null;
  }
  return outcome;
}

function worstOf(outcomes: (PerturbedOutcome | null)[]): number {
  let worst = 0;
  for (const outcome of outcomes) {
    if (!outcome) continue;
    if (!outcome.stable || outcome.trackingError === null) return Infinity;
    worst = Math.max(worst, outcome.trackingError);
  }
  return worst;
}

/** Parameter vectors of the box check: all vertices for k ≤ maxVertexParameters, else seeded samples. */
function boxPoints(nominal: number[], percent: number, maxVertexParameters = 10, samples = 1024): { method: 'vertices' | 'sampled'; points: number[][] } {
  const fraction = percent / 100;
  const k = nominal.length;
  const points: number[][] = [];
  if (k <= maxVertexParameters) {
    for (let mask = 0; mask < 1 << k; mask++) points.push(nominal.map((v, i) => v * (1 + ((mask >> i) & 1 ? fraction : -fraction))));
    return { method: 'vertices', points };
  }
  const random = seededRandom(20261202);
  for (let s = 0; s < samples; s++) points.push(nominal.map((v) => v * (1 + 2 * fraction * random())));
  return { method: 'sampled', points };
}

/** One parameter moved by ±p % with the others nominal (sign −1 or +1). */
function movedParameter(nominal: number[], index: number, sign: number, fraction: number): number[] {
  const values = nominal.slice();
  values[index] = nominal[index] * (1 + sign * fraction);
  return values;
}

/**
 * Every parameter vector the study rebuilds the plant at, in the order it does: nominal, each
 * parameter −p % and +p %, then the box. Lets a caller prepare the plants before the gains exist.
 */
export function fragilityParameterPoints(input: Pick<FragilityInput, 'nominal' | 'percent' | 'maxVertexParameters' | 'samples'>): number[][] {
  const fraction = input.percent / 100;
  const moved = input.nominal.flatMap((_, index) => [movedParameter(input.nominal, index, -1, fraction), movedParameter(input.nominal, index, 1, fraction)]);
  return [input.nominal.slice(), ...moved, ...boxPoints(input.nominal, input.percent, input.maxVertexParameters, input.samples).points];
}

export function analyzeFragility(input: FragilityInput): FragilityResult {
  const fraction = input.percent / 100;
  const nominalPlant = input.rebuild(input.nominal);
  const nominalLoop = nominalPlant ? prescalerLoop(nominalPlant, input.K, input.N, input.trackedOutputs).A : undefined;
  const certificate = input.lyapunovMatrix ? lyapunovCertificate(input.lyapunovMatrix, nominalLoop) : null;
  const nominal = evaluate(nominalPlant, input, certificate) ?? { trackingError: null, integralError: null, stable: false, integralStable: null };
  const parameters: ParameterFragility[] = input.nominal.map((_, index) => {
    const at = (sign: number) => evaluate(input.rebuild(movedParameter(input.nominal, index, sign, fraction)), input, certificate);
    const minus = at(-1);
    const plus = at(1);
    return { index, minus, plus, worstTrackingError: worstOf([minus, plus]) };
  });
  const scaledB = (sign: number) => (nominalPlant ? evaluate({ ...nominalPlant, B: nominalPlant.B.map((row) => row.map((v) => v * (1 + sign * fraction))) }, input, certificate) : null);
  const inputScaleMinus = scaledB(-1);
  const inputScalePlus = scaledB(1);
  const inputScale: ParameterFragility = { index: -1, minus: inputScaleMinus, plus: inputScalePlus, worstTrackingError: worstOf([inputScaleMinus, inputScalePlus]) };
  const worstParameters = parameters
    .filter((p) => p.worstTrackingError > 0)
    .sort((a, b) => b.worstTrackingError - a.worstTrackingError)
    .slice(0, 3)
    .map((p) => p.index);
  const all = [...parameters, inputScale];
  const worstTrackingError = Math.max(0, ...all.map((p) => p.worstTrackingError));
  let worstIntegralError: number | null = null;
  if (input.integral) {
    worstIntegralError = 0;
    for (const p of all) for (const o of [p.minus, p.plus]) if (o) worstIntegralError = Math.max(worstIntegralError, o.integralError ?? Infinity);
  }

  // Stability over the box.
  const { method, points } = boxPoints(input.nominal, input.percent, input.maxVertexParameters, input.samples);
  let allStable = true;
  let integralAllStable: boolean | null = input.integral ? true : null;
  let worstPole: Complex | null = null;
  let worstPoint: number[] | null = null;
  let rebuildFailures = 0;
  let certified = 0;
  for (const point of points) {
    const plant = input.rebuild(point);
    if (!plant) {
      rebuildFailures += 1;
      continue;
    }
    const loop = prescalerLoop(plant, input.K, input.N, input.trackedOutputs);
    if (certificate && certifiesStability(certificate, loop.A, input.domain)) {
      certified += 1;
    } else {
      const check = isStable(loop.A, input.domain);
      if (!check.stable) allStable = false;
      if (check.worst && (!worstPole || stabilityMeasure(check.worst, input.domain) > stabilityMeasure(worstPole, input.domain))) {
        worstPole = check.worst;
        worstPoint = point;
      }
    }
    if (input.integral) {
      const iLoop = integralLoop(plant, input.integral.Kx, input.integral.Ki, input.integral.outputs, input.domain, input.samplePeriod);
      if (!isStable(iLoop.A, input.domain).stable) integralAllStable = false;
    }
  }
  return {
    percent: input.percent,
    nominal,
    parameters,
    inputScale,
    worstParameters,
    worstTrackingError,
    worstIntegralError,
    box: { method, points: points.length, allStable, integralAllStable, worstPole, worstPoint, rebuildFailures, certified },
  };
}
