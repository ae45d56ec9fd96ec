// Moves ranges along with an incremental edit, so diagnostics of the previous analysis stay
// where their text went while the next analysis runs (instead of vanishing and reappearing).
import type { Position, Range } from '../../../grammar/src/ast';

export interface ContentChange {
  range: Range;
  text: string;
}

function before(a: Position, b: Position): boolean {
  return a.line < b.line || (a.line === b.line && a.character < b.character);
}

function endOfInsertion(start: Position, text: string): Position {
  const lines = text.split(/\r\n|\r|\n/);
  if (lines.length === 1) return { line: start.line, character: start.character + text.length };
  return { line: start.line + lines.length - 1, character: lines[lines.length - 1].length };
}

function shiftPosition(position: Position, change: ContentChange, insertedEnd: Position): Position {
  const { end } = change.range;
  if (before(position, change.range.start)) return position;
  return {
    line: position.line - end.line + insertedEnd.line,
    character: position.line === end.line ? position.character - end.character + insertedEnd.character : position.character,
  };
}

/** The range after the change, or null when the change touched its inside. */
export function shiftRange(range: Range, change: ContentChange): Range | null {
  const changed = change.range;
  // Overlap (touching ends allowed): the range's meaning may have changed, so drop it.
  if (before(changed.start, range.end) && before(range.start, changed.end)) return null;
  const insertedEnd = endOfInsertion(changed.start, change.text);
  return { start: shiftPosition(range.start, change, insertedEnd), end: shiftPosition(range.end, change, insertedEnd) };
}
