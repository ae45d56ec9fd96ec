// Outputs O·z(t_k), t_k = k·h, of z' = A·z + f with z(0) = 0 and f constant (a step), by modal
// coordinates of A's real Schur form A = Z·T·Zᵀ, T·V = V·Λ (quasiTriangularModes.ts):
//   O·z(t) = Σ_j R_j·q_j(t),  R_j = (O·Z·V)_{:,j}·(V⁻¹·Zᵀ·f)_j,  q_j(t) = ∫₀ᵗ e^{λ_j τ} dτ,
// and q_j(t_{k+1}) = e^{λ_j h}·q_j(t_k) + q_j(h): the zero-order-hold recursion of each mode, exact
// for a constant input. A conjugate pair contributes 2·Re(R_j q_j) once. Work: count·n·(rows + 4)
// multiply–adds instead of count·n² (plus the Schur form the caller supplies).
//
// Rounding estimate per output row r, over the whole run (Wilkinson's first-order eigenvalue
// bound, as in the frequency evaluator): Σ_j ε·c_j·|R_rj|·(n·Q_j + ‖T‖_F·P_j) + count·ε·|R_rj|·Q_j,
// with c_j = ‖v_j‖·‖w_j‖ the condition of λ_j, Q_j ≥ max_t |q_j(t)| = ∫₀^{t_end} e^{Re λ_j τ} dτ and
// P_j ≥ max_t |∂q_j/∂λ| = ∫₀^{t_end} τ·e^{Re λ_j τ} dτ (≤ 1/(Re λ_j)² for a stable mode); the
// last term is the recursion's growth of rounding over `count` steps. The result is null when
// some row's estimate is not below `relativeAccuracy` times that row's largest value: the
// caller then steps the state itself.
import type { Dense } from './dense';
import { quasiTriangularModes, type QuasiTriangularModes } from './quasiTriangularModes';

const EPS = Number.EPSILON;

/**
 * O·z(t_k) for k = 0 … count−1 (count × rows, row-major), or null when the modal sum cannot be
 * trusted to `relativeAccuracy`. schurT, schurZ: A = Z·T·Zᵀ (size × size); forcing: f (size);
 * outputs: O (rows × size, row-major).
 */
export function modalStepOutputs(
  schurT: Dense,
  schurZ: Dense,
  forcing: Float64Array,
  outputs: Float64Array,
  rows: number,
  step: number,
  count: number,
  relativeAccuracy: number,
): Float64Array | null {
  const n = schurT.rows;
  const modes = quasiTriangularModes(schurT);
  if (!(modes.condition * n * EPS < relativeAccuracy)) return null;
  // f̃ = Zᵀ f and Õ = O·Z.
  const z = schurZ.data;
  const ft = new Float64Array(n);
  for (let k = 0; k < n; k++) if (forcing[k] !== 0) for (let i = 0; i < n; i++) ft[i] += z[k * n + i] * forcing[k];
  const ot = new Float64Array(rows * n);
  for (let r = 0; r < rows; r++) {
    for (let k = 0; k < n; k++) {
      const o = outputs[r * n + k];
      if (o !== 0) for (let j = 0; j < n; j++) ot[r * n + j] += o * z[k * n + j];
    }
  }
  let normT = 0;
  for (const entry of schurT.data) normT += entry * entry;
  const records = modeRecords(modes, ft, ot, rows, step, count, Math.sqrt(normT));
  if (!records) return null;
  const signals = runModes(records, rows, count);
  for (let r = 0; r < rows; r++) {
    let largest = 0;
    for (let k = 0; k < count; k++) largest = Math.max(largest, Math.abs(signals[k * rows + r]));
    if (!Number.isFinite(largest)) return null;
    if (records.estimate[r] > 0 && !(records.estimate[r] < relativeAccuracy * largest)) return null;
  }
  return signals;
}

/** Per kept mode: residues (weight 2 for a pair), e^{λh}, q(h); per row: the rounding estimate. */
interface ModeRecords {
  count: number;
  residueRe: Float64Array;
  residueIm: Float64Array;
  multiplierRe: Float64Array;
  multiplierIm: Float64Array;
  incrementRe: Float64Array;
  incrementIm: Float64Array;
  estimate: Float64Array;
}

