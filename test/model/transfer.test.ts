// Transfer-function realisation: C(sI − A)⁻¹B + D must equal N(s)/D(s) at sample points of
// the complex plane (an identity check, independent of the realisation's form).
import { describe, expect, it } from 'vitest';
import type { CheckedPlant } from '../../server/src/model/types';
import { check, plantOf, problems } from './helpers';

interface C {
  re: number;
  im: number;
}
const cmul = (a: C, b: C): C => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const cdiv = (a: C, b: C): C => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
const csub = (a: C, b: C): C => ({ re: a.re - b.re, im: a.im - b.im });

/** C (sI − A)⁻¹ B + D by Gaussian elimination with partial pivoting on complex numbers. */
function realisedResponse(plant: CheckedPlant, s: C): C {
  const n = plant.A.length;
  const M: C[][] = plant.A.map((row, i) => row.map((a, j) => ({ re: (i === j ? s.re : 0) - a, im: i === j ? s.im : 0 })));
  const x: C[] = plant.B.map((row) => ({ re: row[0]!, im: 0 }));
  for (let k = 0; k < n; k++) {
    let pivot = k;
    for (let i = k + 1; i < n; i++) if (Math.hypot(M[i]![k]!.re, M[i]![k]!.im) > Math.hypot(M[pivot]![k]!.re, M[pivot]![k]!.im)) pivot = i;
    [M[k], M[pivot]] = [M[pivot]!, M[k]!];
    [x[k], x[pivot]] = [x[pivot]!, x[k]!];
    for (let i = k + 1; i < n; i++) {
      const factor = cdiv(M[i]![k]!, M[k]![k]!);
      for (let j = k; j < n; j++) M[i]![j] = csub(M[i]![j]!, cmul(factor, M[k]![j]!));
      x[i] = csub(x[i]!, cmul(factor, x[k]!));
    }
  }
  for (let k = n - 1; k >= 0; k--) {
    let sum = x[k]!;
    for (let j = k + 1; j < n; j++) sum = csub(sum, cmul(M[k]![j]!, x[j]!));
    x[k] = cdiv(sum, M[k]![k]!);
  }
  let y: C = { re: plant.D[0]![0]!, im: 0 };
  plant.C[0]!.forEach((c, j) => (y = { re: y.re + c * x[j]!.re, im: y.im + c * x[j]!.im }));
  return y;
}

const points: C[] = [
  { re: 0.3, im: 0.7 },
  { re: -2.5, im: 1.1 },
  { re: 4, im: -3 },
  { re: 0, im: 10 },
];

function cases(): { text: string; rational: (s: C) => C; order: number }[] {
  const poly = (coefficients: number[]) => (s: C) => coefficients.reduce<C>((acc, c) => ({ re: cmul(acc, s).re + c, im: cmul(acc, s).im }), { re: 0, im: 0 });
  return [
    {
      text: 'transfer = (0.5*s + 2) / (s^3 + 4*s^2 + 5*s + 2)',
      rational: (s) => cdiv(poly([0.5, 2])(s), poly([1, 4, 5, 2])(s)),
      order: 3,
    },
    {
      // exactly proper with a non-monic denominator and a parameter
      text: 'param k = 3\n  transfer = k*(2*s^2 + 3*s + 1) / (4*s^2 + s + 8)',
      rational: (s) => cdiv(poly([6, 9, 3])(s), poly([4, 1, 8])(s)),
      order: 2,
    },
    {
      // products, `20 s` as 20·s, and a sum over different denominators
      text: 'transfer = 0.8 / ((20 s + 1) * (2*s + 1)) + 1 / (s + 3)',
      rational: (s) => {
        const first = cdiv({ re: 0.8, im: 0 }, cmul(poly([20, 1])(s), poly([2, 1])(s)));
        const second = cdiv({ re: 1, im: 0 }, poly([1, 3])(s));
        return { re: first.re + second.re, im: first.im + second.im };
      },
      order: 3,
    },
    {
      // a shared denominator stays first order; negative powers and nested fractions
      text: 'transfer = 1/(s + 1) + 2/(s + 1) + (s^-1)/(1/s)',
      rational: (s) => {
        const a = cdiv({ re: 3, im: 0 }, poly([1, 1])(s));
        return { re: a.re + 1, im: a.im };
      },
      order: 1,
    },
  ];
}

describe('transfer-function realisation', () => {
  for (const { text, rational, order } of cases()) {
    it(`realises ${text.split('\n').pop()!.trim()}`, () => {
      const doc = check(`plant tf {\n  inputs drive\n  outputs speed\n  ${text}\n}\n`);
      expect(problems(doc)).toEqual([]);
      const plant = plantOf(doc, 'tf');
      expect(plant.form).toBe('transfer');
      expect(plant.states.map((s) => s.name)).toEqual(Array.from({ length: order }, (_, i) => `x${i + 1}`));
      expect(plant.inputs.map((s) => s.name)).toEqual(['drive']);
      for (const s of points) {
        const want = rational(s);
        const got = realisedResponse(plant, s);
        const scale = Math.max(1, Math.hypot(want.re, want.im));
        expect(Math.hypot(got.re - want.re, got.im - want.im)).toBeLessThanOrEqual(1e3 * Number.EPSILON * scale);
      }
    });
  }

  it('uses the controllable canonical (phase-variable) form with x1 the lowest derivative', () => {
    const doc = check('plant tf {\n  transfer = (0.5*s + 2) / (2*s^3 + 8*s^2 + 10*s + 4)\n}\n');
    const plant = plantOf(doc, 'tf');
    expect(plant.A).toEqual([
      [0, 1, 0],
      [0, 0, 1],
      [-2, -5, -4],
    ]);
    expect(plant.B).toEqual([[0], [0], [1]]);
    expect(plant.C).toEqual([[1, 0.25, 0]]);
    expect(plant.D).toEqual([[0]]);
    expect(plant.inputs.map((s) => s.name)).toEqual(['u']);
    expect(plant.outputs.map((s) => s.name)).toEqual(['y']);
    expect(doc.diagnostics.filter((d) => d.code === 'model/inferred-signals')).toHaveLength(2);
  });

  it('takes the feedthrough D from the ratio of leading coefficients', () => {
    const doc = check('plant tf {\n  transfer = (6*s + 1) / (2*s + 4)\n}\n');
    const plant = plantOf(doc, 'tf');
    expect(plant.D).toEqual([[3]]);
    expect(plant.A).toEqual([[-2]]);
    expect(plant.C).toEqual([[0.5 - 3 * 2]]);
  });

  it('uses declared state names when their number matches the order', () => {
    const doc = check('plant tf {\n  states pos, vel\n  transfer = 1 / (s^2 + s + 1)\n}\n');
    expect(plantOf(doc, 'tf').states.map((s) => s.name)).toEqual(['pos', 'vel']);
    expect(plantOf(doc, 'tf').usable).toBe(true);
  });
});
