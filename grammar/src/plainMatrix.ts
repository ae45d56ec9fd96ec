// Large matrices, read at the character level. A 200-state plant has a 40,000-entry A matrix;
// lexing every number, comma and row break and building eight objects per entry dominated parse
// time. When the bracket contents are only signed real number literals and short sums and
// products of names and numbers (`-k - h`, `2*k`, `g/m`), separated by commas, spaces and row
// breaks, and are well formed, the parse lexer produces one `PlainNumberMatrix` token for the
// whole bracket (see tokens.ts) carrying the scanned values, offsets and expression lexemes. The
// parser turns it into a `MatrixExpr` whose `rows` are built on first use, identical to what the
// expression rules would build: expression entries get their trees at once, from the node
// builder below, which applies the grammar's own precedence (expression → term → unary → power →
// primary in parser.ts). The model reads `plain.values` directly and evaluates only those trees.
// Anything unusual (brackets, calls, a unit, an imaginary literal, two signs in a row, a reserved
// word, a comment, a missing or extra comma) makes the scan give up, and the ordinary tokens and
// grammar take over, reporting any errors.
import type { Expr, MatrixExpr, MatrixRow, NumberExpr, PlainMatrixEntries } from './ast';
import { defineLazyProperty } from './lazyProperty';
import type { LineIndex } from './positions';

/** Smaller matrices go through the grammar (cheap, and keeps that path exercised). */
export const FOLD_MIN_ENTRIES = 64;

/** Entry count from which the parse lexer folds a matrix; tests set 1 or Infinity. */
let foldThreshold = FOLD_MIN_ENTRIES;
export function setFoldThreshold(minEntries: number): void {
  foldThreshold = minEntries;
}
export function foldThresholdNow(): number {
  return foldThreshold;
}

/** Kinds of the lexemes of an expression entry, as recorded by the scan. */
const LEXEME_NUMBER = 0;
const LEXEME_NAME = 1;
const OPERATORS = '+-*/^';

/** Longest expression entry read by the scan (its tree then stays far below the depth limit). */
const MAX_ENTRY_OPERANDS = 32;

/**
 * The names an entry may use: end offset of the name starting at `start`, or -1 when none starts
 * there or it is a reserved word (tokens.ts supplies it, with the lexer's own name rule).
 */
export type NameEnd = (text: string, start: number) => number;

/** What the scan found: entry values and where each entry's sign and digits are. */
export interface PlainMatrixScan {
  /** Offset just past the closing `]`. */
  end: number;
  /** Entry values; NaN for an expression entry (see `expressions`). */
  values: Float64Array;
  /**
   * Expression entries: their index in `values` and their lexemes as (kind, start, end) triples,
   * kind LEXEME_NUMBER, LEXEME_NAME or an operator's index in OPERATORS plus 2.
   */
  expressions: { index: number; lexemes: number[] }[];
  /** Offset of the entry's `+`/`-`, or -1 when it has none. */
  signStarts: Int32Array;
  numberStarts: Int32Array;
  numberEnds: Int32Array;
  /** Entry count of each non-empty row, in order. */
  rowLengths: Int32Array;
}

const SPACE = 32;
const TAB = 9;
const LF = 10;
const CR = 13;
const COMMA = 44;
const SEMICOLON = 59;
const CLOSE = 93;
const PLUS = 43;
const MINUS = 45;
const DOT = 46;
const isDigit = (code: number): boolean => code >= 48 && code <= 57;
const isBlank = (code: number): boolean => code === SPACE || code === TAB;
const separatesEntries = (code: number): boolean => code === COMMA || code === SEMICOLON || code === LF || code === CR || code === CLOSE;
const endsEntry = (code: number): boolean =>
  code === SPACE || code === TAB || code === COMMA || code === SEMICOLON || code === LF || code === CR || code === CLOSE;

