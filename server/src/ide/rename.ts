// Rename a plant, controller, param or signal everywhere it is meant (scoped: a param `k` in one
// plant is not the `k` of another; a controller's `track y` follows its plant's output `y`).
import type { Position, Range } from '../../../grammar/src/ast';
import { CONSTANT_NAMES, FUNCTION_NAMES, KEYWORDS, UNIT_NAMES } from '../../../grammar/src/tokens';
import type { FastCheck } from '../analyze';
import type { TextEdit } from './edits';
import { occurrenceAtOffset, occurrencesOf, symbolIndex } from './symbolIndex';
import { offsetAt } from './text';

export type RenameResult = { edits: TextEdit[] } | { error: string };

const NAME = /^[A-Za-z_\u00C0-\u00D6\u00D8-\u00F6\u00F8-\u024F\u0370-\u03FF][A-Za-z_0-9\u00C0-\u00D6\u00D8-\u00F6\u00F8-\u024F\u0370-\u03FF]*$/;
const RESERVED: ReadonlySet<string> = new Set<string>([...KEYWORDS]);
const FIXED_MEANING: ReadonlySet<string> = new Set<string>([...FUNCTION_NAMES, ...CONSTANT_NAMES, ...UNIT_NAMES]);

/** The range of the renameable name under the cursor, or null when there is none. */
export function prepareRename(fast: FastCheck, position: Position): { range: Range; placeholder: string } | null {
  const occurrence = occurrenceAtOffset(symbolIndex(fast.parse.document), offsetAt(fast.text, position));
  if (!occurrence?.definition) return null;
  return { range: occurrence.range, placeholder: occurrence.name };
}

export function renameAt(fast: FastCheck, position: Position, newName: string): RenameResult {
  const index = symbolIndex(fast.parse.document);
  const occurrence = occurrenceAtOffset(index, offsetAt(fast.text, position));
  const definition = occurrence?.definition;
  if (!definition) return { error: 'Nothing to rename here: put the cursor on a plant, controller, param or signal name.' };
  if (!NAME.test(newName)) return { error: `\`${newName}\` is not a valid name.` };
  if (RESERVED.has(newName)) return { error: `\`${newName}\` is a reserved word.` };
  if (FIXED_MEANING.has(newName)) return { error: `\`${newName}\` already means a function, constant or unit.` };
  if (newName === definition.name) return { edits: [] };
  if (definition.kind === 'plant' || definition.kind === 'controller') {
    const clash = index.definitions.find((other) => other.kind === definition.kind && other.name === newName);
    if (clash) return { error: `A ${definition.kind} named \`${newName}\` already exists (line ${clash.range.start.line + 1}).` };
  } else {
    const scope = index.scopeOf(definition.declarationIndex);
    const clash = scope.get(newName);
    if (clash) return { error: `\`${newName}\` is already declared in this plant (line ${clash.range.start.line + 1}).` };
    if (/^[A-E]$/.test(newName)) return { error: `\`${newName}\` names a model matrix.` };
  }
  return {
    edits: occurrencesOf(index, definition).map((occurrence) => ({ range: occurrence.range, newText: newName })),
  };
}
