// The checked model: what the model layer hands to the control engine. Plain records only.
// Matrices are arrays of rows of finite numbers; every element that came from the text keeps
// the range it came from, so later stages can point diagnostics at the cause.
import type { Range } from '../../../grammar/src/ast';

export type { Range, Position } from '../../../grammar/src/ast';

export type Severity = 'error' | 'warning' | 'info';

export interface RelatedInformation {
  message: string;
  range: Range;
}

/**
 * One finding. `code` is stable (documented in docs/diagnostics.md); `message` is one line in
 * the engineer's words; `range` is exactly the text responsible; `data.fix` names a quick fix.
 */
export interface Diagnostic {
  severity: Severity;
  code: string;
  message: string;
  range: Range;
  related?: RelatedInformation[];
  data?: { fix?: string; [key: string]: unknown };
}

export interface Complex {
  re: number;
  im: number;
}

export type Rows = number[][];

/** A declared signal (state, input, output, disturbance) and where it was declared. */
export interface Signal {
  name: string;
  range: Range;
}

/** Where each matrix, row and entry of the model came from (matrix form), for diagnostics. */
export interface MatrixSource {
  range: Range;
  rowRanges: Range[];
  entryRanges: Range[][];
}

export interface ParameterValue {
  name: string;
  value: number;
  range: Range; // the declaration's name
  valueRange: Range; // the expression
}

/** Linearisation about an operating point (equation form with `around`, or affine equations). */
export interface OperatingPoint {
  states: number[]; // x0, physical values
  inputs: number[]; // u0
  disturbances: number[]; // w0 (zero unless given)
  outputs: number[]; // y0 = g(x0, u0, w0)
  drift: number[]; // f(x0, u0, w0): zero at an equilibrium
  isEquilibrium: boolean; // drift below a tolerance scaled to the magnitude of the terms
  /** An input that would hold x0 (least squares on B u = -(f - B u0)), when one exists. */
  holdingInput: number[] | null;
  range: Range; // the `around` line (or the plant name when implied)
}

/**
 * The nonlinear right-hand side for simulation of linearised models. Pure functions of
 * physical values; they never throw (non-finite results are reported by the caller).
 */
export interface NonlinearModel {
  derivatives(x: number[], u: number[], w: number[]): number[];
  outputs(x: number[], u: number[], w: number[]): number[];
}

export interface CheckedPlant {
  name: string;
  nameRange: Range;
  range: Range;
  form: 'matrix' | 'equations' | 'transfer';
  states: Signal[];
  inputs: Signal[];
  outputs: Signal[];
  disturbances: Signal[];
  /** Real scalar parameters that evaluated (matrix-valued and complex parameters are not listed). */
  parameters: ParameterValue[];
  /** The linear model actually analysed (deviation variables when `operatingPoint` is set). */
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
  /** Disturbance input matrix (n × number of disturbances); empty columns when none. */
  E: Rows;
  /** Output feedthrough of disturbances (p × number of disturbances). */
  F: Rows;
  /** Source ranges per matrix (matrix form); for equation form, the equation of each row. */
  sources: Partial<Record<'A' | 'B' | 'C' | 'D' | 'E' | 'transfer', MatrixSource>>;
  /** Range of the equation defining each state derivative / output (equation form). */
  equationRanges?: { states: Range[]; outputs: Range[] };
  operatingPoint?: OperatingPoint;
  nonlinear?: NonlinearModel;
  /** True when the equations were nonlinear (linearised about the operating point). */
  linearised: boolean;
  /** False when errors leave the model unusable; analyses skip it. */
  usable: boolean;
}

export interface PoleSpec {
  values: Complex[];
  range: Range;
  entryRanges: Range[];
}

export interface CheckedController {
  name: string;
  nameRange: Range;
  range: Range;
  plantName: string;
  plantRange?: Range;
  /** Index into CheckedDocument.plants, when the plant resolved. */
  plantIndex: number | null;
  poles?: PoleSpec;
  lqr?: { Q: Rows; R: Rows; N?: Rows; range: Range };
  spec?: {
    settling?: { seconds: number; range: Range };
    overshoot?: { percent: number; range: Range };
    rise?: { seconds: number; range: Range };
    range: Range;
  };
  track?: { outputs: number[]; ranges: Range[]; range: Range };
  integral?: { outputs: number[]; ranges: Range[]; poles?: PoleSpec; range: Range };
  observer?:
    | { kind: 'poles'; poles: PoleSpec; form: 'predictor' | 'current'; range: Range }
    | {
        kind: 'noise';
        W: Rows;
        V: Rows;
        form: 'predictor' | 'current';
        range: Range;
        /**
         * Where the process noise W enters: through E (W is d×d) when the plant declares
         * disturbances, otherwise on every state directly (W is n×n).
         */
        enters?: 'states' | 'disturbances';
      };
  sample?: { period: number; range: Range };
  delay?: { samples: number; range: Range };
  limits: { input: number; low: number; high: number; range: Range }[];
  /** `step` lines: physical set-point values (the caller subtracts y0 for linearised plants). */
  steps: { output: number; value: number; range: Range }[];
  usable: boolean;
}

export interface CheckedDocument {
  plants: CheckedPlant[];
  controllers: CheckedController[];
  diagnostics: Diagnostic[];
}
