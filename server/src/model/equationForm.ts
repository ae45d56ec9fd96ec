// Equation form: one `x' = f(x, u, w)` per state and one `output y = g(x, u, w)` per output.
// Every equation is evaluated on dual numbers at the operating point (zero without `around`),
// so A = ∂f/∂x, B = ∂f/∂u, E = ∂f/∂w, C = ∂g/∂x, D = ∂g/∂u, F = ∂g/∂w are exact (no finite
// differences); linear and affine equations give their coefficients exactly.
import { SingularValueDecomposition, Matrix } from 'ml-matrix';
import type { OperatingPointDecl, OutputEquation, PlantDecl, StateEquation } from '../../../grammar/src/ast';
import {
  aroundDefaultInput,
  aroundMissingState,
  duplicateDefinition,
  inferredSignals,
  missingEquation,
  needsOperatingPoint,
  notEquilibrium,
  unknownName,
} from './diagnostics/index';
import type { Dual } from './dual';
import { DualEvaluator, compileReal, countOperations, type DualScope } from './dualEvaluate';
import { realEntry, zeros } from './matrixSource';
import { suggestName } from './names';
import { parameterScope, type ParameterTable } from './parameters';
import { addImpliedSignal, roleArticle, type SignalTable } from './signals';
import type { Diagnostic, MatrixSource, NonlinearModel, OperatingPoint, Range, Rows } from './types';

export interface EquationFormResult {
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
  E: Rows;
  F: Rows;
  equationRanges: { states: Range[]; outputs: Range[] };
  /** Per matrix: each row points at its equation (state equations for A, B, E; output equations for C, D). */
  sources: Partial<Record<'A' | 'B' | 'C' | 'D' | 'E', MatrixSource>>;
  operatingPoint?: OperatingPoint;
  nonlinear?: NonlinearModel;
  linearised: boolean;
}

/** Rounding allowance per operation when deciding whether a drift is zero (common practice: a few ε per operation). */
const roundingPerOperation = 8;

