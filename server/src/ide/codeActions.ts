// Quick fixes for diagnostics that name one in `data.fix`. Each builder reads the data fields
// the engine attached (see the list below) and turns them into text edits; no analysis here.
//   add-integral-action      data.output (name or names), data.pole (number, complex, list or text),
//                            data.insertAfter (range of the line to insert after; else the block end)
//   add-observer             (none: a Kalman filter with identity covariances, which needs only sizes)
//   complete-conjugate-pair  data.missing (the conjugate, as text or complex)
//   add-observer-poles       data.poles (text or list)
//   poles-from-spec          data.poles (text or list)
//   resize-matrix            data.expectedRows, data.expectedCols
//   hold-with-input          data.inputs (values, one per input; else the model's holding input)
//   rename                   data.replacement (a known name close to the unknown one)
//   add-conjugate            data.conjugate (complex)
//   add-design               (none: LQR with identity weights, which needs only the sizes)
//   add-operating-point      (none: every state and input at 0)
//   add-operating-point-values data.names (states missing from `around`, set to 0)
// Any diagnostic may also carry ready edits: data.edits = [{range, newText}] with data.title.
import type { ControllerDecl, DocumentNode, MatrixExpr, PlantDecl, Range } from '../../../grammar/src/ast';
import type { Complex, Diagnostic } from '../model/types';
import { formatComplex } from './numbers';
import type { TextEdit } from './edits';
import { lineBreakOf, lineText, offsetAt, positionAt, rangesOverlap } from './text';
import type { AnalysisView } from './view';
import { itemExpressions, walkExpression } from './symbolIndex';

export interface CodeFix {
  title: string;
  kind: 'quickfix';
  diagnostic: Diagnostic;
  edits: TextEdit[];
  isPreferred: boolean;
}

type FixBuilder = (view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) => Omit<CodeFix, 'kind' | 'diagnostic' | 'isPreferred'> | null;

const builders: Record<string, FixBuilder> = {
  'add-integral-action': addIntegralAction,
  'complete-conjugate-pair': completeConjugatePair,
  'add-observer-poles': addObserverPoles,
  'add-observer': addObserverPoles,
  'poles-from-spec': polesFromSpec,
  'resize-matrix': resizeMatrix,
  'hold-with-input': holdWithInput,
  rename: replaceWithSuggestion,
  'add-conjugate': (view, diagnostic, data) => completeConjugatePair(view, diagnostic, { ...data, missing: data.missing ?? data.conjugate }),
  'add-design': addDesign,
  'add-operating-point': addOperatingPoint,
  'add-operating-point-values': addOperatingPointValues,
};

export function codeActions(view: AnalysisView, range: Range, diagnostics: Diagnostic[]): CodeFix[] {
  const fixes: CodeFix[] = [];
  for (const diagnostic of diagnostics) {
    if (!rangesOverlap(diagnostic.range, range)) continue;
    const data = (diagnostic.data ?? {}) as Record<string, unknown>;
    try {
      const ready = readyEdits(data);
      const fix = ready ?? (typeof data.fix === 'string' && builders[data.fix] ? builders[data.fix](view, diagnostic, data) : null);
      if (fix && fix.edits.length > 0) fixes.push({ ...fix, kind: 'quickfix', diagnostic, isPreferred: fixes.length === 0 });
    } catch {
      // A malformed data record yields no fix rather than a failed request.
    }
  }
  return fixes;
}

function readyEdits(data: Record<string, unknown>): { title: string; edits: TextEdit[] } | null {
  if (!Array.isArray(data.edits) || typeof data.title !== 'string') return null;
  const edits = data.edits.filter(
    (edit): edit is TextEdit => typeof edit === 'object' && edit !== null && 'range' in edit && typeof (edit as TextEdit).newText === 'string',
  );
  return edits.length ? { title: data.title, edits } : null;
}

// ------------------------------------------------------------------ value text

function isComplex(value: unknown): value is Complex {
  return typeof value === 'object' && value !== null && typeof (value as Complex).re === 'number' && typeof (value as Complex).im === 'number';
}

/** Text of a value as the language writes it (6 significant digits keep designs reproducible). */
export function valueText(value: unknown): string | null {
  if (typeof value === 'string') return value.trim() || null;
  if (typeof value === 'number') return Number.isFinite(value) ? formatComplex({ re: value, im: 0 }, 6) : null;
  if (isComplex(value)) return formatComplex(value, 6);
  if (Array.isArray(value)) {
    const parts = value.map(valueText);
    if (parts.some((part) => part === null)) return null;
    return `[${parts.join(', ')}]`;
  }
  return null;
}

