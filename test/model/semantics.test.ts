// Decisions a control engineer relies on, pinned down: which name wins, what counts as
// nonlinear, which controller lines may be combined.
import { describe, expect, it } from 'vitest';
import { check, codes, controllerOf, plantOf, problems } from './helpers';

describe('names in equations', () => {
  it('the signal wins over a parameter of the same name (with a warning on the parameter)', () => {
    const doc = check("plant p {\n  param v = 100\n  states x, v\n  inputs u\n  x' = v\n  v' = u\n}\n");
    expect(plantOf(doc, 'p').A).toEqual([
      [0, 1],
      [0, 0],
    ]);
    const warning = doc.diagnostics.find((d) => d.code === 'model/shadowed-name')!;
    expect(warning.severity).toBe('warning');
    expect(warning.range.start.line).toBe(1);
  });

  it('the parameter wins in matrix entries, where signals have no value', () => {
    const doc = check('plant p {\n  param v = 100\n  states x, v\n  inputs u\n  A = [0, v; 0, 0]\n  B = [0; 1]\n}\n');
    expect(plantOf(doc, 'p').A[0]![1]).toBe(100);
  });
});

describe('what is nonlinear', () => {
  it('functions of constants and products with parameters stay linear', () => {
    const doc = check("plant p {\n  param k = 2\n  states x\n  inputs u\n  x' = -abs(-3)*k*x + exp(0)*u/2 + x^1\n}\n");
    expect(problems(doc)).toEqual([]);
    const plant = plantOf(doc, 'p');
    expect(plant.linearised).toBe(false);
    expect(plant.A).toEqual([[-5]]);
    expect(plant.B).toEqual([[0.5]]);
  });

  it('a product of two signals, a division by a signal or x^2 is nonlinear', () => {
    for (const rhs of ['x*u', '1/(1 + x)', 'x^2', 'u^x']) {
      const doc = check(`plant p {\n  states x\n  inputs u\n  x' = ${rhs}\n}\n`);
      expect(codes(doc), rhs).toContain('model/needs-operating-point');
    }
  });
});

describe('controller line combinations', () => {
  const plant = 'plant p {\n  states x, v\n  inputs u\n  outputs y\n  A = [0, 1; 0, 0]\n  B = [0; 1]\n  C = [1, 0]\n}\n';

  it('a spec may accompany poles or lqr as a requirement', () => {
    const doc = check(plant + 'controller a for p {\n  poles = [-2, -3]\n  spec settling <= 3 s\n}\ncontroller b for p {\n  lqr Q = identity(2), R = 1\n  spec overshoot <= 10 %\n}\n');
    expect(problems(doc)).toEqual([]);
    expect(controllerOf(doc, 'a').spec!.settling!.seconds).toBe(3);
    expect(controllerOf(doc, 'b').spec!.overshoot!.percent).toBe(10);
  });

  it('a spec alone is a design', () => {
    const doc = check(plant + 'controller a for p {\n  spec settling <= 2 s, overshoot <= 5 %\n}\n');
    expect(problems(doc)).toEqual([]);
    expect(controllerOf(doc, 'a').usable).toBe(true);
  });

  it('integrator poles of their own leave the main pole count at the plant order', () => {
    const doc = check(plant + 'controller a for p {\n  poles = [-2, -3]\n  integral y pole -1\n}\n');
    expect(problems(doc)).toEqual([]);
    expect(controllerOf(doc, 'a').integral!.poles!.values).toEqual([{ re: -1, im: 0 }]);
  });

  it('a second line of the same kind is reported and the first one kept', () => {
    const doc = check(plant + 'controller a for p {\n  poles = [-2, -3]\n  poles = [-4, -5]\n}\n');
    expect(codes(doc)).toEqual(['model/duplicate-definition']);
    expect(controllerOf(doc, 'a').poles!.values.map((z) => z.re)).toEqual([-2, -3]);
  });
});
