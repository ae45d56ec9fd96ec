// Eigenvalues and eigenvectors of a real square matrix: diagonal balancing, Hessenberg reduction,
// Francis QR to real Schur form T, then right eigenvectors of T by back-substitution (LAPACK dtrevc)
// mapped back through the Schur vectors and the balancing. Eigenvalues are returned sorted by real
// part, then imaginary part.

import { balanceDense } from './balance';
import { complexDivide } from './lu';
import { type Dense, denseFromRows, transposeDense } from './dense';
import { hessenbergDense } from './hessenberg';
import { hessenbergQr, realSchurDense, type RealSchurOptions } from './schur';
import type { Complex, ComplexRows, Rows } from './types';

const EPS = Number.EPSILON;
const SAFE_MIN = 2.2250738585072014e-308;
/** Back-substitution rescales the vector when an entry exceeds this, to avoid overflow. */
const RESCALE_THRESHOLD = 1e100;

/** Orders complex numbers by real part, then imaginary part (returns a new array). */
export function sortComplex(values: Complex[]): Complex[] {
  return values.slice().sort((x, y) => x.re - y.re || x.im - y.im);
}

export interface EigenvaluesOutcome {
  values: Complex[];
  /** False when the QR iteration exhausted its sweep budget; unconverged values are NaN. */
  converged: boolean;
}

/** Eigenvalues with a convergence flag (no Schur vectors are accumulated). */
export function eigenvaluesWithStatus(A: Rows, options: RealSchurOptions = {}): EigenvaluesOutcome {
  const matrix = denseFromRows(A);
  const n = matrix.rows;
  if (n === 0) return { values: [], converged: true };
  if (!matrix.data.every(Number.isFinite)) {
    return { values: Array.from({ length: n }, () => ({ re: NaN, im: NaN })), converged: false };
  }
  const remembered = recentEigenvalues.find((entry) => entry.maxSweeps === options.maxSweeps && sameEntries(entry.data, matrix.data));
  if (remembered) return copyOutcome(remembered.outcome);
  const { scaled } = balanceDense(matrix);
  const { H } = hessenbergDense(scaled, false);
  const outcome = hessenbergQr(H.data, n, null, false, options.maxSweeps);
  const result = { values: sortComplex(outcome.eigenvalues), converged: outcome.converged };
  if (n >= MEMO_FROM_ORDER) {
    recentEigenvalues.unshift({ data: matrix.data.slice(), maxSweeps: options.maxSweeps, outcome: copyOutcome(result) });
    recentEigenvalues.length = Math.min(recentEigenvalues.length, MEMO_SIZE);
  }
  return result;
}

export interface BalancedSchur {
  /** D⁻¹·A·D = Z·T·Zᵀ with D = diag(scaling), powers of two (balance.ts). */
  T: Dense;
  Z: Dense;
  scaling: Float64Array;
  converged: boolean;
}

/**
 * The eigenvalues eigenvaluesWithStatus gives (the same balancing, Hessenberg form and QR sweeps,
 * so the same numbers: accumulating Z changes no arithmetic on the active block), computed with
 * the Schur vectors of the balanced matrix, which balancedRealSchur then finds in its memo.
 */
export function eigenvaluesAndBalancedSchur(A: Rows): EigenvaluesOutcome {
  const schur = balancedRealSchur(A);
  if (!schur.outcome) return eigenvaluesWithStatus(A);
  return copyOutcome(schur.outcome);
}

/**
 * Real Schur form of the balanced A (D⁻¹·A·D = Z·T·Zᵀ), remembered for the last two matrices by
 * exact content (the step response asks for the closed loop the Riccati solver just formed).
 */
