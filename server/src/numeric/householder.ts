// Householder reflector generation, H = I − τ·v·vᵀ with v[0] = 1, mapping [α; x] to [β; 0]
// (LAPACK dlarfg; Golub & Van Loan, Matrix Computations, algorithm 5.1.1).

import { scaledNorm2 } from './dense';

/**
 * On entry v[0..length) holds [α, x]; on exit it holds the reflector vector [1, x/(α − β)].
 * Returns τ (0 when x is already zero, so H = I) and β = ∓‖[α; x]‖.
 */
export function generateHouseholder(v: Float64Array, length: number): { tau: number; beta: number } {
  const alpha = v[0];
  const tailNorm = length > 1 ? scaledNorm2(v, 1, length) : 0;
  if (tailNorm === 0) {
    v[0] = 1;
    return { tau: 0, beta: alpha };
  }
  const beta = -(alpha >= 0 ? 1 : -1) * Math.hypot(alpha, tailNorm);
  const tau = (beta - alpha) / beta;
  const inverse = 1 / (alpha - beta);
  for (let i = 1; i < length; i++) v[i] *= inverse;
  v[0] = 1;
  return { tau, beta };
}