function namesText(value: unknown): string | null {
  if (typeof value === 'string') return value;
  if (Array.isArray(value) && value.every((item) => typeof item === 'string')) return value.join(', ');
  return null;
}

// ------------------------------------------------------------------ places

function declarationContaining(document: DocumentNode, range: Range): PlantDecl | ControllerDecl | undefined {
  return document.declarations.find((declaration) => rangesOverlap(declaration.range, range));
}

function itemIndent(view: AnalysisView, declaration: PlantDecl | ControllerDecl): string {
  const first = declaration.items[0];
  if (first) {
    const match = /^[ \t]*/.exec(lineText(view.text, first.range.start.line));
    if (match && match[0].length > 0) return match[0];
  }
  return '  ';
}

/** An edit adding a statement as the last line of a block (before its closing brace). */
function appendToBlock(view: AnalysisView, declaration: PlantDecl | ControllerDecl, statement: string): TextEdit {
  const text = view.text;
  const eol = lineBreakOf(text);
  const indent = itemIndent(view, declaration);
  const closing = text[declaration.endOffset - 1] === '}' ? declaration.endOffset - 1 : -1;
  if (closing >= 0) {
    const position = positionAt(text, closing);
    const before = lineText(text, position.line).slice(0, position.character);
    if (before.trim() === '') {
      const start = { line: position.line, character: 0 };
      return { range: { start, end: start }, newText: `${indent}${statement}${eol}` };
    }
    return { range: { start: position, end: position }, newText: `${eol}${indent}${statement}${eol}` };
  }
  // Unclosed block: add after the last item.
  const last = declaration.items[declaration.items.length - 1];
  const end = last ? last.range.end : declaration.name.range.end;
  const endOfLine = { line: end.line, character: lineText(text, end.line).length };
  return { range: { start: endOfLine, end: endOfLine }, newText: `${eol}${indent}${statement}` };
}

function isRange(value: unknown): value is Range {
  const range = value as Range;
  return (
    typeof value === 'object' && value !== null && typeof range.start?.line === 'number' && typeof range.end?.line === 'number'
  );
}

/** A new statement after the line the engine names in `data.insertAfter`, else at the block end. */
function insertStatement(view: AnalysisView, declaration: PlantDecl | ControllerDecl, statement: string, data: Record<string, unknown>): TextEdit {
  if (isRange(data.insertAfter)) {
    const line = data.insertAfter.end.line;
    const lineEnd = { line, character: lineText(view.text, line).length };
    return { range: { start: lineEnd, end: lineEnd }, newText: `${lineBreakOf(view.text)}${itemIndent(view, declaration)}${statement}` };
  }
  return appendToBlock(view, declaration, statement);
}

// ------------------------------------------------------------------ builders

function addIntegralAction(view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  const declaration = declarationContaining(view.parse.document, diagnostic.range);
  const output = namesText(data.output ?? data.outputs);
  if (!declaration || declaration.kind !== 'controller' || !output) return null;
  const pole = data.pole === undefined ? null : valueText(data.pole);
  const statement = `integral ${output}${pole ? ` pole ${pole}` : ''}`;
  return { title: `Add \`${statement}\``, edits: [insertStatement(view, declaration, statement, data)] };
}

function addObserverPoles(view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  const declaration = declarationContaining(view.parse.document, diagnostic.range);
  if (!declaration || declaration.kind !== 'controller') return null;
  const poles = data.poles === undefined || data.poles === null ? null : valueText(data.poles);
  let statement: string;
  if (poles) statement = `observer poles = ${poles.startsWith('[') ? poles : `[${poles}]`}`;
  else {
    const plant = view.model.plants.find((p) => p.name === declaration.plant?.name);
    if (!plant || plant.states.length === 0 || plant.outputs.length === 0) return null;
    const weight = (n: number) => (n === 1 ? '1' : `identity(${n})`);
    statement = `observer noise W = ${weight(plant.states.length)}, V = ${weight(plant.outputs.length)}`;
  }
  return { title: `Add \`${statement}\``, edits: [insertStatement(view, declaration, statement, data)] };
}