function modeRecords(modes: QuasiTriangularModes, ft: Float64Array, ot: Float64Array, rows: number, step: number, count: number, normT: number): ModeRecords | null {
  const { n, vectorsRe: vr, vectorsIm: vi, inverseRe: wr, inverseIm: wi, values } = modes;
  const duration = step * (count - 1);
  // Modes kept: every real one and the first of each conjugate pair.
  const kept: number[] = [];
  for (let j = 0; j < n; j++) if (!(j > 0 && values[j].im < 0 && values[j - 1].im === -values[j].im && values[j - 1].re === values[j].re)) kept.push(j);
  const modeCount = kept.length;
  const records: ModeRecords = {
    count: modeCount,
    residueRe: new Float64Array(modeCount * rows),
    residueIm: new Float64Array(modeCount * rows),
    multiplierRe: new Float64Array(modeCount),
    multiplierIm: new Float64Array(modeCount),
    incrementRe: new Float64Array(modeCount),
    incrementIm: new Float64Array(modeCount),
    estimate: new Float64Array(rows),
  };
  for (let index = 0; index < modeCount; index++) {
    const j = kept[index];
    const weight = values[j].im !== 0 ? 2 : 1;
    // (V⁻¹ f̃)_j and the row norm of V⁻¹ (c_j, ‖v_j‖ = 1).
    let gr = 0;
    let gi = 0;
    let rowNormSquared = 0;
    for (let q = Math.max(0, j - 1); q < n; q++) {
      gr += wr[j * n + q] * ft[q];
      gi += wi[j * n + q] * ft[q];
      rowNormSquared += wr[j * n + q] ** 2 + wi[j * n + q] ** 2;
    }
    const condition = Math.sqrt(rowNormSquared);
    const a = values[j].re;
    const b = values[j].im;
    // Bounds over the run: Q ≥ |q(t)|, P ≥ |∂q/∂λ(t)|.
    const Q = a === 0 ? duration : Math.expm1(a * duration) / a;
    const P = a < 0 ? Math.min(duration * Q, 1 / (a * a)) : duration * Q;
    for (let r = 0; r < rows; r++) {
      let cr = 0;
      let ci = 0;
      for (let q = 0; q <= Math.min(n - 1, j + 1); q++) {
        cr += ot[r * n + q] * vr[q * n + j];
        ci += ot[r * n + q] * vi[q * n + j];
      }
      const rr = weight * (cr * gr - ci * gi);
      const ri = weight * (cr * gi + ci * gr);
      records.residueRe[index * rows + r] = rr;
      records.residueIm[index * rows + r] = ri;
      records.estimate[r] += EPS * Math.hypot(rr, ri) * (condition * (n * Q + normT * P) + count * Q);
    }
    // e^{λh} and q(h) = ∫₀ʰ e^{λτ} dτ = (e^{λh} − 1)/λ, with e^{λh} − 1 formed without cancellation:
    // e^{ah}(cos bh − 1) + (e^{ah} − 1) + i·e^{ah} sin bh, cos bh − 1 = −2 sin²(bh/2).
    const growth = Math.exp(a * step);
    const half = Math.sin((b * step) / 2);
    records.multiplierRe[index] = growth * Math.cos(b * step);
    records.multiplierIm[index] = growth * Math.sin(b * step);
    const minusOneRe = growth * (-2 * half * half) + Math.expm1(a * step);
    const minusOneIm = growth * Math.sin(b * step);
    const d = a * a + b * b;
    records.incrementRe[index] = d === 0 ? step : (minusOneRe * a + minusOneIm * b) / d;
    records.incrementIm[index] = d === 0 ? 0 : (minusOneIm * a - minusOneRe * b) / d;
  }
  if (!records.residueRe.every(Number.isFinite) || !records.residueIm.every(Number.isFinite)) return null;
  return records;
}

/**
 * The recursion, mode-major: a real mode (real λ, real residues) needs one multiply–add per step
 * instead of a complex one, and four of them run side by side (independent chains).
 */
function runModes(records: ModeRecords, rows: number, count: number): Float64Array {
  const signals = new Float64Array(count * rows);
  const { residueRe, residueIm, multiplierRe, multiplierIm, incrementRe, incrementIm } = records;
  const realModes: number[] = [];
  for (let index = 0; index < records.count; index++) {
    let real = multiplierIm[index] === 0 && incrementIm[index] === 0;
    for (let r = 0; r < rows && real; r++) real = residueIm[index * rows + r] === 0;
    if (real) realModes.push(index);
    else accumulateComplexMode(signals, rows, count, multiplierRe[index], multiplierIm[index], incrementRe[index], incrementIm[index], residueRe, residueIm, index * rows);
  }
  const group = new Float64Array(8);
  const weights = new Float64Array(4 * rows);
  for (let first = 0; first < realModes.length; first += 4) {
    weights.fill(0);
    group.fill(0);
    // A short last group leaves its empty places at zero (computed, adds nothing).
    for (let g = 0; g < 4 && first + g < realModes.length; g++) {
      const index = realModes[first + g];
      group[g] = multiplierRe[index];
      group[4 + g] = incrementRe[index];
      for (let r = 0; r < rows; r++) weights[r * 4 + g] = residueRe[index * rows + r];
    }
    accumulateRealModes(signals, rows, count, group, weights);
  }
  return signals;
}

/** signals[k][r] += Σ_g weights[r][g]·q_g(k) for four real modes, q_g(k+1) = a_g·q_g(k) + c_g, q_g(0) = 0. */
function accumulateRealModes(signals: Float64Array, rows: number, count: number, group: Float64Array, weights: Float64Array): void {
  const a0 = group[0], a1 = group[1], a2 = group[2], a3 = group[3];
  const c0 = group[4], c1 = group[5], c2 = group[6], c3 = group[7];
  let q0 = 0;
  let q1 = 0;
  let q2 = 0;
  let q3 = 0;
  for (let k = 1; k < count; k++) {
    q0 = a0 * q0 + c0;
    q1 = a1 * q1 + c1;
    q2 = a2 * q2 + c2;
    q3 = a3 * q3 + c3;
    const base = k * rows;
    for (let r = 0; r < rows; r++) {
      const w = r * 4;
      signals[base + r] += weights[w] * q0 + weights[w + 1] * q1 + weights[w + 2] * q2 + weights[w + 3] * q3;
    }
  }
}

/** signals[k][r] += Re(R_r·q(k)) for one complex mode, q(k+1) = μ·q(k) + c, q(0) = 0. */
function accumulateComplexMode(
  signals: Float64Array,
  rows: number,
  count: number,
  muRe: number,
  muIm: number,
  cRe: number,
  cIm: number,
  residueRe: Float64Array,
  residueIm: Float64Array,
  at: number,
): void {
  let pr = 0;
  let pi = 0;
  for (let k = 1; k < count; k++) {
    const nr = muRe * pr - muIm * pi + cRe;
    pi = muRe * pi + muIm * pr + cIm;
    pr = nr;
    const base = k * rows;
    for (let r = 0; r < rows; r++) signals[base + r] += residueRe[at + r] * pr - residueIm[at + r] * pi;
  }
}
