// Zero-order-hold discretisation and the sampled continuous cost (Van Loan 1978, "Computing
// integrals involving the matrix exponential", IEEE TAC 23(3)).
//
//  • x[k+1] = Φ x[k] + Γ u[k] + Γ_E w[k] with Φ = e^{AT}, [Γ Γ_E] = ∫₀ᵀ e^{Aτ}dτ·[B E], from one
//    exponential of the block matrix [[A, B, E], [0, 0, 0]]·T (no A⁻¹, so singular A is fine).
//  • Poles map by z = e^{sT}.
//  • Sampled cost: with the input held, x(t) = Φ(t)x_k + Γ(t)u_k on [0, T), so
//        ∫₀ᵀ xᵀQx + 2xᵀNu + uᵀRu dt = [x_k; u_k]ᵀ W [x_k; u_k],
//        W = ∫₀ᵀ e^{Fᵀt} Qc e^{Ft} dt,  F = [[A, B], [0, 0]],  Qc = [[Q, N], [Nᵀ, R]],
//    and W = [[Qd, Nd], [Ndᵀ, Rd]]. Van Loan: exp([[−Fᵀ, Qc], [0, F]]·T) = [[·, G], [0, e^{FT}]]
//    gives W = e^{FT}ᵀ G. (The 2(n+m) block form; the last m rows of F are zero.)
//    A discrete LQR with (Qd, Rd, Nd) minimises the continuous cost of the sampled loop, so its
//    gain approaches the continuous LQR gain as T → 0 and changes little with T.
import { matrixExponential, matrixExponentialIntegral } from '../numeric';
import type { Complex, Rows } from '../numeric/types';

export interface ZeroOrderHold {
  Phi: Rows;
  Gamma: Rows;
  /** Disturbance input matrix of the sampled model (n × d), when E was given. */
  GammaDisturbance: Rows;
}

export function discretiseZeroOrderHold(A: Rows, B: Rows, T: number, E?: Rows): ZeroOrderHold {
  const n = A.length;
  const m = n === 0 ? 0 : (B[0]?.length ?? 0);
  const d = E && n > 0 ? (E[0]?.length ?? 0) : 0;
  const inputs = A.map((_, i) => [...(B[i] ?? []), ...(d > 0 && E ? E[i] : [])]);
  const { Phi, Gamma } = matrixExponentialIntegral(A, inputs, T);
  return {
    Phi,
    Gamma: Gamma.map((row) => row.slice(0, m)),
    GammaDisturbance: Gamma.map((row) => row.slice(m, m + d)),
  };
}

/** z = e^{sT} for each pole. */
export function mapPolesToDiscrete(poles: Complex[], T: number): Complex[] {
  return poles.map((s) => {
    const magnitude = Math.exp(s.re * T);
    return { re: magnitude * Math.cos(s.im * T), im: magnitude * Math.sin(s.im * T) };
  });
}

/**
 * s = ln(z)/T on the principal branch (|Im s| ≤ π/T); z = 0 maps to re = −∞. Used to compare
 * discrete poles in rates (1/s).
 */
export function mapPolesToContinuous(poles: Complex[], T: number): Complex[] {
  return poles.map((z) => {
    const magnitude = Math.hypot(z.re, z.im);
    return { re: Math.log(magnitude) / T, im: Math.atan2(z.im, z.re) / T };
  });
}

export interface SampledCostWeights {
  Qd: Rows;
  Rd: Rows;
  Nd: Rows;
}

export function sampledCostWeights(A: Rows, B: Rows, Q: Rows, R: Rows, T: number, N?: Rows): SampledCostWeights {
  const n = A.length;
  const m = n === 0 ? 0 : (B[0]?.length ?? 0);
  const k = n + m;
  // F = [[A, B], [0, 0]], Qc = [[Q, N], [Nᵀ, R]]; block = [[−Fᵀ, Qc], [0, F]]·T.
  const F: Rows = Array.from({ length: k }, (_, i) =>
    Array.from({ length: k }, (_, j) => (i < n ? (j < n ? A[i][j] : B[i][j - n]) : 0)),
  );
  const Qc: Rows = Array.from({ length: k }, (_, i) =>
    Array.from({ length: k }, (_, j) => {
      if (i < n && j < n) return Q[i][j];
      if (i >= n && j >= n) return R[i - n][j - n];
      if (i < n) return N ? N[i][j - n] : 0;
      return N ? N[j][i - n] : 0;
    }),
  );
  const block: Rows = Array.from({ length: 2 * k }, (_, i) =>
    Array.from({ length: 2 * k }, (_, j) => {
      if (i < k && j < k) return -F[j][i] * T;
      if (i < k) return Qc[i][j - k] * T;
      if (j < k) return 0;
      return F[i - k][j - k] * T;
    }),
  );
  const E = matrixExponential(block);
  // W = e^{FT}ᵀ · G, e^{FT} = lower-right block, G = upper-right block.
  const W: Rows = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      let sum = 0;
      for (let l = 0; l < k; l++) sum += E[k + l][k + i] * E[l][k + j];
      W[i][j] = sum;
    }
  }
  // Symmetrise: W is symmetric in exact arithmetic.
  for (let i = 0; i < k; i++) {
    for (let j = i + 1; j < k; j++) {
      const mean = 0.5 * (W[i][j] + W[j][i]);
      W[i][j] = mean;
      W[j][i] = mean;
    }
  }
  return {
    Qd: W.slice(0, n).map((row) => row.slice(0, n)),
    Rd: W.slice(n).map((row) => row.slice(n)),
    Nd: W.slice(0, n).map((row) => row.slice(n)),
  };
}
