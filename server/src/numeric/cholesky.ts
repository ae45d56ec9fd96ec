// Positive definiteness by Cholesky factorisation (Golub & Van Loan, Matrix Computations,
// algorithm 4.2.1): a symmetric matrix is positive definite exactly when every pivot of its
// Cholesky factorisation is positive.

/**
 * True when the symmetric n×n matrix a − shift·I (row-major; only the lower triangle is read)
 * has a Cholesky factorisation with positive pivots. `a` is not modified.
 */
export function isPositiveDefiniteShifted(a: Float64Array, n: number, shift: number): boolean {
  const l = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    const rowJ = j * n;
    const pivot = a[rowJ + j] - shift - rowProduct(l, rowJ, rowJ, j);
    if (!(pivot > 0)) return false; // also false for NaN
    const root = Math.sqrt(pivot);
    l[rowJ + j] = root;
    for (let i = j + 1; i < n; i++) {
      const rowI = i * n;
      l[rowI + j] = (a[rowI + j] - rowProduct(l, rowI, rowJ, j)) / root;
    }
  }
  return true;
}

/**
 * Σ_{k<length} l[first + k]·l[second + k] with four partial sums: independent additions instead
 * of one chain, about twice the speed of the plain loop at n = 100 (the sums round differently,
 * well inside the test's margin).
 */
function rowProduct(l: Float64Array, first: number, second: number, length: number): number {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let k = 0;
  for (; k + 3 < length; k += 4) {
    s0 += l[first + k] * l[second + k];
    s1 += l[first + k + 1] * l[second + k + 1];
    s2 += l[first + k + 2] * l[second + k + 2];
    s3 += l[first + k + 3] * l[second + k + 3];
  }
  for (; k < length; k++) s0 += l[first + k] * l[second + k];
  return s0 + s1 + (s2 + s3);
}
