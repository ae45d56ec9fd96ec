import { describe, expect, it } from 'vitest';
import { augmentWithIntegrators, designIntegralAction, integralActionFeasibility, suggestIntegralPole } from '../../server/src/control/integralAction';
import { analyzeFragility, type PlantMatrices } from '../../server/src/control/fragility';
import { disturbanceRejection } from '../../server/src/control/disturbanceRejection';
import { placePoles } from '../../server/src/control/placement';
import { setpointGains } from '../../server/src/control/setpoint';
import { defaultSettings } from '../../server/src/control/settings';

const real = (...values: number[]) => values.map((re) => ({ re, im: 0 }));

// A thermal chamber: air temperature x₁, wall temperature x₂ (deviations), heater power u,
// door-opening heat loss w. Parameters: air capacity, wall capacity, air–wall conductance,
// wall–ambient conductance, heater efficiency.
const nominal = [2, 8, 0.6, 0.3, 0.9];
function chamber(p: number[]): PlantMatrices & { F: number[][] } {
  const [airCapacity, wallCapacity, airWall, wallAmbient, efficiency] = p;
  return {
    A: [
      [-airWall / airCapacity, airWall / airCapacity],
      [airWall / wallCapacity, -(airWall + wallAmbient) / wallCapacity],
    ],
    B: [[efficiency / airCapacity], [0]],
    C: [[1, 0]],
    D: [[0]],
    E: [[-1 / airCapacity], [0]],
    F: [[0]],
  };
}

describe('integral action', () => {
  it('augmented model follows the convention ξ′ = r − y (continuous) and ξ⁺ = ξ + T(r − y) (discrete)', () => {
    const A = [[0, 1], [0, -1]];
    const B = [[0], [1]];
    const C = [[1, 0]];
    const D = [[0.5]];
    const cont = augmentWithIntegrators(A, B, C, D, [0], 'continuous');
    expect(cont.A).toEqual([[0, 1, 0], [0, -1, 0], [-1, -0, 0]]);
    expect(cont.B).toEqual([[0], [1], [-0.5]]);
    const disc = augmentWithIntegrators(A, B, C, D, [0], 'discrete', 0.1);
    expect(disc.A[2]).toEqual([-0.1, -0, 1]);
    expect(disc.B[2][0]).toBeCloseTo(-0.05, 15);
  });

  it('designs Kx, Ki placing n + q poles; infeasibility reasons', () => {
    const plant = chamber(nominal);
    const design = designIntegralAction(plant.A, plant.B, plant.C, plant.D, [0], real(-0.5, -0.6, -0.4), 'continuous', defaultSettings);
    expect(design.ok).toBe(true);
    expect(design.Kx[0]).toHaveLength(2);
    expect(design.Ki[0]).toHaveLength(1);
    expect(design.placement!.maxRelativePoleError).toBeLessThan(1e-10);
    // s/(s + 1) has a zero at the origin: no integral action can hold its output.
    expect(integralActionFeasibility([[-1]], [[1]], [[-1]], [[1]], [0], 'continuous').reason).toBe('zero-at-dc');
    expect(integralActionFeasibility([[-1, 0], [0, -2]], [[1], [1]], [[1, 0], [0, 1]], [[0], [0]], [0, 1], 'continuous').reason).toBe('more-outputs-than-inputs');
    expect(integralActionFeasibility([[1, 0], [0, -2]], [[0], [1]], [[0, 1]], [[0]], [0], 'continuous').reason).toBe('not-stabilisable');
  });

  it('suggested integrator pole: 0.8 × slowest real part (common practice)', () => {
    expect(suggestIntegralPole([{ re: -2, im: 1 }, { re: -2, im: -1 }, { re: -5, im: 0 }]).re).toBeCloseTo(-1.6, 12);
    expect(suggestIntegralPole([{ re: 0.5, im: 0 }], 'discrete').re).toBeCloseTo(Math.pow(0.5, 0.8), 12);
  });
});

