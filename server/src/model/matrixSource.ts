// Evaluates a plant or controller matrix expression to real rows, keeping where every row and
// entry came from. A matrix literal is evaluated entry by entry (an error in one entry does
// not hide the others); any other expression (diag(…), identity(n), a matrix parameter,
// 2*identity(2)) is evaluated whole and all its entries point at it.
import type { Expr, MatrixExpr, PlainMatrixEntries, Range } from '../../../grammar/src/ast';
import { defineLazyProperty } from '../../../grammar/src/lazyProperty';
import * as Cx from './complex';
import { notReal, shapeMismatch } from './diagnostics/index';
import { asScalar, evaluateValue, shapeText, type ValueScope } from './evaluate';
import { printExpr } from './printExpr';
import type { Complex, Diagnostic, MatrixSource } from './types';

export interface SourcedMatrix {
  /** Entries; null where the entry had an error (already reported). */
  rows: (number | null)[][];
  source: MatrixSource;
  /** True for a `[…]` literal: row and entry ranges are exact. */
  literal: boolean;
}

export function evaluateSourcedMatrix(expr: Expr, scope: ValueScope, out: Diagnostic[]): SourcedMatrix | null {
  if (expr.kind === 'matrix' && expr.plain) return plainSourcedMatrix(expr, expr.plain, scope, out);
  if (expr.kind === 'matrix') {
    const rows = expr.rows.filter((row) => row.entries.length > 0);
    const values = literalEntries(expr, rows, scope, out);
    // Ranges only when a diagnostic or a hover asks for them: a plant is re-checked many times
    // over (fragility study) and a 100-state A has 10,000 entries.
    const source = { range: expr.range } as MatrixSource;
    defineLazyProperty(source, 'rowRanges', () => rows.map((row) => row.range));
    defineLazyProperty(source, 'entryRanges', () => rows.map((row) => row.entries.map((entry) => entry.range)));
    return { rows: values, literal: true, source };
  }
  if (expr.kind === 'error') return null;
  const value = evaluateValue(expr, scope, out);
  if (value === null) return null;
  const entries = value.kind === 'scalar' ? [[value.value]] : value.entries;
  let complexEntry: Complex | undefined;
  const rows = entries.map((row) =>
    row.map((z) => {
      if (!Cx.isNearlyReal(z)) {
        complexEntry ??= z;
        return null;
      }
      return z.re;
    }),
  );
  if (complexEntry) {
    out.push(notReal.create(expr.range, [printExpr(expr), Cx.formatComplex(complexEntry), scope.place]));
  }
  // Every entry's range is the whole expression's (`identity(100)`): built only when asked for.
  const source = { range: expr.range } as MatrixSource;
  defineLazyProperty(source, 'rowRanges', () => rows.map(() => expr.range));
  defineLazyProperty(source, 'entryRanges', () => rows.map((row) => row.map(() => expr.range)));
  return { rows, literal: false, source };
}

/**
 * The entries of a matrix literal. The number literals among them (most entries of a large
 * model: zeros and constants) do not depend on the scope, so after a first evaluation of the same
 * syntax tree they are copied instead of evaluated again, and only the other entries are: a
 * plant re-checked with moved parameters (the fragility study) costs its parameter-dependent
 * entries only. Same values either way (a number literal evaluates to itself).
 */
function literalEntries(expr: MatrixExpr, rows: MatrixExpr['rows'], scope: ValueScope, out: Diagnostic[]): (number | null)[][] {
  const remembered = literalConstants.get(expr);
  if (remembered) {
    const values = remembered.rows.map((row) => row.slice());
    for (const [i, j] of remembered.dependent) values[i][j] = realEntry(rows[i].entries[j], scope, out);
    return values;
  }
  const dependent: [number, number][] = [];
  const reportedBefore = out.length;
  const values = rows.map((row, i) =>
    row.entries.map((entry, j) => {
      if (!isNumberLiteral(entry)) dependent.push([i, j]);
      return realEntry(entry, scope, out);
    }),
  );
  // Remembered only when nothing was reported: a cached copy must not skip a diagnostic.
  if (out.length === reportedBefore) {
    literalConstants.set(expr, { rows: values.map((row, i) => row.map((value, j) => (isNumberLiteral(rows[i].entries[j]) ? value : null))), dependent });
  }
  return values;
}

/** Per matrix literal (its syntax node, so a new parse starts afresh): the number-literal entries and where the others are. */
const literalConstants = new WeakMap<MatrixExpr, { rows: (number | null)[][]; dependent: [number, number][] }>();

/** A real number written out (optionally signed): its value never depends on parameters. */
function isNumberLiteral(entry: Expr): boolean {
  const node = entry.kind === 'unary' ? entry.operand : entry;
  return node.kind === 'number' && !node.unit && !node.imaginary;
}

/**
 * A literal read in one piece: numbers straight from the scan, expression entries evaluated in
 * entry order (as the literal path does, so diagnostics come in the same order); row and entry
 * ranges (which build the matrix's syntax nodes) only when a diagnostic asks for them.
 */
