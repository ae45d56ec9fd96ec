// Parameters: duplicates, reserved names, shadowing, dependency order (parameters may use
// later ones), cycles, and evaluation. Dependencies are ordered by Tarjan's strongly
// connected components algorithm; every component with more than one member (or a member
// using itself) is a cycle, reported at each member with the whole loop spelled out.
import type { ParamDecl, PlantDecl } from '../../../grammar/src/ast';
import { duplicateName, parameterCycle, reservedName, shadowedName } from './diagnostics/index';
import { evaluateValue, referencedNames, scalar, type Value, type ValueScope } from './evaluate';
import { isBuiltinName, roleArticle, type SignalTable } from './signals';
import type { Diagnostic, Range } from './types';

export interface EvaluatedParameter {
  name: string;
  decl: ParamDecl;
  /** null when the value could not be computed (the reason was reported). */
  value: Value | null;
}

export type ParameterTable = Map<string, EvaluatedParameter>;

export function evaluateParameters(
  plant: PlantDecl,
  signals: SignalTable,
  out: Diagnostic[],
  overrides: Readonly<Record<string, number>> = {},
): ParameterTable {
  const decls = new Map<string, ParamDecl>();
  for (const item of plant.items) {
    if (item.kind !== 'param') continue;
    const name = item.name.name;
    if (name === '') continue; // `param = …`: the syntax error already says the name is missing
    const builtin = isBuiltinName(name);
    if (builtin) {
      out.push(reservedName.create(item.name.range, [name, builtin]));
      continue;
    }
    const first = decls.get(name);
    if (first) {
      out.push(
        duplicateName.create(item.name.range, [name, 'a parameter'], {
          related: [{ message: `${name} is first declared here`, range: first.name.range }],
        }),
      );
      continue;
    }
    const signal = signals.byName.get(name);
    if (signal) {
      out.push(
        shadowedName.create(item.name.range, [name, `${signal.role} ${'`'}${name}${'`'}`, `in equations ${'`'}${name}${'`'} means the ${signal.role}`], {
          related: [{ message: `the ${signal.role} ${name} is declared here`, range: signal.range }],
        }),
      );
    }
    decls.set(name, item);
  }

  const dependencies = new Map<string, string[]>();
  for (const [name, decl] of decls) {
    const uses = referencedNames(decl.value)
      .map((ref) => ref.name)
      .filter((ref) => decls.has(ref));
    dependencies.set(name, [...new Set(uses)]);
  }

  const table: ParameterTable = new Map();
  const scope: ValueScope = {
    place: 'a parameter',
    unitsMeaningful: true,
    lookup: (name) => (decls.has(name) ? (table.get(name)?.value ?? null) : undefined),
    signalRole: (name) => {
      const signal = signals.byName.get(name);
      return signal ? roleArticle[signal.role] : undefined;
    },
    candidates: () => decls.keys(),
    declaration: (name): Range | undefined => decls.get(name)?.name.range,
  };

  for (const component of stronglyConnectedComponents([...decls.keys()], dependencies)) {
    const cyclic = component.length > 1 || dependencies.get(component[0]!)!.includes(component[0]!);
    if (cyclic) {
      const loop = findCycle(component, dependencies);
      for (const member of component) {
        const decl = decls.get(member)!;
        out.push(parameterCycle.create(decl.name.range, [loop]));
        table.set(member, { name: member, decl, value: null });
      }
      continue;
    }
    const name = component[0]!;
    const decl = decls.get(name)!;
    const override = overrides[name];
    const value = override !== undefined ? scalar({ re: override, im: 0 }) : evaluateValue(decl.value, scope, out);
    table.set(name, { name, decl, value });
  }
  return table;
}

/**
 * Tarjan's algorithm (1972). Components come out dependencies-first, which is the order in
 * which parameters are evaluated.
 */
export function stronglyConnectedComponents(nodes: string[], edges: Map<string, string[]>): string[][] {
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const components: string[][] = [];
  const visit = (v: string): void => {
    index.set(v, counter);
    low.set(v, counter);
    counter++;
    stack.push(v);
    onStack.add(v);
    for (const w of edges.get(v) ?? []) {
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) {
        low.set(v, Math.min(low.get(v)!, index.get(w)!));
      }
    }
    if (low.get(v) === index.get(v)) {
      const component: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        component.push(w);
      } while (w !== v);
      components.push(component.sort((a, b) => nodes.indexOf(a) - nodes.indexOf(b)));
    }
  };
  for (const v of nodes) if (!index.has(v)) visit(v);
  return components;
}

/** One closed loop through the component, starting at its first-declared member: a → b → a. */
function findCycle(component: string[], edges: Map<string, string[]>): string[] {
  const members = new Set(component);
  const start = component[0]!;
  const path: string[] = [start];
  const seen = new Set<string>([start]);
  const walk = (v: string): boolean => {
    for (const w of edges.get(v) ?? []) {
      if (!members.has(w)) continue;
      if (w === start) {
        path.push(start);
        return true;
      }
      if (seen.has(w)) continue;
      seen.add(w);
      path.push(w);
      if (walk(w)) return true;
      path.pop();
    }
    return false;
  };
  walk(start);
  return path;
}

/** A scope for values computed from a plant's parameters (matrix entries, poles, weights). */
export function parameterScope(parameters: ParameterTable, signals: SignalTable | undefined, place: string): ValueScope {
  return {
    place,
    unitsMeaningful: false,
    lookup: (name) => (parameters.has(name) ? parameters.get(name)!.value : undefined),
    signalRole: (name) => {
      const signal = signals?.byName.get(name);
      return signal ? roleArticle[signal.role] : undefined;
    },
    candidates: () => parameters.keys(),
    declaration: (name) => parameters.get(name)?.decl.name.range,
  };
}
