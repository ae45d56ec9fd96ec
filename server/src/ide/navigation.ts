// Go to definition and find references, by the scoped symbol index.
import type { Position, Range } from '../../../grammar/src/ast';
import type { FastCheck } from '../analyze';
import { occurrenceAtOffset, occurrencesOf, symbolIndex, type Definition } from './symbolIndex';
import { offsetAt } from './text';

/** The definition of the symbol under the cursor (null for keywords, numbers, unknown names). */
export function symbolAt(fast: FastCheck, position: Position): Definition | null {
  const index = symbolIndex(fast.parse.document);
  return occurrenceAtOffset(index, offsetAt(fast.text, position))?.definition ?? null;
}

export function definitionAt(fast: FastCheck, position: Position): Range | null {
  return symbolAt(fast, position)?.range ?? null;
}

export function referencesAt(fast: FastCheck, position: Position, includeDeclaration = true): Range[] {
  const definition = symbolAt(fast, position);
  if (!definition) return [];
  return occurrencesOf(symbolIndex(fast.parse.document), definition)
    .filter((occurrence) => includeDeclaration || occurrence.role !== 'declaration')
    .map((occurrence) => occurrence.range);
}

/** Occurrences to highlight in the editor when the cursor sits on a name. */
export function highlightsAt(fast: FastCheck, position: Position): { range: Range; write: boolean }[] {
  const definition = symbolAt(fast, position);
  if (!definition) return [];
  return occurrencesOf(symbolIndex(fast.parse.document), definition).map((occurrence) => ({
    range: occurrence.range,
    write: occurrence.role === 'declaration',
  }));
}
