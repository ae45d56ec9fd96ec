import { describe, expect, it } from 'vitest';
import { denseFromRows, multiplyDense, multiplyTransposeSymmetricDense, transposeDense, transposeMultiplySymmetricDense } from '../../server/src/numeric/dense';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;

describe('dense product', () => {
  it('equals the defining sum Σ_k a_ik·b_kj for every remainder of the 4×4 blocking (blocked loop and its edges)', () => {
    for (const m of [1, 2, 3, 6, 7, 9]) {
      for (const inner of [1, 2, 5, 8, 11]) {
        for (const n of [1, 3, 4]) {
          const a = seededMatrix(m, inner, 10 * m + inner);
          const b = seededMatrix(inner, n, 100 + n);
          // Sparse rows exercise the skipped pairs of zeros.
          if (m > 2) a[1] = a[1].map((v, k) => (k % 3 === 0 ? v : 0));
          // A whole 4×4 block of zeros (rows 4–7, columns 4–7) exercises the skipped blocks.
          if (m > 8 && inner > 8) for (let i = 4; i < 8; i++) for (let k = 4; k < 8; k++) a[i][k] = 0;
          const product = multiplyDense(denseFromRows(a), denseFromRows(b));
          expect([product.rows, product.cols]).toEqual([m, n]);
          for (let i = 0; i < m; i++) {
            for (let j = 0; j < n; j++) {
              let sum = 0;
              let size = 0;
              for (let k = 0; k < inner; k++) {
                sum += a[i][k] * b[k][j];
                size += Math.abs(a[i][k] * b[k][j]);
              }
              expect(Math.abs(product.data[i * n + j] - sum)).toBeLessThanOrEqual(2 * inner * EPS * size);
            }
          }
        }
      }
    }
  });

  it('refuses mismatched shapes', () => {
    expect(() => multiplyDense(denseFromRows([[1, 2]]), denseFromRows([[1, 2]]))).toThrow(/1×2 times 1×2/);
  });
});

describe('symmetric products (one triangle computed)', () => {
  it.each([1, 2, 7, 9, 30])('A·S·Aᵀ and Aᵀ·S·A of order %i equal the full products and are exactly symmetric', (n) => {
    // Identity check against multiplyDense; S symmetric so both products are symmetric.
    const A = denseFromRows(seededMatrix(n, n, 300 + n));
    const raw = seededMatrix(n, n, 400 + n);
    const S = denseFromRows(raw.map((row, i) => row.map((v, j) => (v + raw[j][i]) / 2)));
    const AS = multiplyDense(A, S);
    const SA = multiplyDense(S, A);
    const cases = [
      { fast: multiplyTransposeSymmetricDense(AS, A), full: multiplyDense(AS, transposeDense(A)) },
      { fast: transposeMultiplySymmetricDense(A, SA), full: multiplyDense(transposeDense(A), SA) },
    ];
    for (const { fast, full } of cases) {
      let scale = 0;
      for (const v of full.data) scale = Math.max(scale, Math.abs(v));
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          expect(fast.data[i * n + j]).toBe(fast.data[j * n + i]);
          expect(Math.abs(fast.data[i * n + j] - full.data[i * n + j])).toBeLessThanOrEqual(4 * n * Number.EPSILON * scale);
        }
      }
    }
    expect(() => multiplyTransposeSymmetricDense(A, denseFromRows(seededMatrix(n, n + 1, 1)))).toThrow();
  });
});

