// Expression evaluation: precedence, complex values, units, order-free parameters, matrices.
import { describe, expect, it } from 'vitest';
import { check, codes, parameterValues, plantOf, problems } from './helpers';

function parameters(lines: string): Record<string, number> {
  const doc = check(`plant probe {\n${lines}\n  states x\n  inputs u\n  A = [-1]\n  B = [1]\n}\n`);
  expect(problems(doc)).toEqual([]);
  return parameterValues(plantOf(doc, 'probe'));
}

describe('precedence and associativity', () => {
  it('binds ^ tighter than unary minus and associates it to the right', () => {
    const p = parameters('  param a = -2^2\n  param b = 2^3^2\n  param c = (-2)^2\n  param d = 2*-3');
    expect(p.a).toBe(-4);
    expect(p.b).toBe(512);
    expect(p.c).toBe(4);
    expect(p.d).toBe(-6);
  });

  it('associates - and / to the left and multiplies before adding', () => {
    const p = parameters('  param a = 1 - 2 - 3\n  param b = 8 / 2 / 2\n  param c = 1 + 2 * 3\n  param d = 2 * 3 ^ 2');
    expect(p).toMatchObject({ a: -4, b: 2, c: 7, d: 18 });
  });

  it('evaluates functions and pi', () => {
    const p = parameters('  param a = sin(pi / 2)\n  param b = log(exp(2))\n  param c = sqrt(16) + abs(-3)\n  param d = tanh(0)');
    expect(p.a).toBe(1);
    expect(p.b).toBe(2);
    expect(p.c).toBe(7);
    expect(p.d).toBe(0);
  });
});

describe('parameters', () => {
  it('may use parameters declared later', () => {
    const p = parameters('  param wn = 2 * zeta\n  param zeta = k / 4\n  param k = 2');
    expect(p).toMatchObject({ wn: 1, zeta: 0.5, k: 2 });
  });

  it('names the whole cycle at every member', () => {
    const doc = check('plant cyc {\n  param a = b\n  param b = c\n  param c = a\n  param free = 1\n  states x\n  inputs u\n  A = [-free]\n  B = [1]\n}\n');
    const cycles = doc.diagnostics.filter((d) => d.code === 'model/parameter-cycle');
    expect(cycles.map((d) => d.range.start.line)).toEqual([1, 2, 3]);
    for (const d of cycles) expect(d.message).toContain('a → b → c → a');
    expect(parameterValues(plantOf(doc, 'cyc'))).toEqual({ free: 1 });
  });

  it('can be replaced by overrides without editing the text (for fragility analyses)', () => {
    const text = 'plant m {\n  param k = 2\n  param c = 3 * k\n  states x\n  inputs u\n  A = [-c]\n  B = [k]\n}\n';
    const doc = check(text, { parameterOverrides: { m: { k: 2.2 } } });
    const plant = plantOf(doc, 'm');
    expect(plant.B).toEqual([[2.2]]);
    expect(plant.A[0]![0]).toBeCloseTo(-6.6, 14);
  });

  it('re-checking the same syntax tree with moved parameters (number-literal entries copied) equals checking the edited text', async () => {
    const { parsePlantText } = await import('../../grammar/src');
    const { checkPlant } = await import('../../server/src/model/check');
    const source = (k: string) =>
      `plant m {\n  param k = ${k}\n  param h = 0.05\n  states a, b, c\n  inputs u\n  A = [-k - h, k, 0; k, -2*k, k; 0, k, -k - h]\n  B = [1; 0; -0]\n}\n`;
    const declaration = parsePlantText(source('0.5')).document.declarations[0] as never;
    const first = checkPlant(declaration, []).checked;
    for (const k of [0.55, 0.45, 0.55]) {
      const moved = checkPlant(declaration, [], { k }).checked;
      const edited = checkPlant(parsePlantText(source(String(k))).document.declarations[0] as never, []).checked;
      expect(moved.A).toEqual(edited.A);
      expect(moved.B).toEqual(edited.B);
      expect(Object.is(moved.B[2][0], -0)).toBe(true);
    }
    expect(checkPlant(declaration, []).checked.A).toEqual(first.A);
  });

  it('keeps matrix-valued parameters usable in matrices but out of the scalar list', () => {
    const doc = check('plant m {\n  param M = diag(-1, -2)\n  param g = 3\n  states a, b\n  inputs u\n  A = M\n  B = [0; g]\n  C = identity(2)\n  D = zeros(2, 1)\n}\n');
    expect(problems(doc)).toEqual([]);
    const plant = plantOf(doc, 'm');
    expect(plant.A).toEqual([[-1, 0], [0, -2]]);
    expect(plant.C).toEqual([[1, 0], [0, 1]]);
    expect(plant.D).toEqual([[0], [0]]);
    expect(plant.parameters.map((p) => p.name)).toEqual(['g']);
  });

  it('supports matrix arithmetic: products, scaling and whole powers', () => {
    const doc = check('plant m {\n  param T = [0, 1; 0, 0]\n  states a, b\n  inputs u\n  A = 2 * T * T + T^1 - identity(2)\n  B = [1, 2; 3, 4] * [0; 1]\n}\n');
    expect(problems(doc)).toEqual([]);
    expect(plantOf(doc, 'm').A).toEqual([[-1, 1], [0, -1]]);
    expect(plantOf(doc, 'm').B).toEqual([[2], [4]]);
  });
});

