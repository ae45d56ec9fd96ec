// Large all-number matrices skip the expression rules (see grammar/src/plainMatrix.ts); the tree
// must be exactly what the grammar builds, and anything unusual must fall back to the grammar.
import { describe, expect, it } from 'vitest';
import { parsePlantText } from '../../grammar/src/parser';

function matrixText(rows: number, columns: number, entry: (i: number, j: number) => string): string {
  const lines: string[] = [];
  for (let i = 0; i < rows; i++) lines.push(Array.from({ length: columns }, (_, j) => entry(i, j)).join(', '));
  return `[${lines.join(';\n       ')}]`;
}

describe('folding of plain-number matrices', () => {
  const documents = [
    `plant big {\n  A = ${matrixText(12, 12, (i, j) => (i === j ? '-1.5' : (i + j) % 5 === 0 ? '+0.25' : '0'))}\n  B = ${matrixText(12, 1, () => '2j')}\n}\n`,
    `plant rows {\n  A = [${Array(80).fill('1').join(', ')};;\n\n ${Array(80).fill('2e-3').join(', ')}\n]\n}\n`,
    // Not plain (a name, a missing comma, a unit, a trailing comma): must give the grammar's result and errors.
    `plant mixed {\n  A = [${Array(70).fill('1').join(', ')}, x]\n  B = [${Array(70).fill('1').join(', ')} 2]\n  C = [${Array(70).fill('1').join(', ')}, 5 ms]\n  D = [${Array(70).fill('1').join(', ')},]\n}\n`,
  ];
  for (const [index, text] of documents.entries()) {
    it(`gives the same tree and diagnostics with and without folding (document ${index + 1})`, () => {
      const folded = parsePlantText(text, { foldMinEntries: 1 });
      const grammarOnly = parsePlantText(text, { foldMinEntries: Number.POSITIVE_INFINITY });
      expect(folded).toEqual(grammarOnly);
    });
  }

  it('reports errors in non-plain large matrices', () => {
    expect(parsePlantText(documents[2]).diagnostics.map((d) => d.code)).toEqual([
      'syntax/missing-token',
      'syntax/missing-expression',
    ]);
  });
});
