// Linearisation by dual numbers: exact Jacobians against hand-derived ones and against central
// differences of the nonlinear model at seeded random operating points; linear and affine
// equations; operating points and equilibria; an outside reference (cart and pendulum).
import { describe, expect, it } from 'vitest';
import * as D from '../../server/src/model/dual';
import { Dual } from '../../server/src/model/dual';
import type { CheckedPlant, Rows } from '../../server/src/model/types';
import { check, codes, plantOf, problems, seededRandom } from './helpers';

const eps = Number.EPSILON;

function expectMatrixClose(actual: Rows, expected: Rows, relative: number): void {
  expect(actual.length).toBe(expected.length);
  actual.forEach((row, i) => {
    expect(row.length).toBe(expected[i]!.length);
    row.forEach((value, j) => {
      const want = expected[i]![j]!;
      expect(Math.abs(value - want), `entry (${i + 1},${j + 1}): ${value} vs ${want}`).toBeLessThanOrEqual(relative * Math.max(1, Math.abs(want)));
    });
  });
}

describe('dual numbers', () => {
  it('apply the product, quotient and chain rules exactly', () => {
    const x = Dual.variable(1.5, 0, 2);
    const y = Dual.variable(-0.5, 1, 2);
    const f = D.div(D.mul(x, y), D.apply(x, Math.sin(x.value), Math.cos(x.value))); // x*y / sin(x)
    const s = Math.sin(1.5);
    expect(f.value).toBeCloseTo((1.5 * -0.5) / s, 15);
    expect(f.gradient![0]).toBeCloseTo((-0.5 * s - 1.5 * -0.5 * Math.cos(1.5)) / (s * s), 14);
    expect(f.gradient![1]).toBeCloseTo(1.5 / s, 15);
  });

  it('differentiate a power with a varying exponent', () => {
    const a = Dual.variable(2, 0, 2);
    const b = Dual.variable(3, 1, 2);
    const p = D.pow(a, b);
    expect(p.value).toBe(8);
    expect(p.gradient![0]).toBeCloseTo(3 * 4, 14);
    expect(p.gradient![1]).toBeCloseTo(8 * Math.log(2), 14);
  });

  it('keep constants free of gradients', () => {
    const c = D.add(Dual.constant(2), Dual.constant(3));
    expect(c.isConstant).toBe(true);
    expect(c.magnitude).toBe(5);
  });
});

describe('linear and affine equations', () => {
  it('give exactly the matrices of the matrix form', () => {
    const doc = check(`
plant eq {
  param J = 0.012
  param b = 0.004
  param kt = 0.08
  param r = 0.05
  states theta, omega
  inputs current
  disturbances load
  outputs height
  theta' = omega
  omega' = (kt*current - b*omega - load)/J
  output height = r*theta
}
plant mat {
  param J = 0.012
  param b = 0.004
  param kt = 0.08
  param r = 0.05
  states theta, omega
  inputs current
  disturbances load
  outputs height
  A = [0, 1; 0, -b/J]
  B = [0; kt/J]
  C = [r, 0]
  E = [0; -1/J]
}
`);
    expect(problems(doc)).toEqual([]);
    const eq = plantOf(doc, 'eq');
    const mat = plantOf(doc, 'mat');
    expectMatrixClose(eq.A, mat.A, 4 * eps);
    expectMatrixClose(eq.B, mat.B, 4 * eps);
    expectMatrixClose(eq.E, mat.E, 4 * eps);
    expect(eq.C).toEqual(mat.C);
    expect(eq.D).toEqual([[0]]);
    expect(eq.F).toEqual([[0]]);
    expect(eq.linearised).toBe(false);
    expect(eq.operatingPoint).toBeUndefined();
    // Each row of the equation-form matrices points at its equation.
    expect(eq.sources.B!.rowRanges.map((r) => r.start.line)).toEqual([10, 11]);
    expect(eq.sources.C!.rowRanges.map((r) => r.start.line)).toEqual([12]);
  });

  it('report the drift of an affine model without `around` and the input that holds it', () => {
    const doc = check(`
plant drop {
  param g = 9.81
  param mass = 2
  states h, v
  inputs thrust
  outputs level
  h' = v
  v' = -g + thrust/mass
  output level = h
}
`);
    const plant = plantOf(doc, 'drop');
    const warning = doc.diagnostics.find((d) => d.code === 'model/not-equilibrium')!;
    expect(warning.severity).toBe('warning');
    expect(warning.data).toMatchObject({ fix: 'hold-with-input', suggested: { thrust: 19.62 }, inputs: [19.62] });
    expect(plant.operatingPoint!.isEquilibrium).toBe(false);
    expect(plant.operatingPoint!.drift).toEqual([0, -9.81]);
    expect(plant.operatingPoint!.holdingInput![0]).toBeCloseTo(19.62, 12);
    expect(plant.usable).toBe(true);
  });

  it('accept an equilibrium whose drift is only rounding, scaled to the size of the terms', () => {
    // 0.1 + 0.2 - 0.3 is 5.55e-17 in binary floating point: an equilibrium within rounding.
    const doc = check('plant r {\n  states x\n  inputs u\n  x\' = 0.1 + 0.2 - 0.3 - x + u\n  around x = 0, u = 0\n}\n');
    expect(codes(doc)).not.toContain('model/not-equilibrium');
    expect(plantOf(doc, 'r').operatingPoint!.isEquilibrium).toBe(true);
  });
});

