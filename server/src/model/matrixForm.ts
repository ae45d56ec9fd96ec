// Matrix form: A (n×n), B (n×m), C (p×n), D (p×m, zero when absent), E (n×d, zero when
// absent; only with `disturbances`). Dimensions come from the declared signals; when a
// signal list is not declared it is inferred from the matrices and named x1…, u1…, y1….
import type { MatrixAssign, PlantDecl } from '../../../grammar/src/ast';
import {
  duplicateDefinition,
  inferredSignals,
  matrixShape,
  missingMatrix,
  missingSignals,
  raggedMatrix,
  unknownMatrix,
} from './diagnostics/index';
import { majorityLength } from './evaluate';
import { checkShape, evaluateSourcedMatrix, plural, zeros, type SourcedMatrix } from './matrixSource';
import { parameterScope, type ParameterTable } from './parameters';
import { addImpliedSignal, describeSignals, type SignalRole, type SignalTable } from './signals';
import type { Diagnostic, MatrixSource, Rows } from './types';

type MatrixName = 'A' | 'B' | 'C' | 'D' | 'E';
const matrixNames: MatrixName[] = ['A', 'B', 'C', 'D', 'E'];

export interface MatrixFormResult {
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
  E: Rows;
  F: Rows;
  sources: Partial<Record<MatrixName, MatrixSource>>;
}

export function buildMatrixForm(
  plant: PlantDecl,
  assigns: MatrixAssign[],
  signals: SignalTable,
  parameters: ParameterTable,
  out: Diagnostic[],
): MatrixFormResult {
  const given = new Map<MatrixName, MatrixAssign>();
  for (const assign of assigns) {
    const name = assign.name.name as MatrixName;
    if (!matrixNames.includes(name)) {
      out.push(unknownMatrix.create(assign.name.range, [assign.name.name]));
      continue;
    }
    const first = given.get(name);
    if (first) {
      out.push(
        duplicateDefinition.create(assign.name.range, [`${'`'}${name}${'`'}`], {
          related: [{ message: `${name} is first defined here`, range: first.name.range }],
        }),
      );
      continue;
    }
    given.set(name, assign);
  }

  const scope = parameterScope(parameters, signals, 'a matrix entry');
  const evaluated = new Map<MatrixName, SourcedMatrix>();
  for (const [name, assign] of given) {
    const matrix = evaluateSourcedMatrix(assign.value, scope, out);
    if (matrix) evaluated.set(name, matrix);
  }

  // Dimensions: declared signals first, otherwise inferred from the matrices.
  const infer = (role: SignalRole, prefix: string, count: number, noun: string): void => {
    if (signals.declared[role] || count === 0) return;
    for (let i = 1; i <= count; i++) addImpliedSignal(signals, role, `${prefix}${i}`, plant.name.range);
    const names = Array.from({ length: count }, (_, i) => `${prefix}${i + 1}`);
    out.push(inferredSignals.create(plant.name.range, [`no ${'`'}${noun}${'`'} declared: ${names.length === 1 ? 'it is' : 'they are'} called ${names.join(', ')}`]));
  };
  const A = evaluated.get('A');
  const B = evaluated.get('B');
  const Cm = evaluated.get('C');
  infer('state', 'x', A ? A.rows.length : (B?.rows.length ?? 0), 'states');
  infer('input', 'u', B ? majorityLength(B.rows.map((r) => r.length)) : 0, 'inputs');
  const n = signals.states.length;
  let identityOutputs = false;
  if (!given.has('C') && !signals.declared.output && n > 0) {
    identityOutputs = true;
    for (let i = 1; i <= n; i++) addImpliedSignal(signals, 'output', `y${i}`, plant.name.range);
    out.push(
      inferredSignals.create(plant.name.range, [
        `no ${'`'}C${'`'} and no ${'`'}outputs${'`'}: every state is measured (C = identity), outputs ${signals.outputs.map((s) => s.name).join(', ')}`,
      ]),
    );
  } else {
    infer('output', 'y', Cm ? Cm.rows.length : 0, 'outputs');
  }
  const m = signals.inputs.length;
  const p = signals.outputs.length;
  const d = signals.disturbances.length;

  const statesText = describeSignals(signals.states, 'state', 'states');
  const inputsText = describeSignals(signals.inputs, 'input', 'inputs');
  const outputsText = describeSignals(signals.outputs, 'output', 'outputs');
  const disturbancesText = describeSignals(signals.disturbances, 'disturbance', 'disturbances');
  const reasons: Record<SignalRole, { text: string; declared: boolean }> = {
    state: { text: statesText, declared: signals.declared.state },
    input: { text: inputsText, declared: signals.declared.input },
    output: { text: outputsText, declared: signals.declared.output },
    disturbance: { text: disturbancesText, declared: signals.declared.disturbance },
  };
  const layout: Record<MatrixName, [SignalRole, SignalRole, number, number]> = {
    A: ['state', 'state', n, n],
    B: ['state', 'input', n, m],
    C: ['output', 'state', p, n],
    D: ['output', 'input', p, m],
    E: ['state', 'disturbance', n, d],
  };

  const sources: Partial<Record<MatrixName, MatrixSource>> = {};
  const result: Record<MatrixName, Rows> = { A: zeros(n, n), B: zeros(n, m), C: zeros(p, n), D: zeros(p, m), E: zeros(n, d) };
  if (identityOutputs) result.C = result.C.map((row, i) => row.map((_, j) => (i === j ? 1 : 0)));

  for (const name of matrixNames) {
    const [rowRole, colRole, rows, cols] = layout[name];
    const matrix = evaluated.get(name);
    const assign = given.get(name);
    if (name === 'E' && assign && !signals.declared.disturbance) {
      out.push(missingSignals.create(assign.name.range, ['E is the disturbance input matrix, but the plant declares no `disturbances`']));
      continue;
    }
    if (!matrix) continue;
    sources[name] = matrix.source;
    const rowReason = reasons[rowRole];
    const colReason = reasons[colRole];
    const shapeOk = checkShape(
      matrix,
      {
        name,
        rows,
        cols,
        rowReason: rowReason.declared ? `the plant declares ${rowReason.text}` : `there are ${rowReason.text}`,
        colReason: colReason.declared ? `the plant declares ${colReason.text}` : `the other rows have ${cols}`,
        makeDiagnostic: (range, message, data) =>
          colReason.declared || !message.includes('entr') ? matrixShape.create(range, [message], { data }) : raggedMatrix.create(range, [message], { data }),
      },
      out,
    );
    if (shapeOk) result[name] = zeroWhereMissing(matrix.rows);
  }

  const need = (name: MatrixName, shape: string): void => {
    if (!given.has(name)) out.push(missingMatrix.create(plant.name.range, [name, shape]));
  };
  need('A', `${plural(n, 'state')} × ${plural(n, 'state')}`);
  need('B', `${plural(n, 'state')} × ${plural(m, 'input')}`);
  if (signals.declared.output) need('C', `${plural(p, 'output')} × ${plural(n, 'state')}`);

  return { ...result, F: zeros(p, d), sources };
}

/** The entries with 0 where one had an error (already reported), in place: the rows are this call's own. */
function zeroWhereMissing(rows: (number | null)[][]): number[][] {
  for (const row of rows) for (let j = 0; j < row.length; j++) if (row[j] === null) row[j] = 0;
  return rows as number[][];
}