export function buildEquationForm(
  plant: PlantDecl,
  stateEquations: StateEquation[],
  outputEquations: OutputEquation[],
  around: OperatingPointDecl | undefined,
  signals: SignalTable,
  parameters: ParameterTable,
  out: Diagnostic[],
): EquationFormResult {
  const errorsBefore = countErrors(out);
  // States and outputs may be inferred from the equations when not declared.
  if (!signals.declared.state) {
    const names: string[] = [];
    for (const eq of stateEquations) {
      if (!signals.byName.has(eq.state.name)) {
        addImpliedSignal(signals, 'state', eq.state.name, eq.state.range);
        names.push(eq.state.name);
      }
    }
    if (names.length > 0) out.push(inferredSignals.create(plant.name.range, [`no ${'`'}states${'`'} line: the states are ${names.join(', ')}, in the order of their equations`]));
  }
  if (!signals.declared.output) {
    const names: string[] = [];
    for (const eq of outputEquations) {
      if (!signals.byName.has(eq.output.name)) {
        addImpliedSignal(signals, 'output', eq.output.name, eq.output.range);
        names.push(eq.output.name);
      }
    }
    if (names.length > 0) out.push(inferredSignals.create(plant.name.range, [`no ${'`'}outputs${'`'} line: the outputs are ${names.join(', ')}`]));
  }

  const n = signals.states.length;
  const m = signals.inputs.length;
  const d = signals.disturbances.length;

  const stateEq = assign(stateEquations.map((eq) => ({ id: eq.state, eq })), 'state', signals, out, (name) => `the equation ${'`'}${name}'${'`'}`);
  const outputEq = assign(outputEquations.map((eq) => ({ id: eq.output, eq })), 'output', signals, out, (name) => `the equation for output ${'`'}${name}${'`'}`);

  let identityOutputs = false;
  if (!signals.declared.output && signals.outputs.length === 0 && n > 0) {
    identityOutputs = true;
    for (const state of [...signals.states]) addImpliedSignal(signals, 'output', `y_${state.name}`, plant.name.range);
    out.push(
      inferredSignals.create(plant.name.range, [
        `no outputs: every state is measured, outputs ${signals.outputs.map((s) => s.name).join(', ')}`,
      ]),
    );
  }
  const p = signals.outputs.length;

  signals.states.forEach((state, i) => {
    if (!stateEq[i]) out.push(missingEquation.create(state.range, [`state ${'`'}${state.name}${'`'} has no equation ${'`'}${state.name}' = …${'`'}`]));
  });
  if (!identityOutputs) {
    signals.outputs.forEach((output, i) => {
      if (!outputEq[i]) out.push(missingEquation.create(output.range, [`output ${'`'}${output.name}${'`'} has no equation ${'`'}output ${output.name} = …${'`'}`]));
    });
  }

  // Operating point.
  const variableIndex = new Map<string, number>();
  signals.states.forEach((s, i) => variableIndex.set(s.name, i));
  signals.inputs.forEach((s, i) => variableIndex.set(s.name, n + i));
  signals.disturbances.forEach((s, i) => variableIndex.set(s.name, n + m + i));
  const point = new Float64Array(n + m + d);
  if (around) readOperatingPoint(around, signals, parameters, variableIndex, point, out);

  const scope: DualScope = { signals, parameters, variableIndex, point };
  const evaluator = new DualEvaluator(scope, out);
  const f: (Dual | null)[] = stateEq.map((eq) => (eq ? evaluator.evaluate(eq.value) : null));
  const g: (Dual | null)[] = outputEq.map((eq) => (eq ? evaluator.evaluate(eq.value) : null));

  const result: EquationFormResult = {
    A: zeros(n, n),
    B: zeros(n, m),
    C: identityOutputs ? zeros(p, n).map((row, i) => row.map((_, j) => (i === j ? 1 : 0))) : zeros(p, n),
    D: zeros(p, m),
    E: zeros(n, d),
    F: zeros(p, d),
    equationRanges: {
      states: signals.states.map((s, i) => stateEq[i]?.range ?? s.range),
      outputs: signals.outputs.map((s, i) => outputEq[i]?.range ?? s.range),
    },
    linearised: evaluator.nonlinearAt !== null,
    sources: {},
  };
  const rowSource = (rows: Range[], cols: number): MatrixSource | undefined =>
    rows.length === 0 ? undefined : { range: rows[0]!, rowRanges: rows, entryRanges: rows.map((r) => new Array<Range>(cols).fill(r)) };
  const stateRows = result.equationRanges.states;
  const outputRows = identityOutputs ? [] : result.equationRanges.outputs;
  for (const [name, rows, cols] of [
    ['A', stateRows, n],
    ['B', stateRows, m],
    ['E', stateRows, d],
    ['C', outputRows, n],
    ['D', outputRows, m],
  ] as const) {
    const source = rowSource([...rows], cols);
    if (source) result.sources[name] = source;
  }
  const slice = (dual: Dual | null, from: number, count: number): number[] =>
    Array.from({ length: count }, (_, j) => dual?.gradient?.[from + j] ?? 0);
  f.forEach((dual, i) => {
    result.A[i] = slice(dual, 0, n);
    result.B[i] = slice(dual, n, m);
    result.E[i] = slice(dual, n + m, d);
  });
  if (!identityOutputs) {
    g.forEach((dual, i) => {
      result.C[i] = slice(dual, 0, n);
      result.D[i] = slice(dual, n, m);
      result.F[i] = slice(dual, n + m, d);
    });
  }

  if (evaluator.nonlinearAt !== null && !around) {
    out.push(
      needsOperatingPoint.create(plant.name.range, [], {
        related: [{ message: 'this makes the model nonlinear', range: evaluator.nonlinearAt }],
        data: { fix: 'add-operating-point' },
      }),
    );
  }
  if (countErrors(out) > errorsBefore) return result;

  // Drift and equilibrium: |f_i| against the rounding expected from its terms.
  const drift = f.map((dual) => dual?.value ?? 0);
  const tolerance = f.map((dual, i) => roundingPerOperation * countOperations(stateEq[i]!.value) * Number.EPSILON * (dual?.magnitude ?? 0));
  const isEquilibrium = drift.every((value, i) => Math.abs(value) <= tolerance[i]!);
  if (!around && isEquilibrium && evaluator.nonlinearAt === null) return result; // purely linear

  const compiledF = stateEq.map((eq) => compileReal(eq!.value, scope));
  const compiledG = outputEq.map((eq) => (eq ? compileReal(eq.value, scope) : null));
  const pack = (x: number[], u: number[], w: number[]): Float64Array => {
    const v = new Float64Array(n + m + d);
    for (let i = 0; i < n; i++) v[i] = x[i] ?? Number.NaN;
    for (let i = 0; i < m; i++) v[n + i] = u[i] ?? 0;
    for (let i = 0; i < d; i++) v[n + m + i] = w[i] ?? 0;
    return v;
  };
  result.nonlinear = {
    derivatives: (x, u, w) => {
      const v = pack(x, u, w);
      return compiledF.map((fn) => fn(v));
    },
    outputs: (x, u, w) => {
      const v = pack(x, u, w);
      return identityOutputs ? x.slice(0, n) : compiledG.map((fn) => (fn ? fn(v) : Number.NaN));
    },
  };

  const x0 = Array.from(point.subarray(0, n));
  const u0 = Array.from(point.subarray(n, n + m));
  const w0 = Array.from(point.subarray(n + m));
  const holdingInput = isEquilibrium ? null : findHoldingInput(result.B, drift, x0, u0, w0, result.nonlinear, tolerance);
  const range = around?.range ?? plant.name.range;
  result.operatingPoint = {
    states: x0,
    inputs: u0,
    disturbances: w0,
    outputs: result.nonlinear.outputs(x0, u0, w0),
    drift,
    isEquilibrium,
    holdingInput,
    range,
  };
  if (!isEquilibrium) {
    const residual: Record<string, number> = {};
    const moving = signals.states.filter((_, i) => Math.abs(drift[i]!) > tolerance[i]!);
    for (const state of moving) residual[state.name] = drift[signals.states.indexOf(state)]!;
    const residualText = moving.map((s) => `${s.name}' = ${round(residual[s.name]!)}`).join(', ');
    const where = around ? 'the operating point' : 'zero (no `around`)';
    let advice: string;
    const data: Record<string, unknown> = { residual };
    if (holdingInput) {
      const suggested: Record<string, number> = {};
      signals.inputs.forEach((s, i) => (suggested[s.name] = holdingInput[i]!));
      advice = `; ${signals.inputs.map((s, i) => `${s.name} = ${round(holdingInput[i]!)}`).join(', ')} would hold it`;
      data.fix = 'hold-with-input';
      data.suggested = suggested;
      data.inputs = holdingInput;
    } else {
      advice = m === 0 ? '; the plant has no input to hold it' : '; no input can hold it there';
    }
    out.push(notEquilibrium.create(range, [`${where} is not an equilibrium: ${residualText} there${advice}`], { data }));
  }
  return result;
}

