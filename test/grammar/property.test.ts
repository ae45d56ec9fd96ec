// Property tests: no input makes the parser throw, and every node and diagnostic range lies in
// the document with offsets agreeing with line/character positions.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { KEYWORDS, parsePlantText } from '../../grammar/src/index';
import { checkTreeInvariants } from './invariants';

const fragments = [
  ...KEYWORDS,
  'A', 'B', 'x', 'theta', "'", 'θ', 's', 'ms', 'Hz', '%', 'sin', 'diag', 'pi',
  '0', '1.5', '2e-3', '3j', '.5', '1e', '+', '-', '*', '/', '^', '=', ',', ';', '<=', '<',
  '(', ')', '[', ']', '{', '}', '#c', ' ', '\n', '\r\n', '\r', '\t', '@', '$', '"', '\u00A0', '😀',
];

function assertParses(text: string): void {
  let result;
  try {
    result = parsePlantText(text);
  } catch (error) {
    throw new Error(`parsePlantText threw on ${JSON.stringify(text)}: ${String(error)}`);
  }
  expect(checkTreeInvariants(text, result)).toEqual([]);
  expect(result.diagnostics.every((d) => d.code.startsWith('syntax/') && d.code !== 'syntax/internal-error')).toBe(true);
}

describe('parser robustness', () => {
  it('never throws on random strings', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 200, unit: 'binary' }), (text) => assertParses(text)),
      { numRuns: 400 },
    );
  });

  it('never throws on random token sequences', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...fragments), { maxLength: 120 }), (parts) => assertParses(parts.join(' '))),
      { numRuns: 600 },
    );
  });

  it('never throws on token sequences inside a block, without spaces', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...fragments), { maxLength: 80 }), (parts) =>
        assertParses(`plant p {\n  ${parts.join('')}\n}\ncontroller c for p {\n  ${parts.reverse().join('')}\n}`),
      ),
      { numRuns: 400 },
    );
  });

  it('never throws when a valid document is cut or has a character deleted', () => {
    const valid = `plant hoist {\n  param J = 0.012\n  states theta, omega\n  inputs current\n  outputs height\n  A = [0, 1;\n       0, -b/J]\n  B = [0; kt/J]\n  C = [r, 0]\n}\ncontroller lift for hoist {\n  poles = [-4 + 3j, -4 - 3j]\n  spec settling <= 1.5 s, overshoot <= 5 %\n  track height\n}\n`;
    expect(parsePlantText(valid).diagnostics).toEqual([]);
    fc.assert(
      fc.property(fc.nat(valid.length), fc.nat(valid.length), (cut, removed) => {
        assertParses(valid.slice(0, cut));
        assertParses(valid.slice(0, removed) + valid.slice(removed + 1));
      }),
      { numRuns: 400 },
    );
  });
});
