// Frequency response of a state-space model G = C (λI − A)⁻¹ B + D at λ = jω (continuous) or
// λ = e^{jωT} (discrete, ω up to the Nyquist frequency π/T). A is first brought to real Schur
// form A = Z T Zᵀ (T quasi-upper-triangular, Z orthogonal), so each frequency costs one block
// back substitution with (λI − T): about n²·m real multiply-adds, no copy and no elimination
// (the Schur variant of Laub's method, "Efficient multivariable frequency response
// computations", IEEE TAC 26(2), 1981). From MODAL_FROM_STATES states on, T's eigenvectors turn
// each value into a modal sum G(λ) = D + Σ_k R_k/(λ − λ_k), n·p·m work per point, kept only where
// its rounding estimate is small (else that point takes the back substitution). When the QR
// iteration does not converge, the Hessenberg form A = Q H Qᵀ and an O(n²·m) complex Hessenberg
// solve with partial pivoting serve instead.
// Phase is unwrapped along the grid (jumps > 180° removed by ±360°), magnitude in dB.
import type { Complex, ComplexRows, Rows } from '../numeric/types';
import { denseFromRows, hessenbergDecomposition, quasiTriangularModes, realSchurDense, type Dense, type RealSchurDense } from '../numeric';

export type TransferEvaluator = ((point: Complex) => { value: ComplexRows; singular: boolean }) & {
  /** The same values at many points, faster where the evaluator can share work between them. */
  many?: (points: Complex[]) => { value: ComplexRows; singular: boolean }[];
  /** How values are computed (tests and timing read it). */
  route?: 'schur' | 'modal' | 'hessenberg';
};

/**
 * Precomputes the real Schur form of A (or, failing that, its Hessenberg form); the returned
 * function evaluates G(λ). `singular` is set when λ is numerically an eigenvalue of A (a pivot
 * below n·ε·max|T|).
 */
export function transferEvaluator(A: Rows, B: Rows, C: Rows, D: Rows, schurOfA?: RealSchurDense): TransferEvaluator {
  const n = A.length;
  if (n === 0) {
    return () => ({ value: { re: D.map((row) => row.slice()), im: D.map((row) => row.map(() => 0)) }, singular: false });
  }
  return schurTransferEvaluator(A, B, C, D, schurOfA) ?? hessenbergTransferEvaluator(A, B, C, D);
}

/**
 * G(λ) = C̃ (λI − T)⁻¹ B̃ + D with A = Z T Zᵀ, B̃ = Zᵀ B, C̃ = C Z; null when the Schur form fails.
 * A Schur form of A already at hand (shared by several responses of one loop) may be passed in.
 * From `modalFromStates` states on (default MODAL_FROM_STATES) values are first tried as modal sums.
 */