function countErrors(out: Diagnostic[]): number {
  return out.reduce((count, d) => count + (d.severity === 'error' ? 1 : 0), 0);
}

function round(x: number): string {
  return String(Number(x.toPrecision(6)));
}

/** Maps each equation to its signal; unknown names and duplicates are reported. */
function assign<T extends { range: Range; value: import('../../../grammar/src/ast').Expr }>(
  items: { id: { name: string; range: Range }; eq: T }[],
  role: 'state' | 'output',
  signals: SignalTable,
  out: Diagnostic[],
  describe: (name: string) => string,
): (T | undefined)[] {
  const list = role === 'state' ? signals.states : signals.outputs;
  const result: (T | undefined)[] = new Array(list.length).fill(undefined);
  for (const { id, eq } of items) {
    const signal = signals.byName.get(id.name);
    if (!signal || signal.role !== role) {
      const suggestion = suggestName(id.name, list.map((s) => s.name));
      out.push(
        unknownName.create(id.range, [id.name, role, suggestion], {
          related: signal ? [{ message: `${id.name} is ${roleArticle[signal.role]}`, range: signal.range }] : undefined,
          data: suggestion ? { fix: 'rename', replacement: suggestion } : undefined,
        }),
      );
      continue;
    }
    const first = result[signal.index];
    if (first) {
      out.push(duplicateDefinition.create(eq.range, [describe(id.name)], { related: [{ message: 'first defined here', range: first.range }] }));
      continue;
    }
    result[signal.index] = eq;
  }
  return result;
}

