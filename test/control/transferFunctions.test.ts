import { describe, expect, it } from 'vitest';
import { transferFunctions } from '../../server/src/control/transferFunctions';
import { plantInvariantZeros } from '../../server/src/control/invariantZeros';
import fixture from '../fixtures/reference/control_placement.json';

describe('transfer functions', () => {
  it('s/(s + 1) from A = −1, B = 1, C = −1, D = 1 (hand algebra: 1 − 1/(s + 1))', () => {
    const [pair] = transferFunctions([[-1]], [[1]], [[-1]], [[1]]).pairs;
    expect(pair.numerator).toEqual([1, 0]);
    expect(pair.denominator).toEqual([1, 1]);
    expect(Math.abs(pair.zeros[0].re)).toBe(0);
  });

  it('mass–spring–damper position output: 1/(s² + 0.4s + 4), leading zeros trimmed', () => {
    const [pair] = transferFunctions([[0, 1], [-4, -0.4]], [[0], [1]], [[1, 0]], [[0]]).pairs;
    expect(pair.numerator).toHaveLength(1);
    expect(pair.numerator[0]).toBeCloseTo(1, 14);
    expect(pair.denominator[1]).toBeCloseTo(0.4, 14);
    expect(pair.denominator[2]).toBeCloseTo(4, 14);
  });

  it('matches scipy.signal.ss2tf (numerators/denominators, padded on the left)', () => {
    for (const c of fixture.transfer) {
      const result = transferFunctions(c.A, c.B, c.C, c.D);
      for (const reference of c.pairs) {
        const pair = result.pairs.find((p) => p.output === reference.output && p.input === reference.input)!;
        const scale = Math.max(1, ...reference.denominator.map(Math.abs), ...reference.numerator.map(Math.abs));
        const tolerance = 1e3 * c.A.length * Number.EPSILON * scale;
        reference.denominator.forEach((v: number, k: number) => expect(Math.abs(pair.denominator[k] - v)).toBeLessThan(tolerance));
        const padded = [...new Array(reference.numerator.length - pair.numerator.length).fill(0), ...pair.numerator];
        reference.numerator.forEach((v: number, k: number) => expect(Math.abs(padded[k] - v)).toBeLessThan(tolerance));
      }
    }
  });
});

describe('invariant zeros', () => {
  it('a zero at the origin that the transfer function cancels is still found', () => {
    // x₁ integrator driven by u, unobservable; x₂ lag with y = x₂, ẋ₂ = −x₂ + x₁ − … use
    // G(s) = s/(s + 1) realised minimally: zero at 0.
    const result = plantInvariantZeros([[-1]], [[1]], [[-1]], [[1]]);
    expect(result.supported).toBe(true);
    expect(result.zeros).toHaveLength(1);
    expect(Math.abs(result.zeros[0].re)).toBeLessThan(1e-14);
  });

  it('an input-decoupling zero: the uncontrollable mode s = −3 is an invariant zero', () => {
    const result = plantInvariantZeros([[-3, 0], [0, -1]], [[0], [1]], [[1, 1]], [[0]]);
    expect(result.zeros.map((z) => z.re)).toEqual([expect.closeTo(-3, 12)]);
  });

  it('two inputs, two outputs: zeros of a square system', () => {
    // Decoupled channels (s + 2)/(s + 1) and 1/(s + 3): the only zero is −2 (hand algebra).
    const result = plantInvariantZeros([[-1, 0], [0, -3]], [[1, 0], [0, 1]], [[1, 0], [0, 1]], [[1, 0], [0, 0]]);
    expect(result.normalRank).toBe(2);
    expect(result.zeros.map((z) => z.re)).toEqual([expect.closeTo(-2, 12)]);
  });
});
