// Matrix exponential by scaling and squaring with Padé approximants of degree 3, 5, 7, 9 or 13,
// chosen by the 1-norm thresholds θ_m of Higham, "The scaling and squaring method for the matrix
// exponential revisited", SIAM J. Matrix Anal. Appl. 26(4), 2005 (algorithm 2.3), and Van Loan's
// block exponential for the zero-order-hold integral (Van Loan, "Computing integrals involving the
// matrix exponential", IEEE Trans. Automat. Control 23(3), 1978).

import {
  type Dense,
  denseFromRows,
  denseToRows,
  identityDense,
  multiplyDense,
  norm1Dense,
  zerosDense,
} from './dense';
import { luFactor, luSolveDense } from './lu';
import type { Rows } from './types';

/** θ_m of Higham 2005, table 2.3: largest ‖A‖₁ for which the [m/m] Padé approximant is accurate to unit roundoff. */
const PADE_THETA: ReadonlyArray<readonly [number, number]> = [
  [3, 1.495585217958292e-2],
  [5, 2.539398330063230e-1],
  [7, 9.504178996162932e-1],
  [9, 2.097847961257068e0],
];
const THETA_13 = 5.371920351148152e0;

/**
 * Coefficients b_0 … b_m of the [m/m] Padé approximant to e^x (Higham 2005, section 2), i.e.
 * b_j ∝ (2m − j)!·m! / ((2m)!·j!·(m − j)!), normalised so that b_m = 1.
 */
const PADE_COEFFICIENTS: Record<number, readonly number[]> = {
  3: [120, 60, 12, 1],
  5: [30240, 15120, 3360, 420, 30, 1],
  7: [17297280, 8648640, 1995840, 277200, 25200, 1512, 56, 1],
  9: [17643225600, 8821612800, 2075673600, 302702400, 30270240, 2162160, 110880, 3960, 90, 1],
  13: [
    64764752532480000, 32382376266240000, 7771770303897600, 1187353796428800, 129060195264000,
    10559470521600, 670442572800, 33522128640, 1323241920, 40840800, 960960, 16380, 182, 1,
  ],
};

/** Σ_k c_k M_k over matrices of the same shape (a small axpy helper for the Padé sums). */
function linearCombination(terms: ReadonlyArray<readonly [number, Dense]>, n: number): Dense {
  const result = zerosDense(n, n);
  const rd = result.data;
  for (const [coefficient, matrix] of terms) {
    if (coefficient === 0) continue;
    const md = matrix.data;
    for (let i = 0; i < rd.length; i++) rd[i] += coefficient * md[i];
  }
  return result;
}

/** r_m(A) = (V − U)⁻¹(V + U) from the odd part U and even part V. */
function padeQuotient(U: Dense, V: Dense): Dense | null {
  const n = U.rows;
  const numerator = zerosDense(n, n);
  const denominator = zerosDense(n, n);
  for (let i = 0; i < n * n; i++) {
    numerator.data[i] = V.data[i] + U.data[i];
    denominator.data[i] = V.data[i] - U.data[i];
  }
  const factor = luFactor(denominator);
  if (factor.hasZeroPivot) return null;
  return luSolveDense(factor, numerator);
}

function padeLowDegree(A: Dense, degree: number): Dense | null {
  const n = A.rows;
  const b = PADE_COEFFICIENTS[degree];
  const I = identityDense(n);
  const powers: Dense[] = [I, multiplyDense(A, A)]; // even powers A^0, A^2, A^4, …
  for (let k = 2; 2 * k <= degree; k++) powers.push(multiplyDense(powers[k - 1], powers[1]));
  const oddTerms: Array<[number, Dense]> = [];
  const evenTerms: Array<[number, Dense]> = [];
  for (let k = 0; 2 * k <= degree; k++) {
    evenTerms.push([b[2 * k], powers[k]]);
    if (2 * k + 1 <= degree) oddTerms.push([b[2 * k + 1], powers[k]]);
  }
  const U = multiplyDense(A, linearCombination(oddTerms, n));
  const V = linearCombination(evenTerms, n);
  return padeQuotient(U, V);
}