describe('units', () => {
  it('converts times to seconds, kilohertz to hertz and percent to a fraction in parameters', () => {
    const p = parameters('  param a = 20 ms\n  param b = 2 min\n  param c = 3 kHz\n  param d = 5 %\n  param e = 7 us\n  param f = 4 ns\n  param g = 1.5 s');
    expect(p.a).toBeCloseTo(0.02, 15);
    expect(p.b).toBe(120);
    expect(p.c).toBe(3000);
    expect(p.d).toBeCloseTo(0.05, 15);
    expect(p.e).toBeCloseTo(7e-6, 20);
    expect(p.f).toBeCloseTo(4e-9, 22);
    expect(p.g).toBe(1.5);
  });

  it('reads sample periods, settling, rise and overshoot in their own units', () => {
    const doc = check(
      'plant m {\n  states x\n  inputs u\n  outputs y\n  A = [-1]\n  B = [1]\n  C = [1]\n}\n' +
        'controller k for m {\n  spec settling <= 300 ms, overshoot <= 5 %, rise <= 0.1 min\n  sample 200 Hz\n}\n' +
        'controller q for m {\n  poles = [-3]\n  sample 2 kHz\n}\n',
    );
    expect(problems(doc)).toEqual([]);
    const [k, q] = doc.controllers;
    expect(k!.spec!.settling!.seconds).toBeCloseTo(0.3, 15);
    expect(k!.spec!.overshoot!.percent).toBe(5);
    expect(k!.spec!.rise!.seconds).toBeCloseTo(6, 14);
    expect(k!.sample!.period).toBeCloseTo(0.005, 17);
    expect(q!.sample!.period).toBeCloseTo(0.0005, 18);
  });

  it('takes a bare sample period as seconds, with a warning', () => {
    const doc = check('plant m {\n  states x\n  inputs u\n  A = [-1]\n  B = [1]\n}\ncontroller k for m {\n  poles = [-2]\n  sample 0.01\n}\n');
    expect(doc.controllers[0]!.sample!.period).toBe(0.01);
    expect(codes(doc)).toContain('model/missing-unit');
  });
});

describe('complex values', () => {
  it('evaluates complex parameters and pole lists; snaps near-conjugates to exact pairs', () => {
    const doc = check(
      'plant m {\n  param wd = 3\n  param p1 = -4 + wd*1j\n  param p2 = -4 - wd*1j\n  states a, b\n  inputs u\n  A = [0, 1; 0, 0]\n  B = [0; 1]\n}\n' +
        'controller k for m {\n  poles = [p1, -4 - 3j * (1 + 1e-12)]\n}\n',
    );
    expect(problems(doc)).toEqual([]);
    const values = doc.controllers[0]!.poles!.values;
    expect(values[0]).toEqual({ re: -4, im: 3 });
    expect(values[1]).toEqual({ re: -4, im: -3 });
  });

  it('rejects a complex entry in a plant matrix at the entry', () => {
    const doc = check('plant m {\n  states a\n  inputs u\n  A = [sqrt(-1)]\n  B = [1]\n}\n');
    const d = doc.diagnostics.find((x) => x.code === 'model/not-real')!;
    expect(d.range.start).toEqual({ line: 3, character: 7 });
    expect(plantOf(doc, 'm').usable).toBe(false);
  });
});

describe('matrix entries', () => {
  // Plain numbers and bare parameters are read without the general evaluator; each entry must
  // still equal what the evaluator gives for the same expression as a parameter (same source of
  // truth: the expression rules above), and every problem must still be reported.
  const entries = ['0', '-0', '2.5', '-3', '+4', 'k', '-k', '+k', '2*k', 'pi', '-pi', '1 ms', '3e2', 'k^2'];

  it('gives each kind of entry the value the evaluator gives it', () => {
    const states = entries.map((_, i) => `x${i}`).join(', ');
    const parameterLines = entries.map((text, i) => `  param e${i} = ${text}`).join('\n');
    const rows = entries.map((text) => entries.map(() => text).join(', ')).join('; ');
    const doc = check(`plant probe {\n  param k = 1.5\n${parameterLines}\n  states ${states}\n  inputs u\n  outputs y\n  A = [${rows}]\n  B = [${entries.map(() => '1').join('; ')}]\n  C = [${entries.map((_, i) => (i === 0 ? '1' : '0')).join(', ')}]\n}\n`);
    // Only the unit in a matrix entry is worth a warning here.
    expect(codes(doc).filter((code) => !code.includes('unit'))).toEqual([]);
    const values = parameterValues(plantOf(doc, 'probe'));
    const A = plantOf(doc, 'probe').A;
    entries.forEach((text, i) => {
      expect(Object.is(A[i][0], values[`e${i}`]), `${text}: ${A[i][0]} vs ${values[`e${i}`]}`).toBe(true);
    });
  });

  it('still reports a non-finite number, an unknown name and a signal in an entry', () => {
    const doc = check('plant probe {\n  param k = 2\n  states x, v\n  inputs u\n  A = [0, 1e400; kk, -x]\n  B = [0; 1]\n}\n');
    const found = codes(doc);
    expect(found.some((code) => code.includes('non-finite'))).toBe(true);
    expect(found.some((code) => code.includes('unknown-name'))).toBe(true);
    expect(found.some((code) => code.includes('signal'))).toBe(true);
  });
});