/** End offset of the number literal at `start` (same rule as the NumberLiteral token), or -1. */
function numberEnd(text: string, start: number): number {
  let i = start;
  let digits = 0;
  while (isDigit(text.charCodeAt(i))) {
    i++;
    digits++;
  }
  if (text.charCodeAt(i) === DOT) {
    i++;
    while (isDigit(text.charCodeAt(i))) {
      i++;
      digits++;
    }
  }
  if (digits === 0) return -1;
  const e = text.charCodeAt(i);
  if (e === 101 /* e */ || e === 69 /* E */) {
    let j = i + 1;
    const sign = text.charCodeAt(j);
    if (sign === PLUS || sign === MINUS) j++;
    if (!isDigit(text.charCodeAt(j))) return -1; // `1e` then a name: not plain
    while (isDigit(text.charCodeAt(j))) j++;
    i = j;
  }
  return i;
}

/** Exact powers of ten representable in a double (10^0 … 10^22). */
const EXACT_POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * Value of the literal text[start, end). Clinger's fast path (1990): with at most 15 digits the
 * digits form an exact integer, and one multiplication or division by an exact power of ten is
 * correctly rounded, so the result equals `Number(text)`; anything else goes to `Number`.
 */
function literalValue(text: string, start: number, end: number): number {
  let digits = 0;
  let mantissa = 0;
  let scale = 0;
  let afterDot = false;
  let i = start;
  for (; i < end; i++) {
    const code = text.charCodeAt(i);
    if (code === DOT) {
      afterDot = true;
      continue;
    }
    if (!isDigit(code)) break;
    mantissa = mantissa * 10 + (code - 48);
    digits++;
    if (afterDot) scale--;
  }
  if (i < end) {
    // exponent: [eE][+-]?digits
    let j = i + 1;
    let negative = false;
    if (text.charCodeAt(j) === MINUS) {
      negative = true;
      j++;
    } else if (text.charCodeAt(j) === PLUS) j++;
    let exponent = 0;
    for (; j < end && exponent < 1000; j++) exponent = exponent * 10 + (text.charCodeAt(j) - 48);
    if (j < end) return Number(text.slice(start, end));
    scale += negative ? -exponent : exponent;
  }
  if (digits > 15 || scale > 22 || scale < -22) return Number(text.slice(start, end));
  return scale >= 0 ? mantissa * EXACT_POWERS_OF_TEN[scale]! : mantissa / EXACT_POWERS_OF_TEN[-scale]!;
}

/**
 * Scan `text[open] = '['` up to its `]`; undefined when the contents are not plain or hold
 * fewer than `minEntries` entries.
 */
export function scanPlainMatrix(text: string, open: number, minEntries: number, nameEnd?: NameEnd): PlainMatrixScan | undefined {
  // Growable typed buffers: plain arrays plus `Float64Array.from` cost four times as much here.
  let capacity = 256;
  let values = new Float64Array(capacity);
  let offsets = new Int32Array(3 * capacity); // sign start, number start, number end per entry
  let count = 0;
  const expressions: PlainMatrixScan['expressions'] = [];
  const rowLengths: number[] = [];
  let rowLength = 0;
  let afterComma = false;
  const length = text.length;
  let i = open + 1;
  while (i < length) {
    const code = text.charCodeAt(i);
    if (code === SPACE || code === TAB) {
      i++;
      continue;
    }
    if (code === LF || code === CR || code === SEMICOLON || code === CLOSE) {
      // A row break (or the end) right after a comma is not plain: the grammar decides.
      if (afterComma) return undefined;
      if (rowLength > 0) rowLengths.push(rowLength);
      rowLength = 0;
      if (code === CLOSE) {
        if (count < minEntries) return undefined;
        return {
          end: i + 1,
          values: values.slice(0, count),
          expressions,
          signStarts: strided(offsets, count, 0),
          numberStarts: strided(offsets, count, 1),
          numberEnds: strided(offsets, count, 2),
          rowLengths: Int32Array.from(rowLengths),
        };
      }
      i++;
      continue;
    }
    if (code === COMMA) {
      if (rowLength === 0 || afterComma) return undefined;
      afterComma = true;
      i++;
      continue;
    }
    // An entry: only at the start of a row or after a comma.
    if (rowLength > 0 && !afterComma) return undefined;
    let signStart = -1;
    let start = i;
    if (code === PLUS || code === MINUS) {
      signStart = i;
      start = i + 1;
      while (text.charCodeAt(start) === SPACE || text.charCodeAt(start) === TAB) start++;
    }
    const end = numberEnd(text, start);
    let after = end;
    while (after >= 0 && isBlank(text.charCodeAt(after))) after++;
    const plainNumber = end >= 0 && (end >= length || endsEntry(text.charCodeAt(end))) && (after >= length || separatesEntries(text.charCodeAt(after)));
    let expression: { next: number; lexemes: number[] } | undefined;
    if (!plainNumber) {
      expression = nameEnd ? scanEntryExpression(text, i, nameEnd) : undefined;
      if (!expression) return undefined;
    }
    if (count === capacity) {
      capacity *= 2;
      const grownValues = new Float64Array(capacity);
      grownValues.set(values);
      values = grownValues;
      const grownOffsets = new Int32Array(3 * capacity);
      grownOffsets.set(offsets);
      offsets = grownOffsets;
    }
    if (expression) {
      values[count] = Number.NaN;
      offsets[3 * count] = -1;
      offsets[3 * count + 1] = i;
      offsets[3 * count + 2] = i;
      expressions.push({ index: count, lexemes: expression.lexemes });
      count++;
      rowLength++;
      afterComma = false;
      i = expression.next;
      continue;
    }
    const magnitude = literalValue(text, start, end);
    values[count] = signStart >= 0 && code === MINUS ? -magnitude : magnitude;
    offsets[3 * count] = signStart;
    offsets[3 * count + 1] = start;
    offsets[3 * count + 2] = end;
    count++;
    rowLength++;
    afterComma = false;
    i = end;
  }
  return undefined;
}