export function balancedRealSchur(A: Rows): BalancedSchur & { outcome?: EigenvaluesOutcome } {
  const matrix = denseFromRows(A);
  const n = matrix.rows;
  const remembered = recentSchurForms.find((entry) => sameEntries(entry.data, matrix.data));
  if (remembered) return remembered.schur;
  if (n === 0 || !matrix.data.every(Number.isFinite)) {
    return { T: matrix, Z: matrix, scaling: new Float64Array(n).fill(1), converged: n === 0 };
  }
  const { scaled, scaling } = balanceDense(matrix);
  const { H, Q } = hessenbergDense(scaled, true);
  const zt = transposeDense(Q!);
  const outcome = hessenbergQr(H.data, n, zt.data, true);
  for (let i = 2; i < n; i++) H.data.fill(0, i * n, i * n + i - 1);
  const result = { values: sortComplex(outcome.eigenvalues), converged: outcome.converged };
  if (n >= MEMO_FROM_ORDER && !recentEigenvalues.some((entry) => entry.maxSweeps === undefined && sameEntries(entry.data, matrix.data))) {
    recentEigenvalues.unshift({ data: matrix.data.slice(), maxSweeps: undefined, outcome: copyOutcome(result) });
    recentEigenvalues.length = Math.min(recentEigenvalues.length, MEMO_SIZE);
  }
  const schur = { T: H, Z: transposeDense(zt), scaling, converged: outcome.converged, outcome: result };
  recentSchurForms.unshift({ data: matrix.data.slice(), schur });
  recentSchurForms.length = Math.min(recentSchurForms.length, 2);
  return schur;
}

const recentSchurForms: { data: Float64Array; schur: BalancedSchur & { outcome: EigenvaluesOutcome } }[] = [];

// The analysis of one design asks for the eigenvalues of the same closed loop in several places
// (the Riccati solver's check, the step response's horizon, the margins' frequency grid), each
// forming A − B·K itself. The last few results are kept by exact content: an entry-by-entry
// comparison costs n² against the QR iteration's ~10·n³, and equal entries give the same answer.
const MEMO_SIZE = 4;
const MEMO_FROM_ORDER = 12;
const recentEigenvalues: { data: Float64Array; maxSweeps: number | undefined; outcome: EigenvaluesOutcome }[] = [];

/** Empties the memo (benchmarks time fresh computations; nothing else needs this). */
export function forgetRecentEigenvalues(): void {
  recentEigenvalues.length = 0;
  recentSchurForms.length = 0;
}

function sameEntries(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  // Bit for bit: −0 and 0 differ (1/x tells them apart), so the answer is exactly the one computed.
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i] || (a[i] === 0 && 1 / a[i] !== 1 / b[i])) return false;
  return true;
}

function copyOutcome(outcome: EigenvaluesOutcome): EigenvaluesOutcome {
  return { values: outcome.values.map((value) => ({ re: value.re, im: value.im })), converged: outcome.converged };
}

/** Eigenvalues of A sorted by real part then imaginary part (NaN entries if QR failed to converge). */
export function eigenvalues(A: Rows): Complex[] {
  return eigenvaluesWithStatus(A).values;
}

export interface EigenDecomposition {
  /** Sorted by real part, then imaginary part. */
  values: Complex[];
  /** Column j is a unit-2-norm eigenvector for values[j], its largest entry made real and positive. */
  vectors: ComplexRows;
  converged: boolean;
}

/** Solves the complex 2×2 system M·y = r with partial pivoting, raising tiny pivots to minimumPivot. */
function solveComplex2x2(
  m11r: number, m11i: number, m12r: number, m12i: number,
  m21r: number, m21i: number, m22r: number, m22i: number,
  r1r: number, r1i: number, r2r: number, r2i: number,
  minimumPivot: number,
): [number, number, number, number] {
  if (Math.hypot(m21r, m21i) > Math.hypot(m11r, m11i)) {
    [m11r, m11i, m12r, m12i, m21r, m21i, m22r, m22i] = [m21r, m21i, m22r, m22i, m11r, m11i, m12r, m12i];
    [r1r, r1i, r2r, r2i] = [r2r, r2i, r1r, r1i];
  }
  if (Math.hypot(m11r, m11i) < minimumPivot) {
    m11r = minimumPivot;
    m11i = 0;
  }
  const [lr, li] = complexDivide(m21r, m21i, m11r, m11i);
  let u22r = m22r - (lr * m12r - li * m12i);
  let u22i = m22i - (lr * m12i + li * m12r);
  const s2r = r2r - (lr * r1r - li * r1i);
  const s2i = r2i - (lr * r1i + li * r1r);
  if (Math.hypot(u22r, u22i) < minimumPivot) {
    u22r = minimumPivot;
    u22i = 0;
  }
  const [y2r, y2i] = complexDivide(s2r, s2i, u22r, u22i);
  const [y1r, y1i] = complexDivide(r1r - (m12r * y2r - m12i * y2i), r1i - (m12r * y2i + m12i * y2r), m11r, m11i);
  return [y1r, y1i, y2r, y2i];
}