export function schurTransferEvaluator(
  A: Rows,
  B: Rows,
  C: Rows,
  D: Rows,
  schurOfA?: RealSchurDense,
  modalFromStates = MODAL_FROM_STATES,
): TransferEvaluator | null {
  const n = A.length;
  const m = D[0]?.length ?? B[0]?.length ?? 0;
  const p = C.length;
  const schur = schurOfA ?? realSchurDense(denseFromRows(A));
  if (!schur.converged || schur.T.rows !== n) return null;
  const t = schur.T.data;
  const z = schur.Z.data;
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(t[i]));
  const bt = new Float64Array(n * m);
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < m; j++) {
      const bkj = B[k][j];
      if (bkj === 0) continue;
      for (let i = 0; i < n; i++) bt[i * m + j] += z[k * n + i] * bkj;
    }
  }
  const ct = new Float64Array(p * n);
  for (let i = 0; i < p; i++) {
    for (let k = 0; k < n; k++) {
      const cik = C[i][k];
      if (cik === 0) continue;
      for (let j = 0; j < n; j++) ct[i * n + j] += cik * z[k * n + j];
    }
  }
  const pivotFloor = n * Number.EPSILON * Math.max(scale, Number.MIN_VALUE);
  const xr = new Float64Array(n * m);
  const xi = new Float64Array(n * m);
  const block = new Float64Array(4);
  const evaluate = (point: Complex) => {
    const lr = point.re;
    const li = point.im;
    let singular = false;
    // Back substitution from the last row; a nonzero subdiagonal T[i][i−1] marks a 2×2 block.
    for (let i = n - 1; i >= 0; ) {
      const pair = i > 0 && t[i * n + i - 1] !== 0;
      const top = pair ? i - 1 : i;
      for (let j = 0; j < m; j++) {
        // r_q = b̃_q + Σ_{k beyond the block} T[q][k]·x_k for the block's rows q.
        let r0r = bt[top * m + j];
        let r0i = 0;
        let r1r = pair ? bt[i * m + j] : 0;
        let r1i = 0;
        const row0 = top * n;
        const row1 = i * n;
        for (let k = i + 1; k < n; k++) {
          const x = xr[k * m + j];
          const y = xi[k * m + j];
          const t0 = t[row0 + k];
          r0r += t0 * x;
          r0i += t0 * y;
          if (pair) {
            const t1 = t[row1 + k];
            r1r += t1 * x;
            r1i += t1 * y;
          }
        }
        if (!solveDiagonalBlock(lr, li, t, n, top, pair, r0r, r0i, r1r, r1i, pivotFloor, block)) singular = true;
        xr[top * m + j] = block[0];
        xi[top * m + j] = block[1];
        if (pair) {
          xr[i * m + j] = block[2];
          xi[i * m + j] = block[3];
        }
      }
      i -= pair ? 2 : 1;
    }
    return { value: outputCombination(ct, xr, xi, D, n, m, p), singular };
  };
  // Four points per pass over T (x stored point-minor: entry (k, j) of point q at (k·m + j)·4 + q):
  // each loaded entry of T serves four right-hand sides, and the eight sums per row are
  // independent. Each point's sums run in the same order as `evaluate`'s, so the values are the same.
  const batchXr = new Float64Array(n * m * BATCH);
  const batchXi = new Float64Array(n * m * BATCH);
  const pointXr = new Float64Array(n * m);
  const pointXi = new Float64Array(n * m);
  const many = (points: Complex[]) => {
    const results: { value: ComplexRows; singular: boolean }[] = [];
    for (let first = 0; first < points.length; first += BATCH) {
      // A short last batch repeats its last point (computed, not returned).
      const batch = Array.from({ length: BATCH }, (_, q) => points[Math.min(first + q, points.length - 1)]);
      const singular = [false, false, false, false];
      for (let i = n - 1; i >= 0; ) {
        const pair = i > 0 && t[i * n + i - 1] !== 0;
        const top = pair ? i - 1 : i;
        const row0 = top * n;
        const row1 = i * n;
        for (let j = 0; j < m; j++) {
          const b0 = bt[top * m + j];
          const b1 = pair ? bt[i * m + j] : 0;
          let re0 = b0, re1 = b0, re2 = b0, re3 = b0;
          let im0 = 0, im1 = 0, im2 = 0, im3 = 0;
          let se0 = b1, se1 = b1, se2 = b1, se3 = b1;
          let sim0 = 0, sim1 = 0, sim2 = 0, sim3 = 0;
          for (let k = i + 1; k < n; k++) {
            const at = (k * m + j) * BATCH;
            const t0 = t[row0 + k];
            const x0 = batchXr[at], x1 = batchXr[at + 1], x2 = batchXr[at + 2], x3 = batchXr[at + 3];
            const y0 = batchXi[at], y1 = batchXi[at + 1], y2 = batchXi[at + 2], y3 = batchXi[at + 3];
            re0 += t0 * x0; re1 += t0 * x1; re2 += t0 * x2; re3 += t0 * x3;
            im0 += t0 * y0; im1 += t0 * y1; im2 += t0 * y2; im3 += t0 * y3;
            if (pair) {
              const t1 = t[row1 + k];
              se0 += t1 * x0; se1 += t1 * x1; se2 += t1 * x2; se3 += t1 * x3;
              sim0 += t1 * y0; sim1 += t1 * y1; sim2 += t1 * y2; sim3 += t1 * y3;
            }
          }
          const sums = [re0, im0, se0, sim0, re1, im1, se1, sim1, re2, im2, se2, sim2, re3, im3, se3, sim3];
          for (let q = 0; q < BATCH; q++) {
            const point = batch[q];
            const o = q * 4;
            if (!solveDiagonalBlock(point.re, point.im, t, n, top, pair, sums[o], sums[o + 1], sums[o + 2], sums[o + 3], pivotFloor, block)) singular[q] = true;
            batchXr[(top * m + j) * BATCH + q] = block[0];
            batchXi[(top * m + j) * BATCH + q] = block[1];
            if (pair) {
              batchXr[(i * m + j) * BATCH + q] = block[2];
              batchXi[(i * m + j) * BATCH + q] = block[3];
            }
          }
        }
        i -= pair ? 2 : 1;
      }
      for (let q = 0; q < BATCH && first + q < points.length; q++) {
        for (let e = 0; e < n * m; e++) {
          pointXr[e] = batchXr[e * BATCH + q];
          pointXi[e] = batchXi[e * BATCH + q];
        }
        results.push({ value: outputCombination(ct, pointXr, pointXi, D, n, m, p), singular: singular[q] });
      }
    }
    return results;
  };
  const schurEvaluator: TransferEvaluator = Object.assign(evaluate, { many, route: 'schur' as const });
  if (n < modalFromStates) return schurEvaluator;
  return modalTransferEvaluator(schur.T, bt, ct, D, n, m, p, schurEvaluator) ?? schurEvaluator;
}

