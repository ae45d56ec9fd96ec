// Hostile input: extreme nesting, very long lines and long operator chains must give a clear
// diagnostic instead of a stack overflow, and must not hang.
import { describe, expect, it } from 'vitest';
import type { PlantDecl } from '../../grammar/src/ast';
import { MAX_EXPRESSION_DEPTH, MAX_NESTING, parsePlantText } from '../../grammar/src/index';

function plantWith(value: string): string {
  return `plant p {\n  param a = ${value}\n  param b = 2\n}\n`;
}

function codes(text: string): string[] {
  return parsePlantText(text).diagnostics.map((d) => d.code);
}

describe('nesting limits', () => {
  it('10,000 opening parentheses give one too-deep diagnostic, and the next line still parses', () => {
    const result = parsePlantText(plantWith('('.repeat(10_000)));
    expect(result.diagnostics.map((d) => d.code)).toEqual(['syntax/too-deep']);
    expect(result.diagnostics[0].message).toContain('nested too deeply');
    expect(result.diagnostics[0].range.start).toEqual({ line: 1, character: 12 + MAX_NESTING });
    const plant = result.document.declarations[0] as PlantDecl;
    expect(plant.items.map((item) => item.kind === 'param' && item.name.name)).toEqual(['b']);
  });

  it('10,000 balanced parentheses and brackets are too deep as well', () => {
    expect(codes(plantWith(`${'('.repeat(10_000)}1${')'.repeat(10_000)}`))).toEqual(['syntax/too-deep']);
    expect(codes(plantWith(`${'['.repeat(10_000)}1${']'.repeat(10_000)}`))).toEqual(['syntax/too-deep']);
    expect(codes(plantWith('sin('.repeat(10_000)))).toEqual(['syntax/too-deep']);
  });

  it('nesting just inside the limit parses', () => {
    const depth = MAX_NESTING;
    expect(codes(plantWith(`${'('.repeat(depth)}1${')'.repeat(depth)}`))).toEqual([]);
  });

  it('long chains of signs, powers and sums are caught by the tree depth guard', () => {
    for (const value of ['-'.repeat(10_000) + '1', Array(10_000).fill('2').join('^'), Array(10_000).fill('1').join('+')]) {
      const result = parsePlantText(plantWith(value));
      expect(result.diagnostics.map((d) => d.code)).toEqual(['syntax/too-deep']);
      const plant = result.document.declarations[0] as PlantDecl;
      const a = plant.items[0];
      expect(a.kind === 'param' && a.value.kind).toBe('error');
    }
  });

  it('chains below the depth limit are kept', () => {
    const result = parsePlantText(plantWith(Array(MAX_EXPRESSION_DEPTH - 10).fill('1').join('+')));
    expect(result.diagnostics).toEqual([]);
  });
});

describe('very long input', () => {
  it('parses a one-megabyte matrix line', () => {
    const entries = Array(200_000).fill('1.25');
    const text = `plant p {\n  param a = [${entries.join(', ')}]\n}\n`;
    expect(text.length).toBeGreaterThan(1_000_000);
    const result = parsePlantText(text);
    expect(result.diagnostics).toEqual([]);
    const a = (result.document.declarations[0] as PlantDecl).items[0];
    expect(a.kind === 'param' && a.value.kind === 'matrix' && a.value.rows[0].entries.length).toBe(200_000);
  });

  it('survives a one-megabyte line of garbage', () => {
    const garbage = Array.from({ length: 1_000_000 }, (_, i) => '@x(]1+;'[i % 7]).join('');
    const result = parsePlantText(`plant p {\n  param a = ${garbage}\n  param b = 2\n}\n`);
    expect(result.diagnostics.length).toBeGreaterThan(0);
    const plant = result.document.declarations[0] as PlantDecl;
    expect(plant.items.some((item) => item.kind === 'param' && item.name.name === 'b')).toBe(true);
  });
});
