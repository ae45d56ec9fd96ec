// Controller lines: design (poles / lqr / spec), tracking, integral action, observer, sample,
// delay, limits and steps, resolved against the controller's plant. Values may use the
// plant's parameters.
import type { ControllerDecl, ControllerItem, Expr, Identifier, NamedValue } from '../../../grammar/src/ast';
import {
  conflictingDesign,
  delayWithoutSample,
  duplicateDefinition,
  formWithoutSample,
  matrixShape,
  missingWeight,
  noDesign,
  notSymmetric,
  outOfRange,
  poleCount,
  unknownName,
  unknownPlant,
  unknownSetting,
  wrongUnit,
} from './diagnostics/index';
import { evaluateSourcedMatrix, checkShape, filled, plural, realEntry } from './matrixSource';
import { suggestName } from './names';
import { parameterScope, type ParameterTable } from './parameters';
import { evaluatePoles } from './poles';
import { readQuantity } from './quantities';
import { describeSignals, roleArticle, type SignalTable } from './signals';
import type { CheckedController, CheckedPlant, Diagnostic, Range, Rows, Signal } from './types';

export interface PlantContext {
  checked: CheckedPlant;
  signals: SignalTable;
  parameters: ParameterTable;
}

const emptyParameters: ParameterTable = new Map();

