// Pole placement u = −K·x: the public entry point. Checks, then
//  1. orthogonal controllability staircase (structure.ts): uncontrollable modes must be among the
//     requested poles and stay where they are; placement works on the controllable block;
//  2. input compression by SVD (B₁ = U·Σ·Wᵀ, rank r);
//  3. r = 1: Hessenberg recursion (placementSingleInput.ts); r ≥ 2 and no pole repeated more than
//     r times: Kautsky–Nichols–Van Dooren robust assignment (placementRobust.ts); otherwise the
//     closed loop must be defective: reduce to one input by a seeded random combination (Heymann's
//     lemma) and use the single-input method, with warning 'defective-closed-loop';
//  4. accuracy record: achieved poles, κ₂(V), backward error, relative pole error, fragility.
import type { Complex, Rows } from '../numeric/types';
import type { AnalysisSettings } from './settings';
import {
  EPS,
  conditionNumber2,
  eigenvaluesOf,
  frobenius,
  multiplyRows,
  realEigenvectors,
  sortEigenvalues,
  thinSvd,
  transposeRows,
  zerosRows,
} from './controlLinearAlgebra';
import { controllabilityStaircase, structureTolerance } from './structure';
import { groupConjugatePairs, largestMultiplicity, matchPoles, slotsToPoles, type PoleSlot } from './poleSlots';
import { placeSingleInput } from './placementSingleInput';
import { placeRobustEigenstructure, seededRandom } from './placementRobust';

export type PlacementWarning =
  | 'defective-closed-loop'
  | 'ill-conditioned-eigenvectors'
  | 'poles-inaccurate'
  | 'large-gain'
  | 'sweeps-not-converged'
  | 'uncontrollable-modes-kept'
  | 'nearly-uncontrollable';

export type PlacementFailureReason = 'uncontrollable-mode-not-requested' | 'pole-count' | 'not-conjugate-closed' | 'no-input';

export interface PlacementResult {
  ok: boolean;
  /** m × n gain, u = −K·x (zeros when !ok). */
  K: Rows;
  achievedPoles: Complex[];
  requestedPoles: Complex[];
  /** ‖K‖_F. */
  gainNorm: number;
  /** κ₂ of the closed-loop eigenvector matrix (columns of unit norm; real representation). */
  eigenvectorCondition: number;
  /** ‖(A − BK)V − VΛ‖_F / ((‖A‖_F + ‖B‖_F‖K‖_F)‖V‖_F), Λ built from the requested poles. */
  backwardError: number;
  /** max |achieved − requested| / max(|requested|, ε‖A − BK‖_F) over matched pairs. */
  maxRelativePoleError: number;
  method: 'single-input' | 'robust-eigenstructure' | 'defective-fallback';
  /**
   * κ₂(V) > settings.placementConditionLimit, or maxRelativePoleError > √ε (half the digits lost;
   * first-order perturbation theory predicts ≈ κ₂(V)·ε·(‖A‖ + ‖B‖‖K‖)/|λ|), or
   * ‖B‖‖K‖ > placementConditionLimit·max(‖A‖, max|λ|).
   */
  fragile: boolean;
  warnings: PlacementWarning[];
  /** KNV sweeps used (0 for the single-input method). */
  sweeps: number;
  /** Controllable subspace dimension found by the staircase. */
  controllableDimension: number;
  failure?: { reason: PlacementFailureReason; mode?: Complex };
}

function failed(n: number, m: number, poles: Complex[], reason: PlacementFailureReason, mode?: Complex): PlacementResult {
  return {
    ok: false,
    K: zerosRows(m, n),
    achievedPoles: [],
    requestedPoles: poles,
    gainNorm: 0,
    eigenvectorCondition: Infinity,
    backwardError: Infinity,
    maxRelativePoleError: Infinity,
    method: 'single-input',
    fragile: true,
    warnings: [],
    sweeps: 0,
    controllableDimension: 0,
    failure: mode ? { reason, mode } : { reason },
  };
}