describe('fragility and disturbance rejection (acceptance: prescaler drifts, integral action does not)', () => {
  const plant = chamber(nominal);
  const K = placePoles(plant.A, plant.B, real(-0.5, -0.6), defaultSettings).K;
  const N = setpointGains(plant.A, plant.B, plant.C, plant.D, [0], K, 'continuous').prescaler!;
  const integral = designIntegralAction(plant.A, plant.B, plant.C, plant.D, [0], real(-0.5, -0.6, -0.4), 'continuous', defaultSettings);

  it('±10 % parameter error: nominal prescaler leaves a steady-state error of several percent, integral action ≈ 0', () => {
    const result = analyzeFragility({
      rebuild: chamber,
      nominal,
      K,
      N,
      trackedOutputs: [0],
      percent: 10,
      domain: 'continuous',
      integral: { Kx: integral.Kx, Ki: integral.Ki, outputs: [0] },
    });
    expect(result.nominal.trackingError).toBeLessThan(1e-12);
    expect(result.worstTrackingError).toBeGreaterThan(0.02);
    expect(result.worstIntegralError).toBeLessThan(1e-12);
    expect(result.box.method).toBe('vertices');
    expect(result.box.points).toBe(32);
    expect(result.box.allStable).toBe(true);
    // The heater efficiency enters the DC gain directly: it is among the worst parameters, and
    // the ±10 % scale of B gives the same (≈ 10 %·loop factor) drift.
    expect(result.worstParameters).toContain(4);
    expect(result.inputScale.worstTrackingError).toBeCloseTo(result.parameters[4].worstTrackingError, 12);
  });

  it('a unit step of the door-loss disturbance: offset with the prescaler, none with integral action', () => {
    const result = disturbanceRejection(plant, K, [0], 'continuous', { Kx: integral.Kx, Ki: integral.Ki, outputs: [0] });
    expect(Math.abs(result.worstPrescalerError!)).toBeGreaterThan(0.1);
    expect(result.worstIntegralError).toBeLessThan(1e-12);
  });

  it('more than 10 parameters: seeded sampling of the box', () => {
    const many = [...nominal, 1, 1, 1, 1, 1, 1];
    const result = analyzeFragility({
      rebuild: (p) => chamber(p.slice(0, 5)),
      nominal: many,
      K,
      N,
      trackedOutputs: [0],
      percent: 10,
      domain: 'continuous',
      samples: 64,
    });
    expect(result.box.method).toBe('sampled');
    expect(result.box.points).toBe(64);
    expect(result.worstIntegralError).toBeNull();
  });
});

import { matrixExponentialIntegral } from '../../server/src/numeric';

describe('discrete domain (zero-order hold of the thermal chamber, T = 0.5 s)', () => {
  const T = 0.5;
  const sampled = (p: number[]): PlantMatrices & { F: number[][] } => {
    const plant = chamber(p);
    const { Phi, Gamma } = matrixExponentialIntegral(plant.A, plant.B.map((row, i) => [...row, ...plant.E[i]]), T);
    return { ...plant, A: Phi, B: Gamma.map((row) => [row[0]]), E: Gamma.map((row) => [row[1]]) };
  };
  const plant = sampled(nominal);
  const zPoles = (...s: number[]) => s.map((value) => ({ re: Math.exp(value * T), im: 0 }));

  it('integral action in z: ±10 % parameters leave ≈ 0 error, the prescaler does not; disturbances likewise', () => {
    const K = placePoles(plant.A, plant.B, zPoles(-0.5, -0.6), defaultSettings).K;
    const N = setpointGains(plant.A, plant.B, plant.C, plant.D, [0], K, 'discrete').prescaler!;
    const integral = designIntegralAction(plant.A, plant.B, plant.C, plant.D, [0], zPoles(-0.5, -0.6, -0.4), 'discrete', defaultSettings, T);
    expect(integral.ok).toBe(true);
    const input = { Kx: integral.Kx, Ki: integral.Ki, outputs: [0] };
    const result = analyzeFragility({ rebuild: sampled, nominal, K, N, trackedOutputs: [0], percent: 10, domain: 'discrete', samplePeriod: T, integral: input });
    expect(result.nominal.trackingError).toBeLessThan(1e-12);
    expect(result.worstTrackingError).toBeGreaterThan(0.02);
    expect(result.worstIntegralError).toBeLessThan(1e-12);
    const disturbance = disturbanceRejection(plant, K, [0], 'discrete', input, T);
    expect(disturbance.worstPrescalerError!).toBeGreaterThan(0.1);
    expect(disturbance.worstIntegralError!).toBeLessThan(1e-12);
  });

  it('a discrete plant with a zero at z = 1 (first difference y[k] = x[k] − x[k−1] style) is zero-at-dc', () => {
    // x[k+1] = 0.5·x[k] + u[k], y = −0.5·x + u: G(z) = 1 − 0.5/(z − 0.5) = (z − 1)/(z − 0.5).
    const result = setpointGains([[0.5]], [[1]], [[-0.5]], [[1]], [0], [[0.2]], 'discrete');
    expect(result.feasibility).toBe('zero-at-dc');
    expect(integralActionFeasibility([[0.5]], [[1]], [[-0.5]], [[1]], [0], 'discrete').reason).toBe('zero-at-dc');
  });
});
