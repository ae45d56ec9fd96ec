import { describe, expect, it } from 'vitest';
import { balance } from '../../server/src/numeric/balance';
import { normFrobenius } from '../../server/src/numeric/dense';
import { eigenDecomposition, eigenvalues, eigenvaluesWithStatus, sortComplex } from '../../server/src/numeric/eigenvectors';
import type { Complex, ComplexRows, Rows } from '../../server/src/numeric/types';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;

/** max_j ‖A·v_j − λ_j·v_j‖₂ for complex eigenvectors stored column-wise. */
function eigenResidual(A: Rows, values: Complex[], vectors: ComplexRows): number {
  const n = A.length;
  let worst = 0;
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i < n; i++) {
      let re = 0;
      let im = 0;
      for (let k = 0; k < n; k++) {
        re += A[i][k] * vectors.re[k][j];
        im += A[i][k] * vectors.im[k][j];
      }
      re -= values[j].re * vectors.re[i][j] - values[j].im * vectors.im[i][j];
      im -= values[j].re * vectors.im[i][j] + values[j].im * vectors.re[i][j];
      sum += re * re + im * im;
    }
    worst = Math.max(worst, Math.sqrt(sum));
  }
  return worst;
}

function columnNorms(vectors: ComplexRows): number[] {
  const n = vectors.re.length;
  return Array.from({ length: n }, (_, j) => Math.sqrt(vectors.re.reduce((s, row, i) => s + row[j] ** 2 + vectors.im[i][j] ** 2, 0)));
}

describe('eigenvalues and eigenvectors', () => {
  it.each([1, 2, 3, 6, 15, 40])('satisfy A·V = V·Λ for a random matrix of order %i', (n) => {
    const A = seededMatrix(n, n, 500 + n);
    const { values, vectors, converged } = eigenDecomposition(A);
    expect(converged).toBe(true);
    expect(eigenResidual(A, values, vectors)).toBeLessThan(50 * n * EPS * normFrobenius(A));
    for (const norm of columnNorms(vectors)) expect(norm).toBeCloseTo(1, 13);
    expect(values).toEqual(sortComplex(values));
    // Same spectrum from the eigenvalue-only path.
    const alone = eigenvalues(A);
    alone.forEach((lambda, i) => {
      expect(Math.abs(lambda.re - values[i].re)).toBeLessThan(1e-10);
      expect(Math.abs(lambda.im - values[i].im)).toBeLessThan(1e-10);
    });
  });

  it('sorts by real part then imaginary part', () => {
    const values = eigenvalues([[0, 1, 0], [-1, 0, 0], [0, 0, -3]]);
    expect(values.map((v) => [v.re, v.im])).toEqual([[-3, 0], [0, -1], [0, 1]]);
  });

  it('does not fail on a defective Jordan block (vectors nearly parallel, residual still small)', () => {
    const jordan = [[-1, 1, 0], [0, -1, 1], [0, 0, -1]];
    const { values, vectors, converged } = eigenDecomposition(jordan);
    expect(converged).toBe(true);
    for (const lambda of values) {
      expect(lambda.re).toBe(-1);
      expect(lambda.im).toBe(0);
    }
    expect(eigenResidual(jordan, values, vectors)).toBeLessThan(1e-6);
    for (const norm of columnNorms(vectors)) expect(norm).toBeCloseTo(1, 13);
    const zeroJordan = [[0, 1], [0, 0]];
    const zero = eigenDecomposition(zeroJordan);
    expect(zero.vectors.re.flat().every(Number.isFinite)).toBe(true);
  });

  it('balancing recovers eigenvalues of a matrix scaled over 1e-12…1e12', () => {
    // D·B·D⁻¹ with B = companion-like matrix of known spectrum {−1, −2, −3, −4} (roots of
    // (s+1)(s+2)(s+3)(s+4) = s⁴ + 10s³ + 35s² + 50s + 24) and D = diag(1e-12, 1e-4, 1e4, 1e12).
    const B = [[-10, -35, -50, -24], [1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, 0]];
    const d = [1e-12, 1e-4, 1e4, 1e12];
    const A = B.map((row, i) => row.map((value, j) => (d[i] * value) / d[j]));
    const values = eigenvalues(A);
    [-4, -3, -2, -1].forEach((expected, i) => {
      expect(values[i].re).toBeCloseTo(expected, 8);
      expect(values[i].im).toBe(0);
    });
    const { scaled, scaling } = balance(A);
    expect(normFrobenius(scaled)).toBeLessThan(1e3);
    for (const factor of scaling) expect(Math.log2(factor)).toBe(Math.round(Math.log2(factor)));
    const { values: vals, vectors } = eigenDecomposition(A);
    // Residual relative to ‖A‖ would be meaningless here; check each column's scaled residual.
    const residual = eigenResidual(scaled, vals, {
      re: vectors.re.map((row, i) => row.map((v) => v / scaling[i])),
      im: vectors.im.map((row, i) => row.map((v) => v / scaling[i])),
    });
    const smallestColumn = Math.min(...columnNorms({
      re: vectors.re.map((row, i) => row.map((v) => v / scaling[i])),
      im: vectors.im.map((row, i) => row.map((v) => v / scaling[i])),
    }));
    expect(residual / smallestColumn).toBeLessThan(1e-8);
  });

  it('reports non-convergence when the sweep budget is too small', () => {
    const outcome = eigenvaluesWithStatus(seededMatrix(20, 20, 4), { maxSweeps: 2 });
    expect(outcome.converged).toBe(false);
    expect(eigenDecomposition(seededMatrix(20, 20, 4), { maxSweeps: 2 }).converged).toBe(false);
  });

  it('rejects non-finite input without throwing', () => {
    expect(eigenvaluesWithStatus([[NaN, 0], [0, 1]]).converged).toBe(false);
  });

  it('answers a repeated matrix from its recent results, exactly and as a copy', () => {
    const A = seededMatrix(30, 30, 77);
    const first = eigenvaluesWithStatus(A);
    first.values[0].re = 1e9; // a caller changing its copy must not reach the next caller
    const again = eigenvaluesWithStatus(A.map((row) => row.slice()));
    expect(again.values[0].re).not.toBe(1e9);
    // A matrix differing in one entry is computed afresh.
    const moved = A.map((row) => row.slice());
    moved[29][29] += 0.5;
    const expected = eigenvaluesWithStatus(moved).values;
    const product = moved.map((row) => row.slice());
    // Sum of eigenvalues = trace (identity, no reference needed).
    const trace = moved.reduce((sum, row, i) => sum + row[i], 0);
    expect(Math.abs(expected.reduce((sum, z) => sum + z.re, 0) - trace)).toBeLessThan(1e-10 * 30 * normFrobenius(moved));
    expect(eigenvaluesWithStatus(product).values).toEqual(expected);
    // Fresh answers equal the remembered ones bit for bit.
    const freshOrder = seededMatrix(40, 40, 78);
    const computed = eigenvaluesWithStatus(freshOrder).values;
    for (let k = 0; k < 5; k++) eigenvaluesWithStatus(seededMatrix(40, 40, 100 + k)); // pushes it out of the memo
    expect(eigenvaluesWithStatus(freshOrder).values).toEqual(computed);
    expect(eigenvaluesWithStatus(A).values).not.toEqual(expected);
  });
});


