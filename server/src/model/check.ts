// The model layer's entry point: syntax tree → checked plants and controllers + diagnostics.
// Never throws: an internal failure becomes a `model/internal-error` diagnostic and the
// affected declaration is marked unusable; everything else is still checked.
import type { ControllerDecl, ParseResult, PlantDecl } from '../../../grammar/src/ast';
import { checkController, type PlantContext } from './controller';
import { duplicateDefinition, duplicateName, internalError, mixedForms, noDynamics, aroundIgnored, trackingOffEquilibrium } from './diagnostics/index';
import { buildEquationForm } from './equationForm';
import { asScalar } from './evaluate';
import { buildMatrixForm } from './matrixForm';
import { evaluateParameters, type ParameterTable } from './parameters';
import { collectSignals, type SignalTable } from './signals';
import { buildTransferForm } from './transferForm';
import type { CheckedController, CheckedDocument, CheckedPlant, Diagnostic, ParameterValue, Range } from './types';

export interface CheckOptions {
  /**
   * Replace parameter values (by plant name, then parameter name) without editing the text:
   * used by fragility analyses to re-check a model with perturbed parameters.
   */
  parameterOverrides?: Readonly<Record<string, Readonly<Record<string, number>>>>;
}

const formNames = { matrix: 'matrix form (A = …)', equations: "equation form (x' = …)", transfer: 'transfer-function form' } as const;

export function checkDocument(parse: ParseResult, options: CheckOptions = {}): CheckedDocument {
  const diagnostics: Diagnostic[] = [];
  const plants: CheckedPlant[] = [];
  const controllers: CheckedController[] = [];
  try {
    const declarations = parse.document?.declarations ?? [];
    const plantsByName = new Map<string, { index: number; context: PlantContext }>();
    for (const decl of declarations) {
      if (decl.kind !== 'plant') continue;
      const first = plantsByName.get(decl.name.name);
      if (first) {
        diagnostics.push(
          duplicateName.create(decl.name.range, [decl.name.name, 'a plant'], {
            related: [{ message: `plant ${decl.name.name} is first declared here`, range: first.context.checked.nameRange }],
          }),
        );
      }
      const context = guardedPlant(decl, diagnostics, options.parameterOverrides?.[decl.name.name] ?? {});
      plants.push(context.checked);
      if (!first) plantsByName.set(decl.name.name, { index: plants.length - 1, context });
    }
    const controllerNames = new Map<string, Range>();
    for (const decl of declarations) {
      if (decl.kind !== 'controller') continue;
      const first = controllerNames.get(decl.name.name);
      if (first) {
        diagnostics.push(
          duplicateName.create(decl.name.range, [decl.name.name, 'a controller'], {
            related: [{ message: `controller ${decl.name.name} is first declared here`, range: first }],
          }),
        );
      } else controllerNames.set(decl.name.name, decl.name.range);
      const controller = guardedController(decl, plantsByName, diagnostics);
      controllers.push(controller);
      checkTrackingAtEquilibrium(decl, controller, plants, diagnostics);
    }
  } catch (error) {
    const origin = { start: { line: 0, character: 0 }, end: { line: 0, character: 0 } };
    diagnostics.push(internalError.create(origin, [describeError(error)]));
  }
  return { plants, controllers, diagnostics };
}