/**
 * From this many states on, G(λ) is first tried as a modal sum (below it the back substitution
 * is already cheap, and small models keep exactly the Schur route's values).
 */
export const MODAL_FROM_STATES = 24;

/** A modal value is kept only when its rounding estimate is below this fraction of max|G(λ)|. */
const MODAL_RELATIVE_ACCURACY = 1e-9;

/**
 * G(λ) = D + Σ_k R_k/(λ − λ_k) with residues R_k = (C̃V)_{:,k}·(V⁻¹B̃)_{k,:} from the modal
 * coordinates of T (numeric/quasiTriangularModes.ts): n·p·m work per point instead of n²·m/2.
 * Every value carries an a-posteriori rounding estimate Σ_k ε·c_k·|R_k|·(n/|λ − λ_k| +
 * ‖T‖_F/|λ − λ_k|²), with c_k = ‖v_k‖·‖w_k‖ the condition of λ_k (w_k row k of V⁻¹): the first
 * part covers the residue and the sum's rounding, the second the eigenvalue's own error (about
 * ε·c_k·‖T‖, Wilkinson's first-order bound). A point whose estimate is not below
 * MODAL_RELATIVE_ACCURACY·max|G| (cancellation among the terms, or λ beside a pole) is evaluated
 * by the Schur route instead. Null when κ(V) = ‖V‖_F·‖V⁻¹‖_F is so large (T nearly defective)
 * that n·ε·κ(V) alone exceeds that accuracy.
 */
