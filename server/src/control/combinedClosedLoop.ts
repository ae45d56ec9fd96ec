// Plant + observer-based state feedback, as implemented.
//   Plant       x' = A x + B u,  y = C x + D u          (x[k+1] = Φ x + Γ u for discrete)
//   Predictor   x̂' = A x̂ + B u + L (y − C x̂ − D u),   u = −K x̂
//   Current     x̄[k+1] = Φ x̂[k|k] + Γ u[k],  x̂[k|k] = x̄ + M (y − C x̄ − D u),  u = −K x̂[k|k]
// Composite state (x, x̂) (predictor) or (x, x̄) (current). By the separation principle the
// composite poles are eig(A − BK) ∪ eig(A − LC) (current form: eig(Φ − ΓK) ∪ eig(Φ − ΦMC));
// the record reports both sets and the composite eigenvalues so the identity can be checked.
// The controller alone, from y to u, is also returned (u = Cc xc + Dc y): margins.ts breaks the
// loop at the plant input with it.
import type { Complex, Rows } from '../numeric/types';
import { eigenvalues, solveLinear } from '../numeric';
import { multiplyRows as multiply } from './controlLinearAlgebra';

export interface StateSpace {
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
}

export interface CombinedClosedLoop {
  /** Composite state matrix (2n × 2n) on (x, x̂) or (x, x̄). */
  A: Rows;
  controllerPoles: Complex[];
  observerPoles: Complex[];
  combinedPoles: Complex[];
  /** Output-feedback controller from y to u: xc' = Ac xc + Bc y, u = Cc xc + Dc y. */
  controller: StateSpace;
}

const add = (a: Rows, b: Rows): Rows => a.map((row, i) => row.map((value, j) => value + b[i][j]));
const subtract = (a: Rows, b: Rows): Rows => a.map((row, i) => row.map((value, j) => value - b[i][j]));
const negate = (a: Rows): Rows => a.map((row) => row.map((value) => -value));
const identity = (n: number): Rows => Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
function blocks(topLeft: Rows, topRight: Rows, bottomLeft: Rows, bottomRight: Rows): Rows {
  return [...topLeft.map((row, i) => [...row, ...topRight[i]]), ...bottomLeft.map((row, i) => [...row, ...bottomRight[i]])];
}

/**
 * @param L observer gain: L (predictor / continuous) or M (current form), n × p.
 */
export function combinedClosedLoop(
  A: Rows,
  B: Rows,
  C: Rows,
  D: Rows,
  K: Rows,
  L: Rows,
  domain: 'continuous' | 'discrete',
  form: 'predictor' | 'current' = 'predictor',
): CombinedClosedLoop {
  const n = A.length;
  const m = K.length;
  const p = C.length;
  const BK = multiply(B, K);
  const controllerPoles = eigenvalues(subtract(A, BK));
  if (domain === 'continuous' || form === 'predictor') {
    const LC = multiply(L, C);
    const composite = blocks(A, negate(BK), LC, subtract(subtract(A, BK), LC));
    // x̂' = (A − BK − LC + LDK) x̂ + L y (the D u terms of plant and observer cancel in the composite).
    const LDK = multiply(multiply(L, D), K);
    const controller: StateSpace = {
      A: add(subtract(subtract(A, BK), LC), LDK),
      B: L,
      C: negate(K),
      D: Array.from({ length: m }, () => new Array<number>(p).fill(0)),
    };
    return {
      A: composite,
      controllerPoles,
      observerPoles: eigenvalues(subtract(A, LC)),
      combinedPoles: eigenvalues(composite),
      controller,
    };
  }
  // Current form with M = L: u = −K(I − MC) x̄ − KMC x (the D u terms cancel as above).
  const M = L;
  const MC = multiply(M, C);
  const IminusMC = subtract(identity(n), MC);
  const KMC = multiply(K, MC);
  const KIminusMC = multiply(K, IminusMC);
  const topLeft = subtract(A, multiply(B, KMC));
  const topRight = negate(multiply(B, KIminusMC));
  const bottomLeft = subtract(multiply(A, MC), multiply(B, KMC));
  const bottomRight = subtract(multiply(A, IminusMC), multiply(B, KIminusMC));
  const composite = blocks(topLeft, topRight, bottomLeft, bottomRight);
  // Controller on x̄ with input y: u = −K(I − MC)x̄ − KM(y − D u) ⇒ (I − KMD) u = −K(I − MC)x̄ − KM y.
  const KM = multiply(K, M);
  const S = subtract(identity(m), multiply(KM, D));
  const Cc = solveLinear(S, negate(KIminusMC)).X;
  const Dc = solveLinear(S, negate(KM)).X;
  // x̄[k+1] = Φ(I − MC)x̄ + ΦM(y − D u) + Γ u = Φ(I − MC)x̄ + ΦM y + (Γ − ΦMD) u.
  const GammaMinusPhiMD = subtract(B, multiply(multiply(A, M), D));
  const controller: StateSpace = {
    A: add(multiply(A, IminusMC), multiply(GammaMinusPhiMD, Cc)),
    B: add(multiply(A, M), multiply(GammaMinusPhiMD, Dc)),
    C: Cc,
    D: Dc,
  };
  return {
    A: composite,
    controllerPoles,
    observerPoles: eigenvalues(subtract(A, multiply(A, MC))),
    combinedPoles: eigenvalues(composite),
    controller,
  };
}