/** Gain for the controllable pair (A, B) with B of any rank ≥ 1; returns K (m × n). */
function placeControllable(
  A: Rows,
  B: Rows,
  slots: PoleSlot[],
  settings: AnalysisSettings,
  warnings: PlacementWarning[],
): { K: Rows; method: PlacementResult['method']; sweeps: number; V?: Rows; Lambda?: Rows } {
  const n = A.length;
  const m = B[0].length;
  if (n === 0) return { K: zerosRows(m, 0), method: 'single-input', sweeps: 0 };
  const { U, s, V: W } = thinSvd(B);
  const tolerance = structureTolerance(A, B);
  const rank = s.filter((value) => value > tolerance).length;
  // Compressed input matrix B̃ = U_r·Σ_r (n × r) and K = W_r·K̃.
  const Bc = U.map((row) => row.slice(0, rank).map((value, c) => value * s[c]));
  const expand = (Kc: Rows): Rows => W.map((wRow) => A[0].map((_, j) => wRow.slice(0, rank).reduce((sum, w, c) => sum + w * Kc[c][j], 0)));
  const poles = slotsToPoles(slots);
  if (rank === 1) {
    if (largestMultiplicity(poles) > 1) warnings.push('defective-closed-loop');
    const { k } = placeSingleInput(A, Bc.map((row) => row[0]), slots);
    return { K: expand([k]), method: 'single-input', sweeps: 0 };
  }
  if (largestMultiplicity(poles) <= rank) {
    const maxSweeps = Math.max(1, Math.ceil(50 * settings.iterationBudget));
    const robust = placeRobustEigenstructure(A, Bc, slots, maxSweeps);
    if (robust.ok) {
      if (!robust.converged && robust.sweeps >= maxSweeps) warnings.push('sweeps-not-converged');
      return { K: expand(robust.K), method: 'robust-eigenstructure', sweeps: robust.sweeps, V: robust.V, Lambda: robust.Lambda };
    }
  }
  // Defective fallback (Heymann's lemma): u = −K₀x + g·v makes (A − B̃K₀, B̃g) controllable for
  // almost every K₀, g; then place with one input.
  warnings.push('defective-closed-loop');
  const random = seededRandom(7);
  const scaleA = frobenius(A) || 1;
  const scaleB = frobenius(Bc) || 1;
  for (let attempt = 0; attempt < 8; attempt++) {
    const g = Bc[0].map(() => random());
    const gNorm = Math.hypot(...g) || 1;
    const direction = g.map((value) => value / gNorm);
    const K0: Rows = attempt === 0 ? zerosRows(rank, n) : Array.from({ length: rank }, () => A.map(() => (random() * scaleA) / scaleB));
    const A0 = A.map((row, i) => row.map((value, j) => value - Bc[i].reduce((sum, b, c) => sum + b * K0[c][j], 0)));
    const b = Bc.map((row) => row.reduce((sum, value, c) => sum + value * direction[c], 0));
    const stair = controllabilityStaircase(A0, b.map((value) => [value]));
    if (stair.controllableDimension < n) continue;
    const { k } = placeSingleInput(A0, b, slots);
    const Kc = K0.map((row, c) => row.map((value, j) => value + direction[c] * k[j]));
    return { K: expand(Kc), method: 'defective-fallback', sweeps: 0 };
  }
  return { K: expand(zerosRows(rank, n)), method: 'defective-fallback', sweeps: 0 };
}