function modalTransferEvaluator(
  T: Dense,
  bt: Float64Array,
  ct: Float64Array,
  D: Rows,
  n: number,
  m: number,
  p: number,
  schurEvaluator: TransferEvaluator,
): TransferEvaluator | null {
  const eps = Number.EPSILON;
  const modes = quasiTriangularModes(T);
  if (!(modes.condition * n * eps < MODAL_RELATIVE_ACCURACY)) return null;
  const { vectorsRe: vr, vectorsIm: vi, inverseRe: wr, inverseIm: wi } = modes;
  // Residues R_k (p × m per k, stored k-major) and their largest entry magnitude.
  const residueRe = new Float64Array(n * p * m);
  const residueIm = new Float64Array(n * p * m);
  /** ε·c_k·max|R_k|: the weight of mode k in the rounding estimate. */
  const residueRounding = new Float64Array(n);
  const leftRe = new Float64Array(p);
  const leftIm = new Float64Array(p);
  const rightRe = new Float64Array(m);
  const rightIm = new Float64Array(m);
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < p; i++) {
      let sr = 0;
      let si = 0;
      for (let q = 0; q <= k + 1 && q < n; q++) {
        const c = ct[i * n + q];
        sr += c * vr[q * n + k];
        si += c * vi[q * n + k];
      }
      leftRe[i] = sr;
      leftIm[i] = si;
    }
    let rowNormSquared = 0;
    for (let q = Math.max(0, k - 1); q < n; q++) rowNormSquared += wr[k * n + q] ** 2 + wi[k * n + q] ** 2;
    for (let j = 0; j < m; j++) {
      let sr = 0;
      let si = 0;
      for (let q = Math.max(0, k - 1); q < n; q++) {
        const b = bt[q * m + j];
        sr += wr[k * n + q] * b;
        si += wi[k * n + q] * b;
      }
      rightRe[j] = sr;
      rightIm[j] = si;
    }
    let size = 0;
    for (let i = 0; i < p; i++) {
      for (let j = 0; j < m; j++) {
        const e = (k * p + i) * m + j;
        residueRe[e] = leftRe[i] * rightRe[j] - leftIm[i] * rightIm[j];
        residueIm[e] = leftRe[i] * rightIm[j] + leftIm[i] * rightRe[j];
        size = Math.max(size, Math.hypot(residueRe[e], residueIm[e]));
      }
    }
    // c_k = ‖v_k‖·‖w_k‖ with ‖v_k‖ = 1.
    residueRounding[k] = eps * Math.sqrt(rowNormSquared) * size;
  }
  if (!residueRe.every(Number.isFinite) || !residueIm.every(Number.isFinite)) return null;
  const values = modes.values;
  let normT = 0;
  for (let e = 0; e < n * n; e++) normT += T.data[e] * T.data[e];
  normT = Math.sqrt(normT);
  const sumRe = new Float64Array(p * m);
  const sumIm = new Float64Array(p * m);
  /** The modal value at λ, or null when its rounding estimate is too large. */
  const modal = (point: Complex): ComplexRows | null => {
    for (let e = 0; e < p * m; e++) {
      sumRe[e] = 0;
      sumIm[e] = 0;
    }
    let firstOrder = 0;
    let secondOrder = 0;
    for (let k = 0; k < n; k++) {
      const dr = point.re - values[k].re;
      const di = point.im - values[k].im;
      const d2 = dr * dr + di * di;
      if (!(d2 > 0)) return null;
      const ir = dr / d2;
      const ii = -di / d2;
      const base = k * p * m;
      for (let e = 0; e < p * m; e++) {
        const rr = residueRe[base + e];
        const ri = residueIm[base + e];
        sumRe[e] += rr * ir - ri * ii;
        sumIm[e] += rr * ii + ri * ir;
      }
      const weight = residueRounding[k] / Math.sqrt(d2);
      firstOrder += weight;
      secondOrder += weight / Math.sqrt(d2);
    }
    const re: Rows = [];
    const im: Rows = [];
    let largest = 0;
    for (let i = 0; i < p; i++) {
      const rowRe = new Array<number>(m);
      const rowIm = new Array<number>(m);
      for (let j = 0; j < m; j++) {
        rowRe[j] = (D[i]?.[j] ?? 0) + sumRe[i * m + j];
        rowIm[j] = sumIm[i * m + j];
        largest = Math.max(largest, Math.hypot(rowRe[j], rowIm[j]));
      }
      re.push(rowRe);
      im.push(rowIm);
    }
    const estimate = n * firstOrder + normT * secondOrder;
    return estimate < MODAL_RELATIVE_ACCURACY * largest ? { re, im } : null;
  };
  const evaluate = (point: Complex) => {
    const value = modal(point);
    return value ? { value, singular: false } : schurEvaluator(point);
  };
  const many = (points: Complex[]) => {
    const results: ({ value: ComplexRows; singular: boolean } | null)[] = points.map((point) => {
      const value = modal(point);
      return value ? { value, singular: false } : null;
    });
    const rest = points.filter((_, k) => results[k] === null);
    if (rest.length) {
      const solved = schurEvaluator.many ? schurEvaluator.many(rest) : rest.map((point) => schurEvaluator(point));
      let next = 0;
      for (let k = 0; k < results.length; k++) if (results[k] === null) results[k] = solved[next++];
    }
    return results as { value: ComplexRows; singular: boolean }[];
  };
  return Object.assign(evaluate, { many, route: 'modal' as const });
}

/** Right-hand sides solved together by a TransferEvaluator's `many`. */
const BATCH = 4;

/**
 * One diagonal block of (λI − T)·x = r (1×1, or 2×2 rows top and top + 1 when `pair`), complex λ:
 * x into out (x₀ real, imaginary; x₁ real, imaginary). False when a pivot is at most pivotFloor
 * (λ numerically an eigenvalue); a 2×2 block with a vanishing first pivot gives NaN.
 */
