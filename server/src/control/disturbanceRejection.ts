// Steady-state output error per unit step of each disturbance (ẋ = Ax + Bu + Ew, y = Cx + Du + Fw,
// r = 0): with the prescaler design u = −Kx + Nr the error is −(C_t − D_tK)(−(A − BK))⁻¹E − F_t;
// with integral action the integrators drive it to zero whenever the loop is stable.
import type { Rows } from '../numeric/types';
import { steadyStateGain } from './dcGain';
import { integralLoop, type PlantMatrices } from './fragility';
import type { Domain } from './structure';

export interface DisturbanceRejectionResult {
  /** q × d: tracked-output error per unit step of each disturbance (prescaler design); null if undefined. */
  prescalerError: Rows | null;
  /** q × d with integral action; null without integral design or when undefined. */
  integralError: Rows | null;
  /** Largest |entry| of each, for a one-line summary. */
  worstPrescalerError: number | null;
  worstIntegralError: number | null;
}

export function disturbanceRejection(
  plant: PlantMatrices & { F?: Rows },
  K: Rows,
  trackedOutputs: number[],
  domain: Domain,
  integral?: { Kx: Rows; Ki: Rows; outputs: number[] },
  samplePeriod = 1,
): DisturbanceRejectionResult {
  const d = plant.E[0]?.length ?? 0;
  const F = plant.F ?? plant.C.map(() => new Array<number>(d).fill(0));
  const Ct = trackedOutputs.map((o) => plant.C[o]);
  const Dt = trackedOutputs.map((o) => plant.D[o]);
  const Acl = plant.A.map((row, i) => row.map((v, j) => v - plant.B[i].reduce((sum, b, c) => sum + b * K[c][j], 0)));
  const Ccl = Ct.map((row, i) => row.map((v, j) => v - Dt[i].reduce((sum, dd, c) => sum + dd * K[c][j], 0)));
  const Ft = trackedOutputs.map((o) => F[o] ?? new Array<number>(d).fill(0));
  const gain = d === 0 ? [] : steadyStateGain(Acl, plant.E, Ccl, Ft, domain);
  const prescalerError = gain ? gain.map((row) => row.map((v) => -v)) : null;
  let integralError: Rows | null = null;
  if (integral && d > 0) {
    const loop = integralLoop(plant, integral.Kx, integral.Ki, integral.outputs, domain, samplePeriod);
    const g = steadyStateGain(loop.A, loop.Bw, loop.C, loop.Dw, domain);
    integralError = g ? g.map((row) => row.map((v) => -v)) : null;
  }
  const worst = (M: Rows | null) => (M ? Math.max(0, ...M.flat().map(Math.abs)) : null);
  return { prescalerError, integralError, worstPrescalerError: worst(prescalerError), worstIntegralError: worst(integralError) };
}
