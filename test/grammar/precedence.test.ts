// Operator precedence and associativity as the language defines them: `^` binds tightest and is
// right-associative, then unary signs, then `* /`, then `+ -` (both left-associative).
import { describe, expect, it } from 'vitest';
import type { Expr, PlantDecl } from '../../grammar/src/ast';
import { parsePlantText } from '../../grammar/src/index';

function show(expr: Expr): string {
  switch (expr.kind) {
    case 'number':
      return expr.unit ? `${expr.text}[${expr.unit.name}]` : expr.text;
    case 'name':
      return expr.name;
    case 'unary':
      return `(${expr.op}${show(expr.operand)})`;
    case 'binary':
      return `(${show(expr.left)} ${expr.op} ${show(expr.right)})`;
    case 'call':
      return `${expr.callee.name}(${expr.args.map(show).join(', ')})`;
    case 'matrix':
      return `[${expr.rows.map((row) => row.entries.map(show).join(', ')).join('; ')}]`;
    case 'error':
      return '<error>';
  }
}

function parseValue(source: string): { value: string; diagnostics: string[] } {
  const result = parsePlantText(`plant p {\n  param v = ${source}\n}\n`);
  const item = (result.document.declarations[0] as PlantDecl).items[0];
  if (item.kind !== 'param') throw new Error('expected a parameter');
  return { value: show(item.value), diagnostics: result.diagnostics.map((d) => d.code) };
}

describe('precedence', () => {
  const cases: [string, string][] = [
    ['-2^2', '(-(2 ^ 2))'],
    ['2^3^2', '(2 ^ (3 ^ 2))'],
    ['a - b - c', '((a - b) - c)'],
    ['a / b * c', '((a / b) * c)'],
    ['1 + 2 * 3', '(1 + (2 * 3))'],
    ['(1 + 2) * 3', '((1 + 2) * 3)'],
    ['-a * b', '((-a) * b)'],
    ['2^-1', '(2 ^ (-1))'],
    ['-2^-2^2', '(-(2 ^ (-(2 ^ 2))))'],
    ['a^b*c', '((a ^ b) * c)'],
    ['- - a', '(-(-a))'],
    ['+3', '(+3)'],
    ['sin(a)^2', '(sin(a) ^ 2)'],
    ['[1, -2; a*b, 3]', '[1, (-2); (a * b), 3]'],
    ['zeros(2, 3)', 'zeros(2, 3)'],
    ['identity()', 'identity()'],
  ];
  for (const [source, expected] of cases) {
    it(`${source} → ${expected}`, () => {
      expect(parseValue(source)).toEqual({ value: expected, diagnostics: [] });
    });
  }
});

describe('units after numbers', () => {
  it('attaches a unit written after a number on the same line', () => {
    expect(parseValue('5 ms').value).toBe('5[ms]');
    expect(parseValue('200 Hz').value).toBe('200[Hz]');
    expect(parseValue('5 %').value).toBe('5[%]');
    expect(parseValue('2s + 1').value).toBe('(2[s] + 1)');
  });

  it('covers number and unit with the node range and gives the unit its own range', () => {
    const result = parsePlantText('controller c for p {\n  sample 200 Hz\n}\n');
    const line = result.document.declarations[0].items[0];
    if (line.kind !== 'sample' || line.value.kind !== 'number') throw new Error('expected sample number');
    expect(line.value.value).toBe(200);
    expect(line.value.range).toEqual({ start: { line: 1, character: 9 }, end: { line: 1, character: 15 } });
    expect(line.value.unit?.range).toEqual({ start: { line: 1, character: 13 }, end: { line: 1, character: 15 } });
  });

  it('does not take a name that is not a unit, nor a unit on the next line', () => {
    expect(parseValue('2 * x').value).toBe('(2 * x)');
    const split = parseValue('(2\n s)');
    expect(split.value).toBe('2');
    expect(split.diagnostics.length).toBeGreaterThan(0);
  });
});

describe('literals', () => {
  it('reads exponents and imaginary literals', () => {
    const result = parsePlantText('plant p {\n  param a = [1.5e-3, 3j, 2.5i, 1e-3j, .5]\n}\n');
    const item = (result.document.declarations[0] as PlantDecl).items[0];
    if (item.kind !== 'param' || item.value.kind !== 'matrix') throw new Error('expected matrix');
    const entries = item.value.rows[0].entries.map((e) => (e.kind === 'number' ? [e.value, e.imaginary] : null));
    expect(entries).toEqual([
      [1.5e-3, false],
      [3, true],
      [2.5, true],
      [1e-3, true],
      [0.5, false],
    ]);
  });
});

describe('a unit followed by a power', () => {
  it('keeps (2 s)^2 as written and warns that only s may have been meant', () => {
    const result = parsePlantText('plant p {\n  transfer = 1 / (2 s^2 + 1)\n}\n');
    const item = (result.document.declarations[0] as PlantDecl).items[0];
    if (item.kind !== 'transfer') throw new Error('expected transfer');
    expect(show(item.value)).toBe('(1 / ((2[s] ^ 2) + 1))');
    expect(result.diagnostics.map((d) => [d.severity, d.code, d.range.start.character, d.range.end.character])).toEqual([
      ['warning', 'syntax/unit-power', 18, 21],
    ]);
    expect(result.diagnostics[0].message).toContain('2*s^');
  });
});
