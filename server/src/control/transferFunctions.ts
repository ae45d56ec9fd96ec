// Transfer functions G_ij(s) = n_ij(s)/d(s) of each input–output pair, coefficients highest power
// first. Method: the denominator is det(sI − A), the characteristic polynomial of A (from its
// eigenvalues); the numerator comes from the rank-one determinant identity
//   det(sI − A + B_j·C_i) = det(sI − A)·(1 + C_i(sI − A)⁻¹B_j)
// so n_ij = char(A − B_j C_i) − char(A) + D_ij·char(A). Leading coefficients below the rounding
// level of that difference (10·n·ε·(|a_k| + |b_k|) per coefficient) are trimmed. No pole–zero
// cancellation is performed: the denominator keeps every mode (uncontrollable/unobservable ones
// cancel numerically against a numerator root).
import type { Complex, Rows } from '../numeric/types';
import { characteristicPolynomial, polynomialRoots } from '../numeric';
import { EPS } from './controlLinearAlgebra';

export interface TransferFunctionPair {
  output: number;
  input: number;
  numerator: number[];
  denominator: number[];
  poles: Complex[];
  zeros: Complex[];
}

export interface TransferFunctionsResult {
  method: 'characteristic-polynomial-difference';
  pairs: TransferFunctionPair[];
}

export function transferFunctions(A: Rows, B: Rows, C: Rows, D: Rows): TransferFunctionsResult {
  const n = A.length;
  const m = B[0]?.length ?? D[0]?.length ?? 0;
  const p = C.length;
  const denominator = n === 0 ? [1] : characteristicPolynomial(A);
  const poles = n === 0 ? [] : polynomialRoots(denominator);
  const pairs: TransferFunctionPair[] = [];
  for (let j = 0; j < m; j++) {
    for (let i = 0; i < p; i++) {
      const d = D[i]?.[j] ?? 0;
      let numerator: number[];
      let scale: number[];
      if (n === 0) {
        numerator = [d];
        scale = [Math.abs(d)];
      } else {
        const modified = characteristicPolynomial(A.map((row, r) => row.map((v, c) => v - B[r][j] * C[i][c])));
        numerator = modified.map((v, k) => v - denominator[k] + d * denominator[k]);
        scale = modified.map((v, k) => Math.abs(v) + Math.abs(denominator[k]) * (1 + Math.abs(d)));
      }
      let start = 0;
      while (start < numerator.length - 1 && Math.abs(numerator[start]) <= 10 * Math.max(1, n) * EPS * scale[start]) start++;
      numerator = numerator.slice(start);
      if (numerator.length === 1 && Math.abs(numerator[0]) <= 10 * Math.max(1, n) * EPS * scale[scale.length - 1]) numerator = [0];
      const zeros = numerator.length > 1 && numerator.some((v) => v !== 0) ? polynomialRoots(numerator) : [];
      pairs.push({ output: i, input: j, numerator, denominator: denominator.slice(), poles, zeros });
    }
  }
  return { method: 'characteristic-polynomial-difference', pairs };
}

/** The per-pair list alone (what the plant report shows). */
export function transferFunctionsOf(A: Rows, B: Rows, C: Rows, D: Rows): TransferFunctionPair[] {
  return transferFunctions(A, B, C, D).pairs;
}
