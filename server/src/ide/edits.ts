// Plain edit records shared by quick fixes, rename and formatting.
import type { Range } from '../../../grammar/src/ast';

export interface TextEdit {
  range: Range;
  newText: string;
}

/** Applies edits (non-overlapping, any order) to a text; used by tests and the CLI's --fix. */
export function applyEdits(text: string, edits: TextEdit[], offsetAt: (text: string, p: Range['start']) => number): string {
  const resolved = edits
    .map((edit) => ({ start: offsetAt(text, edit.range.start), end: offsetAt(text, edit.range.end), newText: edit.newText }))
    .sort((a, b) => b.start - a.start || b.end - a.end);
  let result = text;
  for (const edit of resolved) result = result.slice(0, edit.start) + edit.newText + result.slice(edit.end);
  return result;
}