function describeError(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

function guardedPlant(decl: PlantDecl, out: Diagnostic[], overrides: Readonly<Record<string, number>>): PlantContext {
  const local: Diagnostic[] = [];
  try {
    const context = checkPlant(decl, local, overrides);
    out.push(...local);
    return context;
  } catch (error) {
    out.push(...local);
    out.push(internalError.create(decl.name.range, [describeError(error)]));
    const signals: SignalTable = {
      states: [],
      inputs: [],
      outputs: [],
      disturbances: [],
      byName: new Map(),
      declared: { state: false, input: false, output: false, disturbance: false },
      lines: [],
    };
    return { checked: emptyPlant(decl), signals, parameters: new Map() };
  }
}

function guardedController(
  decl: ControllerDecl,
  plants: Map<string, { index: number; context: PlantContext }>,
  out: Diagnostic[],
): CheckedController {
  const local: Diagnostic[] = [];
  try {
    const controller = checkController(decl, plants, local);
    out.push(...local);
    return controller;
  } catch (error) {
    out.push(...local);
    out.push(internalError.create(decl.name.range, [describeError(error)]));
    return {
      name: decl.name.name,
      nameRange: decl.name.range,
      range: decl.range,
      plantName: decl.plant?.name ?? '',
      plantRange: decl.plant?.range,
      plantIndex: null,
      limits: [],
      steps: [],
      usable: false,
    };
  }
}

function emptyPlant(decl: PlantDecl): CheckedPlant {
  return {
    name: decl.name.name,
    nameRange: decl.name.range,
    range: decl.range,
    form: 'matrix',
    states: [],
    inputs: [],
    outputs: [],
    disturbances: [],
    parameters: [],
    A: [],
    B: [],
    C: [],
    D: [],
    E: [],
    F: [],
    sources: {},
    linearised: false,
    usable: false,
  };
}

export function checkPlant(decl: PlantDecl, out: Diagnostic[], overrides: Readonly<Record<string, number>> = {}): PlantContext {
  const errorsBefore = out.filter((d) => d.severity === 'error').length;
  const signals: SignalTable = collectSignals(decl, out);
  const parameters: ParameterTable = evaluateParameters(decl, signals, out, overrides);

  // One form per plant, decided by the first form item.
  let form: CheckedPlant['form'] | undefined;
  let formItemRange: Range | undefined;
  const matrixAssigns = [];
  const stateEquations = [];
  const outputEquations = [];
  let transfer: Extract<PlantDecl['items'][number], { kind: 'transfer' }> | undefined;
  let around: Extract<PlantDecl['items'][number], { kind: 'around' }> | undefined;
  for (const item of decl.items) {
    let itemForm: CheckedPlant['form'] | undefined;
    if (item.kind === 'matrixAssign') itemForm = 'matrix';
    else if (item.kind === 'stateEquation' || item.kind === 'outputEquation') itemForm = 'equations';
    else if (item.kind === 'transfer') itemForm = 'transfer';
    else if (item.kind === 'around') {
      if (around) out.push(duplicateDefinition.create(item.range, ['`around`'], { related: [{ message: 'first given here', range: around.range }] }));
      else around = item;
      continue;
    } else continue;
    if (form === undefined) {
      form = itemForm;
      formItemRange = item.range;
    } else if (form !== itemForm) {
      out.push(mixedForms.create(item.range, [formNames[form], formNames[itemForm].replace(/ \(.*\)$/, '')], { related: [{ message: 'the plant form is set here', range: formItemRange! }] }));
      continue;
    }
    if (item.kind === 'matrixAssign') matrixAssigns.push(item);
    else if (item.kind === 'stateEquation') stateEquations.push(item);
    else if (item.kind === 'outputEquation') outputEquations.push(item);
    else if (item.kind === 'transfer') {
      if (transfer) out.push(duplicateDefinition.create(item.range, ['`transfer`'], { related: [{ message: 'first given here', range: transfer.range }] }));
      else transfer = item;
    }
  }

  const checked = emptyPlant(decl);
  checked.form = form ?? 'matrix';
  if (around && form !== 'equations' && form !== undefined) out.push(aroundIgnored.create(around.range, [formNames[form].replace(/ \(.*\)$/, '')]));

  if (form === undefined) {
    out.push(noDynamics.create(decl.name.range, [decl.name.name]));
  } else if (form === 'matrix') {
    const result = buildMatrixForm(decl, matrixAssigns, signals, parameters, out);
    Object.assign(checked, { A: result.A, B: result.B, C: result.C, D: result.D, E: result.E, F: result.F, sources: result.sources });
  } else if (form === 'equations') {
    const result = buildEquationForm(decl, stateEquations, outputEquations, around, signals, parameters, out);
    Object.assign(checked, {
      A: result.A,
      B: result.B,
      C: result.C,
      D: result.D,
      E: result.E,
      F: result.F,
      equationRanges: result.equationRanges,
      sources: result.sources,
      linearised: result.linearised,
    });
    if (result.operatingPoint) checked.operatingPoint = result.operatingPoint;
    if (result.nonlinear) checked.nonlinear = result.nonlinear;
  } else if (transfer) {
    const result = buildTransferForm(decl, transfer, signals, parameters, out);
    if (result) {
      Object.assign(checked, { A: result.A, B: result.B, C: result.C, D: result.D, E: result.E, F: result.F });
      if (result.source) checked.sources = { transfer: result.source };
    }
  }

  checked.states = signals.states;
  checked.inputs = signals.inputs;
  checked.outputs = signals.outputs;
  checked.disturbances = signals.disturbances;
  checked.parameters = scalarParameters(parameters);
  // Keep the matrices consistent with the signal lists even when a stage stopped early.
  const n = checked.states.length;
  const m = checked.inputs.length;
  const p = checked.outputs.length;
  const d = checked.disturbances.length;
  const fit = (rows: number[][], r: number, c: number) =>
    rows.length === r && rows.every((row) => row.length === c) ? rows : Array.from({ length: r }, () => new Array<number>(c).fill(0));
  const consistent = checked.A.length === n && checked.B.length === n && checked.C.length === p;
  checked.A = fit(checked.A, n, n);
  checked.B = fit(checked.B, n, m);
  checked.C = fit(checked.C, p, n);
  checked.D = fit(checked.D, p, m);
  checked.E = fit(checked.E, n, d);
  checked.F = fit(checked.F, p, d);
  const errors = out.filter((x) => x.severity === 'error').length - errorsBefore;
  checked.usable = errors === 0 && consistent && n > 0;
  return { checked, signals, parameters };
}

function scalarParameters(parameters: ParameterTable): ParameterValue[] {
  const result: ParameterValue[] = [];
  for (const parameter of parameters.values()) {
    if (parameter.value === null) continue;
    const z = asScalar(parameter.value);
    if (z === null || z.im !== 0 || parameter.value.kind !== 'scalar') continue;
    result.push({ name: parameter.name, value: z.re, range: parameter.decl.name.range, valueRange: parameter.decl.value.range });
  }
  return result;
}

/** A set-point on a plant linearised away from an equilibrium cannot be held: error on the line. */
function checkTrackingAtEquilibrium(decl: ControllerDecl, controller: CheckedController, plants: CheckedPlant[], out: Diagnostic[]): void {
  if (controller.plantIndex === null) return;
  const plant = plants[controller.plantIndex]!;
  if (!plant.operatingPoint || plant.operatingPoint.isEquilibrium) return;
  for (const item of decl.items) {
    if (item.kind !== 'track' && item.kind !== 'step') continue;
    out.push(
      trackingOffEquilibrium.create(item.range, [plant.name], {
        related: [{ message: 'the operating point that is not an equilibrium', range: plant.operatingPoint.range }],
        data: plant.operatingPoint.holdingInput ? { fix: 'hold-with-input' } : undefined,
      }),
    );
    controller.usable = false;
  }
}