// A nonlinear two-state model with every supported function (our own scenario: a damped
// swinging load with a quadratic drag and an exponential actuator).
const nonlinearText = (x1: number, x2: number, u: number) => `
plant swing {
  param a = 3.2
  param c = 0.7
  states x1, x2
  inputs u
  outputs y1, y2
  x1' = x2
  x2' = -a*sin(x1) - c*x2*abs(x2) + u^2*exp(-x1) + cos(x2)*tanh(u)
  output y1 = x1^3 + sqrt(x2*x2 + 1)
  output y2 = log(2 + x1) * u + tan(x2)/(1 + u^2) + 2^x1
  around x1 = ${x1}, x2 = ${x2}, u = ${u}
}
`;

function handJacobians(x1: number, x2: number, u: number) {
  const a = 3.2;
  const c = 0.7;
  const sech2 = 1 - Math.tanh(u) ** 2;
  const A = [
    [0, 1],
    [-a * Math.cos(x1) - u * u * Math.exp(-x1), -2 * c * Math.abs(x2) - Math.sin(x2) * Math.tanh(u)],
  ];
  const B = [[0], [2 * u * Math.exp(-x1) + Math.cos(x2) * sech2]];
  const C = [
    [3 * x1 * x1, x2 / Math.sqrt(x2 * x2 + 1)],
    [u / (2 + x1) + Math.pow(2, x1) * Math.log(2), (1 + Math.tan(x2) ** 2) / (1 + u * u)],
  ];
  const D = [[0], [Math.log(2 + x1) - (2 * u * Math.tan(x2)) / (1 + u * u) ** 2]];
  return { A, B, C, D };
}

/** Central differences of the nonlinear model, for an independent check. */
function centralDifferences(plant: CheckedPlant, x0: number[], u0: number[]) {
  const model = plant.nonlinear!;
  const n = x0.length;
  const m = u0.length;
  const f = (x: number[], u: number[]) => model.derivatives(x, u, []);
  const g = (x: number[], u: number[]) => model.outputs(x, u, []);
  const column = (fn: typeof f, which: 'x' | 'u', j: number, h: number) => {
    const shift = (v: number[], k: number, d: number) => v.map((value, i) => (i === k ? value + d : value));
    const plus = which === 'x' ? fn(shift(x0, j, h), u0) : fn(x0, shift(u0, j, h));
    const minus = which === 'x' ? fn(shift(x0, j, -h), u0) : fn(x0, shift(u0, j, -h));
    return plus.map((p, i) => (p - minus[i]!) / (2 * h));
  };
  const step = (v: number) => Math.cbrt(eps) * Math.max(1, Math.abs(v));
  const build = (fn: typeof f, which: 'x' | 'u', count: number, rows: number): Rows => {
    const cols = Array.from({ length: count }, (_, j) => column(fn, which, j, step(which === 'x' ? x0[j]! : u0[j]!)));
    return Array.from({ length: rows }, (_, i) => cols.map((col) => col[i]!));
  };
  return { A: build(f, 'x', n, n), B: build(f, 'u', m, n), C: build(g, 'x', n, 2), D: build(g, 'u', m, 2) };
}

