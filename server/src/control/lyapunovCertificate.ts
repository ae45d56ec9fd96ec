// Stability by a quadratic Lyapunov function. With X ≻ 0, AᵀX + XA ≺ 0 proves every eigenvalue of
// A in the open left half-plane (Lyapunov's theorem); X − AᵀXA ≻ 0 proves every eigenvalue inside
// the unit circle (Stein's). The Riccati solution X of an LQR design is such a function for the
// nominal closed loop; while it still certifies a perturbed loop, the fragility study needs no
// eigenvalue problem to know that loop is stable. Each test leaves a margin for the rounding of
// the products and of the Cholesky factorisation ((n + 2)²·ε relative, generous), so a
// certificate is never an artefact of rounding. A failed test proves nothing: the caller then
// computes eigenvalues.
import { denseFromRows, multiplyDense, normFrobeniusDense, transposeDense, type Dense } from '../numeric/dense';
import { isPositiveDefiniteShifted } from '../numeric';
import type { Rows } from '../numeric/types';
import type { Domain } from './structure';

const EPS = Number.EPSILON;

export interface LyapunovCertificate {
  X: Dense;
  normX: number;
}

function roundingMargin(n: number): number {
  return (n + 2) * (n + 2) * EPS;
}

/** The certificate matrix X (symmetric), or null unless X is positive definite beyond rounding. */
export function lyapunovCertificate(X: Rows): LyapunovCertificate | null {
  const n = X.length;
  if (n === 0 || X.some((row) => row.length !== n)) return null;
  const dense = denseFromRows(X);
  if (!dense.data.every(Number.isFinite)) return null;
  const normX = normFrobeniusDense(dense);
  if (!isPositiveDefiniteShifted(dense.data, n, roundingMargin(n) * normX)) return null;
  return { X: dense, normX };
}

/**
 * True when the certificate proves A stable (continuous: Re λ < 0; discrete: |λ| < 1). False
 * means only that this X does not prove it.
 */
export function certifiesStability(certificate: LyapunovCertificate, A: Rows, domain: Domain): boolean {
  const n = certificate.X.rows;
  if (A.length !== n || A.some((row) => row.length !== n)) return false;
  const a = denseFromRows(A);
  if (!a.data.every(Number.isFinite)) return false;
  const normA = normFrobeniusDense(a);
  const XA = multiplyDense(certificate.X, a);
  const decrease = new Float64Array(n * n); // −(AᵀX + XA), or X − AᵀXA
  let roundingScale: number;
  if (domain === 'continuous') {
    for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) decrease[i * n + j] = -(XA.data[i * n + j] + XA.data[j * n + i]);
    roundingScale = certificate.normX * normA;
  } else {
    const AtXA = multiplyDense(transposeDense(a), XA);
    const x = certificate.X.data;
    for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) decrease[i * n + j] = x[i * n + j] - (AtXA.data[i * n + j] + AtXA.data[j * n + i]) / 2;
    roundingScale = certificate.normX * (1 + normA * normA);
  }
  let normDecrease = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) normDecrease += (i === j ? 1 : 2) * decrease[i * n + j] ** 2;
  const margin = roundingMargin(n) * (roundingScale + Math.sqrt(normDecrease));
  return isPositiveDefiniteShifted(decrease, n, margin);
}

