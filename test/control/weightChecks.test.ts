// Definiteness checks of weights (control/weightChecks.ts). The semidefinite test settles passing
// cases by a Cholesky factorisation of M + (tolerance/2)·I and computes eigenvalues only when that
// fails; its verdict must be the eigenvalue criterion λ_min ≥ −tolerance, checked here on matrices
// of known spectrum (M = V·diag(d)·Vᵀ with V a Householder reflector, exactly orthogonal in theory).
import { describe, expect, it } from 'vitest';
import { checkPositiveSemidefinite } from '../../server/src/control/weightChecks';
import type { Rows } from '../../server/src/numeric/types';

function withSpectrum(d: number[]): Rows {
  const n = d.length;
  const u = d.map((_, i) => Math.cos(1.3 * i + 0.2) + 0.1 * i);
  const uu = u.reduce((sum, v) => sum + v * v, 0);
  const V = u.map((ui, i) => u.map((uj, j) => (i === j ? 1 : 0) - (2 * ui * uj) / uu));
  return V.map((_, i) => V.map((__, j) => d.reduce((sum, dk, k) => sum + V[i][k] * dk * V[j][k], 0)));
}

describe('positive semidefinite check', () => {
  const n = 30;
  const spectrum = (smallest: number) => [smallest, ...Array.from({ length: n - 1 }, (_, k) => 1 + k)];
  // The tolerance the check uses: 10·n·ε·‖M‖_F (‖M‖_F ≈ that of the spectrum).
  const frobenius = Math.hypot(...spectrum(0));
  const tolerance = 10 * n * Number.EPSILON * frobenius;

  it.each([
    ['clearly positive definite', 0.5, true],
    ['singular (a zero eigenvalue)', 0, true],
    ['slightly negative within the tolerance', -0.3 * tolerance, true],
    ['negative at 0.7 of the tolerance (the Cholesky shift alone does not settle it)', -0.7 * tolerance, true],
    ['negative beyond the tolerance', -3 * tolerance, false],
    ['clearly indefinite', -0.5, false],
  ])('%s', (_, smallest, ok) => {
    const check = checkPositiveSemidefinite(withSpectrum(spectrum(smallest as number)));
    expect(check.ok).toBe(ok);
    if (!ok) expect(check.smallest).toBeCloseTo(smallest as number, 10); // the failure names the eigenvalue
  });

  it('an identity weight passes without an eigenvalue computation (NaN smallest)', () => {
    const check = checkPositiveSemidefinite(Array.from({ length: 100 }, (_, i) => Array.from({ length: 100 }, (__, j) => (i === j ? 1 : 0))));
    expect(check.ok).toBe(true);
    expect(check.smallest).toBeNaN();
  });
});
