// One-sample computation delay: the input computed at sample k is applied at sample k + 1.
// The previous input becomes m extra states, x_aug = [x; u_prev]:
//     x[k+1]      = Φ x[k] + Γ u_prev[k] (+ Γ_E w[k])
//     u_prev[k+1] = u[k]
//     y[k]        = C x[k] + D u_prev[k]
// so Φ_aug = [[Φ, Γ], [0, 0]], Γ_aug = [0; I], C_aug = [C, D], D_aug = 0. Φ_aug is singular
// (m zero eigenvalues), so the discrete Riccati solver used on it must not invert Φ.
import type { Rows } from '../numeric/types';

export interface DelayAugmented {
  Phi: Rows;
  Gamma: Rows;
  C: Rows;
  D: Rows;
  GammaDisturbance: Rows;
  /** Number of added states (= inputs). */
  addedStates: number;
}

export function augmentComputationDelay(Phi: Rows, Gamma: Rows, C: Rows, D: Rows, GammaDisturbance?: Rows): DelayAugmented {
  const n = Phi.length;
  const m = n === 0 ? 0 : (Gamma[0]?.length ?? 0);
  const p = C.length;
  const d = GammaDisturbance && n > 0 ? (GammaDisturbance[0]?.length ?? 0) : 0;
  const size = n + m;
  const PhiAug: Rows = Array.from({ length: size }, (_, i) =>
    Array.from({ length: size }, (_, j) => (i < n ? (j < n ? Phi[i][j] : Gamma[i][j - n]) : 0)),
  );
  const GammaAug: Rows = Array.from({ length: size }, (_, i) =>
    Array.from({ length: m }, (_, j) => (i >= n && i - n === j ? 1 : 0)),
  );
  const CAug: Rows = Array.from({ length: p }, (_, i) => [...C[i], ...(D[i] ?? new Array<number>(m).fill(0))]);
  const DAug: Rows = Array.from({ length: p }, () => new Array<number>(m).fill(0));
  const GammaDisturbanceAug: Rows = Array.from({ length: size }, (_, i) =>
    Array.from({ length: d }, (_, j) => (i < n && GammaDisturbance ? GammaDisturbance[i][j] : 0)),
  );
  return { Phi: PhiAug, Gamma: GammaAug, C: CAug, D: DAug, GammaDisturbance: GammaDisturbanceAug, addedStates: m };
}
