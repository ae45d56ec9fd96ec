import { describe, expect, it } from 'vitest';
import { shiftRange } from '../../server/src/lsp/shiftRanges';

const range = (l1: number, c1: number, l2: number, c2: number) => ({ start: { line: l1, character: c1 }, end: { line: l2, character: c2 } });

describe('moving diagnostics with an edit', () => {
  it('keeps ranges before the edit, moves those after it, drops those it touches inside', () => {
    const insertLine = { range: range(2, 0, 2, 0), text: 'new line\n' };
    expect(shiftRange(range(1, 2, 1, 5), insertLine)).toEqual(range(1, 2, 1, 5));
    expect(shiftRange(range(4, 2, 4, 5), insertLine)).toEqual(range(5, 2, 5, 5));
    const typeInside = { range: range(4, 3, 4, 3), text: 'x' };
    expect(shiftRange(range(4, 2, 4, 5), typeInside)).toBeNull();
    const sameLineBefore = { range: range(4, 0, 4, 1), text: 'abc' };
    expect(shiftRange(range(4, 2, 4, 5), sameLineBefore)).toEqual(range(4, 4, 4, 7));
    const joinLines = { range: range(3, 7, 4, 0), text: '' };
    expect(shiftRange(range(4, 2, 4, 5), joinLines)).toEqual(range(3, 9, 3, 12));
  });
});
