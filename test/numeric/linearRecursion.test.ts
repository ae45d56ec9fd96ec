// Outputs of x_{k+1} = Φ·x_k + f by blocks (numeric/linearRecursion.ts) against stepping the state
// one step at a time (the definition): equal up to rounding of the order ε·n·max‖x_k‖·‖O‖, for
// stable, unstable and strongly non-normal Φ, and for counts that do not fill the last block.
import { describe, expect, it } from 'vitest';
import { outputsOfLinearRecursion } from '../../server/src/numeric/linearRecursion';

function seeded(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32 - 0.5;
  };
}

function stepByStep(phi: Float64Array, f: Float64Array, n: number, count: number, O: Float64Array, rows: number) {
  const out = new Float64Array(count * rows);
  let x = new Float64Array(n);
  let largest = 0;
  for (let k = 0; k < count; k++) {
    for (let r = 0; r < rows; r++) {
      let v = 0;
      for (let c = 0; c < n; c++) v += O[r * n + c] * x[c];
      out[k * rows + r] = v;
    }
    const next = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let v = f[i];
      for (let c = 0; c < n; c++) v += phi[i * n + c] * x[c];
      next[i] = v;
    }
    x = next;
    largest = Math.max(largest, Math.hypot(...x));
  }
  return { out, largest };
}

type Case = [string, number, number, (random: () => number, n: number) => Float64Array];
const cases: Case[] = [
  ['stable, random', 40, 500, (random, n) => Float64Array.from({ length: n * n }, (_, i) => (i % (n + 1) === 0 ? 0.9 : 0) + (0.6 * random()) / Math.sqrt(n))],
  ['unstable (spectral radius above 1)', 30, 203, (random, n) => Float64Array.from({ length: n * n }, (_, i) => (i % (n + 1) === 0 ? 1.01 : 0) + (0.2 * random()) / Math.sqrt(n))],
  // A Jordan-like chain: ‖Φ^j‖ grows far above 1 before it decays.
  ['non-normal (a chain of 0.95 with unit coupling)', 50, 777, (_, n) => Float64Array.from({ length: n * n }, (__, i) => (i % (n + 1) === 0 ? 0.95 : i % (n + 1) === 1 ? 1 : 0))],
];

describe('outputs of a linear recursion by blocks', () => {
  it.each(cases)('%s: equal to stepping the state, to rounding', (_, n, count, makePhi) => {
    const random = seeded(n * 7919 + count);
    const phi = makePhi(random, n);
    const f = Float64Array.from({ length: n }, () => random());
    const rows = 3;
    const O = Float64Array.from({ length: rows * n }, () => random());
    const blocks = outputsOfLinearRecursion(phi, f, n, count, O, rows, 16);
    const { out, largest } = stepByStep(phi, f, n, count, O, rows);
    const normO = Math.hypot(...O);
    const tolerance = 100 * n * Number.EPSILON * Math.max(1, largest) * normO;
    let worst = 0;
    for (let i = 0; i < out.length; i++) worst = Math.max(worst, Math.abs(blocks[i] - out[i]));
    expect(worst).toBeLessThan(tolerance);
    expect(blocks.length).toBe(count * rows);
    // the first block starts from x_0 = 0 and x_1 = f
    for (let r = 0; r < rows; r++) expect(blocks[r]).toBe(0);
  });

  it('other block sizes give the same outputs', () => {
    const n = 20;
    const random = seeded(5);
    const phi = Float64Array.from({ length: n * n }, (_, i) => (i % (n + 1) === 0 ? 0.8 : 0) + (0.3 * random()) / Math.sqrt(n));
    const f = Float64Array.from({ length: n }, () => random());
    const O = Float64Array.from({ length: n }, () => random());
    const reference = outputsOfLinearRecursion(phi, f, n, 300, O, 1, 1);
    for (const size of [2, 8, 32]) {
      const other = outputsOfLinearRecursion(phi, f, n, 300, O, 1, size);
      for (let k = 0; k < 300; k++) expect(Math.abs(other[k] - reference[k])).toBeLessThan(1e-12 * Math.max(1, Math.abs(reference[k])));
    }
  });
});
