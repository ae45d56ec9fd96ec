// Position ↔ offset conversion on the document text (UTF-16 code units, as the editor protocol
// counts). Line starts are cached per text string so every feature shares one scan.
import type { Position, Range } from '../../../grammar/src/ast';
import { LineIndex } from '../../../grammar/src/positions';

const cache = new Map<string, number[]>();
const CACHE_LIMIT = 8;

export function lineStarts(text: string): number[] {
  const cached = cache.get(text);
  if (cached) return cached;
  const starts = new LineIndex(text).lineStarts; // the parser's own line scan
  if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value as string);
  cache.set(text, starts);
  return starts;
}

export function offsetAt(text: string, position: Position): number {
  const starts = lineStarts(text);
  if (position.line < 0) return 0;
  if (position.line >= starts.length) return text.length;
  const lineStart = starts[position.line];
  const nextStart = position.line + 1 < starts.length ? starts[position.line + 1] : text.length;
  return Math.min(lineStart + Math.max(0, position.character), nextStart);
}

export function positionAt(text: string, offset: number): Position {
  const starts = lineStarts(text);
  const clamped = Math.max(0, Math.min(offset, text.length));
  let low = 0;
  let high = starts.length - 1;
  while (low < high) {
    const mid = (low + high + 1) >> 1;
    if (starts[mid] <= clamped) low = mid;
    else high = mid - 1;
  }
  return { line: low, character: clamped - starts[low] };
}

export function rangeOf(text: string, startOffset: number, endOffset: number): Range {
  return { start: positionAt(text, startOffset), end: positionAt(text, endOffset) };
}

/** The text of one line without its line break. */
export function lineText(text: string, line: number): string {
  const starts = lineStarts(text);
  if (line < 0 || line >= starts.length) return '';
  const end = line + 1 < starts.length ? starts[line + 1] : text.length;
  return text.slice(starts[line], end).replace(/\r?\n$|\r$/, '');
}

export function comparePositions(a: Position, b: Position): number {
  return a.line - b.line || a.character - b.character;
}

/** True when `position` lies in `range`, both ends included (a cursor right after a word is on it). */
export function rangeContains(range: Range, position: Position): boolean {
  return comparePositions(range.start, position) <= 0 && comparePositions(position, range.end) <= 0;
}

export function rangesOverlap(a: Range, b: Range): boolean {
  return comparePositions(a.start, b.end) <= 0 && comparePositions(b.start, a.end) <= 0;
}

/** Line break used by the document (the first one found), `\n` by default. */
export function lineBreakOf(text: string): string {
  const match = /\r\n|\r|\n/.exec(text);
  return match ? match[0] : '\n';
}