export function checkController(
  decl: ControllerDecl,
  plants: Map<string, { index: number; context: PlantContext }>,
  out: Diagnostic[],
): CheckedController {
  const errorsBefore = out.filter((d) => d.severity === 'error').length;
  const plantName = decl.plant?.name ?? '';
  const resolved = decl.plant ? plants.get(plantName) : undefined;
  if (decl.plant && !resolved) {
    const suggestion = suggestName(plantName, plants.keys());
    const target = suggestion ? plants.get(suggestion)!.context.checked.nameRange : undefined;
    out.push(
      unknownPlant.create(decl.plant.range, [plantName, suggestion], {
        related: target ? [{ message: `plant ${suggestion} is declared here`, range: target }] : undefined,
        data: suggestion ? { fix: 'rename', replacement: suggestion } : undefined,
      }),
    );
  }
  const context = resolved?.context;
  const plant = context?.checked;
  const scope = parameterScope(context?.parameters ?? emptyParameters, context?.signals, 'a controller value');
  const controller: CheckedController = {
    name: decl.name.name,
    nameRange: decl.name.range,
    range: decl.range,
    plantName,
    plantRange: decl.plant?.range,
    plantIndex: resolved ? resolved.index : null,
    limits: [],
    steps: [],
    usable: false,
  };

  // One line of each kind (limit and step once per signal).
  const lines = new Map<ControllerItem['kind'], ControllerItem>();
  for (const item of decl.items) {
    if (item.kind === 'limit' || item.kind === 'step') continue;
    const first = lines.get(item.kind);
    if (first) {
      out.push(duplicateDefinition.create(item.range, [`the ${'`'}${item.kind}${'`'} line`], { related: [{ message: 'first given here', range: first.range }] }));
      continue;
    }
    lines.set(item.kind, item);
  }
  const line = <K extends ControllerItem['kind']>(kind: K) => lines.get(kind) as Extract<ControllerItem, { kind: K }> | undefined;

  const n = plant?.states.length ?? 0;
  const m = plant?.inputs.length ?? 0;
  const p = plant?.outputs.length ?? 0;
  const d = plant?.disturbances.length ?? 0;

  const resolveSignal = (id: Identifier, list: Signal[], role: 'output' | 'input'): number | null => {
    if (!plant) return null;
    const index = list.findIndex((s) => s.name === id.name);
    if (index >= 0) return index;
    const other = context!.signals.byName.get(id.name);
    const suggestion = suggestName(id.name, list.map((s) => s.name));
    out.push(
      unknownName.create(id.range, [id.name, role, suggestion], {
        related: [
          ...(other ? [{ message: `${id.name} is ${roleArticle[other.role]}`, range: other.range }] : []),
          { message: `the ${role}s of plant ${plant.name} are declared here`, range: (list[0]?.range ?? plant.nameRange) },
        ],
        data: suggestion ? { fix: 'rename', replacement: suggestion } : undefined,
      }),
    );
    return null;
  };
  const resolveOutputs = (ids: Identifier[]): { outputs: number[]; ranges: Range[] } => {
    const outputs: number[] = [];
    const ranges: Range[] = [];
    const seen = new Map<string, Range>();
    for (const id of ids) {
      const first = seen.get(id.name);
      if (first) {
        out.push(duplicateDefinition.create(id.range, [`output ${'`'}${id.name}${'`'} in this line`], { related: [{ message: 'first named here', range: first }] }));
        continue;
      }
      seen.set(id.name, id.range);
      const index = resolveSignal(id, plant?.outputs ?? [], 'output');
      if (index !== null) {
        outputs.push(index);
        ranges.push(id.range);
      }
    }
    return { outputs, ranges };
  };

  // track / integral
  const track = line('track');
  if (track) controller.track = { ...resolveOutputs(track.outputs), range: track.range };
  const integral = line('integral');
  let integrators = 0;
  if (integral) {
    const resolvedOutputs = resolveOutputs(integral.outputs);
    integrators = integral.outputs.length;
    controller.integral = { ...resolvedOutputs, range: integral.range };
    if (integral.pole) {
      const poles = evaluatePoles(integral.pole, { ...scope, place: 'a pole' }, out);
      if (poles) {
        if (poles.values.length !== integrators) {
          out.push(poleCount.create(integral.pole.range, [poles.values.length, integrators, `one per integrated output (${integral.outputs.map((o) => o.name).join(', ')})`]));
        } else controller.integral.poles = poles;
      }
    }
  }
  const integratedNames = integral ? integral.outputs.map((o) => o.name).join(', ') : '';
  const designStates = n + integrators;
  const designReason = () =>
    `the plant has ${describeSignals(plant!.states, 'state', 'states')}` +
    (integrators > 0 ? ` plus ${plural(integrators, 'integrator')} (${integratedNames})` : '');

  // poles / lqr / spec
  const poles = line('poles');
  const lqr = line('lqr');
  const spec = line('spec');
  if (!poles && !lqr && !spec) out.push(noDesign.create(decl.name.range, [decl.name.name], { data: { fix: 'add-design' } }));
  if (poles && lqr) out.push(conflictingDesign.create(lqr.range, [], { related: [{ message: 'poles are given here', range: poles.range }] }));
  if (poles) {
    const spec = evaluatePoles(poles.value, { ...scope, place: 'a pole' }, out);
    if (spec) {
      const expected = integral && !integral.pole ? designStates : n;
      if (plant && spec.values.length !== expected) {
        const why =
          `the plant has ${describeSignals(plant.states, 'state', 'states')}` +
          (integral && !integral.pole ? ` plus ${plural(integrators, 'integrator')} (${integratedNames}) without its own ${'`'}pole${'`'}` : '');
        out.push(poleCount.create(poles.value.range, [spec.values.length, expected, why], { data: { expected, found: spec.values.length } }));
      } else controller.poles = spec;
    }
  }
  if (lqr) controller.lqr = checkLqr(lqr.weights, lqr.range, designStates, m, plant, designReason, scope, out);
  if (spec) controller.spec = checkSpec(spec, scope, out);

  // observer
  const observer = line('observer');
  const sample = line('sample');
  if (sample) {
    const period = readQuantity(sample.value, 'period', 'sample', { ...scope, place: 'a sample period' }, out);
    if (period !== null) controller.sample = { period, range: sample.range };
  }
  if (observer) {
    let form: 'predictor' | 'current' = 'predictor';
    if (observer.form) {
      const name = observer.form.name;
      if (name === 'current' || name === 'predictor') {
        form = name;
        if (!sample) out.push(formWithoutSample.create(observer.form.range, [name]));
      } else {
        out.push(unknownSetting.create(observer.form.range, ['observer', name, '`current` or `predictor`', suggestName(name, ['current', 'predictor'])]));
      }
    }
    if (observer.poles) {
      const poles = evaluatePoles(observer.poles, { ...scope, place: 'a pole' }, out);
      if (poles) {
        if (plant && poles.values.length !== n) {
          out.push(poleCount.create(observer.poles.range, [poles.values.length, n, `the observer estimates ${describeSignals(plant.states, 'state', 'states')}`]));
        } else controller.observer = { kind: 'poles', poles, form, range: observer.range };
      }
    } else if (observer.noise) {
      const noise = checkNoise(observer.noise, observer.range, plant, n, p, d, scope, out);
      if (noise) controller.observer = { kind: 'noise', ...noise, form, range: observer.range };
    }
  }

  // delay
  const delay = line('delay');
  if (delay) {
    if (!sample) out.push(delayWithoutSample.create(delay.range, []));
    const value = delay.value;
    if (value.kind === 'number' && value.unit) {
      out.push(wrongUnit.create(value.unit.range, ['`delay`', 'a whole number of samples', '1 sample']));
    } else {
      const samples = realEntry(value, { ...scope, place: 'a delay' }, out);
      if (samples !== null) {
        if (!Number.isInteger(samples) || samples < 0) {
          out.push(outOfRange.create(value.range, [`the delay must be a whole number of samples ≥ 0, got ${samples}`]));
        } else controller.delay = { samples, range: delay.range };
      }
    }
  }

  // limits and steps
  const limited = new Map<string, Range>();
  for (const item of decl.items) {
    if (item.kind !== 'limit') continue;
    const first = limited.get(item.input.name);
    if (first) {
      out.push(duplicateDefinition.create(item.range, [`the limit on ${'`'}${item.input.name}${'`'}`], { related: [{ message: 'first given here', range: first }] }));
      continue;
    }
    limited.set(item.input.name, item.range);
    const input = resolveSignal(item.input, plant?.inputs ?? [], 'input');
    const limitScope = { ...scope, place: 'an input limit' };
    const low = realEntry(item.low, limitScope, out);
    const high = realEntry(item.high, limitScope, out);
    if (low === null || high === null) continue;
    if (!(low < high)) {
      out.push(outOfRange.create(item.range, [`the low end of a limit must be below the high end, got [${low}, ${high}]`]));
      continue;
    }
    if (input !== null) controller.limits.push({ input, low, high, range: item.range });
  }
  const stepped = new Map<string, Range>();
  for (const item of decl.items) {
    if (item.kind !== 'step') continue;
    const first = stepped.get(item.output.name);
    if (first) {
      out.push(duplicateDefinition.create(item.range, [`the step of ${'`'}${item.output.name}${'`'}`], { related: [{ message: 'first given here', range: first }] }));
      continue;
    }
    stepped.set(item.output.name, item.range);
    const output = resolveSignal(item.output, plant?.outputs ?? [], 'output');
    const value = realEntry(item.value, { ...scope, place: 'a set-point', unitsMeaningful: true }, out);
    if (output !== null && value !== null) controller.steps.push({ output, value, range: item.range });
  }

  const errors = out.filter((x) => x.severity === 'error').length - errorsBefore;
  controller.usable = errors === 0 && !!plant && plant.usable;
  return controller;
}

