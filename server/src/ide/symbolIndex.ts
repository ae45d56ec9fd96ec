// Names in a document: every declaration and every occurrence, resolved by scope. Built from the
// syntax tree only (works on broken text). Scopes: plants and controllers are global; params and
// signals belong to their plant; a controller's track/integral/step/limit lines and its
// expressions refer to the signals and params of the plant it names with `for`.
import type {
  ControllerDecl,
  DocumentNode,
  Expr,
  Identifier,
  PlantDecl,
  Range,
} from '../../../grammar/src/ast';
import { CONSTANT_NAMES, FUNCTION_NAMES, UNIT_NAMES } from '../../../grammar/src/tokens';

export type DefinitionKind = 'plant' | 'controller' | 'param' | 'state' | 'input' | 'output' | 'disturbance';

export const SIGNAL_KINDS = ['state', 'input', 'output', 'disturbance'] as const;

export interface Definition {
  kind: DefinitionKind;
  name: string;
  /** The name as written in the declaration. */
  range: Range;
  startOffset: number;
  endOffset: number;
  /** The whole declaring statement (or block, for plants and controllers). */
  declarationRange: Range;
  /** Index in document.declarations of the owning plant (params, signals) or of the block itself. */
  declarationIndex: number;
}

/** What an occurrence of a name is, beyond a reference to a definition. */
export type OccurrenceRole =
  | 'declaration'
  | 'reference'
  | 'matrix' // A, B, C, D, E in a plant
  | 'function'
  | 'unit'
  | 'constant' // pi
  | 'laplace' // s in a transfer function
  | 'weight' // Q, R, N, W, V
  | 'spec' // settling, overshoot, rise
  | 'form' // current, predictor
  | 'unknown';

export interface Occurrence {
  name: string;
  range: Range;
  startOffset: number;
  endOffset: number;
  role: OccurrenceRole;
  /** The definition it declares or refers to (null when unresolved or not a user symbol). */
  definition: Definition | null;
  /** Index in document.declarations of the enclosing plant or controller. */
  declarationIndex: number;
  /** Kinds a reference here may resolve to (for completion and rename checks). */
  expected?: readonly DefinitionKind[];
}

export interface SymbolIndex {
  definitions: Definition[];
  /** Sorted by start offset. */
  occurrences: Occurrence[];
  /** First plant declared under each name (index in document.declarations). */
  plantByName: Map<string, number>;
  /** Per declaration index: the plant scope (name → definition) a block sees. */
  scopeOf(declarationIndex: number): Map<string, Definition>;
  /** The plant declaration index a block refers to (itself for a plant). */
  plantIndexOf(declarationIndex: number): number | null;
}

const ROLE_KIND: Record<'states' | 'inputs' | 'outputs' | 'disturbances', DefinitionKind> = {
  states: 'state',
  inputs: 'input',
  outputs: 'output',
  disturbances: 'disturbance',
};

const FUNCTIONS: ReadonlySet<string> = new Set(FUNCTION_NAMES);
const UNITS: ReadonlySet<string> = new Set(UNIT_NAMES);
const CONSTANTS: ReadonlySet<string> = new Set(CONSTANT_NAMES);

const cache = new WeakMap<DocumentNode, SymbolIndex>();

export function symbolIndex(document: DocumentNode): SymbolIndex {
  const cached = cache.get(document);
  if (cached) return cached;
  const index = buildIndex(document);
  cache.set(document, index);
  return index;
}

function definitionOf(
  kind: DefinitionKind,
  name: Identifier,
  declarationRange: Range,
  declarationIndex: number,
): Definition {
  return {
    kind,
    name: name.name,
    range: name.range,
    startOffset: name.startOffset,
    endOffset: name.endOffset,
    declarationRange,
    declarationIndex,
  };
}

