// Integral action. Convention: ξ' = r − y_t, u = −Kx·x − Ki·ξ, so the augmented plant is
//   continuous  [ẋ; ξ'] = [A 0; −C_t 0]·[x; ξ] + [B; −D_t]·u (+ [0; I]·r)
//   discrete    ξ[k+1] = ξ[k] + T·(r − y_t[k]):  [Φ 0; −T·C_t I], [Γ; −T·D_t]
// and K_aug = [Kx Ki] is placed on it. Feasible exactly when (A, B) is stabilisable and the
// Rosenbrock matrix at DC [A B; C_t D_t] (discrete [Φ − I, Γ; C_t D_t]) has full row rank n + q
// (so q ≤ m): otherwise the augmented pair has an uncontrollable mode at s = 0 / z = 1.
import type { Complex, Rows } from '../numeric/types';
import type { AnalysisSettings } from './settings';
import { placePoles, type PlacementResult } from './placement';
import { analyzeControllability, type Domain } from './structure';
import { setpointGains } from './setpoint';

export interface AugmentedPlant {
  A: Rows;
  B: Rows;
}

export function augmentWithIntegrators(A: Rows, B: Rows, C: Rows, D: Rows, outputs: number[], domain: Domain, samplePeriod = 1): AugmentedPlant {
  const n = A.length;
  const m = A.length > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  const q = outputs.length;
  const step = domain === 'discrete' ? samplePeriod : 1;
  const Aa: Rows = [
    ...A.map((row) => [...row, ...new Array<number>(q).fill(0)]),
    ...outputs.map((o, i) => [
      ...C[o].map((v) => -step * v),
      ...Array.from({ length: q }, (_, j) => (domain === 'discrete' && i === j ? 1 : 0)),
    ]),
  ];
  const Ba: Rows = [...B.map((row) => row.slice()), ...outputs.map((o) => Array.from({ length: m }, (_, c) => -step * (D[o]?.[c] ?? 0)))];
  void n;
  return { A: Aa, B: Ba };
}

export type IntegralInfeasibility = 'not-stabilisable' | 'more-outputs-than-inputs' | 'zero-at-dc' | 'no-outputs';

export interface IntegralFeasibility {
  feasible: boolean;
  reason?: IntegralInfeasibility;
  /** For 'zero-at-dc': weights over the integrated outputs of the combination that cannot be held. */
  singularCombination?: number[];
  /** For 'not-stabilisable': the offending mode. */
  mode?: Complex;
}

export function integralActionFeasibility(A: Rows, B: Rows, C: Rows, D: Rows, outputs: number[], domain: Domain): IntegralFeasibility {
  const m = A.length > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  if (outputs.length === 0) return { feasible: false, reason: 'no-outputs' };
  if (outputs.length > m) return { feasible: false, reason: 'more-outputs-than-inputs' };
  const controllability = analyzeControllability(A, B, domain, { computeMargin: false });
  if (!controllability.stabilisable) {
    const mode = controllability.uncontrollableModes.find((entry) => !entry.stable)?.value;
    return { feasible: false, reason: 'not-stabilisable', mode };
  }
  const K = Array.from({ length: m }, () => new Array<number>(A.length).fill(0));
  const rank = setpointGains(A, B, C, D, outputs, K, domain);
  if (rank.feasibility === 'zero-at-dc') return { feasible: false, reason: 'zero-at-dc', singularCombination: rank.singularCombination };
  if (rank.rankInfo.rank < A.length + outputs.length) {
    // [A B] itself lacks rank (an uncontrollable mode at DC): integrators cannot all be reached.
    return { feasible: false, reason: 'zero-at-dc', singularCombination: rank.singularCombination };
  }
  return { feasible: true };
}

export interface IntegralDesign {
  ok: boolean;
  Kx: Rows;
  Ki: Rows;
  K_aug: Rows;
  placement: PlacementResult | null;
  closedLoopPoles: Complex[];
  reason?: IntegralInfeasibility | 'placement-failed';
  feasibility: IntegralFeasibility;
}

export function designIntegralAction(
  A: Rows,
  B: Rows,
  C: Rows,
  D: Rows,
  outputs: number[],
  poles: Complex[],
  domain: Domain,
  settings: AnalysisSettings,
  samplePeriod = 1,
): IntegralDesign {
  const n = A.length;
  const m = A.length > 0 ? (B[0]?.length ?? 0) : (D[0]?.length ?? 0);
  const q = outputs.length;
  const feasibility = integralActionFeasibility(A, B, C, D, outputs, domain);
  const empty = { Kx: [] as Rows, Ki: [] as Rows, K_aug: [] as Rows, placement: null, closedLoopPoles: [] as Complex[] };
  if (!feasibility.feasible) return { ok: false, ...empty, reason: feasibility.reason, feasibility };
  const augmented = augmentWithIntegrators(A, B, C, D, outputs, domain, samplePeriod);
  const placement = placePoles(augmented.A, augmented.B, poles, settings);
  if (!placement.ok) return { ok: false, ...empty, placement, reason: 'placement-failed', feasibility };
  const Kx = placement.K.map((row) => row.slice(0, n));
  const Ki = placement.K.map((row) => row.slice(n, n + q));
  void m;
  return { ok: true, Kx, Ki, K_aug: placement.K, placement, closedLoopPoles: placement.achievedPoles, feasibility };
}

/**
 * Integrator pole suggestion (common practice): a little slower than the slowest closed-loop pole,
 * here 0.8 × its real part (continuous), or |z|^0.8 of the slowest discrete pole (the same rule
 * through s = log z / T). Slow enough not to dominate the transient, fast enough to remove the
 * offset within a few settling times; distinct from existing poles so no Jordan block is forced.
 */
export function suggestIntegralPole(existingPoles: Complex[], domain: Domain = 'continuous'): Complex {
  if (domain === 'discrete') {
    const magnitudes = existingPoles.map((p) => Math.hypot(p.re, p.im)).filter((r) => r < 1 && r > 0);
    const slowest = magnitudes.length ? Math.max(...magnitudes) : 0.5;
    return { re: Math.pow(slowest, 0.8), im: 0 };
  }
  const realParts = existingPoles.map((p) => p.re).filter((re) => re < 0);
  const slowest = realParts.length ? Math.max(...realParts) : -1;
  return { re: 0.8 * slowest, im: 0 };
}