/**
 * An entry `[±] operand (op operand)*` starting at `at`, operands numbers or names, ending where
 * the entry ends (a separator, after blanks); undefined for anything else. Returns the offset of
 * that separator and the lexemes. Only a leading sign: `2*-k` and `2^-1` go to the grammar.
 */
function scanEntryExpression(text: string, at: number, nameEnd: NameEnd): { next: number; lexemes: number[] } | undefined {
  const lexemes: number[] = [];
  let k = at;
  const first = text.charCodeAt(k);
  if (first === PLUS || first === MINUS) {
    lexemes.push(2 + OPERATORS.indexOf(text[k]!), k, k + 1);
    k++;
    while (isBlank(text.charCodeAt(k))) k++;
  }
  for (let operands = 1; operands <= MAX_ENTRY_OPERANDS; operands++) {
    const code = text.charCodeAt(k);
    const isNumber = isDigit(code) || code === DOT;
    const end = isNumber ? numberEnd(text, k) : nameEnd(text, k);
    if (end < 0) return undefined;
    lexemes.push(isNumber ? LEXEME_NUMBER : LEXEME_NAME, k, end);
    k = end;
    // A number must not run into a name (`2k`, `3j`), nor a name into a bracket or a quote.
    const next = text.charCodeAt(k);
    if (!(isBlank(next) || separatesEntries(next) || OPERATORS.includes(text[k] ?? ' '))) return undefined;
    while (isBlank(text.charCodeAt(k))) k++;
    if (k >= text.length) return undefined;
    if (separatesEntries(text.charCodeAt(k))) return { next: k, lexemes };
    const operator = OPERATORS.indexOf(text[k]!);
    if (operator < 0) return undefined;
    lexemes.push(2 + operator, k, k + 1);
    k++;
    while (isBlank(text.charCodeAt(k))) k++;
  }
  return undefined;
}

function strided(offsets: Int32Array, count: number, field: number): Int32Array {
  const out = new Int32Array(count);
  for (let k = 0; k < count; k++) out[k] = offsets[3 * k + field]!;
  return out;
}

/**
 * The tree of a scanned matrix. `rows` is built on first read (exactly the nodes the grammar
 * would build); `plain` holds the values for evaluation and is not enumerable, so the tree
 * reads and compares the same whether or not it was folded.
 */