function solveDiagonalBlock(
  lr: number,
  li: number,
  t: Float64Array,
  n: number,
  top: number,
  pair: boolean,
  r0r: number,
  r0i: number,
  r1r: number,
  r1i: number,
  pivotFloor: number,
  out: Float64Array,
): boolean {
  const row0 = top * n;
  if (!pair) {
    const dr = lr - t[row0 + top];
    const d = dr * dr + li * li;
    out[0] = (r0r * dr + r0i * li) / d;
    out[1] = (r0i * dr - r0r * li) / d;
    return !(Math.sqrt(d) <= pivotFloor);
  }
  const i = top + 1;
  const row1 = i * n;
  // [λ − a, −b; −c, λ − d]·[x0; x1] = [r0; r1], Gaussian elimination with row pivoting.
  let a00r = lr - t[row0 + top];
  let a00i = li;
  let a01r = -t[row0 + i];
  let a01i = 0;
  let a10r = -t[row1 + top];
  let a10i = 0;
  let a11r = lr - t[row1 + i];
  let a11i = li;
  if (a10r * a10r + a10i * a10i > a00r * a00r + a00i * a00i) {
    [a00r, a00i, a01r, a01i, a10r, a10i, a11r, a11i] = [a10r, a10i, a11r, a11i, a00r, a00i, a01r, a01i];
    [r0r, r0i, r1r, r1i] = [r1r, r1i, r0r, r0i];
  }
  const p0 = a00r * a00r + a00i * a00i;
  if (Math.sqrt(p0) <= pivotFloor) {
    out.fill(NaN);
    return false;
  }
  // factor = a10 / a00
  const fr = (a10r * a00r + a10i * a00i) / p0;
  const fi = (a10i * a00r - a10r * a00i) / p0;
  const b11r = a11r - (fr * a01r - fi * a01i);
  const b11i = a11i - (fr * a01i + fi * a01r);
  const s1r = r1r - (fr * r0r - fi * r0i);
  const s1i = r1i - (fr * r0i + fi * r0r);
  const p1 = b11r * b11r + b11i * b11i;
  const x1r = (s1r * b11r + s1i * b11i) / p1;
  const x1i = (s1i * b11r - s1r * b11i) / p1;
  const u0r = r0r - (a01r * x1r - a01i * x1i);
  const u0i = r0i - (a01r * x1i + a01i * x1r);
  out[0] = (u0r * a00r + u0i * a00i) / p0;
  out[1] = (u0i * a00r - u0r * a00i) / p0;
  out[2] = x1r;
  out[3] = x1i;
  return !(Math.sqrt(p1) <= pivotFloor);
}

/** C̃·X + D for the solved X (n × m, split into real and imaginary parts). */
function outputCombination(ct: Float64Array, xr: Float64Array, xi: Float64Array, D: Rows, n: number, m: number, p: number): ComplexRows {
  const re: Rows = [];
  const im: Rows = [];
  for (let i = 0; i < p; i++) {
    const rowRe = new Array<number>(m).fill(0);
    const rowIm = new Array<number>(m).fill(0);
    for (let j = 0; j < m; j++) {
      let sumRe = D[i]?.[j] ?? 0;
      let sumIm = 0;
      for (let k = 0; k < n; k++) {
        sumRe += ct[i * n + k] * xr[k * m + j];
        sumIm += ct[i * n + k] * xi[k * m + j];
      }
      rowRe[j] = sumRe;
      rowIm[j] = sumIm;
    }
    re.push(rowRe);
    im.push(rowIm);
  }
  return { re, im };
}

