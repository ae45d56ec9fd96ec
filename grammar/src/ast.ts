// Typed syntax tree of a `.plant` document. Every node carries its exact source range
// (0-based line, character in UTF-16 code units, as in the editor protocol) and offsets.
// The parser never throws: it returns a tree (with `ErrorExpr` / missing parts where the
// text was broken) plus syntax diagnostics.

export interface Position {
  line: number;
  character: number;
}

export interface Range {
  start: Position;
  end: Position;
}

/** Every node has a range and the character offsets it spans in the source text. */
export interface Node {
  range: Range;
  startOffset: number;
  endOffset: number;
}

/**
 * A name as written, with its own range (for go-to-definition, rename, diagnostics).
 * When the parser expected a name and found none, `name` is '' and the range is zero-width at
 * the spot; a syntax diagnostic (code `syntax/missing-name`) covers it.
 */
export interface Identifier extends Node {
  kind: 'identifier';
  name: string;
}

// ---------------------------------------------------------------- expressions

export type Expr =
  | NumberExpr
  | NameExpr
  | UnaryExpr
  | BinaryExpr
  | CallExpr
  | MatrixExpr
  | ErrorExpr;

/**
 * A numeric literal. `imaginary` is true for `3j` / `2.5i`. `unit` is the unit suffix that
 * follows the number (`5 ms`, `200 Hz`, `5 %`), with its own range; absent when none.
 */
export interface NumberExpr extends Node {
  kind: 'number';
  value: number;
  imaginary: boolean;
  text: string;
  unit?: Identifier;
}

/** A reference to a parameter, state, input, output, disturbance, or `pi` / the Laplace `s`. */
export interface NameExpr extends Node {
  kind: 'name';
  name: string;
}

export interface UnaryExpr extends Node {
  kind: 'unary';
  op: '-' | '+';
  operand: Expr;
}

export interface BinaryExpr extends Node {
  kind: 'binary';
  op: '+' | '-' | '*' | '/' | '^';
  left: Expr;
  right: Expr;
}

export interface CallExpr extends Node {
  kind: 'call';
  callee: Identifier;
  args: Expr[];
}

/** `[a, b; c, d]`: rows separated by `;` or newlines, entries by `,`. */
export interface MatrixExpr extends Node {
  kind: 'matrix';
  rows: MatrixRow[];
  /**
   * Present on a large all-number matrix read in one piece (grammar/src/plainMatrix.ts): its
   * values row by row, so the model need not walk `rows` (built on first read). Not
   * enumerable: the tree reads and compares the same with or without it.
   */
  readonly plain?: PlainMatrixEntries;
}

/**
 * The entries of a folded matrix: real values row by row, and each row's length; an entry that
 * is an expression (`-k - h`) has NaN there and its tree in `expressions` (by entry index).
 */
export interface PlainMatrixEntries {
  values: Float64Array;
  rowLengths: Int32Array;
  expressions: ReadonlyMap<number, Expr>;
}

export interface MatrixRow extends Node {
  kind: 'row';
  entries: Expr[];
}

/** Stands where the parser could not read an expression; a syntax diagnostic covers it. */
export interface ErrorExpr extends Node {
  kind: 'error';
}

// ---------------------------------------------------------------- plant

export type PlantItem =
  | ParamDecl
  | SignalDecl
  | MatrixAssign
  | StateEquation
  | OutputEquation
  | TransferDecl
  | OperatingPointDecl;

export interface ParamDecl extends Node {
  kind: 'param';
  name: Identifier;
  value: Expr;
}

/** `states a, b` / `inputs u` / `outputs y` / `disturbances w`. */
export interface SignalDecl extends Node {
  kind: 'signals';
  role: 'states' | 'inputs' | 'outputs' | 'disturbances';
  keyword: Node;
  names: Identifier[];
}

/** `A = [...]` (also B, C, D, and E for the disturbance input matrix). Any other name is a model error. */
export interface MatrixAssign extends Node {
  kind: 'matrixAssign';
  name: Identifier;
  value: Expr;
}