/**
 * Right eigenvector of the quasi-triangular t for the block at k (size 1, or size 2 for the pair
 * whose member with positive imaginary part is lambda), as real and imaginary parts of length n.
 */
export function quasiTriangularEigenvector(t: Float64Array, n: number, k: number, size: number, lambda: Complex): [Float64Array, Float64Array] {
  const yr = new Float64Array(n);
  const yi = new Float64Array(n);
  const minimumPivot = Math.max(EPS * (Math.abs(lambda.re) + Math.abs(lambda.im)), SAFE_MIN * (n / EPS));
  const top = k + size - 1;
  if (size === 1) {
    yr[k] = 1;
  } else {
    const b = t[k * n + k + 1];
    const c = t[(k + 1) * n + k];
    if (Math.abs(b) >= Math.abs(c)) {
      yr[k] = 1;
      yi[k + 1] = lambda.im / b;
    } else {
      yi[k] = lambda.im / c;
      yr[k + 1] = 1;
    }
  }
  const rescale = (from: number, magnitude: number) => {
    if (magnitude <= RESCALE_THRESHOLD) return;
    const factor = 1 / magnitude;
    for (let p = from; p <= top; p++) {
      yr[p] *= factor;
      yi[p] *= factor;
    }
  };
  let j = k - 1;
  while (j >= 0) {
    if (j > 0 && t[j * n + j - 1] !== 0) {
      // 2×2 diagonal block at rows j−1, j.
      let s1r = 0;
      let s1i = 0;
      let s2r = 0;
      let s2i = 0;
      for (let p = j + 1; p <= top; p++) {
        const upper = t[(j - 1) * n + p];
        const lower = t[j * n + p];
        s1r += upper * yr[p];
        s1i += upper * yi[p];
        s2r += lower * yr[p];
        s2i += lower * yi[p];
      }
      const [a1r, a1i, a2r, a2i] = solveComplex2x2(
        t[(j - 1) * n + j - 1] - lambda.re, -lambda.im, t[(j - 1) * n + j], 0,
        t[j * n + j - 1], 0, t[j * n + j] - lambda.re, -lambda.im,
        -s1r, -s1i, -s2r, -s2i,
        minimumPivot,
      );
      yr[j - 1] = a1r;
      yi[j - 1] = a1i;
      yr[j] = a2r;
      yi[j] = a2i;
      rescale(j - 1, Math.max(Math.hypot(a1r, a1i), Math.hypot(a2r, a2i)));
      j -= 2;
    } else {
      let sr = 0;
      let si = 0;
      for (let p = j + 1; p <= top; p++) {
        const entry = t[j * n + p];
        sr += entry * yr[p];
        si += entry * yi[p];
      }
      let dr = t[j * n + j] - lambda.re;
      let di = -lambda.im;
      if (Math.hypot(dr, di) < minimumPivot) {
        dr = minimumPivot;
        di = 0;
      }
      const [qr, qi] = complexDivide(-sr, -si, dr, di);
      yr[j] = qr;
      yi[j] = qi;
      rescale(j, Math.hypot(qr, qi));
      j -= 1;
    }
  }
  return [yr, yi];
}