/** The Hessenberg route (Laub 1981), used when the Schur form does not converge. */
export function hessenbergTransferEvaluator(A: Rows, B: Rows, C: Rows, D: Rows): TransferEvaluator {
  const n = A.length;
  const m = D[0]?.length ?? B[0]?.length ?? 0;
  const p = C.length;
  const { H, Q } = hessenbergDecomposition(A);
  const h = new Float64Array(n * n);
  let scale = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      h[i * n + j] = H[i][j];
      scale = Math.max(scale, Math.abs(H[i][j]));
    }
  }
  // B̃ = Qᵀ B (n × m), C̃ = C Q (p × n).
  const bt = new Float64Array(n * m);
  for (let i = 0; i < n; i++) for (let j = 0; j < m; j++) {
    let sum = 0;
    for (let k = 0; k < n; k++) sum += Q[k][i] * B[k][j];
    bt[i * m + j] = sum;
  }
  const ct = new Float64Array(p * n);
  for (let i = 0; i < p; i++) for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let k = 0; k < n; k++) sum += C[i][k] * Q[k][j];
    ct[i * n + j] = sum;
  }
  const pivotFloor = n * Number.EPSILON * Math.max(scale, Number.MIN_VALUE);
  // Work arrays reused by every evaluation (the evaluator is called hundreds of times).
  const mr = new Float64Array(n * n);
  const mi = new Float64Array(n * n);
  const xr = new Float64Array(n * m);
  const xi = new Float64Array(n * m);
  const swapRows = (values: Float64Array, width: number, first: number, second: number, from: number): void => {
    for (let j = from; j < width; j++) {
      const held = values[first * width + j];
      values[first * width + j] = values[second * width + j];
      values[second * width + j] = held;
    }
  };
  const evaluate = (point: Complex) => {
    // M = λI − H (upper Hessenberg: only the entries from the subdiagonal on are touched), X = B̃.
    for (let i = 0; i < n; i++) {
      const from = i === 0 ? 0 : i - 1;
      for (let j = from; j < n; j++) {
        mr[i * n + j] = -h[i * n + j];
        mi[i * n + j] = 0;
      }
      mr[i * n + i] += point.re;
      mi[i * n + i] = point.im;
    }
    xr.set(bt);
    xi.fill(0);
    let singular = false;
    for (let k = 0; k < n - 1; k++) {
      const top = k * n + k;
      const below = (k + 1) * n + k;
      // Partial pivoting between the two candidate rows (moduli compared squared: no hypot).
      if (mr[below] * mr[below] + mi[below] * mi[below] > mr[top] * mr[top] + mi[top] * mi[top]) {
        swapRows(mr, n, k, k + 1, k);
        swapRows(mi, n, k, k + 1, k);
        swapRows(xr, m, k, k + 1, 0);
        swapRows(xi, m, k, k + 1, 0);
      }
      const pr = mr[top];
      const pi = mi[top];
      const pivot = pr * pr + pi * pi;
      if (pivot === 0) {
        singular = true;
        continue;
      }
      // l = M[k+1][k] / M[k][k]
      const lr = (mr[below] * pr + mi[below] * pi) / pivot;
      const li = (mi[below] * pr - mr[below] * pi) / pivot;
      for (let j = k + 1; j < n; j++) {
        const a = k * n + j;
        const b = (k + 1) * n + j;
        mr[b] -= lr * mr[a] - li * mi[a];
        mi[b] -= lr * mi[a] + li * mr[a];
      }
      for (let j = 0; j < m; j++) {
        const a = k * m + j;
        const b = (k + 1) * m + j;
        xr[b] -= lr * xr[a] - li * xi[a];
        xi[b] -= lr * xi[a] + li * xr[a];
      }
    }
    // Back substitution on the upper triangle.
    for (let i = n - 1; i >= 0; i--) {
      const dr = mr[i * n + i];
      const di = mi[i * n + i];
      const d = dr * dr + di * di;
      if (Math.sqrt(d) <= pivotFloor) singular = true;
      for (let j = 0; j < m; j++) {
        let sr = xr[i * m + j];
        let si = xi[i * m + j];
        for (let k = i + 1; k < n; k++) {
          const ar = mr[i * n + k];
          const ai = mi[i * n + k];
          sr -= ar * xr[k * m + j] - ai * xi[k * m + j];
          si -= ar * xi[k * m + j] + ai * xr[k * m + j];
        }
        xr[i * m + j] = (sr * dr + si * di) / d;
        xi[i * m + j] = (si * dr - sr * di) / d;
      }
    }
    return { value: outputCombination(ct, xr, xi, D, n, m, p), singular };
  };
  return Object.assign(evaluate, { route: 'hessenberg' as const });
}

export interface FrequencyChannel {
  output: number;
  input: number;
  magnitudeDb: number[];
  phaseDeg: number[];
}

export interface FrequencyResponse {
  omegas: number[];
  channels: FrequencyChannel[];
}

/** The evaluation point for frequency ω: jω, or e^{jωT}. */
export function frequencyPoint(omega: number, domain: 'continuous' | 'discrete', T = 1): Complex {
  return domain === 'continuous' ? { re: 0, im: omega } : { re: Math.cos(omega * T), im: Math.sin(omega * T) };
}