function readOperatingPoint(
  around: OperatingPointDecl,
  signals: SignalTable,
  parameters: ParameterTable,
  variableIndex: Map<string, number>,
  point: Float64Array,
  out: Diagnostic[],
): void {
  const scope = parameterScope(parameters, signals, 'an operating-point value');
  const given = new Map<string, Range>();
  for (const item of around.assignments) {
    const name = item.name.name;
    const index = variableIndex.get(name);
    if (index === undefined) {
      const signal = signals.byName.get(name);
      const suggestion = suggestName(name, variableIndex.keys());
      out.push(
        unknownName.create(item.name.range, [name, 'state, input or disturbance', suggestion], {
          related: signal ? [{ message: `${name} is ${roleArticle[signal.role]}: it follows from the states and inputs`, range: signal.range }] : undefined,
          data: suggestion ? { fix: 'rename', replacement: suggestion } : undefined,
        }),
      );
      continue;
    }
    const first = given.get(name);
    if (first) {
      out.push(duplicateDefinition.create(item.range, [`the operating-point value of ${'`'}${name}${'`'}`], { related: [{ message: 'first given here', range: first }] }));
      continue;
    }
    given.set(name, item.range);
    const value = realEntry(item.value, scope, out);
    if (value !== null) point[index] = value;
  }
  const missingStates = signals.states.filter((s) => !given.has(s.name)).map((s) => s.name);
  if (missingStates.length > 0) out.push(aroundMissingState.create(around.range, [missingStates], { data: { fix: 'add-operating-point-values', names: missingStates } }));
  const missingInputs = signals.inputs.filter((s) => !given.has(s.name)).map((s) => s.name);
  if (missingInputs.length > 0) out.push(aroundDefaultInput.create(around.range, [missingInputs, missingInputs.length === 1 ? 'input' : 'inputs']));
  const missingDisturbances = signals.disturbances.filter((s) => !given.has(s.name)).map((s) => s.name);
  if (missingDisturbances.length > 0) {
    out.push(aroundDefaultInput.create(around.range, [missingDisturbances, missingDisturbances.length === 1 ? 'disturbance' : 'disturbances']));
  }
}

/**
 * The input that would make x0 an equilibrium: least squares on B·Δu = −f (SVD, which also
 * handles a rank-deficient B), accepted only when the nonlinear drift at (x0, u0 + Δu) is
 * zero within the same rounding tolerance as the equilibrium test.
 */
function findHoldingInput(
  B: Rows,
  drift: number[],
  x0: number[],
  u0: number[],
  w0: number[],
  model: NonlinearModel,
  tolerance: number[],
): number[] | null {
  const m = u0.length;
  if (m === 0 || B.length === 0) return null;
  const svd = new SingularValueDecomposition(new Matrix(B), { autoTranspose: true });
  const delta = svd.solve(Matrix.columnVector(drift.map((x) => -x))).to1DArray();
  const candidate = u0.map((u, i) => u + delta[i]!);
  if (!candidate.every(Number.isFinite)) return null;
  const residual = model.derivatives(x0, candidate, w0);
  // The trial point changes the term sizes slightly; allow the tolerance of both points.
  const ok = residual.every((r, i) => Math.abs(r) <= 2 * tolerance[i]! + 8 * Number.EPSILON * Math.abs(drift[i]!));
  return ok ? candidate : null;
}
