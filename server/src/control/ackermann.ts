// Ackermann's formula k = e_nᵀ·𝒞⁻¹·p(A) for one input. Numerically unsound for anything but small,
// well-scaled plants (it forms the controllability matrix 𝒞 = [b, Ab, …]); used only as an
// independent cross-check of the Hessenberg method in tests.
import type { Complex, Rows } from '../numeric/types';
import { multiplyRows, solveRows, transposeRows } from './controlLinearAlgebra';

/** Real coefficients (highest power first) of ∏(s − λ). */
export function polynomialWithRoots(roots: Complex[]): number[] {
  let re = [1];
  let im = [0];
  for (const root of roots) {
    const nextRe = new Array<number>(re.length + 1).fill(0);
    const nextIm = new Array<number>(re.length + 1).fill(0);
    for (let i = 0; i < re.length; i++) {
      nextRe[i] += re[i];
      nextIm[i] += im[i];
      nextRe[i + 1] -= root.re * re[i] - root.im * im[i];
      nextIm[i + 1] -= root.re * im[i] + root.im * re[i];
    }
    re = nextRe;
    im = nextIm;
  }
  return re;
}

export function ackermannGain(A: Rows, b: number[], poles: Complex[]): number[] {
  const n = A.length;
  const columns: number[][] = [b.slice()];
  for (let k = 1; k < n; k++) columns.push(multiplyRows(A, columns[k - 1].map((v) => [v])).map((row) => row[0]));
  const controllability = transposeRows(columns);
  const coefficients = polynomialWithRoots(poles);
  // p(A) by Horner.
  let P: Rows = A.map((row, i) => row.map((_, j) => (i === j ? coefficients[0] : 0)));
  for (let c = 1; c <= n; c++) {
    P = multiplyRows(P, A).map((row, i) => row.map((value, j) => value + (i === j ? coefficients[c] : 0)));
  }
  // e_nᵀ 𝒞⁻¹ = solution of 𝒞ᵀ·w = e_n.
  const en = A.map((_, i) => [i === n - 1 ? 1 : 0]);
  const w = solveRows(transposeRows(controllability), en).X.map((row) => row[0]);
  return P[0].map((_, j) => w.reduce((sum, value, i) => sum + value * P[i][j], 0));
}