/** G(λ) at one point (prefer transferEvaluator for many points). */
export function evaluateTransfer(A: Rows, B: Rows, C: Rows, D: Rows, point: Complex): { value: ComplexRows; singular: boolean } {
  return transferEvaluator(A, B, C, D)(point);
}

export function unwrapDegrees(phases: number[]): number[] {
  const out: number[] = [];
  let offset = 0;
  for (let k = 0; k < phases.length; k++) {
    if (k > 0 && Number.isFinite(phases[k]) && Number.isFinite(phases[k - 1])) {
      const jump = phases[k] + offset - out[k - 1];
      offset -= 360 * Math.round(jump / 360);
    }
    out.push(phases[k] + offset);
  }
  return out;
}

export function frequencyResponse(
  A: Rows,
  B: Rows,
  C: Rows,
  D: Rows,
  omegas: number[],
  domain: 'continuous' | 'discrete',
  T?: number,
  schurOfA?: RealSchurDense,
): FrequencyResponse {
  const p = C.length;
  const m = D[0]?.length ?? B[0]?.length ?? 0;
  const evaluate = transferEvaluator(A, B, C, D, schurOfA);
  const values = omegas.map((omega) => evaluate(frequencyPoint(omega, domain, T ?? 1)).value);
  const channels: FrequencyChannel[] = [];
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < m; j++) {
      channels.push({ output: i, input: j, ...bodeOf(values.map((value) => ({ re: value.re[i][j], im: value.im[i][j] }))) });
    }
  }
  return { omegas: omegas.slice(), channels };
}

/** Magnitude (dB) and phase (degrees, unwrapped along the points) of a sampled response. */
export function bodeOf(values: Complex[]): { magnitudeDb: number[]; phaseDeg: number[] } {
  return {
    magnitudeDb: values.map((value) => 20 * Math.log10(Math.hypot(value.re, value.im))),
    phaseDeg: unwrapDegrees(values.map((value) => (Math.atan2(value.im, value.re) * 180) / Math.PI)),
  };
}

/** Logarithmic grid from ω_low to ω_high with `perDecade` points per decade (at least 2 points). */
/** Bound on the grid size: a model whose poles span hundreds of decades still gets a finite grid. */
const MAX_GRID_POINTS = 10_000;

export function logarithmicGrid(low: number, high: number, perDecade: number): number[] {
  // Overflowed or underflowed corner frequencies are clamped to the finite positive doubles; NaN gives no grid.
  const bottom = Math.max(low, Number.MIN_VALUE);
  const top = Math.min(high, Number.MAX_VALUE);
  if (!(bottom <= top)) return [];
  const decades = Math.log10(top) - Math.log10(bottom);
  const count = Math.min(MAX_GRID_POINTS, Math.max(2, Math.ceil(decades * perDecade) + 1));
  return Array.from({ length: count }, (_, k) => bottom * Math.pow(10, (decades * k) / (count - 1)));
}

/**
 * Closed-loop bandwidth (rad/s) of a stable SISO channel: the lowest frequency where |G(jω)|
 * falls 3 dB below |G(0)| (null when |G(0)| is zero or the response never falls that far on
 * the grid). Refined by bisection on log ω (at most 60 steps).
 */
export function bandwidth(A: Rows, B: Rows, C: Rows, D: Rows, omegas: number[], domain: 'continuous' | 'discrete', T?: number): number | null {
  const evaluate = transferEvaluator(A, B, C, D);
  const magnitudeAt = (omega: number): number => {
    const { value } = evaluate(frequencyPoint(omega, domain, T ?? 1));
    return Math.hypot(value.re[0][0], value.im[0][0]);
  };
  const dc = magnitudeAt(0);
  if (!(dc > 0) || !Number.isFinite(dc)) return null;
  const level = dc / Math.SQRT2;
  let previous = 0;
  for (const omega of omegas) {
    if (magnitudeAt(omega) < level) {
      let low = previous;
      let high = omega;
      for (let step = 0; step < 60 && high - low > 4 * Number.EPSILON * high; step++) {
        const middle = low > 0 ? Math.sqrt(low * high) : 0.5 * high;
        if (magnitudeAt(middle) < level) high = middle;
        else low = middle;
      }
      return 0.5 * (low + high);
    }
    previous = omega;
  }
  return null;
}
