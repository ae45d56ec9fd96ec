// Single-input pole placement in controller-Hessenberg form.
// An orthogonal similarity Q (a Householder reflector taking b to β·e₁, then Householder
// Hessenberg reduction that leaves e₁ fixed) gives H = Qᵀ·A·Q upper Hessenberg and Qᵀ·b = β·e₁.
// There the controllability matrix is upper triangular, so Ackermann's row e_nᵀ·𝒞⁻¹ is e_nᵀ / (β·∏h_{i+1,i})
// and the gain is k = e_nᵀ·p(H) / (β·∏h_{i+1,i}), evaluated as a row recursion r ← r·(H − λI) with
// one subdiagonal division per step (the Hessenberg recursion of Datta 1987 / Miminis–Paige 1982;
// no powers of A are formed). Repeated poles are allowed (the closed loop is then one Jordan block).
import type { Rows } from '../numeric/types';
import type { PoleSlot } from './poleSlots';

export interface SingleInputPlacement {
  /** Gain row k (u = −k·x). */
  k: number[];
  /** Smallest |h_{i+1,i}| / ‖A‖: a tiny value means a nearly uncontrollable chain. */
  weakestLink: number;
}

export function placeSingleInput(A: Rows, b: number[], slots: PoleSlot[]): SingleInputPlacement {
  const n = A.length;
  const H = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) H[i * n + j] = A[i][j];
  const Q = new Float64Array(n * n);
  for (let i = 0; i < n; i++) Q[i * n + i] = 1;

  // Apply reflector I − β v vᵀ (v supported on [start, n)) as H ← P H P and Q ← Q P.
  const applyReflector = (v: Float64Array, beta: number, start: number) => {
    for (let j = 0; j < n; j++) {
      let dot = 0;
      for (let i = start; i < n; i++) dot += v[i] * H[i * n + j];
      const f = beta * dot;
      if (f !== 0) for (let i = start; i < n; i++) H[i * n + j] -= f * v[i];
    }
    for (let i = 0; i < n; i++) {
      let dot = 0;
      for (let j = start; j < n; j++) dot += H[i * n + j] * v[j];
      const f = beta * dot;
      if (f !== 0) for (let j = start; j < n; j++) H[i * n + j] -= f * v[j];
      let dotQ = 0;
      for (let j = start; j < n; j++) dotQ += Q[i * n + j] * v[j];
      const fQ = beta * dotQ;
      if (fQ !== 0) for (let j = start; j < n; j++) Q[i * n + j] -= fQ * v[j];
    }
  };
  const reflectorFor = (x: Float64Array, start: number): { v: Float64Array; beta: number; alpha: number } => {
    let normSq = 0;
    for (let i = start; i < n; i++) normSq += x[i] * x[i];
    const norm = Math.sqrt(normSq);
    const v = new Float64Array(n);
    if (norm === 0) return { v, beta: 0, alpha: 0 };
    const alpha = x[start] >= 0 ? -norm : norm;
    for (let i = start; i < n; i++) v[i] = x[i];
    v[start] -= alpha;
    const vNormSq = normSq - 2 * alpha * x[start] + alpha * alpha;
    return { v, beta: vNormSq === 0 ? 0 : 2 / vNormSq, alpha };
  };

  const first = reflectorFor(Float64Array.from(b), 0);
  const beta0 = first.beta === 0 ? b[0] : first.alpha;
  if (first.beta !== 0) applyReflector(first.v, first.beta, 0);
  for (let c = 0; c + 2 < n; c++) {
    const column = new Float64Array(n);
    for (let i = c + 1; i < n; i++) column[i] = H[i * n + c];
    const { v, beta } = reflectorFor(column, c + 1);
    if (beta !== 0) applyReflector(v, beta, c + 1);
    for (let i = c + 2; i < n; i++) H[i * n + c] = 0;
  }

  let scaleA = 0;
  for (let i = 0; i < n * n; i++) scaleA = Math.max(scaleA, Math.abs(A[Math.floor(i / n)][i % n]));
  let weakest = Infinity;
  for (let i = 1; i < n; i++) weakest = Math.min(weakest, Math.abs(H[i * n + i - 1]));

  // r ← e_nᵀ ∏(H − λI), dividing by the next subdiagonal entry after each factor.
  let r: Float64Array = new Float64Array(n);
  r[n - 1] = 1;
  let step = 0;
  const multiplyShifted = (row: Float64Array, shift: number): Float64Array => {
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const ri = row[i];
      if (ri === 0) continue;
      const lo = Math.max(0, i - 1);
      for (let j = lo; j < n; j++) out[j] += ri * H[i * n + j];
      out[i] -= ri * shift;
    }
    return out;
  };
  const divideNext = (row: Float64Array): number => {
    step += 1;
    const index = n - step; // subdiagonal h[index][index − 1]
    if (index < 1) return 1;
    const h = H[index * n + index - 1];
    for (let i = 0; i < n; i++) row[i] /= h;
    return h;
  };
  for (const slot of slots) {
    if (slot.kind === 'real') {
      r = multiplyShifted(r, slot.value);
      divideNext(r);
    } else {
      // r·((H − aI)² + b²I) = (t·(H − aI) + b²·r/h₁)·h₁ with t = r·(H − aI)/h₁.
      const t = multiplyShifted(r, slot.re);
      const h1 = divideNext(t);
      const next = multiplyShifted(t, slot.re);
      const weight = (slot.im * slot.im) / h1;
      for (let i = 0; i < n; i++) next[i] += weight * r[i];
      r = next;
      divideNext(r);
    }
  }
  for (let i = 0; i < n; i++) r[i] /= beta0;
  // k = r·Qᵀ
  const k = new Array<number>(n).fill(0);
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += r[i] * Q[j * n + i];
    k[j] = sum;
  }
  return { k, weakestLink: scaleA === 0 ? 0 : weakest / scaleA };
}