function plainSourcedMatrix(expr: MatrixExpr, plain: PlainMatrixEntries, scope: ValueScope, out: Diagnostic[]): SourcedMatrix {
  const entries: (number | null)[] = Array.from(plain.values);
  // The expression entries are kept in scan order, so this is row-major order.
  for (const [index, expression] of plain.expressions) entries[index] = realEntry(expression, scope, out);
  const rows: (number | null)[][] = [];
  let index = 0;
  for (const rowLength of plain.rowLengths) {
    rows.push(entries.slice(index, index + rowLength));
    index += rowLength;
  }
  const source = { range: expr.range } as MatrixSource;
  const nonEmptyRows = () => expr.rows.filter((row) => row.entries.length > 0);
  defineLazyProperty(source, 'rowRanges', () => nonEmptyRows().map((row) => row.range));
  defineLazyProperty(source, 'entryRanges', () => nonEmptyRows().map((row) => row.entries.map((entry) => entry.range)));
  return { rows, literal: true, source };
}

/** One real number from an entry expression, or null (reported). */
export function realEntry(entry: Expr, scope: ValueScope, out: Diagnostic[]): number | null {
  const direct = directRealValue(entry, scope);
  if (direct !== undefined) return direct;
  const value = evaluateValue(entry, scope, out);
  if (value === null) return null;
  const z = asScalar(value);
  if (z === null) {
    out.push(shapeMismatch.create(entry.range, [`${shapeText(value)} where ${scope.place} must be a number (block matrices are not supported)`]));
    return null;
  }
  if (!Cx.isNearlyReal(z)) {
    out.push(notReal.create(entry.range, [printExpr(entry), Cx.formatComplex(z), scope.place]));
    return null;
  }
  return z.re;
}

/**
 * The value of the entries most matrices are made of — a plain finite number, a bare scalar
 * parameter, either negated — without the general evaluator (same result, nothing to report);
 * undefined for anything else, which the evaluator then handles with its diagnostics.
 */
function directRealValue(entry: Expr, scope: ValueScope): number | undefined {
  let negate = false;
  let node = entry;
  if (node.kind === 'unary') {
    negate = node.op === '-';
    node = node.operand;
  }
  let value: number | undefined;
  if (node.kind === 'number') {
    if (node.unit || node.imaginary) return undefined;
    value = node.value;
  } else if (node.kind === 'name' && node.name !== 'pi') {
    const named = scope.lookup(node.name);
    if (!named || named.kind !== 'scalar' || named.value.im !== 0) return undefined;
    value = named.value.re;
  }
  if (value === undefined || !Number.isFinite(value)) return undefined;
  return negate ? -value : value;
}

/** The range from the start of one range to the end of another. */
export function spanRange(from: Range, to: Range): Range {
  return { start: from.start, end: to.end };
}

export function plural(count: number, singular: string, pluralForm = singular + 's'): string {
  return `${count} ${count === 1 ? singular : pluralForm}`;
}

export interface ShapeExpectation {
  name: string;
  rows: number;
  cols: number;
  /** "the plant declares 2 states (theta, omega)" */
  rowReason: string;
  colReason: string;
  /** Which code to use for a column mismatch: a declared width, or only the other rows. */
  makeDiagnostic: (range: Range, message: string, data: { fix: string; expectedRows: number; expectedCols: number }) => Diagnostic;
}

/**
 * Checks a sourced matrix against its expected shape. Extra rows or entries are reported at
 * exactly the extra text; a short row at that row; a wrong-sized computed matrix at its
 * expression. Returns true when the shape is right.
 */
export function checkShape(matrix: SourcedMatrix, expect: ShapeExpectation, out: Diagnostic[]): boolean {
  const { rows, source } = matrix;
  const { name } = expect;
  const resize = { fix: 'resize-matrix', expectedRows: expect.rows, expectedCols: expect.cols };
  if (!matrix.literal) {
    const found = rows.length;
    const width = rows[0]?.length ?? 0;
    if (found === expect.rows && width === expect.cols) return true;
    const reasons = [...new Set([found !== expect.rows ? expect.rowReason : '', width !== expect.cols ? expect.colReason : ''])]
      .filter(Boolean)
      .join(' and ');
    out.push(expect.makeDiagnostic(source.range, `${name} is ${found}×${width} but must be ${expect.rows}×${expect.cols}: ${reasons}`, resize));
    return false;
  }
  let ok = true;
  if (rows.length > expect.rows) {
    ok = false;
    out.push(
      expect.makeDiagnostic(
        spanRange(source.rowRanges[expect.rows]!, source.rowRanges[rows.length - 1]!),
        `${name} has ${plural(rows.length, 'row')} but ${expect.rowReason}`,
        resize,
      ),
    );
  } else if (rows.length < expect.rows) {
    ok = false;
    const last = source.rowRanges[rows.length - 1];
    out.push(
      expect.makeDiagnostic(last ?? source.range, `${name} has ${plural(rows.length, 'row')} but ${expect.rowReason}`, resize),
    );
  }
  const checkedRows = Math.min(rows.length, expect.rows);
  for (let i = 0; i < checkedRows; i++) {
    const count = rows[i]!.length;
    if (count === expect.cols) continue;
    ok = false;
    const where = rows.length === 1 ? name : `row ${i + 1} of ${name}`;
    const range =
      count > expect.cols
        ? spanRange(source.entryRanges[i]![expect.cols]!, source.entryRanges[i]![count - 1]!)
        : source.rowRanges[i]!;
    out.push(expect.makeDiagnostic(range, `${where} has ${plural(count, 'entry', 'entries')} but ${expect.colReason}`, resize));
  }
  return ok;
}

/** Real rows with nulls replaced by zeros (only used when the plant is already unusable). */
export function filled(rows: (number | null)[][]): number[][] {
  return rows.map((row) => row.map((x) => x ?? 0));
}

export function zeros(rows: number, cols: number): number[][] {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
}
