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
    let pivot = a[rowJ + j] - shift;
    for (let k = 0; k < j; k++) pivot -= l[rowJ + k] * l[rowJ + k];
    if (!(pivot > 0)) return false; // also false for NaN
    const root = Math.sqrt(pivot);
    l[rowJ + j] = root;
    for (let i = j + 1; i < n; i++) {
      const rowI = i * n;
      let sum = a[rowI + j];
      for (let k = 0; k < j; k++) sum -= l[rowI + k] * l[rowJ + k];
      l[rowI + j] = sum / root;
    }
  }
  return true;
}