export function plainMatrixNode(scan: PlainMatrixScan, open: number, lines: LineIndex): MatrixExpr {
  const node = { kind: 'matrix', ...lines.span(open, scan.end) } as MatrixExpr;
  const expressions = new Map<number, Expr>();
  for (const { index, lexemes } of scan.expressions) expressions.set(index, entryTree(lexemes, lines));
  const plain: PlainMatrixEntries = { values: scan.values, rowLengths: scan.rowLengths, expressions };
  Object.defineProperty(node, 'plain', { value: plain, enumerable: false });
  defineLazyProperty(node, 'rows', () => buildRows(scan, expressions, lines));
  return node;
}

/**
 * The tree the grammar builds for a scanned expression entry: `+`/`-` join terms, `*`/`/` join
 * factors, a leading sign applies to the first term's first power, `^` joins from the right
 * (the rules expression, term, unary and power of parser.ts, which the fold tests compare with).
 */
function entryTree(lexemes: number[], lines: LineIndex): Expr {
  const text = lines.text;
  let at = 0;
  const kind = (): number => (at < lexemes.length ? lexemes[at]! : -1);
  const isOperator = (...ops: string[]): boolean => kind() >= 2 && ops.includes(OPERATORS[kind() - 2]!);
  const take = (): { op: string; start: number; end: number } => {
    const lexeme = { op: OPERATORS[lexemes[at]! - 2] ?? '', start: lexemes[at + 1]!, end: lexemes[at + 2]! };
    at += 3;
    return lexeme;
  };
  const binary = (op: string, left: Expr, right: Expr): Expr => ({
    kind: 'binary',
    op: op as '+' | '-' | '*' | '/' | '^',
    left,
    right,
    ...lines.span(left.startOffset, right.endOffset),
  });
  const primary = (): Expr => {
    const isName = kind() === LEXEME_NAME;
    const { start, end } = take();
    const image = text.slice(start, end);
    if (isName) return { kind: 'name', name: image, ...lines.span(start, end) };
    return { kind: 'number', value: Number(image), imaginary: false, text: image, range: lines.range(start, end), startOffset: start, endOffset: end };
  };
  const power = (): Expr => {
    const base = primary();
    const links: { caret: string; operand: Expr }[] = [];
    while (isOperator('^')) links.push({ caret: take().op, operand: primary() });
    if (links.length === 0) return base;
    let exponent = links[links.length - 1]!.operand;
    for (let i = links.length - 2; i >= 0; i--) exponent = binary(links[i + 1]!.caret, links[i]!.operand, exponent);
    return binary(links[0]!.caret, base, exponent);
  };
  const unary = (): Expr => {
    if (!isOperator('+', '-')) return power();
    const sign = take();
    const operand = power();
    return { kind: 'unary', op: sign.op as '+' | '-', operand, ...lines.span(sign.start, operand.endOffset) };
  };
  const term = (): Expr => {
    let left = unary();
    while (isOperator('*', '/')) {
      const { op } = take();
      left = binary(op, left, unary());
    }
    return left;
  };
  let tree = term();
  while (isOperator('+', '-')) {
    const { op } = take();
    tree = binary(op, tree, term());
  }
  return tree;
}

function buildRows(scan: PlainMatrixScan, expressions: ReadonlyMap<number, Expr>, lines: LineIndex): MatrixRow[] {
  const rows: MatrixRow[] = [];
  let index = 0;
  for (const rowLength of scan.rowLengths) {
    const entries: Expr[] = [];
    for (let k = 0; k < rowLength; k++, index++) {
      const expression = expressions.get(index);
      if (expression) {
        entries.push(expression);
        continue;
      }
      const start = scan.numberStarts[index];
      const end = scan.numberEnds[index];
      const text = lines.text.slice(start, end);
      const literal: NumberExpr = {
        kind: 'number',
        value: Number(text),
        imaginary: false,
        text,
        ...lines.span(start, end),
      };
      const signStart = scan.signStarts[index];
      entries.push(
        signStart >= 0
          ? { kind: 'unary', op: lines.text[signStart] as '+' | '-', operand: literal, ...lines.span(signStart, end) }
          : literal,
      );
    }
    const first = entries[0];
    const last = entries[entries.length - 1];
    rows.push({ kind: 'row', entries, ...lines.span(first.startOffset, last.endOffset) });
  }
  return rows;
}
