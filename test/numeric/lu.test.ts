import { describe, expect, it } from 'vitest';
import { denseFromRows, multiply, norm1, subtract, identity, normFrobenius, hstack, vstack, blockDiagonal, transpose } from '../../server/src/numeric/dense';
import { determinant, inverse, luFactor, luSolveTransposeVector, solveComplexLinear, solveLinear } from '../../server/src/numeric/lu';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;

describe('dense helpers', () => {
  it('stacks and multiplies consistently', () => {
    const a = [[1, 2], [3, 4]];
    const b = [[5], [6]];
    expect(hstack(a, b)).toEqual([[1, 2, 5], [3, 4, 6]]);
    expect(vstack(a, [[7, 8]])).toEqual([[1, 2], [3, 4], [7, 8]]);
    expect(blockDiagonal(a, [[9]])).toEqual([[1, 2, 0], [3, 4, 0], [0, 0, 9]]);
    expect(multiply(a, b)).toEqual([[17], [39]]);
    expect(transpose(b)).toEqual([[5, 6]]);
    expect(norm1(a)).toBe(6);
    expect(normFrobenius([[3, 4]])).toBe(5);
  });
});

describe('LU with partial pivoting', () => {
  it('satisfies P·A = L·U', () => {
    const n = 9;
    const A = seededMatrix(n, n, 7);
    const factor = luFactor(denseFromRows(A));
    const L = identity(n);
    const U = identity(n).map((row) => row.map(() => 0));
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        const v = factor.lu.data[i * n + j];
        if (j < i) L[i][j] = v;
        else U[i][j] = v;
      }
    const PA = Array.from(factor.permutation, (p) => A[p]);
    const residual = normFrobenius(subtract(PA, multiply(L, U)));
    expect(residual).toBeLessThan(10 * n * EPS * normFrobenius(A));
  });

  it('solves A·X = B with small residual and a sensible condition estimate', () => {
    const n = 12;
    const A = seededMatrix(n, n, 3);
    const B = seededMatrix(n, 2, 4);
    const { X, rcond, singular } = solveLinear(A, B);
    expect(singular).toBe(false);
    const residual = normFrobenius(subtract(multiply(A, X), B));
    expect(residual).toBeLessThan(10 * n * EPS * norm1(A) * normFrobenius(X));
    // The estimate is a lower bound on ‖A⁻¹‖₁, so rcond ≥ true value = 1/(‖A‖₁‖A⁻¹‖₁).
    const inv = inverse(A).X;
    const trueRcond = 1 / (norm1(A) * norm1(inv));
    expect(rcond).toBeGreaterThanOrEqual(trueRcond * (1 - 1e-12));
    expect(rcond).toBeLessThan(trueRcond * 10);
  });

  it('reports exactly singular and nearly singular matrices', () => {
    const exact = solveLinear([[1, 2], [2, 4]], [[1], [1]]);
    expect(exact.singular).toBe(true);
    expect(exact.rcond).toBe(0);
    const near = solveLinear([[1, 1], [1, 1 + 1e-17 * 3]], [[1], [1]]);
    expect(near.singular).toBe(true);
    const hilbertLike = Array.from({ length: 14 }, (_, i) => Array.from({ length: 14 }, (_, j) => 1 / (i + j + 1)));
    expect(solveLinear(hilbertLike, identity(14)).singular).toBe(true);
  });

  it('computes determinants with the permutation sign', () => {
    expect(determinant([[0, 1], [1, 0]])).toBe(-1);
    expect(determinant([[2, 0, 0], [0, 3, 0], [0, 0, 4]])).toBe(24);
    expect(determinant([[1, 2], [2, 4]])).toBe(0);
  });

  it('solves complex systems (checked against the real 2n×2n realification)', () => {
    const n = 6;
    const Are = seededMatrix(n, n, 11);
    const Aim = seededMatrix(n, n, 12);
    const bre = seededMatrix(n, 1, 13);
    const bim = seededMatrix(n, 1, 14);
    const { X, singular, rcond } = solveComplexLinear({ re: Are, im: Aim }, { re: bre, im: bim });
    expect(singular).toBe(false);
    expect(rcond).toBeGreaterThan(0);
    const big = vstack(hstack(Are, Aim.map((r) => r.map((v) => -v))), hstack(Aim, Are));
    const real = solveLinear(big, vstack(bre, bim)).X;
    for (let i = 0; i < n; i++) {
      expect(X.re[i][0]).toBeCloseTo(real[i][0], 10);
      expect(X.im[i][0]).toBeCloseTo(real[n + i][0], 10);
    }
    const sing = solveComplexLinear({ re: [[1, 1], [1, 1]], im: [[1, 1], [1, 1]] }, { re: [[1], [0]], im: [[0], [0]] });
    expect(sing.singular).toBe(true);
  });
});

describe('transposed solve from an LU factorisation', () => {
  it('solves Aᵀx = b with a residual at rounding level (n = 40, random A with row exchanges)', () => {
    const n = 40;
    const A = seededMatrix(n, n, 4040);
    const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
    const factor = luFactor(denseFromRows(A));
    expect(Array.from(factor.permutation).some((p, i) => p !== i)).toBe(true);
    const x = luSolveTransposeVector(factor, b);
    let residual = 0;
    let scale = 0;
    for (let j = 0; j < n; j++) {
      let sum = -b[j];
      for (let i = 0; i < n; i++) sum += A[i][j] * x[i];
      residual = Math.max(residual, Math.abs(sum));
      scale = Math.max(scale, Math.abs(b[j]));
    }
    const normA = A.reduce((largest, row) => Math.max(largest, row.reduce((sum, v) => sum + Math.abs(v), 0)), 0);
    const normX = x.reduce((sum, v) => sum + Math.abs(v), 0);
    // Backward stable: ‖Aᵀx − b‖ ≤ c·n·ε·‖A‖·‖x‖ (common practice for the constant).
    expect(residual).toBeLessThan(10 * n * EPS * normA * normX);
  });
});
