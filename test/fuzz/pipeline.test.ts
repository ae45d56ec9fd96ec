// CI-sized fuzzing of the whole pipeline (5,000 seeded inputs); the full-size run is
// `node test/fuzz/run.mjs --count 100000 --seed 1` (figures in docs/robustness.md).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { join } from 'node:path';
import { FUZZ_SETTINGS, applyMutation, checkPipeline, randomModel, readSamples, sampleMutation, tokenStream } from './harness';

const root = join(__dirname, '..', '..');
const samples = readSamples(root);

function holds(text: string): boolean {
  const verdict = checkPipeline(text, FUZZ_SETTINGS);
  if (verdict.violations.length) throw new Error(verdict.violations.join('\n'));
  return true;
}

describe('fuzzing text → parse → check → analyse → JSON', () => {
  it('random token streams (3,000): nothing throws, ranges inside the text, finite JSON, budgets kept', () => {
    fc.assert(fc.property(tokenStream, holds), { seed: 101, numRuns: 3000 });
  }, 300_000);

  it('grammar-aware random models (1,400) with huge, tiny and zero entries and random design lines', () => {
    fc.assert(fc.property(randomModel, holds), { seed: 202, numRuns: 1400 });
  }, 300_000);

  it('mutated samples (600; each runs a full sample design): deleted, duplicated, swapped tokens and lines, extreme numbers, long lines, deep nesting', () => {
    fc.assert(fc.property(sampleMutation(samples), holds), { seed: 303, numRuns: 600 });
  }, 300_000);

  it('the mutation operators change the text as named', () => {
    const text = 'a = 1\nb = 2\n';
    expect(applyMutation(text, { kind: 'delete-line', at: 0 })).toBe('b = 2\n');
    expect(applyMutation(text, { kind: 'swap-lines', at: 0, other: 1 })).toBe('b = 2\na = 1\n');
    expect(applyMutation(text, { kind: 'number', at: 1, value: '1e300' })).toBe('a = 1\nb = 1e300\n');
    expect(applyMutation(text, { kind: 'deep-nesting', at: 2, depth: 3, bracket: '(' })).toBe('a = (((1)))1\nb = 2\n');
  });

  it('the invariant check itself reports what it is meant to catch', () => {
    // An unknown name and a design on a plant without inputs: errors, all inside the text.
    const verdict = checkPipeline('plant p {\n  states x\n  A = [q]\n}\ncontroller c for p {\n  poles = [-1]\n}\n', FUZZ_SETTINGS);
    expect(verdict.threw).toBeNull();
    expect(verdict.outOfRange).toBe(0);
    expect(verdict.iterations).toBeGreaterThanOrEqual(0);
    const hoist = checkPipeline(samples.find((text) => text.includes('plant hoist'))!, FUZZ_SETTINGS);
    expect(hoist.violations).toEqual([]);
    expect(hoist.iterations).toBeGreaterThan(0);
  });
});
