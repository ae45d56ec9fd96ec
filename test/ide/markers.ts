// Cursor markers for ide tests: `|` marks the cursor in a fixture text.
import type { Position } from '../../grammar/src/ast';
import { applyEdits, type TextEdit } from '../../server/src/ide/edits';
import { offsetAt } from '../../server/src/ide/text';

export function cursor(marked: string): { text: string; position: Position } {
  const offset = marked.indexOf('|');
  if (offset < 0) throw new Error('fixture has no | marker');
  const text = marked.slice(0, offset) + marked.slice(offset + 1);
  const lines = text.slice(0, offset).split('\n');
  return { text, position: { line: lines.length - 1, character: lines[lines.length - 1].length } };
}

export function apply(text: string, edits: TextEdit[]): string {
  return applyEdits(text, edits, offsetAt);
}

export const HOIST = `plant hoist {
  param J  = 0.012      # inertia, kg m^2
  param b  = 0.004
  param kt = 0.08
  param r  = 0.05

  states  theta, omega
  inputs  current
  outputs height

  A = [0, 1;
       0, -b/J]
  B = [0; kt/J]
  C = [r, 0]
}

controller lift for hoist {
  poles = [-4 + 3j, -4 - 3j]
  track height
  step height to 0.2
}
`;
