// Householder reflector generation, H = I − τ·v·vᵀ with v[0] = 1, mapping [α; x] to [β; 0]
// (LAPACK dlarfg; Golub & Van Loan, Matrix Computations, algorithm 5.1.1).

import { scaledNorm2 } from './dense';

/**
 * On entry v[0..length) holds [α, x]; on exit it holds the reflector vector [1, x/(α − β)].
 * Returns τ (0 when x is already zero, so H = I) and β = ∓‖[α; x]‖.
 */
/** dlarfg's safe minimum over ε: below it 1/(α − β) may overflow. */
const RESCALE_BELOW = 2.2250738585072014e-308 / Number.EPSILON;

export function generateHouseholder(v: Float64Array, length: number): { tau: number; beta: number } {
  let alpha = v[0];
  const tailNorm = length > 1 ? scaledNorm2(v, 1, length) : 0;
  if (tailNorm === 0) {
    v[0] = 1;
    return { tau: 0, beta: alpha };
  }
  let beta = -(alpha >= 0 ? 1 : -1) * Math.hypot(alpha, tailNorm);
  // As dlarfg: a (sub)normal-tiny β would overflow 1/(α − β) (a 4.9e-324 entry gave NaN
  // eigenvalues); scale [α; x] up, build the reflector, scale β back down.
  let rescalings = 0;
  while (Math.abs(beta) < RESCALE_BELOW && rescalings < 20) {
    rescalings++;
    for (let i = 1; i < length; i++) v[i] /= RESCALE_BELOW;
    alpha /= RESCALE_BELOW;
    beta = -(alpha >= 0 ? 1 : -1) * Math.hypot(alpha, scaledNorm2(v, 1, length));
  }
  const tau = (beta - alpha) / beta;
  const inverse = 1 / (alpha - beta);
  for (let i = 1; i < length; i++) v[i] *= inverse;
  for (let k = 0; k < rescalings; k++) beta *= RESCALE_BELOW;
  v[0] = 1;
  return { tau, beta };
}
