// The report records every face reads (hover, lens, CLI, JSON, report, export); keep field
// names stable (docs/json-output.md). Produced by plantReport.ts and controllerDesign.ts.
import type { Complex, Diagnostic, Rows } from '../model/types';

export type Stability = 'stable' | 'marginal' | 'unstable';

export interface ModeReport {
  value: Complex;
  naturalFrequency: number; // rad/s
  dampingRatio: number;
  timeConstant: number | null; // s; null when the mode does not decay or grow (|Re| ≈ 0)
  stability: Stability;
}

export interface TransferFunctionReport {
  input: string;
  output: string;
  numerator: number[]; // highest power of s first
  denominator: number[];
  zeros: Complex[];
  poles: Complex[];
}

export interface PlantReport {
  name: string;
  analysed: boolean;
  diagnostics: Diagnostic[];
  eigenvalues: Complex[];
  modes: ModeReport[];
  stability: Stability | null;
  controllable: boolean | null;
  observable: boolean | null;
  stabilisable: boolean | null;
  detectable: boolean | null;
  uncontrollableModes: { value: Complex; stable: boolean }[];
  unobservableModes: { value: Complex; stable: boolean }[];
  /** Distance-like margins: σ_min([A − λI, B]) / ‖[A B]‖ minimised over the eigenvalues. */
  controllabilityMargin: number | null;
  observabilityMargin: number | null;
  transferFunctions: TransferFunctionReport[];
  invariantZeros: Complex[] | null;
}

export interface StepMetricsReport {
  output: string;
  setpoint: number;
  finalValue: number | null;
  riseTime: number | null; // s, 10–90 %
  settlingTime: number | null; // s, 2 %
  overshootPercent: number | null;
  undershootPercent: number | null;
  steadyStateError: number | null;
  /** Per input: `value` the largest excursion from u0 (physical), `min`/`max` the physical range reached. */
  peakInput: { input: string; value: number; min: number; max: number; limit: [number, number] | null }[];
}

export interface StepResponseReport {
  /** The set-point that was stepped (one tracked output at a time). */
  steppedOutput: string;
  time: number[];
  outputs: { name: string; values: number[] }[];
  inputs: { name: string; values: number[]; limit: [number, number] | null }[];
  saturated?: { outputs: { name: string; values: number[] }[]; inputs: { name: string; values: number[] }[] };
  antiWindup?: { outputs: { name: string; values: number[] }[]; inputs: { name: string; values: number[] }[] };
  nonlinear?: { outputs: { name: string; values: number[] }[]; inputs: { name: string; values: number[] }[] };
  metrics: StepMetricsReport;
}

/**
 * Everything controller code needs, in one record (read by the C/JSON export and the report).
 * Control law, in physical units (x0, u0, y0 are zero for plants that were not linearised):
 *   u = u0 − K(x̂ − x0) − Ki·ξ + N(r − y0),   ξ[k+1] = ξ[k] + T(r − y)   (ξ' = r − y in continuous time)
 * Estimator, predictor form: x̂[k+1] = Φx̂[k] + Γ(u[k] − u0) + L(y[k] − y0 − C x̂[k] − D(u[k] − u0)), with x̂ in
 * deviation variables; current form: x̄ predicted as above with gain 0, then x̂[k] = x̄[k] + L(y[k] − y0 − C x̄[k]).
 */
export interface ImplementationReport {
  domain: 'continuous' | 'discrete';
  samplePeriod: number | null;
  states: string[];
  inputs: string[];
  outputs: string[];
  trackedOutputs: string[];
  integratedOutputs: string[];
  K: Rows;
  Ki: Rows | null;
  N: Rows | null;
  Nx: Rows | null;
  Nu: Rows | null;
  observer: { form: 'predictor' | 'current'; L: Rows; Phi: Rows; Gamma: Rows; C: Rows; D: Rows } | null;
  x0: number[];
  u0: number[];
  y0: number[];
}

export interface ControllerReport {
  name: string;
  plant: string;
  designed: boolean;
  diagnostics: Diagnostic[];
  method: 'poles' | 'lqr' | 'spec' | null;
  domain: 'continuous' | 'discrete';
  samplePeriod: number | null;
  /** State-feedback gain (inputs × states), u = −K x (+ …). */
  K: Rows | null;
  /** Integral gain (inputs × integrators), u = −Kx·x − Ki·ξ, ξ' = r − y. */
  Ki: Rows | null;
  /** All closed-loop poles (n, or n + integrators); s for continuous, z for discrete. */
  closedLoopPoles: Complex[];
  trackedOutputs: string[];
  dcGain: Rows | null;
  prescaler: Rows | null;
  Nx: Rows | null;
  Nu: Rows | null;
  details: Record<string, unknown>;
  step: StepResponseReport[];
  implementation: ImplementationReport | null;
}

