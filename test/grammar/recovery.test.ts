// Line-level error recovery: an error on one line must be reported on that line and must not
// swallow the following lines; a valid plant after many broken lines still parses completely.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { PlantDecl } from '../../grammar/src/ast';
import { parsePlantText } from '../../grammar/src/index';

const twentyErrors = readFileSync(join(__dirname, '..', 'fixtures', 'parser', 'recovery-twenty-errors.plant'), 'utf8');

describe('recovery from one syntax error per line', () => {
  const result = parsePlantText(twentyErrors);
  const lines = twentyErrors.split('\n');
  const brokenLines = lines
    .map((text, index) => ({ text, index }))
    .filter(({ text, index }) => index >= 2 && index <= 29 && !/^\s*[{}]?\s*$/.test(text) && !text.startsWith('}'))
    .map(({ index }) => index);

  it('has more than twenty deliberately broken lines', () => {
    expect(brokenLines.length).toBeGreaterThanOrEqual(20);
  });

  it('reports at least one diagnostic on each broken line', () => {
    const reported = new Set(result.diagnostics.map((d) => d.range.start.line));
    const silent = brokenLines.filter((line) => !reported.has(line));
    expect(silent.map((line) => `${line}: ${lines[line]}`)).toEqual([]);
    expect(result.diagnostics.length).toBeGreaterThanOrEqual(20);
  });

  it('keeps every diagnostic on a single line', () => {
    for (const d of result.diagnostics) expect(d.range.end.line).toBe(d.range.start.line);
  });

  it('parses the valid plant after the errors completely and silently', () => {
    const after = result.document.declarations.find((d) => d.name.name === 'after') as PlantDecl;
    expect(after).toBeDefined();
    expect(after.kind).toBe('plant');
    const firstLine = after.range.start.line;
    expect(result.diagnostics.filter((d) => d.range.start.line >= firstLine)).toEqual([]);
    expect(after.items.map((item) => item.kind)).toEqual([
      'param',
      'signals',
      'signals',
      'signals',
      'matrixAssign',
      'matrixAssign',
      'matrixAssign',
    ]);
    expect(after.range.end.line).toBe(lines.length - 2);
  });

  it('keeps the well-formed parts of broken lines', () => {
    const broken = result.document.declarations[0] as PlantDecl;
    // `param k 2`: the missing `=` is reported, the name and value survive.
    const k = broken.items.find((item) => item.kind === 'param' && item.name.name === 'k');
    expect(k && k.kind === 'param' && k.value.kind === 'number' && k.value.value).toBe(2);
  });
});

describe('a broken line never swallows the next line', () => {
  const brokenLines = [
    'param a = (1 + 2',
    'param a = [1, 2',
    'param a = 1 +',
    'param a = sin(',
    'A = [1, 2;',
    'A = [[[',
    'states x,',
    'param a =',
    'param a = 1 ) 2',
    "x' = ",
    'around x =',
    'output =',
    'transfer = (s + 1',
    'param a = 1 @ 2',
    'states',
    'xyz',
    ']]]',
    'param a = 2 ^ ^ 3',
  ];
  for (const broken of brokenLines) {
    it(`recovers after: ${broken}`, () => {
      const text = `plant p {\n  ${broken}\n  param z = 7\n  states q\n}\n`;
      const result = parsePlantText(text);
      const plant = result.document.declarations[0] as PlantDecl;
      const z = plant.items.find((item) => item.kind === 'param' && item.name.name === 'z');
      expect(z).toBeDefined();
      expect(plant.items.some((item) => item.kind === 'signals' && item.names[0]?.name === 'q')).toBe(true);
      expect(result.diagnostics.length).toBeGreaterThan(0);
      for (const d of result.diagnostics) expect(d.range.start.line).toBe(1);
    });
  }
});

describe('block structure errors', () => {
  it('keeps what was parsed when the closing brace is missing at the end of the file', () => {
    const result = parsePlantText('plant p {\n  param a = 1\n  states x\n');
    const plant = result.document.declarations[0] as PlantDecl;
    expect(plant.items.map((item) => item.kind)).toEqual(['param', 'signals']);
    expect(result.diagnostics.map((d) => d.code)).toEqual(['syntax/unterminated-block']);
    expect(result.diagnostics[0].range.start).toEqual({ line: 0, character: 8 });
  });

  it('closes an unterminated block at the next plant header and parses that plant', () => {
    const result = parsePlantText('plant p {\n  states x\nplant q {\n  states y\n}\n');
    expect(result.document.declarations.map((d) => [d.name.name, d.items.length])).toEqual([
      ['p', 1],
      ['q', 1],
    ]);
    expect(result.diagnostics.map((d) => d.code)).toEqual(['syntax/unterminated-block']);
  });

  it('reports a controller without `for` but still parses its lines', () => {
    const result = parsePlantText('controller c {\n  poles = [-1]\n}\n');
    const controller = result.document.declarations[0];
    expect(controller.kind === 'controller' && controller.plant).toBeUndefined();
    expect(controller.items.map((item) => item.kind)).toEqual(['poles']);
    expect(result.diagnostics.map((d) => d.code)).toEqual(['syntax/missing-token']);
  });

  it('reports one unknown-statement diagnostic covering the whole line', () => {
    const result = parsePlantText('plant p {\n  hello there world\n  states x\n}\n');
    expect(result.diagnostics).toHaveLength(1);
    expect(result.diagnostics[0].code).toBe('syntax/unknown-statement');
    expect(result.diagnostics[0].range).toEqual({
      start: { line: 1, character: 2 },
      end: { line: 1, character: 19 },
    });
  });
});
