// Modal step outputs (numeric/modalStepOutputs.ts) against the definition: the zero-order-hold
// recursion x_{k+1} = e^{Ah}·x_k + ∫₀ʰe^{Aτ}dτ·f stepped state by state (Van Loan's block
// exponential, numeric/expm.ts), for stable and unstable A with complex pairs; and no answer for a
// defective A, whose modal sum cannot be trusted.
import { describe, expect, it } from 'vitest';
import { denseFromRows, matrixExponentialIntegral, modalStepOutputs, realSchurDense } from '../../server/src/numeric';
import { seededMatrix } from './coreTestMatrices';

function stepByStep(A: number[][], f: number[], O: number[][], h: number, count: number): Float64Array {
  const n = A.length;
  const { Phi, Gamma } = matrixExponentialIntegral(A, f.map((v) => [v]), h);
  const out = new Float64Array(count * O.length);
  let x = new Array<number>(n).fill(0);
  for (let k = 0; k < count; k++) {
    O.forEach((row, r) => (out[k * O.length + r] = row.reduce((sum, v, j) => sum + v * x[j], 0)));
    x = Phi.map((row, i) => row.reduce((sum, v, j) => sum + v * x[j], Gamma[i][0]));
  }
  return out;
}

describe('modalStepOutputs', () => {
  it.each([
    ['stable', 40, -0.8],
    ['unstable (one growing mode band)', 30, 0.05],
  ])('%s random A (n = %i): equals the stepped recursion to 1e-9 of the largest value', (_, n, shift) => {
    const A = seededMatrix(n, n, 7 + n).map((row, i) => row.map((v, j) => v / Math.sqrt(n) + (i === j ? shift : 0)));
    const f = A.map((_, i) => Math.cos(i));
    const O = [A.map((_, j) => Math.sin(j + 1)), A.map((_, j) => (j % 3 === 0 ? 1 : 0))];
    const schur = realSchurDense(denseFromRows(A));
    const h = 0.05;
    const count = 200;
    const modal = modalStepOutputs(schur.T, schur.Z, Float64Array.from(f), Float64Array.from(O.flat()), O.length, h, count, 1e-9);
    expect(modal).not.toBeNull();
    const reference = stepByStep(A, f, O, h, count);
    let largest = 0;
    for (const v of reference) largest = Math.max(largest, Math.abs(v));
    for (let e = 0; e < reference.length; e++) expect(Math.abs(modal![e] - reference[e])).toBeLessThan(1e-9 * largest);
    expect(modal![0]).toBe(0);
  });

  it('declines a defective A (a Jordan block): no modal answer', () => {
    const n = 24;
    const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (j === i ? -1 : j === i + 1 ? 1 : 0)));
    const schur = realSchurDense(denseFromRows(A));
    const O = Float64Array.from(A.map((_, j) => (j === 0 ? 1 : 0)));
    expect(modalStepOutputs(schur.T, schur.Z, Float64Array.from(A.map((_, i) => (i === n - 1 ? 1 : 0))), O, 1, 0.1, 100, 1e-9)).toBeNull();
  });
});