function namedWeights(
  weights: NamedValue[],
  allowed: string[],
  lineName: string,
  out: Diagnostic[],
): Map<string, NamedValue> {
  const result = new Map<string, NamedValue>();
  for (const weight of weights) {
    const name = weight.name.name;
    if (!allowed.includes(name)) {
      const list = allowed.length === 2 ? `${allowed[0]} and ${allowed[1]}` : `${allowed.slice(0, -1).join(', ')} and ${allowed[allowed.length - 1]}`;
      out.push(unknownSetting.create(weight.name.range, [lineName, name, list, suggestName(name, allowed)]));
      continue;
    }
    const first = result.get(name);
    if (first) {
      out.push(duplicateDefinition.create(weight.range, [`${'`'}${name}${'`'}`], { related: [{ message: 'first given here', range: first.range }] }));
      continue;
    }
    result.set(name, weight);
  }
  return result;
}

/** Weight matrix with shape and (optionally) symmetry checks. */
function weightMatrix(
  weight: NamedValue,
  rows: number,
  cols: number,
  rowReason: string,
  colReason: string,
  symmetric: boolean,
  shapeKnown: boolean,
  scope: ReturnType<typeof parameterScope>,
  out: Diagnostic[],
): Rows | null {
  const name = weight.name.name;
  const before = out.filter((x) => x.severity === 'error').length;
  const matrix = evaluateSourcedMatrix(weight.value, { ...scope, place: 'a weight' }, out);
  if (!matrix) return null;
  if (shapeKnown && !checkShape(matrix, { name, rows, cols, rowReason, colReason, makeDiagnostic: (range, message, data) => matrixShape.create(range, [message], { data }) }, out)) return null;
  if (out.filter((x) => x.severity === 'error').length > before) return null;
  const values = filled(matrix.rows);
  if (symmetric) {
    const size = values.length;
    // A loop, not Math.max(...spread): 10,000 arguments for a 100-state Q cost milliseconds per
    // keystroke, and a few hundred thousand overflow the call stack.
    let largest = 0;
    for (const row of values) for (const value of row) largest = Math.max(largest, Math.abs(value));
    const tolerance = 16 * size * Number.EPSILON * largest;
    for (let i = 0; i < size; i++) {
      for (let j = 0; j < i; j++) {
        const lower = values[i]![j]!;
        const upper = values[j]![i]!;
        if (Math.abs(lower - upper) > tolerance) {
          out.push(
            notSymmetric.create(matrix.source.entryRanges[i]?.[j] ?? matrix.source.range, [`${name} is not symmetric: ${name}(${i + 1},${j + 1}) = ${lower} but ${name}(${j + 1},${i + 1}) = ${upper}`], {
              related: [{ message: `${name}(${j + 1},${i + 1})`, range: matrix.source.entryRanges[j]?.[i] ?? matrix.source.range }],
            }),
          );
          return null;
        }
      }
    }
  }
  return values;
}