function padeDegree13(A: Dense): Dense | null {
  const n = A.rows;
  const b = PADE_COEFFICIENTS[13];
  const I = identityDense(n);
  const A2 = multiplyDense(A, A);
  const A4 = multiplyDense(A2, A2);
  const A6 = multiplyDense(A4, A2);
  const innerOdd = linearCombination([[b[13], A6], [b[11], A4], [b[9], A2]], n);
  const outerOdd = linearCombination([[b[7], A6], [b[5], A4], [b[3], A2], [b[1], I]], n);
  const oddSum = multiplyDense(A6, innerOdd);
  for (let i = 0; i < oddSum.data.length; i++) oddSum.data[i] += outerOdd.data[i];
  const U = multiplyDense(A, oddSum);
  const innerEven = linearCombination([[b[12], A6], [b[10], A4], [b[8], A2]], n);
  const V = multiplyDense(A6, innerEven);
  const outerEven = linearCombination([[b[6], A6], [b[4], A4], [b[2], A2], [b[0], I]], n);
  for (let i = 0; i < V.data.length; i++) V.data[i] += outerEven.data[i];
  return padeQuotient(U, V);
}

function nanDense(rows: number, cols: number): Dense {
  const result = zerosDense(rows, cols);
  result.data.fill(NaN);
  return result;
}

/**
 * e^A for a square Dense matrix. A non-finite input (or an exactly singular Padé denominator, which
 * the θ bounds rule out for finite data) gives a matrix of NaN rather than an exception.
 */
export function matrixExponentialDense(A: Dense): Dense {
  const n = A.rows;
  if (A.cols !== n) return nanDense(A.rows, A.cols);
  if (n === 0) return zerosDense(0, 0);
  const norm = norm1Dense(A);
  if (!Number.isFinite(norm)) return nanDense(n, n);
  for (const [degree, theta] of PADE_THETA) {
    if (norm <= theta) return padeLowDegree(A, degree) ?? nanDense(n, n);
  }
  // Scale so that ‖A / 2^s‖₁ ≤ θ₁₃, then square s times.
  const squarings = Math.max(0, Math.ceil(Math.log2(norm / THETA_13)));
  const scaled = zerosDense(n, n);
  const factor = Math.pow(2, -squarings);
  for (let i = 0; i < n * n; i++) scaled.data[i] = A.data[i] * factor;
  let result = padeDegree13(scaled);
  if (result === null) return nanDense(n, n);
  for (let k = 0; k < squarings; k++) result = multiplyDense(result, result);
  return result;
}

/** e^A (Higham 2005 scaling and squaring). */
export function matrixExponential(A: Rows): Rows {
  return denseToRows(matrixExponentialDense(denseFromRows(A)));
}

export interface MatrixExponentialIntegral {
  /** Φ = e^{A·T}. */
  Phi: Rows;
  /** Γ = ∫₀ᵀ e^{A·τ} dτ · B. */
  Gamma: Rows;
}

/**
 * Φ = e^{AT} and Γ = ∫₀ᵀ e^{Aτ}dτ·B from one exponential of the block matrix [[A, B], [0, 0]]·T
 * (Van Loan 1978); valid for singular A (no A⁻¹ appears).
 */
export function matrixExponentialIntegral(A: Rows, B: Rows, T: number): MatrixExponentialIntegral {
  const n = A.length;
  const m = n === 0 ? 0 : (B[0]?.length ?? 0);
  const size = n + m;
  const block = zerosDense(size, size);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) block.data[i * size + j] = A[i][j] * T;
    for (let j = 0; j < m; j++) block.data[i * size + n + j] = B[i][j] * T;
  }
  const E = matrixExponentialDense(block);
  const Phi: Rows = [];
  const Gamma: Rows = [];
  for (let i = 0; i < n; i++) {
    Phi.push(Array.from(E.data.subarray(i * size, i * size + n)));
    Gamma.push(Array.from(E.data.subarray(i * size + n, i * size + size)));
  }
  return { Phi, Gamma };
}