/** Accuracy record of a gain: achieved poles, κ₂(V), backward error, pole error. */
export function placementAccuracy(
  A: Rows,
  B: Rows,
  K: Rows,
  requestedPoles: Complex[],
): { achievedPoles: Complex[]; eigenvectorCondition: number; backwardError: number; maxRelativePoleError: number } {
  const n = A.length;
  const closedLoop = A.map((row, i) => row.map((value, j) => value - B[i].reduce((sum, b, c) => sum + b * K[c][j], 0)));
  if (n === 0) return { achievedPoles: [], eigenvectorCondition: 1, backwardError: 0, maxRelativePoleError: 0 };
  const { values, V } = realEigenvectors(closedLoop);
  // Normalise each real column / each pair of columns to unit norm.
  const Vn = V.map((row) => row.slice());
  for (let j = 0; j < n; j++) {
    const pair = values[j].im > 0 && j + 1 < n;
    const width = pair ? 2 : 1;
    let norm = 0;
    for (let i = 0; i < n; i++) for (let c = 0; c < width; c++) norm += Vn[i][j + c] ** 2;
    norm = Math.sqrt(norm) || 1;
    for (let i = 0; i < n; i++) for (let c = 0; c < width; c++) Vn[i][j + c] /= norm;
    if (pair) j += 1;
  }
  const eigenvectorCondition = conditionNumber2(Vn);
  const partner = matchPoles(values, requestedPoles);
  const closedLoopNorm = frobenius(closedLoop);
  let maxRelativePoleError = 0;
  values.forEach((value, i) => {
    const target = requestedPoles[partner[i]];
    const error = Math.hypot(value.re - target.re, value.im - target.im);
    const denominator = Math.max(Math.hypot(target.re, target.im), EPS * closedLoopNorm, Number.MIN_VALUE);
    maxRelativePoleError = Math.max(maxRelativePoleError, error / denominator);
  });
  // Λ from the requested partners in the same block layout as the computed eigenvectors.
  const Lambda = zerosRows(n, n);
  for (let j = 0; j < n; j++) {
    const first = requestedPoles[partner[j]];
    if (values[j].im > 0 && j + 1 < n) {
      const second = requestedPoles[partner[j + 1]];
      const re = (first.re + second.re) / 2;
      const im = (first.im - second.im) / 2;
      Lambda[j][j] = re;
      Lambda[j + 1][j + 1] = re;
      Lambda[j][j + 1] = im;
      Lambda[j + 1][j] = -im;
      j += 1;
    } else Lambda[j][j] = first.re;
  }
  const residual = multiplyRows(closedLoop, Vn).map((row, i) => row.map((value, j) => value - Vn[i].reduce((sum, v, k) => sum + v * Lambda[k][j], 0)));
  const denominator = (frobenius(A) + frobenius(B) * frobenius(K)) * frobenius(Vn);
  const backwardError = denominator === 0 ? 0 : frobenius(residual) / denominator;
  return { achievedPoles: sortEigenvalues(values), eigenvectorCondition, backwardError, maxRelativePoleError };
}

/**
 * Gain K (m × n, u = −K·x) giving A − B·K the requested poles. Never throws on user input:
 * problems come back as `failure`.
 */