function checkLqr(
  weights: NamedValue[],
  range: Range,
  designStates: number,
  m: number,
  plant: CheckedPlant | undefined,
  designReason: () => string,
  scope: ReturnType<typeof parameterScope>,
  out: Diagnostic[],
): CheckedController['lqr'] {
  const given = namedWeights(weights, ['Q', 'R', 'N'], 'lqr', out);
  const known = !!plant;
  const inputsReason = plant ? `the plant has ${describeSignals(plant.inputs, 'input', 'inputs')}` : '';
  const stateText = `${designStates}×${designStates}, weighting the states`;
  const inputText = `${m}×${m}, weighting the inputs`;
  if (!given.has('Q')) out.push(missingWeight.create(range, ['lqr', 'Q', plant ? stateText : 'weighting the states']));
  if (!given.has('R')) out.push(missingWeight.create(range, ['lqr', 'R', plant ? inputText : 'weighting the inputs']));
  const Q = given.has('Q') ? weightMatrix(given.get('Q')!, designStates, designStates, plant ? designReason() : '', plant ? designReason() : '', true, known, scope, out) : null;
  const R = given.has('R') ? weightMatrix(given.get('R')!, m, m, inputsReason, inputsReason, true, known, scope, out) : null;
  const N = given.has('N') ? weightMatrix(given.get('N')!, designStates, m, plant ? designReason() : '', inputsReason, false, known, scope, out) : undefined;
  if (!Q || !R || N === null) return undefined;
  return N ? { Q, R, N, range } : { Q, R, range };
}

function checkNoise(
  weights: NamedValue[],
  range: Range,
  plant: CheckedPlant | undefined,
  n: number,
  p: number,
  d: number,
  scope: ReturnType<typeof parameterScope>,
  out: Diagnostic[],
): { W: Rows; V: Rows; enters: 'states' | 'disturbances' } | null {
  const given = namedWeights(weights, ['W', 'V'], 'observer noise', out);
  // With declared disturbances the process noise enters through E (W is d×d); otherwise it
  // acts on every state directly (W is n×n).
  const enters: 'states' | 'disturbances' = d > 0 ? 'disturbances' : 'states';
  const wSize = enters === 'disturbances' ? d : n;
  const wReason = plant
    ? enters === 'disturbances'
      ? `process noise enters through the plant's ${describeSignals(plant.disturbances, 'disturbance', 'disturbances')}`
      : `process noise acts on the plant's ${describeSignals(plant.states, 'state', 'states')}`
    : '';
  const vReason = plant ? `measurement noise is on the plant's ${describeSignals(plant.outputs, 'output', 'outputs')}` : '';
  if (!given.has('W')) out.push(missingWeight.create(range, ['observer noise', 'W', `${wSize}×${wSize}, process noise intensity`]));
  if (!given.has('V')) out.push(missingWeight.create(range, ['observer noise', 'V', `${p}×${p}, measurement noise intensity`]));
  const W = given.has('W') ? weightMatrix(given.get('W')!, wSize, wSize, wReason, wReason, true, !!plant, scope, out) : null;
  const V = given.has('V') ? weightMatrix(given.get('V')!, p, p, vReason, vReason, true, !!plant, scope, out) : null;
  return W && V ? { W, V, enters } : null;
}

function checkSpec(
  spec: Extract<ControllerItem, { kind: 'spec' }>,
  scope: ReturnType<typeof parameterScope>,
  out: Diagnostic[],
): CheckedController['spec'] {
  const result: NonNullable<CheckedController['spec']> = { range: spec.range };
  const seen = new Map<string, Range>();
  for (const item of spec.items) {
    const name = item.name.name;
    if (name !== 'settling' && name !== 'overshoot' && name !== 'rise') {
      out.push(unknownSetting.create(item.name.range, ['spec', name, 'settling, overshoot and rise', suggestName(name, ['settling', 'overshoot', 'rise'])]));
      continue;
    }
    const first = seen.get(name);
    if (first) {
      out.push(duplicateDefinition.create(item.range, [`${'`'}${name}${'`'}`], { related: [{ message: 'first given here', range: first }] }));
      continue;
    }
    seen.set(name, item.range);
    const value = readQuantity(item.value as Expr, name === 'overshoot' ? 'percent' : 'time', name, scope, out);
    if (value === null) continue;
    if (name === 'overshoot') result.overshoot = { percent: value, range: item.range };
    else result[name] = { seconds: value, range: item.range };
  }
  return result;
}
