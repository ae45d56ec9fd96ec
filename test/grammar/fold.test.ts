// Large matrices of numbers and short name expressions are read in one piece (see
// grammar/src/plainMatrix.ts); the tree
// must be exactly what the grammar builds, the values exactly what JavaScript's own
// string-to-number conversion gives, and anything unusual must fall back to the grammar.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { MatrixAssign, PlantDecl } from '../../grammar/src/ast';
import { parsePlantText } from '../../grammar/src/parser';
import { checkDocument } from '../../server/src/model/check';

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
    // Simple entries of a non-plain matrix (signed numbers and names) and everything near them.
    `plant ladder {\n  A = [-k - h, k, 0;\n       k, -2*k, k; 0, +k, -k - h]\n  B = [g; -0; 0]\n  C = [pi, -pi, +x, 2j, -3j, 5 ms, 1e3, sin(1), a(2), - 1, --1, -2^2, (3), k\n  ]\n  D = [1 2, x y; , 3,; 4 5 %]\n}\n`,
    `plant mixed {\n  A = [${Array(70).fill('1').join(', ')}, x]\n  B = [${Array(70).fill('1').join(', ')} 2]\n  C = [${Array(70).fill('1').join(', ')}, 5 ms]\n  D = [${Array(70).fill('1').join(', ')},]\n}\n`,
  ];
  for (const [index, text] of documents.entries()) {
    it(`gives the same tree and diagnostics with and without folding (document ${index + 1})`, () => {
      const folded = parsePlantText(text, { foldMinEntries: 1 });
      const grammarOnly = parsePlantText(text, { foldMinEntries: Number.POSITIVE_INFINITY });
      expect(folded).toEqual(grammarOnly);
    });
  }

  it('gives the same checked model and model diagnostics with and without folding', () => {
    // Ragged rows and an extra row: the shape diagnostics must point at the same entries.
    const ragged = `plant shaped {\n  states ${Array.from({ length: 9 }, (_, i) => `x${i + 1}`).join(', ')}\n  inputs u\n  outputs y\n` +
      `  A = ${matrixText(10, 9, (i, j) => (i === 3 && j === 8 ? '1, 2, 3' : String(i - j)))}\n` +
      `  B = ${matrixText(9, 1, () => '1')}\n  C = ${matrixText(1, 9, () => '-0')}\n}\n`;
    for (const text of [...documents, ragged]) {
      const folded = checkDocument(parsePlantText(text, { foldMinEntries: 1 }));
      const grammarOnly = checkDocument(parsePlantText(text, { foldMinEntries: Number.POSITIVE_INFINITY }));
      expect(JSON.parse(JSON.stringify(folded))).toEqual(JSON.parse(JSON.stringify(grammarOnly)));
    }
    const codes = checkDocument(parsePlantText(ragged)).diagnostics.map((d) => d.code);
    expect(codes.length).toBeGreaterThan(0);
  });

  it('gives the grammar\'s tree and diagnostics for any edit of a large matrix (random insertions and deletions)', () => {
    const big = matrixText(9, 9, (i, j) => (i === j ? '-2.5e-1' : (i * j) % 4 === 1 ? '+1' : '0'));
    const bases = [
      `plant edited {\n  states a, b\n  A = ${big}\n  B = [1; 2]\n}\n`,
      `plant p {\n  A = [0]\n}\ncontroller c for p {\n  poles = ${big}\n  lqr Q = ${big}, R = [1]\n}\n`,
      `plant ${big} {\n  A = ${big}\n}\n${big}\n`,
    ];
    const edit = fc.tuple(fc.nat(), fc.boolean(), fc.constantFrom(...'0123456789.,;-+eEjx[] \n#(*=A{}'));
    fc.assert(
      fc.property(fc.constantFrom(...bases), fc.array(edit, { minLength: 0, maxLength: 6 }), (base, edits) => {
        let text = base;
        for (const [position, insert, character] of edits) {
          const at = position % (text.length + 1);
          text = insert ? text.slice(0, at) + character + text.slice(at) : text.slice(0, at) + text.slice(at + 1);
        }
        expect(parsePlantText(text, { foldMinEntries: 1 })).toEqual(parsePlantText(text, { foldMinEntries: Number.POSITIVE_INFINITY }));
      }),
      { numRuns: 1500 },
    );
  });

  it('gives the grammar\'s tree and checked model for matrices of short name expressions (random entries)', () => {
    // Operands, operators and blanks in any order: well-formed sums and products of names and
    // numbers fold; everything else (two operators, a unit, a keyword, `2k`, a bracket) must fall
    // back to the grammar with its diagnostics. Either way the result must be the grammar's.
    const goodOperand = fc.constantFrom('k', 'h', 'g', 'θ', 'k2', 'pi', 'ms', 'x1', '0', '2', '2.5e-3', '.5', '1e3', '7.');
    const badOperand = fc.constantFrom('step', '2k', '3j', '1e', '(k)', 'sin(k)', '5 ms', '2 %', "k'", '[1]');
    const goodOperator = fc.constantFrom('+', '-', '*', '/', '^');
    const badOperator = fc.constantFrom('', ' ', '--', '*-', '^-', '(', "'", '%', '=');
    const blank = fc.constantFrom('', '', ' ', '  ', '\t');
    const expression = (operand: fc.Arbitrary<string>, operator: fc.Arbitrary<string>) =>
      fc
        .tuple(fc.constantFrom('', '', '-', '+', '- '), operand, fc.array(fc.tuple(blank, operator, blank, operand), { maxLength: 3 }))
        .map(([sign, first, rest]) => sign + first + rest.map(([before, op, after, next]) => before + op + after + next).join(''));
    // Mostly well-formed entries, so that about a third of the matrices fold; the rest hold a bad one.
    const entry = fc.oneof(
      { arbitrary: expression(goodOperand, goodOperator), weight: 60 },
      { arbitrary: expression(fc.oneof(goodOperand, badOperand), fc.oneof(goodOperator, badOperator)), weight: 1 },
    );
    const plant = (entries: string[], columns: number) => {
      const rows: string[] = [];
      for (let i = 0; i < entries.length; i += columns) rows.push(entries.slice(i, i + columns).join(', '));
      return `plant p {\n  param k = 0.5\n  param h = 0.05\n  param g = 1\n  param θ = 2\n  param k2 = 3\n  param x1 = 4\n  states ${Array.from({ length: columns }, (_, i) => `s${i + 1}`).join(', ')}\n  inputs u\n  A = [${rows.join(';\n       ')}]\n  B = [${Array(columns).fill('1').join('; ')}]\n}\n`;
    };
    let foldedCount = 0;
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 6 }), fc.array(entry, { minLength: 36, maxLength: 36 }), (columns, entries) => {
        const text = plant(entries, columns);
        const folded = parsePlantText(text, { foldMinEntries: 1 });
        const A = ((folded.document.declarations[0] as PlantDecl).items.find((item) => item.kind === 'matrixAssign') as MatrixAssign | undefined)?.value;
        if (A?.kind === 'matrix' && A.plain && A.plain.expressions.size > 0) foldedCount++;
        expect(folded).toEqual(parsePlantText(text, { foldMinEntries: Number.POSITIVE_INFINITY }));
        const checked = checkDocument(folded);
        const grammarChecked = checkDocument(parsePlantText(text, { foldMinEntries: Number.POSITIVE_INFINITY }));
        expect(JSON.parse(JSON.stringify(checked))).toEqual(JSON.parse(JSON.stringify(grammarChecked)));
      }),
      { numRuns: 400 },
    );
    // The property says something only if expression matrices did fold.
    expect(foldedCount).toBeGreaterThan(40);
  });

  it('folds a parameter-dependent matrix (the rod of the benchmark) and reads its entries from the expressions', () => {
    const row = (i: number) => Array.from({ length: 10 }, (_, j) => (i === j ? (i === 0 ? '-k - h' : '-2*k') : Math.abs(i - j) === 1 ? 'k' : '0')).join(', ');
    const text = `plant rod {\n  param k = 0.5\n  param h = 0.05\n  states ${Array.from({ length: 10 }, (_, i) => `T${i + 1}`).join(', ')}\n  inputs q\n  A = [${Array.from({ length: 10 }, (_, i) => row(i)).join(';\n       ')}]\n  B = [${['1', ...Array(9).fill('0')].join('; ')}]\n}\n`;
    const parsed = parsePlantText(text);
    const matrix = ((parsed.document.declarations[0] as PlantDecl).items.find((item) => item.kind === 'matrixAssign') as MatrixAssign).value;
    if (matrix.kind !== 'matrix' || !matrix.plain) throw new Error('expected a folded matrix');
    expect(matrix.plain.expressions.size).toBe(28); // 10 diagonal and 18 neighbour entries
    const A = checkDocument(parsed).plants[0].A;
    // Hand values: −k − h = −0.55 in the corner, −2k = −1 on the diagonal, k = 0.5 beside it.
    expect(A[0][0]).toBeCloseTo(-0.55, 15);
    expect(A[4][4]).toBe(-1);
    expect(A[4][5]).toBe(0.5);
    expect(A[4][7]).toBe(0);
  });

  it('merges adjacent bad characters as the grammar does, also where a plain matrix could follow (fast-check counterexample)', () => {
    // The lexer's error recovery tries the folded-matrix pattern at each skipped character; it
    // must not start a matrix at the second `.` of `..` (only a `[` does).
    const row = (i: number) => Array.from({ length: 9 }, (_, j) => (i === j ? '-2.5e-1' : '0')).join(', ');
    const text = `0plant edited {\n  A = [${row(0)};\n       ${row(1).replace(', -2.5e-1', ',.. -2.5e-1')};\n       ${row(2)}]\n}\n`;
    const folded = parsePlantText(text, { foldMinEntries: 1 });
    expect(folded).toEqual(parsePlantText(text, { foldMinEntries: Number.POSITIVE_INFINITY }));
    expect(folded.diagnostics.filter((d) => d.code === 'syntax/bad-character').map((d) => d.message)).toEqual(['unexpected characters `..`']);
  });

  it('reads every number literal as JavaScript does (reference: ECMAScript Number(string))', () => {
    const digits = fc.string({ unit: fc.constantFrom(...'0123456789'), minLength: 1, maxLength: 22 });
    const literal = fc
      .tuple(digits, fc.option(fc.string({ unit: fc.constantFrom(...'0123456789'), maxLength: 22 })), fc.option(fc.tuple(fc.constantFrom('e', 'E'), fc.constantFrom('', '+', '-'), fc.integer({ min: 0, max: 400 }))))
      .map(([whole, fraction, exponent]) => `${whole}${fraction === null ? '' : `.${fraction}`}${exponent === null ? '' : `${exponent[0]}${exponent[1]}${exponent[2]}`}`);
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.constantFrom('', '-', '+', '- '), literal), { minLength: 64, maxLength: 100 }), (entries) => {
        const text = `plant p {\n  A = [${entries.map(([sign, value]) => sign + value).join(', ')}]\n}\n`;
        const plant = parsePlantText(text).document.declarations[0] as PlantDecl;
        const matrix = (plant.items[0] as MatrixAssign).value;
        if (matrix.kind !== 'matrix' || !matrix.plain) throw new Error('expected a folded matrix');
        entries.forEach(([sign, value], k) => {
          const expected = sign.startsWith('-') ? -Number(value) : Number(value);
          expect(Object.is(matrix.plain!.values[k], expected)).toBe(true);
        });
      }),
      { numRuns: 300 },
    );
  });

  it('reports errors in non-plain large matrices', () => {
    expect(parsePlantText(documents.find((text) => text.startsWith('plant mixed'))!).diagnostics.map((d) => d.code)).toEqual([
      'syntax/missing-token',
      'syntax/missing-expression',
    ]);
  });
});
