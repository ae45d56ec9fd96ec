// Large all-number matrices, read at the character level. A 200-state plant has a 40,000-entry
// A matrix; lexing every number, comma and row break and building eight objects per entry
// dominated parse time. When the bracket contents are only signed real number literals,
// commas, spaces and row breaks, and are well formed, the parse lexer produces one
// `PlainNumberMatrix` token for the whole bracket (see tokens.ts) carrying the scanned values
// and offsets. The parser turns it into a `MatrixExpr` whose `rows` are built on first use,
// identical to what the expression rules would build; the model reads `plain.values` directly.
// Anything unusual (a name, a unit, an imaginary literal, a comment, a missing or extra comma)
// makes the scan give up, and the ordinary tokens and grammar take over, reporting any errors.
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

/** What the scan found: entry values and where each entry's sign and digits are. */
export interface PlainMatrixScan {
  /** Offset just past the closing `]`. */
  end: number;
  values: Float64Array;
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
export function scanPlainMatrix(text: string, open: number, minEntries: number): PlainMatrixScan | undefined {
  // Growable typed buffers: plain arrays plus `Float64Array.from` cost four times as much here.
  let capacity = 256;
  let values = new Float64Array(capacity);
  let offsets = new Int32Array(3 * capacity); // sign start, number start, number end per entry
  let count = 0;
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
    if (end < 0 || (end < length && !endsEntry(text.charCodeAt(end)))) return undefined;
    if (count === capacity) {
      capacity *= 2;
      const grownValues = new Float64Array(capacity);
      grownValues.set(values);
      values = grownValues;
      const grownOffsets = new Int32Array(3 * capacity);
      grownOffsets.set(offsets);
      offsets = grownOffsets;
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
  const plain: PlainMatrixEntries = { values: scan.values, rowLengths: scan.rowLengths };
  Object.defineProperty(node, 'plain', { value: plain, enumerable: false });
  defineLazyProperty(node, 'rows', () => buildRows(scan, lines));
  return node;
}

function buildRows(scan: PlainMatrixScan, lines: LineIndex): MatrixRow[] {
  const rows: MatrixRow[] = [];
  let index = 0;
  for (const rowLength of scan.rowLengths) {
    const entries: Expr[] = [];
    for (let k = 0; k < rowLength; k++, index++) {
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
