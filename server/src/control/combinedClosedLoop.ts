// Plant + observer-based state feedback, as implemented.
//   Plant       x' = A x + B u,  y = C x + D u          (x[k+1] = Φ x + Γ u for discrete)
//   Predictor   x̂' = A x̂ + B u + L (y − C x̂ − D u),   u = −K x̂
//   Current     x̄[k+1] = Φ x̂[k|k] + Γ u[k],  x̂[k|k] = x̄ + M (y − C x̄ − D u),  u = −K x̂[k|k]
// Composite state (x, x̂) (predictor) or (x, x̄) (current). By the separation principle the
// composite poles are eig(A − BK) ∪ eig(A − LC) (current form: eig(Φ − ΓK) ∪ eig(Φ − ΦMC));
// the record reports both sets and the composite eigenvalues so the identity can be checked.
// The controller alone, from y to u, is also returned (u = Cc xc + Dc y): margins.ts breaks the
// loop at the plant input with it. `observerController` builds that controller, also with
// integral action (integrators ξ' = r − y_I, or ξ[k+1] = ξ[k] + T(r − y_I[k]), fed by the
// measured outputs, u = −Kx·x̂ − Ki·ξ), so margins of observer designs with integrators are
// those of the loop as implemented.
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
  const BK = multiply(B, K);
  const controllerPoles = eigenvalues(subtract(A, BK));
  const controller = observerController({ A, B, C, D }, K, L, domain, form);
  if (domain === 'continuous' || form === 'predictor') {
    const LC = multiply(L, C);
    const composite = blocks(A, negate(BK), LC, subtract(subtract(A, BK), LC));
    return {
      A: composite,
      controllerPoles,
      observerPoles: eigenvalues(subtract(A, LC)),
      combinedPoles: eigenvalues(composite),
      controller,
    };
  }
  // Current form with M = L: u = −K(I − MC) x̄ − KMC x (the D u terms of plant and observer cancel).
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
  return {
    A: composite,
    controllerPoles,
    observerPoles: eigenvalues(subtract(A, multiply(A, MC))),
    combinedPoles: eigenvalues(composite),
    controller,
  };
}

/** Integral action of an observer-based controller: Ki (m × qi) on the measured outputs `outputs`. */
export interface ControllerIntegrators {
  Ki: Rows;
  outputs: number[];
}

/**
 * The observer-based controller from the measured y to u, state (estimate, integrators).
 * Both estimator forms share one shape:
 *   (I − KxMD)·u = F·e − Ki·ξ + G·y,   e⁺ = P·e + W·u + V·y,   ξ⁺ = J·ξ − s·S·y
 * predictor / continuous: F = −Kx, G = 0, P = A − LC, W = B − LD, V = L (no D feedthrough term);
 * current (M = L): F = −Kx(I − MC), G = −KxM, P = Φ(I − MC), W = Γ − ΦMD, V = ΦM.
 * J = 0 and s = 1 (continuous) or J = I and s = T (discrete); S selects the integrated outputs.
 */
export function observerController(
  plant: StateSpace,
  Kx: Rows,
  L: Rows,
  domain: 'continuous' | 'discrete',
  form: 'predictor' | 'current' = 'predictor',
  integrators?: ControllerIntegrators,
  samplePeriod = 1,
): StateSpace {
  const { A, B, C, D } = plant;
  const n = A.length;
  const m = Kx.length;
  const p = C.length;
  const outputs = integrators?.outputs ?? [];
  const qi = outputs.length;
  const Ki = integrators?.Ki ?? Kx.map(() => []);
  const current = domain === 'discrete' && form === 'current';
  let F: Rows;
  let G: Rows;
  let P: Rows;
  let W: Rows;
  let V: Rows;
  let Su: Rows;
  if (current) {
    const MC = multiply(L, C);
    const IminusMC = subtract(identity(n), MC);
    const KM = multiply(Kx, L);
    F = negate(multiply(Kx, IminusMC));
    G = negate(KM);
    P = multiply(A, IminusMC);
    W = subtract(B, multiply(multiply(A, L), D));
    V = multiply(A, L);
    Su = subtract(identity(m), multiply(KM, D));
  } else {
    F = negate(Kx);
    G = Array.from({ length: m }, () => new Array<number>(p).fill(0));
    P = subtract(A, multiply(L, C));
    W = subtract(B, multiply(L, D));
    V = L;
    Su = identity(m);
  }
  const solveSu = (right: Rows): Rows => (current ? solveLinear(Su, right).X : right);
  const Cc = solveSu(F.map((row, i) => [...row, ...Ki[i].map((v) => -v)]));
  const Dc = solveSu(G);
  const discrete = domain === 'discrete';
  const step = discrete ? samplePeriod : 1;
  const WCc = multiply(W, Cc);
  const WDc = multiply(W, Dc);
  const Ac: Rows = [
    ...P.map((row, i) => [...row, ...new Array<number>(qi).fill(0)].map((v, j) => v + WCc[i][j])),
    ...outputs.map((_, k) => Array.from({ length: n + qi }, (__, j) => (discrete && j === n + k ? 1 : 0))),
  ];
  const Bc: Rows = [
    ...V.map((row, i) => row.map((v, j) => v + WDc[i][j])),
    ...outputs.map((output) => Array.from({ length: p }, (_, j) => (j === output ? -step : 0))),
  ];
  return { A: Ac, B: Bc, C: Cc, D: Dc };
}