function polesFromSpec(view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  const declaration = declarationContaining(view.parse.document, diagnostic.range);
  const poles = valueText(data.poles);
  if (!declaration || declaration.kind !== 'controller' || !poles) return null;
  const statement = `poles = ${poles.startsWith('[') ? poles : `[${poles}]`}`;
  const spec = declaration.items.find((item) => item.kind === 'spec');
  if (!spec) return { title: `Add \`${statement}\``, edits: [appendToBlock(view, declaration, statement)] };
  const specText = view.text.slice(spec.startOffset, spec.endOffset).replace(/\s+/g, ' ');
  return {
    title: `Replace the spec by \`${statement}\``,
    edits: [{ range: spec.range, newText: `${statement}  # from: ${specText}` }],
  };
}

function completeConjugatePair(view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  const missing = valueText(data.missing);
  if (!missing) return null;
  const text = view.text;
  // The diagnostic points at one entry (insert after it) or at the whole matrix (insert before `]`).
  const matrix = matrixAt(view.parse.document, diagnostic.range);
  let insertAt = offsetAt(text, diagnostic.range.end);
  if (matrix && matrix.startOffset === offsetAt(text, diagnostic.range.start) && matrix.endOffset === insertAt && text[insertAt - 1] === ']') {
    insertAt -= 1;
  }
  const position = positionAt(text, insertAt);
  return { title: `Add the conjugate pole ${missing}`, edits: [{ range: { start: position, end: position }, newText: `, ${missing}` }] };
}

function matrixAt(document: DocumentNode, range: Range): MatrixExpr | null {
  let found: MatrixExpr | null = null;
  for (const declaration of document.declarations) {
    if (!rangesOverlap(declaration.range, range)) continue;
    for (const item of declaration.items) {
      for (const expression of itemExpressions(item)) {
        walkExpression(expression, (node) => {
          if (node.kind !== 'matrix' || !rangesOverlap(node.range, range)) return;
          if (!found || node.endOffset - node.startOffset < found.endOffset - found.startOffset) found = node;
        });
      }
    }
  }
  return found;
}

function resizeMatrix(view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  const rows = Number(data.expectedRows);
  const columns = Number(data.expectedCols);
  if (!Number.isInteger(rows) || !Number.isInteger(columns) || rows < 0 || columns < 0 || rows * columns > 10_000) return null;
  const declaration = declarationContaining(view.parse.document, diagnostic.range);
  if (!declaration) return null;
  // The matrix assignment the diagnostic points into (or the smallest matrix literal there).
  let matrix: MatrixExpr | null = null;
  if (declaration.kind === 'plant') {
    const assign = declaration.items.find((item) => item.kind === 'matrixAssign' && rangesOverlap(item.range, diagnostic.range));
    if (assign && assign.kind === 'matrixAssign' && assign.value.kind === 'matrix') matrix = assign.value;
  }
  matrix ??= matrixAt(view.parse.document, diagnostic.range);
  if (!matrix) return null;
  const text = view.text;
  const cells: string[][] = [];
  for (let r = 0; r < rows; r++) {
    const row = matrix.rows[r];
    const line: string[] = [];
    for (let c = 0; c < columns; c++) {
      const entry = row?.entries[c];
      line.push(entry ? text.slice(entry.startOffset, entry.endOffset).replace(/\s+/g, ' ') : '0');
    }
    cells.push(line);
  }
  const start = positionAt(text, matrix.startOffset);
  const newText = renderMatrix(cells, start.character, lineBreakOf(text), matrix.rows.length > 1 || rows > 1);
  return { title: `Resize to ${rows}×${columns} (pad with zeros)`, edits: [{ range: matrix.range, newText }] };
}

/**
 * A matrix literal with right-aligned columns. Rows after the first start under the first
 * entry (one column right of `[`, which sits at `column`).
 */
export function renderMatrix(cells: string[][], column: number, eol: string, multiline: boolean): string {
  if (cells.length === 0) return '[]';
  const columns = Math.max(...cells.map((row) => row.length));
  const widths = Array.from({ length: columns }, (_, c) => Math.max(0, ...cells.map((row) => (row[c] ?? '').length)));
  const rowTexts = cells.map((row) =>
    row.map((cell, c) => (multiline && cells.length > 1 ? cell.padStart(widths[c]) : cell)).join(', '),
  );
  if (!multiline || cells.length === 1) return `[${rowTexts.join('; ')}]`;
  return '[' + rowTexts.join(`;${eol}${' '.repeat(column + 1)}`) + ']';
}