/** Unit 2-norm, with the largest-magnitude entry made real and positive. */
function normaliseComplexVector(xr: Float64Array, xi: Float64Array): void {
  let largest = 0;
  let largestIndex = 0;
  let maxAbs = 0;
  for (let i = 0; i < xr.length; i++) maxAbs = Math.max(maxAbs, Math.abs(xr[i]), Math.abs(xi[i]));
  if (maxAbs === 0 || !Number.isFinite(maxAbs)) return;
  let sumOfSquares = 0;
  for (let i = 0; i < xr.length; i++) {
    const re = xr[i] / maxAbs;
    const im = xi[i] / maxAbs;
    const magnitudeSquared = re * re + im * im;
    sumOfSquares += magnitudeSquared;
    if (magnitudeSquared > largest) {
      largest = magnitudeSquared;
      largestIndex = i;
    }
  }
  const norm = maxAbs * Math.sqrt(sumOfSquares);
  const phaseMagnitude = Math.hypot(xr[largestIndex], xi[largestIndex]);
  // Multiply by conj(phase)/norm where phase = x[largest]/|x[largest]|.
  const cr = xr[largestIndex] / phaseMagnitude / norm;
  const ci = -xi[largestIndex] / phaseMagnitude / norm;
  for (let i = 0; i < xr.length; i++) {
    const re = xr[i];
    const im = xi[i];
    xr[i] = re * cr - im * ci;
    xi[i] = re * ci + im * cr;
  }
  xi[largestIndex] = 0;
}

/** Right eigenvectors of A = Z·T·Zᵀ (T quasi-triangular): column j of the result belongs to values[j]. */
export function eigenvectorsFromSchur(T: Dense, Z: Dense, scaling: Float64Array | null): { values: Complex[]; re: Float64Array; im: Float64Array } {
  const n = T.rows;
  const t = T.data;
  const z = Z.data;
  const values: Complex[] = [];
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  const xr = new Float64Array(n);
  const xi = new Float64Array(n);
  const store = (column: number, conjugate: boolean) => {
    for (let i = 0; i < n; i++) {
      re[i * n + column] = xr[i];
      im[i * n + column] = conjugate ? -xi[i] : xi[i];
    }
  };
  for (let k = 0; k < n; ) {
    const size = k + 1 < n && t[(k + 1) * n + k] !== 0 ? 2 : 1;
    let lambda: Complex;
    if (size === 1) lambda = { re: t[k * n + k], im: 0 };
    else {
      const omega = Math.sqrt(Math.abs(t[k * n + k + 1])) * Math.sqrt(Math.abs(t[(k + 1) * n + k]));
      lambda = { re: t[k * n + k], im: omega };
    }
    const [yr, yi] = quasiTriangularEigenvector(t, n, k, size, lambda);
    const top = k + size - 1;
    for (let i = 0; i < n; i++) {
      let sr = 0;
      let si = 0;
      const offset = i * n;
      for (let p = 0; p <= top; p++) {
        sr += z[offset + p] * yr[p];
        si += z[offset + p] * yi[p];
      }
      const d = scaling ? scaling[i] : 1;
      xr[i] = sr * d;
      xi[i] = si * d;
    }
    normaliseComplexVector(xr, xi);
    values.push(lambda);
    store(k, false);
    if (size === 2) {
      values.push({ re: lambda.re, im: -lambda.im });
      store(k + 1, true);
    }
    k += size;
  }
  return { values, re, im };
}

/** Eigenvalues and unit-norm right eigenvectors, A·v_j = λ_j·v_j, sorted by eigenvalue. */
export function eigenDecomposition(A: Rows, options: RealSchurOptions = {}): EigenDecomposition {
  const matrix = denseFromRows(A);
  const n = matrix.rows;
  if (n === 0) return { values: [], vectors: { re: [], im: [] }, converged: true };
  const nanResult = (): EigenDecomposition => ({
    values: Array.from({ length: n }, () => ({ re: NaN, im: NaN })),
    vectors: {
      re: Array.from({ length: n }, () => new Array<number>(n).fill(NaN)),
      im: Array.from({ length: n }, () => new Array<number>(n).fill(NaN)),
    },
    converged: false,
  });
  if (!matrix.data.every(Number.isFinite)) return nanResult();
  const { scaled, scaling } = balanceDense(matrix);
  const schur = realSchurDense(scaled, options);
  if (!schur.converged) return nanResult();
  const { values, re, im } = eigenvectorsFromSchur(schur.T, schur.Z, scaling);
  const order = values.map((_, index) => index).sort((x, y) => values[x].re - values[y].re || values[x].im - values[y].im);
  const vectors: ComplexRows = {
    re: Array.from({ length: n }, (_, i) => order.map((column) => re[i * n + column])),
    im: Array.from({ length: n }, (_, i) => order.map((column) => im[i * n + column])),
  };
  return { values: order.map((index) => values[index]), vectors, converged: true };
}
