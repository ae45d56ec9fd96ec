// Modal coordinates of a Schur form, checked by identities: T·V ≈ V·Λ, V·V⁻¹ ≈ I, the
// eigenvalues those of the Schur form, and the condition infinite for a defective T.
import { describe, expect, it } from 'vitest';
import { denseFromRows, realSchurDense } from '../../server/src/numeric';
import { quasiTriangularModes } from '../../server/src/numeric/quasiTriangularModes';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;

describe('quasiTriangularModes', () => {
  it.each([5, 24, 60])('n = %i random matrix (complex pairs): T·V = V·Λ and V·V⁻¹ = I to rounding scaled by ‖T‖ and κ(V)', (n) => {
    const schur = realSchurDense(denseFromRows(seededMatrix(n, n, 100 + n)));
    expect(schur.converged).toBe(true);
    const t = schur.T.data;
    const modes = quasiTriangularModes(schur.T);
    const { vectorsRe: vr, vectorsIm: vi, inverseRe: wr, inverseIm: wi, values } = modes;
    expect(values.some((value) => value.im !== 0)).toBe(true);
    let normT = 0;
    for (const v of t) normT += v * v;
    normT = Math.sqrt(normT);
    let residual = 0;
    let identity = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let re = -(values[j].re * vr[i * n + j] - values[j].im * vi[i * n + j]);
        let im = -(values[j].re * vi[i * n + j] + values[j].im * vr[i * n + j]);
        let pr = i === j ? -1 : 0;
        let pi = 0;
        for (let k = 0; k < n; k++) {
          re += t[i * n + k] * vr[k * n + j];
          im += t[i * n + k] * vi[k * n + j];
          pr += vr[i * n + k] * wr[k * n + j] - vi[i * n + k] * wi[k * n + j];
          pi += vr[i * n + k] * wi[k * n + j] + vi[i * n + k] * wr[k * n + j];
        }
        residual = Math.max(residual, Math.hypot(re, im));
        identity = Math.max(identity, Math.hypot(pr, pi));
      }
    }
    expect(Number.isFinite(modes.condition)).toBe(true);
    expect(modes.condition).toBeGreaterThanOrEqual(Math.sqrt(n) * (1 - 1e-12)); // ‖V‖_F = √n, ‖V⁻¹‖_F ≥ 1
    expect(residual).toBeLessThan(10 * n * EPS * normT);
    expect(identity).toBeLessThan(10 * n * EPS * modes.condition);
    // The eigenvalues are the Schur form's (diagonal order, a pair as λ then λ̄).
    values.forEach((value, k) => {
      expect(value.re).toBeCloseTo(schur.eigenvalues[k].re, 12);
      expect(Math.abs(value.im)).toBeCloseTo(Math.abs(schur.eigenvalues[k].im), 12);
    });
  });

  it('a Jordan block (defective) has an infinite or enormous condition', () => {
    const n = 4;
    const T = { rows: n, cols: n, data: new Float64Array(n * n) };
    for (let i = 0; i < n; i++) {
      T.data[i * n + i] = -2;
      if (i + 1 < n) T.data[i * n + i + 1] = 1;
    }
    expect(quasiTriangularModes(T).condition).toBeGreaterThan(1 / EPS);
  });
});