describe('nonlinear equations', () => {
  it('match hand-derived Jacobians and central differences at seeded random operating points', () => {
    const random = seededRandom(20261202);
    for (let trial = 0; trial < 25; trial++) {
      const x1 = -0.9 + 1.8 * random();
      const x2 = -1.2 + 2.4 * random();
      const u = -1.5 + 3 * random();
      const doc = check(nonlinearText(x1, x2, u));
      expect(doc.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
      const plant = plantOf(doc, 'swing');
      expect(plant.linearised).toBe(true);
      const hand = handJacobians(x1, x2, u);
      // Exact derivatives agree with the hand-derived formulas to rounding.
      expectMatrixClose(plant.A, hand.A, 64 * eps);
      expectMatrixClose(plant.B, hand.B, 64 * eps);
      expectMatrixClose(plant.C, hand.C, 64 * eps);
      expectMatrixClose(plant.D, hand.D, 64 * eps);
      // Central differences carry truncation error O(h²) and rounding O(ε/h); with h = ε^(1/3)
      // both are about ε^(2/3) ≈ 4e-11 times the size of the derivatives.
      const numeric = centralDifferences(plant, [x1, x2], [u]);
      const h = Math.cbrt(eps);
      const tolerance = 1e3 * h * h;
      expectMatrixClose(plant.A, numeric.A, tolerance);
      expectMatrixClose(plant.B, numeric.B, tolerance);
      expectMatrixClose(plant.C, numeric.C, tolerance);
      expectMatrixClose(plant.D, numeric.D, tolerance);
    }
  });

  it('evaluate f and g at the operating point and expose them for simulation', () => {
    const doc = check(nonlinearText(0.3, -0.2, 0.5));
    const plant = plantOf(doc, 'swing');
    const op = plant.operatingPoint!;
    expect(op.states).toEqual([0.3, -0.2]);
    expect(op.inputs).toEqual([0.5]);
    const expectedDrift = -3.2 * Math.sin(0.3) - 0.7 * -0.2 * 0.2 + 0.25 * Math.exp(-0.3) + Math.cos(-0.2) * Math.tanh(0.5);
    expect(op.drift[0]).toBeCloseTo(-0.2, 15);
    expect(op.drift[1]).toBeCloseTo(expectedDrift, 14);
    expect(op.outputs[0]).toBeCloseTo(0.027 + Math.sqrt(1.04), 14);
    expect(plant.nonlinear!.derivatives([0.3, -0.2], [0.5], [])[1]).toBeCloseTo(expectedDrift, 14);
  });

  it('needs an operating point, and says which operation made the model nonlinear', () => {
    const doc = check("plant p {\n  states x, v\n  inputs u\n  x' = v\n  v' = -x*v + u\n}\n");
    const d = doc.diagnostics.find((x) => x.code === 'model/needs-operating-point')!;
    expect(d.severity).toBe('error');
    expect(d.related![0]!.range.start).toEqual({ line: 4, character: 7 });
    expect(plantOf(doc, 'p').usable).toBe(false);
  });

  it('finds no holding input when the input cannot reach the drifting state', () => {
    const doc = check("plant p {\n  states x, v\n  inputs u\n  x' = v + 1\n  v' = u\n  around x = 0, v = 0, u = 0\n}\n");
    const op = plantOf(doc, 'p').operatingPoint!;
    expect(op.isEquilibrium).toBe(false);
    expect(op.holdingInput).toBeNull();
    const d = doc.diagnostics.find((x) => x.code === 'model/not-equilibrium')!;
    expect(d.message).toContain('no input can hold it');
    expect(d.data?.fix).toBeUndefined();
  });
});

describe('outside reference: inverted pendulum on a cart', () => {
  // Nonlinear point-mass pendulum on a cart (angle from upright, frictionless), and its
  // linearisation about the upright equilibrium as given in Franklin, Powell and
  // Emami-Naeini, Feedback Control of Dynamic Systems, inverted pendulum on a cart
  // (from memory):  x'' = (F − m g θ)/M,  θ'' = ((M + m) g θ − F)/(M l).
  // Scenario of our own: a camera dolly balancing a mast.
  it('linearises to the textbook model at the upright equilibrium', () => {
    const M = 1.5;
    const m = 0.3;
    const l = 0.8;
    const g = 9.81;
    const doc = check(`
plant dolly {
  param M = ${M}
  param m = ${m}
  param l = ${l}
  param g = ${g}
  states x, v, theta, omega
  inputs F
  outputs position, tilt
  x' = v
  v' = (F + m*sin(theta)*(l*omega^2 - g*cos(theta))) / (M + m*sin(theta)^2)
  theta' = omega
  omega' = (-F*cos(theta) - m*l*omega^2*sin(theta)*cos(theta) + (M + m)*g*sin(theta)) / (l*(M + m*sin(theta)^2))
  output position = x
  output tilt = theta
  around x = 0, v = 0, theta = 0, omega = 0, F = 0
}
`);
    expect(problems(doc)).toEqual([]);
    const plant = plantOf(doc, 'dolly');
    expect(plant.linearised).toBe(true);
    expect(plant.operatingPoint!.isEquilibrium).toBe(true);
    const textbookA = [
      [0, 1, 0, 0],
      [0, 0, (-m * g) / M, 0],
      [0, 0, 0, 1],
      [0, 0, ((M + m) * g) / (M * l), 0],
    ];
    const textbookB = [[0], [1 / M], [0], [-1 / (M * l)]];
    expectMatrixClose(plant.A, textbookA, 16 * eps);
    expectMatrixClose(plant.B, textbookB, 16 * eps);
    expect(plant.C).toEqual([
      [1, 0, 0, 0],
      [0, 0, 1, 0],
    ]);
  });
});

describe('disturbances in equations', () => {
  it('give E = ∂f/∂w and F = ∂g/∂w at the operating point', () => {
    const doc = check(
      "plant p {\n  states x\n  inputs u\n  disturbances w\n  outputs y\n  x' = -x + w*u\n  output y = x + w^2\n  around x = 6, u = 2, w = 3\n}\n",
    );
    expect(problems(doc)).toEqual([]);
    const plant = plantOf(doc, 'p');
    expect(plant.A).toEqual([[-1]]);
    expect(plant.B).toEqual([[3]]);
    expect(plant.E).toEqual([[2]]);
    expect(plant.C).toEqual([[1]]);
    expect(plant.D).toEqual([[0]]);
    expect(plant.F).toEqual([[6]]);
    expect(plant.operatingPoint).toMatchObject({ states: [6], inputs: [2], disturbances: [3], outputs: [15], drift: [0], isEquilibrium: true });
  });
});
