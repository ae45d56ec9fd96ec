import { describe, expect, it } from 'vitest';
import { parseMarkers, rangeCoversMarker, unmatchedMarkers } from './markers';

describe('inline diagnostic markers', () => {
  const source = 'plant p {\n  param a 1\n#         ^ expected `=`\n#   ^^^^^\n  states x\n}\n';

  it('reads carets and text relative to the nearest non-marker line above', () => {
    expect(parseMarkers(source)).toEqual([
      { line: 1, startChar: 10, endChar: 11, text: 'expected `=`', markerLine: 2 },
      { line: 1, startChar: 4, endChar: 9, text: '', markerLine: 3 },
    ]);
  });

  it('ignores ordinary comments and lines without carets', () => {
    expect(parseMarkers('# just a comment\nplant p {}\n# no carets here\n')).toEqual([]);
  });

  it('matches a covering range and rejects a range that misses the carets', () => {
    const [marker] = parseMarkers(source);
    const at = (s: number, e: number) => ({ start: { line: 1, character: s }, end: { line: 1, character: e } });
    expect(rangeCoversMarker(at(10, 11), marker)).toBe(true);
    expect(rangeCoversMarker(at(8, 12), marker)).toBe(true);
    expect(rangeCoversMarker(at(10, 10), marker)).toBe(true); // zero width at the caret
    expect(rangeCoversMarker(at(11, 12), marker)).toBe(false);
    expect(rangeCoversMarker({ start: { line: 2, character: 10 }, end: { line: 2, character: 11 } }, marker)).toBe(false);
    expect(unmatchedMarkers([marker], [{ range: at(10, 11), message: 'expected `=` here' }])).toEqual([]);
    expect(unmatchedMarkers([marker], [{ range: at(10, 11), message: 'something else' }])).toEqual([marker]);
  });
});

describe('tree invariant checker', () => {
  it('flags a node whose range disagrees with its offsets, and a diagnostic outside the text', async () => {
    const { parsePlantText } = await import('../../grammar/src/index');
    const { checkTreeInvariants } = await import('./invariants');
    const text = 'plant p {\n  param a = 1\n}\n';
    const result = parsePlantText(text);
    expect(checkTreeInvariants(text, result)).toEqual([]);
    const plant = result.document.declarations[0];
    plant.name.range = { start: { line: 0, character: 7 }, end: { line: 0, character: 8 } };
    result.diagnostics.push({
      severity: 'error',
      code: 'syntax/test',
      message: 'outside',
      range: { start: { line: 9, character: 0 }, end: { line: 9, character: 1 } },
    });
    const problems = checkTreeInvariants(text, result);
    expect(problems.some((p) => p.includes('range does not match'))).toBe(true);
    expect(problems.some((p) => p.includes('outside the document'))).toBe(true);
  });
});