function buildIndex(document: DocumentNode): SymbolIndex {
  const definitions: Definition[] = [];
  const occurrences: Occurrence[] = [];
  const plantByName = new Map<string, number>();
  const controllerByName = new Map<string, number>();
  const scopes = new Map<number, Map<string, Definition>>();
  const plantOfDeclaration = new Map<number, number | null>();

  const add = (occurrence: Occurrence) => {
    if (occurrence.name.length > 0) occurrences.push(occurrence);
  };

  // Pass 1: declarations (names may be used before they are declared).
  document.declarations.forEach((declaration, declarationIndex) => {
    if (declaration.kind === 'plant') {
      const plant = definitionOf('plant', declaration.name, declaration.range, declarationIndex);
      definitions.push(plant);
      if (!plantByName.has(plant.name)) plantByName.set(plant.name, declarationIndex);
      const scope = new Map<string, Definition>();
      for (const item of declaration.items) {
        if (item.kind === 'param') {
          const definition = definitionOf('param', item.name, item.range, declarationIndex);
          definitions.push(definition);
          if (!scope.has(definition.name)) scope.set(definition.name, definition);
        } else if (item.kind === 'signals') {
          for (const name of item.names) {
            const definition = definitionOf(ROLE_KIND[item.role], name, item.range, declarationIndex);
            definitions.push(definition);
            if (!scope.has(definition.name)) scope.set(definition.name, definition);
          }
        }
      }
      scopes.set(declarationIndex, scope);
      plantOfDeclaration.set(declarationIndex, declarationIndex);
    } else {
      const controller = definitionOf('controller', declaration.name, declaration.range, declarationIndex);
      definitions.push(controller);
      if (!controllerByName.has(controller.name)) controllerByName.set(controller.name, declarationIndex);
    }
  });
  document.declarations.forEach((declaration, declarationIndex) => {
    if (declaration.kind !== 'controller') return;
    const plantIndex = declaration.plant ? plantByName.get(declaration.plant.name) ?? null : null;
    plantOfDeclaration.set(declarationIndex, plantIndex);
    scopes.set(declarationIndex, plantIndex === null ? new Map() : scopes.get(plantIndex)!);
  });

  const definitionByRange = new Map<number, Definition>();
  for (const definition of definitions) definitionByRange.set(definition.startOffset, definition);

  // Pass 2: occurrences.
  document.declarations.forEach((declaration, declarationIndex) => {
    const scope = scopes.get(declarationIndex)!;
    const declare = (name: Identifier) => {
      add({
        name: name.name,
        range: name.range,
        startOffset: name.startOffset,
        endOffset: name.endOffset,
        role: 'declaration',
        definition: definitionByRange.get(name.startOffset) ?? null,
        declarationIndex,
      });
    };
    const refer = (name: Identifier, expected: readonly DefinitionKind[]) => {
      const definition = scope.get(name.name);
      add({
        name: name.name,
        range: name.range,
        startOffset: name.startOffset,
        endOffset: name.endOffset,
        role: 'reference',
        definition: definition && expected.includes(definition.kind) ? definition : null,
        declarationIndex,
        expected,
      });
    };
    const special = (name: Identifier, role: OccurrenceRole) => {
      add({ ...nameParts(name), role, definition: null, declarationIndex });
    };
    const expression = (expr: Expr | undefined, laplace: boolean) => {
      walkExpression(expr, (node) => {
        if (node.kind === 'name') {
          const definition = scope.get(node.name);
          if (definition) {
            add({
              ...nameParts(node),
              role: 'reference',
              definition,
              declarationIndex,
              expected: EXPRESSION_KINDS,
            });
          } else if (laplace && node.name === 's') {
            add({ ...nameParts(node), role: 'laplace', definition: null, declarationIndex });
          } else if (CONSTANTS.has(node.name)) {
            add({ ...nameParts(node), role: 'constant', definition: null, declarationIndex });
          } else {
            add({
              ...nameParts(node),
              role: 'reference',
              definition: null,
              declarationIndex,
              expected: EXPRESSION_KINDS,
            });
          }
        } else if (node.kind === 'call') {
          special(node.callee, FUNCTIONS.has(node.callee.name) ? 'function' : 'unknown');
        } else if (node.kind === 'number' && node.unit) {
          special(node.unit, UNITS.has(node.unit.name) ? 'unit' : 'unknown');
        }
      });
    };

    if (declaration.kind === 'plant') {
      declare(declaration.name);
      for (const item of declaration.items) {
        switch (item.kind) {
          case 'param':
            declare(item.name);
            expression(item.value, false);
            break;
          case 'signals':
            item.names.forEach(declare);
            break;
          case 'matrixAssign':
            special(item.name, 'matrix');
            expression(item.value, false);
            break;
          case 'stateEquation':
            refer(item.state, ['state']);
            expression(item.value, false);
            break;
          case 'outputEquation':
            refer(item.output, ['output']);
            expression(item.value, false);
            break;
          case 'transfer':
            expression(item.value, true);
            break;
          case 'around':
            for (const assignment of item.assignments) {
              refer(assignment.name, ['state', 'input', 'disturbance']);
              expression(assignment.value, false);
            }
            break;
        }
      }
    } else {
      controllerOccurrences(declaration, declare, refer, special, expression, (name) => {
        const plantIndex = plantByName.get(name.name);
        add({
          ...nameParts(name),
          role: 'reference',
          definition: plantIndex === undefined ? null : definitionByRange.get(
            (document.declarations[plantIndex] as PlantDecl).name.startOffset,
          ) ?? null,
          declarationIndex,
          expected: ['plant'],
        });
      });
    }
  });

  occurrences.sort((a, b) => a.startOffset - b.startOffset);
  return {
    definitions,
    occurrences,
    plantByName,
    scopeOf: (declarationIndex) => scopes.get(declarationIndex) ?? new Map(),
    plantIndexOf: (declarationIndex) => plantOfDeclaration.get(declarationIndex) ?? null,
  };
}

