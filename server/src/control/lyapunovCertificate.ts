// Stability by a quadratic Lyapunov function. With X ≻ 0, AᵀX + XA ≺ 0 proves every eigenvalue of
// A in the open left half-plane (Lyapunov's theorem); X − AᵀXA ≻ 0 proves every eigenvalue inside
// the unit circle (Stein's). The Riccati solution X of an LQR design is such a function for the
// nominal closed loop; while it still certifies a perturbed loop, the fragility study needs no
// eigenvalue problem to know that loop is stable. Each test leaves a margin for the rounding of
// the products and of the Cholesky factorisation ((n + 2)²·ε relative, generous), so a
// certificate is never an artefact of rounding. A failed test proves nothing: the caller then
// computes eigenvalues.
import { denseFromRows, multiplyDense, normFrobeniusDense, transposeMultiplySymmetricDense, type Dense } from '../numeric/dense';
import { isPositiveDefiniteShifted } from '../numeric';
import type { Rows } from '../numeric/types';
import type { Domain } from './structure';

const EPS = Number.EPSILON;

export interface LyapunovCertificate {
  X: Dense;
  normX: number;
  /**
   * A reference loop A₀ (the nominal one) with X·A₀ + (X·A₀)ᵀ formed once: a loop that differs
   * from it in a few entries (one parameter moved) then costs X·Δ over Δ's nonzeros only.
   */
  reference?: {
    A: Dense;
    normA: number;
    /** Xᵀ (rows of Xᵀ are the columns of X, read contiguously). */
    Xt: Float64Array;
    /** X·A₀ + (X·A₀)ᵀ, lower triangle. */
    symmetricPart: Float64Array;
  };
}

function roundingMargin(n: number): number {
  return (n + 2) * (n + 2) * EPS;
}

/**
 * The certificate matrix X (symmetric), or null unless X is positive definite beyond rounding.
 * `referenceLoop`, when given, is the loop most tested loops differ from in few entries.
 */
export function lyapunovCertificate(X: Rows, referenceLoop?: Rows): LyapunovCertificate | null {
  const n = X.length;
  if (n === 0 || X.some((row) => row.length !== n)) return null;
  const dense = denseFromRows(X);
  if (!allFinite(dense.data)) return null;
  const normX = normFrobeniusDense(dense);
  if (!isPositiveDefiniteShifted(dense.data, n, roundingMargin(n) * normX)) return null;
  const certificate: LyapunovCertificate = { X: dense, normX };
  if (referenceLoop && referenceLoop.length === n && referenceLoop.every((row) => row.length === n)) {
    const A = denseFromRows(referenceLoop);
    if (allFinite(A.data)) {
      const XA = multiplyDense(dense, A).data;
      const symmetricPart = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) symmetricPart[i * n + j] = XA[i * n + j] + XA[j * n + i];
      const Xt = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) Xt[j * n + i] = dense.data[i * n + j];
      certificate.reference = { A, normA: normFrobeniusDense(A), Xt, symmetricPart };
    }
  }
  return certificate;
}

/** Entries of A − A₀ that are not zero: (row, column, value) triples, or null beyond `limit`. */
function sparseDifference(a: Float64Array, reference: Float64Array, n: number, limit: number): { rows: number[]; columns: number[]; values: number[] } | null {
  const difference = { rows: [] as number[], columns: [] as number[], values: [] as number[] };
  for (let k = 0; k < a.length; k++) {
    const value = a[k] - reference[k];
    if (value === 0) continue;
    if (difference.values.length >= limit) return null;
    difference.rows.push(Math.floor(k / n));
    difference.columns.push(k % n);
    difference.values.push(value);
  }
  return difference;
}

/**
 * −(AᵀX + XA) into `decrease` (lower triangle) for a loop A that differs from the reference loop
 * in few entries: with U = (X·Δ)ᵀ, whose row j gains Δ(i, j)·(row i of Xᵀ) per nonzero of Δ
 * (n multiply–adds each, contiguous), XA(i, j) = XA₀(i, j) + U(j, i). Returns the scale of the
 * rounding, ‖X‖(‖A₀‖ + ‖Δ‖) ≥ ‖X‖‖A‖; null when Δ has too many nonzeros.
 */
function decreaseFromReference(certificate: LyapunovCertificate, a: Dense, decrease: Float64Array): number | null {
  const n = a.rows;
  const reference = certificate.reference;
  const difference = reference ? sparseDifference(a.data, reference.A.data, n, (n * n) >> 3) : null;
  if (!reference || !difference) return null;
  const update = new Float64Array(n * n);
  const xt = reference.Xt;
  let normDifference = 0;
  for (let k = 0; k < difference.values.length; k++) {
    const from = difference.rows[k] * n;
    const to = difference.columns[k] * n;
    const value = difference.values[k];
    normDifference += value * value;
    for (let r = 0; r < n; r++) update[to + r] += xt[from + r] * value;
  }
  const symmetricPart = reference.symmetricPart;
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) decrease[i * n + j] = -(symmetricPart[i * n + j] + update[j * n + i] + update[i * n + j]);
  return certificate.normX * (reference.normA + Math.sqrt(normDifference));
}

/** True when every entry is a finite number. */
function allFinite(values: Float64Array): boolean {
  for (let k = 0; k < values.length; k++) if (!Number.isFinite(values[k])) return false;
  return true;
}

/**
 * True when the certificate proves A stable (continuous: Re λ < 0; discrete: |λ| < 1). False
 * means only that this X does not prove it.
 */
export function certifiesStability(certificate: LyapunovCertificate, A: Rows, domain: Domain): boolean {
  const n = certificate.X.rows;
  if (A.length !== n || A.some((row) => row.length !== n)) return false;
  const a = denseFromRows(A);
  if (!allFinite(a.data)) return false;
  const decrease = new Float64Array(n * n); // −(AᵀX + XA), or X − AᵀXA
  let roundingScale: number;
  if (domain === 'continuous') {
    const fromReference = decreaseFromReference(certificate, a, decrease);
    if (fromReference !== null) roundingScale = fromReference;
    else {
      const XA = multiplyDense(certificate.X, a).data;
      for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) decrease[i * n + j] = -(XA[i * n + j] + XA[j * n + i]);
      roundingScale = certificate.normX * normFrobeniusDense(a);
    }
  } else {
    const normA = normFrobeniusDense(a);
    // AᵀXA is symmetric: one triangle of the last product (exactly symmetric, no averaging needed).
    const AtXA = transposeMultiplySymmetricDense(a, multiplyDense(certificate.X, a));
    const x = certificate.X.data;
    for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) decrease[i * n + j] = x[i * n + j] - AtXA.data[i * n + j];
    roundingScale = certificate.normX * (1 + normA * normA);
  }
  let normDecrease = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) normDecrease += (i === j ? 1 : 2) * decrease[i * n + j] ** 2;
  const margin = roundingMargin(n) * (roundingScale + Math.sqrt(normDecrease));
  return isPositiveDefiniteShifted(decrease, n, margin);
}