/** The plant a diagnostic concerns: the block it is in, or the plant a controller names. */
function plantConcerned(view: AnalysisView, range: Range): PlantDecl | undefined {
  const declaration = declarationContaining(view.parse.document, range);
  if (!declaration) return undefined;
  if (declaration.kind === 'plant') return declaration;
  const plantName = declaration.plant?.name;
  return view.parse.document.declarations.find((d): d is PlantDecl => d.kind === 'plant' && d.name.name === plantName);
}

function signalNames(plant: PlantDecl, role: 'states' | 'inputs' | 'outputs' | 'disturbances'): string[] {
  return plant.items.flatMap((item) => (item.kind === 'signals' && item.role === role ? item.names.map((n) => n.name) : []));
}

function replaceWithSuggestion(_view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  if (typeof data.replacement !== 'string' || !data.replacement) return null;
  return { title: `Change to \`${data.replacement}\``, edits: [{ range: diagnostic.range, newText: data.replacement }] };
}

function addDesign(view: AnalysisView, diagnostic: Diagnostic) {
  const declaration = declarationContaining(view.parse.document, diagnostic.range);
  if (!declaration || declaration.kind !== 'controller') return null;
  const plant = view.model.plants.find((p) => p.name === declaration.plant?.name);
  if (!plant || plant.states.length === 0 || plant.inputs.length === 0) return null;
  const weight = (n: number) => (n === 1 ? '1' : `identity(${n})`);
  const statement = `lqr Q = ${weight(plant.states.length)}, R = ${weight(plant.inputs.length)}`;
  return { title: `Add \`${statement}\` (a starting point to tune)`, edits: [appendToBlock(view, declaration, statement)] };
}

function addOperatingPoint(view: AnalysisView, diagnostic: Diagnostic) {
  const plant = plantConcerned(view, diagnostic.range);
  if (!plant) return null;
  const names = [...signalNames(plant, 'states'), ...signalNames(plant, 'inputs')];
  if (names.length === 0) return null;
  const statement = `around ${names.map((name) => `${name} = 0`).join(', ')}`;
  return { title: `Add \`${statement}\``, edits: [appendToBlock(view, plant, statement)] };
}

function addOperatingPointValues(view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  const plant = plantConcerned(view, diagnostic.range);
  const names = Array.isArray(data.names) ? data.names.filter((name): name is string => typeof name === 'string') : [];
  const around = plant?.items.find((item) => item.kind === 'around');
  if (!plant || names.length === 0 || !around || around.kind !== 'around') return null;
  const text = names.map((name) => `${name} = 0`).join(', ');
  const end = around.range.end;
  return { title: `Add ${text} to the operating point`, edits: [{ range: { start: end, end }, newText: `${around.assignments.length ? ', ' : ' '}${text}` }] };
}

function holdWithInput(view: AnalysisView, diagnostic: Diagnostic, data: Record<string, unknown>) {
  const declaration = plantConcerned(view, diagnostic.range);
  if (!declaration) return null;
  const checked = view.model.plants.find((p) => p.name === declaration.name.name);
  const raw = Array.isArray(data.inputs) ? data.inputs : checked?.operatingPoint?.holdingInput;
  if (!Array.isArray(raw)) return null;
  const values = raw.map((value) => valueText(value));
  if (values.some((value) => value === null)) return null;
  const inputNames = signalNames(declaration, 'inputs');
  if (inputNames.length !== values.length) return null;
  const around = declaration.items.find((item) => item.kind === 'around');
  const edits: TextEdit[] = [];
  const appended: string[] = [];
  inputNames.forEach((name, i) => {
    const existing = around?.kind === 'around' ? around.assignments.find((assignment) => assignment.name.name === name) : undefined;
    if (existing) edits.push({ range: existing.value.range, newText: values[i]! });
    else appended.push(`${name} = ${values[i]}`);
  });
  if (appended.length > 0) {
    if (around && around.kind === 'around') {
      const end = around.range.end;
      edits.push({ range: { start: end, end }, newText: `${around.assignments.length ? ', ' : ' '}${appended.join(', ')}` });
    } else {
      edits.push(appendToBlock(view, declaration, `around ${appended.join(', ')}`));
    }
  }
  return { title: `Hold the operating point with ${inputNames.map((name, i) => `${name} = ${values[i]}`).join(', ')}`, edits };
}