const EXPRESSION_KINDS: readonly DefinitionKind[] = ['param', 'state', 'input', 'output', 'disturbance'];

function controllerOccurrences(
  controller: ControllerDecl,
  declare: (name: Identifier) => void,
  refer: (name: Identifier, expected: readonly DefinitionKind[]) => void,
  special: (name: Identifier, role: OccurrenceRole) => void,
  expression: (expr: Expr | undefined, laplace: boolean) => void,
  referPlant: (name: Identifier) => void,
): void {
  declare(controller.name);
  if (controller.plant) referPlant(controller.plant);
  for (const item of controller.items) {
    switch (item.kind) {
      case 'poles':
      case 'sample':
      case 'delay':
        expression(item.value, false);
        break;
      case 'lqr':
        for (const weight of item.weights) {
          special(weight.name, 'weight');
          expression(weight.value, false);
        }
        break;
      case 'spec':
        for (const spec of item.items) {
          special(spec.name, 'spec');
          expression(spec.value, false);
        }
        break;
      case 'track':
        for (const output of item.outputs) refer(output, ['output']);
        break;
      case 'integral':
        for (const output of item.outputs) refer(output, ['output']);
        expression(item.pole, false);
        break;
      case 'observer':
        expression(item.poles, false);
        for (const weight of item.noise ?? []) {
          special(weight.name, 'weight');
          expression(weight.value, false);
        }
        if (item.form) special(item.form, 'form');
        break;
      case 'limit':
        refer(item.input, ['input']);
        expression(item.low, false);
        expression(item.high, false);
        break;
      case 'step':
        refer(item.output, ['output']);
        expression(item.value, false);
        break;
    }
  }
}

function nameParts(node: { name: string; range: Range; startOffset: number; endOffset: number }) {
  return { name: node.name, range: node.range, startOffset: node.startOffset, endOffset: node.endOffset };
}

/** Visits every expression node, parents before children. */
export function walkExpression(expr: Expr | undefined, visit: (node: Expr) => void): void {
  if (!expr) return;
  visit(expr);
  switch (expr.kind) {
    case 'unary':
      walkExpression(expr.operand, visit);
      break;
    case 'binary':
      walkExpression(expr.left, visit);
      walkExpression(expr.right, visit);
      break;
    case 'call':
      for (const argument of expr.args) walkExpression(argument, visit);
      break;
    case 'matrix':
      for (const row of expr.rows) for (const entry of row.entries) walkExpression(entry, visit);
      break;
  }
}

/** The occurrence under an offset (a cursor just after a name counts as on it). */
export function occurrenceAtOffset(index: SymbolIndex, offset: number): Occurrence | null {
  const list = index.occurrences;
  let low = 0;
  let high = list.length - 1;
  let found: Occurrence | null = null;
  while (low <= high) {
    const mid = (low + high) >> 1;
    if (list[mid].startOffset <= offset) {
      found = list[mid];
      low = mid + 1;
    } else high = mid - 1;
  }
  if (found && offset <= found.endOffset) return found;
  return null;
}

/** Every occurrence (declaration included) of the symbol a definition introduces. */
export function occurrencesOf(index: SymbolIndex, definition: Definition): Occurrence[] {
  return index.occurrences.filter((occurrence) => occurrence.definition === definition);
}

/** Index of the plant or controller block whose range contains an offset. */
export function declarationAtOffset(document: DocumentNode, offset: number): number | null {
  const declarations = document.declarations;
  for (let i = 0; i < declarations.length; i++) {
    if (declarations[i].startOffset <= offset && offset <= declarations[i].endOffset) return i;
  }
  return null;
}

/** Every top-level expression of a plant or controller statement. */
export function itemExpressions(item: PlantDecl['items'][number] | ControllerDecl['items'][number]): Expr[] {
  switch (item.kind) {
    case 'param':
    case 'matrixAssign':
    case 'stateEquation':
    case 'outputEquation':
    case 'transfer':
    case 'poles':
    case 'sample':
    case 'delay':
    case 'step':
      return [item.value];
    case 'around':
      return item.assignments.map((assignment) => assignment.value);
    case 'lqr':
      return item.weights.map((weight) => weight.value);
    case 'spec':
      return item.items.map((spec) => spec.value);
    case 'integral':
      return item.pole ? [item.pole] : [];
    case 'observer':
      return [...(item.poles ? [item.poles] : []), ...(item.noise ?? []).map((weight) => weight.value)];
    case 'limit':
      return [item.low, item.high];
    default:
      return [];
  }
}