describe('eigenvalues with the balanced Schur form kept', () => {
  it('gives exactly the eigenvalues of eigenvaluesWithStatus, and D⁻¹AD = Z·T·Zᵀ with Z orthogonal', async () => {
    const { balancedRealSchur, eigenvaluesAndBalancedSchur, forgetRecentEigenvalues } = await import('../../server/src/numeric/eigenvectors');
    for (const n of [6, 30, 50]) {
      // Badly scaled rows and columns, so the balancing is not the identity.
      const A = seededMatrix(n, n, 900 + n).map((row, i) => row.map((v, j) => (v * 2 ** (i % 7)) / 2 ** (j % 5)));
      forgetRecentEigenvalues();
      const plain = eigenvaluesWithStatus(A);
      forgetRecentEigenvalues();
      const kept = eigenvaluesAndBalancedSchur(A);
      expect(kept).toEqual(plain);
      const { T, Z, scaling } = balancedRealSchur(A); // from the memo
      expect(Array.from(scaling).some((d) => d !== 1)).toBe(true);
      let worst = 0;
      let orthogonality = 0;
      let scale = 0;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          let sum = 0;
          let gram = i === j ? -1 : 0;
          for (let k = 0; k < n; k++) {
            gram += Z.data[k * n + i] * Z.data[k * n + j];
            for (let l = 0; l < n; l++) sum += Z.data[i * n + k] * T.data[k * n + l] * Z.data[j * n + l];
          }
          const balanced = (A[i][j] / scaling[i]) * scaling[j];
          scale = Math.max(scale, Math.abs(balanced));
          worst = Math.max(worst, Math.abs(sum - balanced));
          orthogonality = Math.max(orthogonality, Math.abs(gram));
        }
      }
      expect(worst).toBeLessThan(100 * n * EPS * scale);
      expect(orthogonality).toBeLessThan(100 * n * EPS);
    }
  });
});