export function placePoles(A: Rows, B: Rows, poles: Complex[], settings: AnalysisSettings): PlacementResult {
  const n = A.length;
  const m = B[0]?.length ?? 0;
  const requested = poles.map((p) => ({ re: p.re, im: p.im }));
  if (m === 0) return failed(n, m, requested, 'no-input');
  if (poles.length !== n) return failed(n, m, requested, 'pole-count');
  const grouped = groupConjugatePairs(poles);
  if ('unpaired' in grouped) return failed(n, m, requested, 'not-conjugate-closed', grouped.unpaired);
  const warnings: PlacementWarning[] = [];

  const stair = controllabilityStaircase(A, B);
  const nc = stair.controllableDimension;
  let slots = grouped.slots;
  let uncontrollableEigenvalues: Complex[] = [];
  if (nc < n) {
    const A22 = stair.Abar.slice(nc).map((row) => row.slice(nc));
    uncontrollableEigenvalues = eigenvaluesOf(A22);
    // Eigenvalues of A22 carry errors ~ ε‖A‖ (√ε‖A‖ for a double root): match within √ε·(‖A‖ + |λ|)·10.
    const scale = frobenius(A);
    const remaining = slots.slice();
    for (const mode of uncontrollableEigenvalues) {
      if (mode.im < 0) continue;
      const tolerance = 10 * Math.sqrt(EPS) * (scale + Math.hypot(mode.re, mode.im));
      const index = remaining.findIndex((slot) =>
        Math.abs(mode.im) > tolerance
          ? slot.kind === 'pair' && Math.hypot(slot.re - mode.re, slot.im - Math.abs(mode.im)) <= tolerance
          : slot.kind === 'real' && Math.abs(slot.value - mode.re) <= tolerance,
      );
      if (index < 0) return { ...failed(n, m, requested, 'uncontrollable-mode-not-requested', mode), controllableDimension: nc };
      remaining.splice(index, 1);
    }
    slots = remaining;
    warnings.push('uncontrollable-modes-kept');
  }

  let K: Rows;
  let method: PlacementResult['method'] = 'single-input';
  let sweeps = 0;
  let designed: { V: Rows; Lambda: Rows } | null = null;
  if (nc === 0) K = zerosRows(m, n);
  else {
    const A11 = stair.Abar.slice(0, nc).map((row) => row.slice(0, nc));
    const B1 = stair.Bbar.slice(0, nc);
    const placed = placeControllable(A11, B1, slots, settings, warnings);
    method = placed.method;
    sweeps = placed.sweeps;
    if (placed.V && placed.Lambda && nc === n) designed = { V: multiplyRows(stair.T, placed.V), Lambda: placed.Lambda };
    // K = [K₁ 0]·Tᵀ
    const K1full = placed.K.map((row) => [...row, ...new Array<number>(n - nc).fill(0)]);
    K = multiplyRows(K1full, transposeRows(stair.T));
  }

  const accuracy = placementAccuracy(A, B, K, requested);
  if (designed) {
    // The assigned eigenvectors give the placement's own backward error (Kautsky et al. 1985, §2).
    const closedLoop = A.map((row, i) => row.map((value, j) => value - B[i].reduce((sum, b, c) => sum + b * K[c][j], 0)));
    const AV = multiplyRows(closedLoop, designed.V);
    const VL = multiplyRows(designed.V, designed.Lambda);
    const residual = AV.map((row, i) => row.map((value, j) => value - VL[i][j]));
    accuracy.backwardError = frobenius(residual) / ((frobenius(A) + frobenius(B) * frobenius(K)) * frobenius(designed.V));
  }
  const gainNorm = frobenius(K);
  const poleScale = Math.max(frobenius(A), ...requested.map((p) => Math.hypot(p.re, p.im)));
  if (accuracy.eigenvectorCondition > settings.placementConditionLimit) warnings.push('ill-conditioned-eigenvectors');
  // Written so that NaN (poles beyond the double range, an overflowed gain) counts as inaccurate.
  if (!(accuracy.maxRelativePoleError <= Math.sqrt(EPS))) warnings.push('poles-inaccurate');
  if (frobenius(B) * gainNorm > settings.placementConditionLimit * Math.max(poleScale, Number.MIN_VALUE)) warnings.push('large-gain');
  const fragile = warnings.some((w) => w === 'ill-conditioned-eigenvectors' || w === 'poles-inaccurate' || w === 'large-gain');
  return {
    ok: true,
    K,
    achievedPoles: accuracy.achievedPoles,
    requestedPoles: requested,
    gainNorm,
    eigenvectorCondition: accuracy.eigenvectorCondition,
    backwardError: accuracy.backwardError,
    maxRelativePoleError: accuracy.maxRelativePoleError,
    method,
    fragile,
    warnings: [...new Set(warnings)],
    sweeps,
    controllableDimension: nc,
  };
}
