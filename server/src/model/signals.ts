// The signals a plant declares (states, inputs, outputs, disturbances), by name.
import type { Identifier, PlantDecl, SignalDecl } from '../../../grammar/src/ast';
import { duplicateName, reservedName } from './diagnostics/index';
import { builtinConstants, builtinFunctions } from './evaluate';
import type { Diagnostic, Range, Signal } from './types';

export type SignalRole = 'state' | 'input' | 'output' | 'disturbance';

export const roleArticle: Record<SignalRole, string> = {
  state: 'a state',
  input: 'an input',
  output: 'an output',
  disturbance: 'a disturbance',
};

const roleOfKeyword: Record<SignalDecl['role'], SignalRole> = {
  states: 'state',
  inputs: 'input',
  outputs: 'output',
  disturbances: 'disturbance',
};

export interface SignalEntry {
  name: string;
  role: SignalRole;
  index: number;
  range: Range;
}

export interface SignalTable {
  states: Signal[];
  inputs: Signal[];
  outputs: Signal[];
  disturbances: Signal[];
  byName: Map<string, SignalEntry>;
  /** Whether a `states` / `inputs` / … line was written at all. */
  declared: Record<SignalRole, boolean>;
  /** The declaration lines, for ranges of messages. */
  lines: SignalDecl[];
}

export function isBuiltinName(name: string): string | undefined {
  if (builtinConstants.includes(name)) return 'constant';
  if (builtinFunctions.includes(name)) return 'function';
  return undefined;
}

export function collectSignals(plant: PlantDecl, out: Diagnostic[]): SignalTable {
  const table: SignalTable = {
    states: [],
    inputs: [],
    outputs: [],
    disturbances: [],
    byName: new Map(),
    declared: { state: false, input: false, output: false, disturbance: false },
    lines: [],
  };
  for (const item of plant.items) {
    if (item.kind !== 'signals') continue;
    table.lines.push(item);
    const role = roleOfKeyword[item.role];
    table.declared[role] = true;
    // A missing name (`states` with nothing after it) is a syntax error already; skip it here.
    for (const id of item.names) if (id.name !== '') addSignal(table, role, id, out);
  }
  return table;
}

function addSignal(table: SignalTable, role: SignalRole, id: Identifier, out: Diagnostic[]): void {
  const builtin = isBuiltinName(id.name);
  if (builtin) {
    out.push(reservedName.create(id.range, [id.name, builtin]));
    return;
  }
  const existing = table.byName.get(id.name);
  if (existing) {
    out.push(
      duplicateName.create(id.range, [id.name, roleArticle[existing.role]], {
        related: [{ message: `${id.name} is first declared here`, range: existing.range }],
      }),
    );
    return;
  }
  const list = listFor(table, role);
  table.byName.set(id.name, { name: id.name, role, index: list.length, range: id.range });
  list.push({ name: id.name, range: id.range });
}

export function listFor(table: SignalTable, role: SignalRole): Signal[] {
  switch (role) {
    case 'state':
      return table.states;
    case 'input':
      return table.inputs;
    case 'output':
      return table.outputs;
    case 'disturbance':
      return table.disturbances;
  }
}

/** Adds a signal Loopwright named itself (inferred dimensions, transfer defaults). */
export function addImpliedSignal(table: SignalTable, role: SignalRole, name: string, range: Range): void {
  const list = listFor(table, role);
  table.byName.set(name, { name, role, index: list.length, range });
  list.push({ name, range });
}

/** "2 states (theta, omega)" */
export function describeSignals(list: Signal[], singular: string, plural: string): string {
  const noun = list.length === 1 ? singular : plural;
  return list.length === 0 ? `no ${plural}` : `${list.length} ${noun} (${list.map((s) => s.name).join(', ')})`;
}