/** `theta' = omega`: the derivative of a declared state. */
export interface StateEquation extends Node {
  kind: 'stateEquation';
  state: Identifier;
  value: Expr;
}

/** `output height = r*theta`: a declared output defined by an expression. */
export interface OutputEquation extends Node {
  kind: 'outputEquation';
  output: Identifier;
  value: Expr;
}

/** `transfer = (0.5*s + 2) / (s^3 + 4*s^2 + 5*s + 2)`; `s` is the Laplace variable here. */
export interface TransferDecl extends Node {
  kind: 'transfer';
  value: Expr;
}

/** `around theta = 0.1, omega = 0, current = 0`: the operating point for linearisation. */
export interface OperatingPointDecl extends Node {
  kind: 'around';
  assignments: NamedValue[];
}

export interface NamedValue extends Node {
  kind: 'namedValue';
  name: Identifier;
  value: Expr;
}

export interface PlantDecl extends Node {
  kind: 'plant';
  name: Identifier;
  items: PlantItem[];
}

// ---------------------------------------------------------------- controller

export type ControllerItem =
  | PolesLine
  | LqrLine
  | SpecLine
  | TrackLine
  | IntegralLine
  | ObserverLine
  | SampleLine
  | DelayLine
  | LimitLine
  | StepLine;

/** `poles = [-4 + 3j, -4 - 3j]` */
export interface PolesLine extends Node {
  kind: 'poles';
  value: Expr;
}

/** `lqr Q = ..., R = ...` (optionally `N = ...`, the state-input cross weight). */
export interface LqrLine extends Node {
  kind: 'lqr';
  weights: NamedValue[];
}

/** `spec settling <= 1.5 s, overshoot <= 5 %` (also `rise <= ...`). */
export interface SpecLine extends Node {
  kind: 'spec';
  items: SpecItem[];
}

export interface SpecItem extends Node {
  kind: 'specItem';
  name: Identifier; // settling | overshoot | rise (checked by the model)
  op: '<=' | '<';
  value: Expr;
}

/** `track height[, other]` */
export interface TrackLine extends Node {
  kind: 'track';
  outputs: Identifier[];
}

/** `integral height[, other] [pole p]` — p a number or a matrix of poles, one per integrator. */
export interface IntegralLine extends Node {
  kind: 'integral';
  outputs: Identifier[];
  pole?: Expr;
}

/**
 * `observer poles = [...]` or `observer noise W = ..., V = ...`, optionally followed by
 * `current` or `predictor` (the discrete estimator form; predictor when absent).
 */
export interface ObserverLine extends Node {
  kind: 'observer';
  poles?: Expr;
  noise?: NamedValue[];
  form?: Identifier;
}

/** `sample 5 ms` or `sample 200 Hz` */
export interface SampleLine extends Node {
  kind: 'sample';
  value: Expr;
}

/** `delay 1 sample`: a computation delay of whole sample periods (adds m states). */
export interface DelayLine extends Node {
  kind: 'delay';
  value: Expr;
}

/** `limit current in [lo, hi]` */
export interface LimitLine extends Node {
  kind: 'limit';
  input: Identifier;
  low: Expr;
  high: Expr;
}

/** `step height to 0.5` (physical value for a linearised plant). */
export interface StepLine extends Node {
  kind: 'step';
  output: Identifier;
  value: Expr;
}

export interface ControllerDecl extends Node {
  kind: 'controller';
  name: Identifier;
  plant?: Identifier; // absent when `for <plant>` is missing (a syntax diagnostic says so)
  items: ControllerItem[];
}

// ---------------------------------------------------------------- document

export interface DocumentNode extends Node {
  kind: 'document';
  declarations: (PlantDecl | ControllerDecl)[];
}

export interface SyntaxDiagnostic {
  severity: 'error' | 'warning';
  code: string; // stable code, e.g. "syntax/unexpected-token"
  message: string;
  range: Range;
}

export interface ParseResult {
  document: DocumentNode;
  diagnostics: SyntaxDiagnostic[];
}
