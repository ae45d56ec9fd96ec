// Controller lines resolved against their plant, and the checker's robustness.
import { describe, expect, it } from 'vitest';
import type { ParseResult, PlantDecl } from '../../grammar/src/ast';
import { parsePlantText } from '../../grammar/src/index';
import { checkDocument } from '../../server/src/model/check';
import { modelDiagnosticKinds } from '../../server/src/model/diagnostics/index';
import { check, codes, controllerOf, plantOf, problems } from './helpers';

const plantText = `
plant rig {
  param wn = 4
  states x, v
  inputs push, brake
  disturbances gust
  outputs pos, speed
  A = [0, 1; -2, -3]
  B = [0, 0; 1, -1]
  C = identity(2)
  E = [0; 1]
}
`;

describe('controllers', () => {
  it('resolve every line into indices and SI values', () => {
    const doc = check(
      plantText +
        `
controller full for rig {
  poles = [-wn, -wn + 1j, -wn - 1j]
  track speed
  integral pos
  observer noise W = 2, V = diag(1, 3) predictor
  sample 5 ms
  delay 2 sample
  limit brake in [0, 10]
  limit push in [-5, 5]
  step pos to 0.25
}
`,
    );
    expect(problems(doc)).toEqual([]);
    const c = controllerOf(doc, 'full');
    expect(c.usable).toBe(true);
    expect(c.plantIndex).toBe(0);
    expect(c.poles!.values).toEqual([
      { re: -4, im: 0 },
      { re: -4, im: 1 },
      { re: -4, im: -1 },
    ]);
    expect(c.track!.outputs).toEqual([1]);
    expect(c.integral!.outputs).toEqual([0]);
    expect(c.observer).toMatchObject({ kind: 'noise', W: [[2]], V: [[1, 0], [0, 3]], form: 'predictor', enters: 'disturbances' });
    expect(c.sample!.period).toBeCloseTo(0.005, 17);
    expect(c.delay!.samples).toBe(2);
    expect(c.limits.map((l) => [l.input, l.low, l.high])).toEqual([
      [1, 0, 10],
      [0, -5, 5],
    ]);
    expect(c.steps.map((s) => [s.output, s.value])).toEqual([[0, 0.25]]);
  });

  it('size lqr weights with the integrators and keep N', () => {
    const doc = check(plantText + '\ncontroller opt for rig {\n  lqr Q = diag(1, 2, 3), R = identity(2), N = zeros(3, 2)\n  integral pos\n}\n');
    expect(problems(doc)).toEqual([]);
    const lqr = controllerOf(doc, 'opt').lqr!;
    expect(lqr.Q).toEqual([
      [1, 0, 0],
      [0, 2, 0],
      [0, 0, 3],
    ]);
    expect(lqr.N).toEqual([
      [0, 0],
      [0, 0],
      [0, 0],
    ]);
  });

  it('report a Q sized without the integrator, with the reason', () => {
    const doc = check(plantText + '\ncontroller opt for rig {\n  lqr Q = diag(1, 2), R = identity(2)\n  integral pos\n}\n');
    const d = doc.diagnostics.find((x) => x.code === 'model/matrix-shape')!;
    expect(d.message).toBe('Q is 2×2 but must be 3×3: the plant has 2 states (x, v) plus 1 integrator (pos)');
    expect(d.data).toEqual({ fix: 'resize-matrix', expectedRows: 3, expectedCols: 3 });
    expect(controllerOf(doc, 'opt').usable).toBe(false);
  });

  it('take W as n×n when the plant has no disturbances', () => {
    const doc = check(
      'plant p {\n  states a, b\n  inputs u\n  outputs y\n  A = [0, 1; 0, 0]\n  B = [0; 1]\n  C = [1, 0]\n}\ncontroller k for p {\n  poles = [-1, -2]\n  observer noise W = identity(2), V = 0.1\n}\n',
    );
    expect(problems(doc)).toEqual([]);
    expect(controllerOf(doc, 'k').observer).toMatchObject({ kind: 'noise', enters: 'states' });
  });

  it('stay checked when their plant is unusable, but are not usable', () => {
    const doc = check('plant p {\n  states a\n  inputs u\n  A = [1/0]\n  B = [1]\n}\ncontroller k for p {\n  poles = [-1]\n}\n');
    expect(plantOf(doc, 'p').usable).toBe(false);
    expect(controllerOf(doc, 'k').poles!.values).toEqual([{ re: -1, im: 0 }]);
    expect(controllerOf(doc, 'k').usable).toBe(false);
  });
});

describe('robustness', () => {
  it('keeps other plants usable when one has an error', () => {
    const doc = check('plant bad {\n  states a\n  inputs u\n  A = [nope]\n  B = [1]\n}\nplant good {\n  states a\n  inputs u\n  A = [-1]\n  B = [1]\n}\n');
    expect(plantOf(doc, 'bad').usable).toBe(false);
    expect(plantOf(doc, 'good').usable).toBe(true);
    expect(codes(doc)).toEqual(expect.arrayContaining(['model/unknown-name']));
  });

  it('never throws: an internal failure becomes model/internal-error on the declaration', () => {
    const range = { start: { line: 0, character: 6 }, end: { line: 0, character: 9 } };
    const broken = {
      kind: 'plant',
      name: { kind: 'identifier', name: 'odd', range, startOffset: 6, endOffset: 9 },
      items: [null],
      range,
      startOffset: 0,
      endOffset: 9,
    } as unknown as PlantDecl;
    const parse: ParseResult = { document: { kind: 'document', declarations: [broken], range, startOffset: 0, endOffset: 9 }, diagnostics: [] };
    const doc = checkDocument(parse);
    expect(doc.diagnostics.map((d) => d.code)).toEqual(['model/internal-error']);
    expect(doc.diagnostics[0]!.range).toEqual(range);
    expect(doc.plants[0]!.usable).toBe(false);
    expect(checkDocument({} as ParseResult).diagnostics).toEqual([]);
  });

  it('reports a unit the grammar does not know (a hand-built tree) as model/unknown-unit', () => {
    // The grammar only accepts known units; put an unknown one into a parsed tree by hand.
    const text = 'plant p {\n  param k = 3 ms\n  states a\n  inputs u\n  A = [-k]\n  B = [1]\n}\n';
    expect(problems(check(text))).toEqual([]);
    const tree = JSON.parse(JSON.stringify(parsePlantText(text))) as ParseResult;
    const plant = tree.document.declarations[0] as PlantDecl;
    const param = plant.items.find((item) => item.kind === 'param')!;
    if (param.kind !== 'param' || param.value.kind !== 'number' || !param.value.unit) throw new Error('unexpected tree');
    param.value.unit.name = 'kg';
    const result = checkDocument(tree);
    const d = result.diagnostics.find((x) => x.code === 'model/unknown-unit')!;
    expect(d.message).toBe('unknown unit `kg`; units are s ms us ns min Hz kHz %');
    expect(d.range).toEqual(param.value.unit.range);
  });

  it('registers every diagnostic once, with a documented severity and example', () => {
    const seen = new Set<string>();
    for (const kind of modelDiagnosticKinds) {
      expect(kind.code).toMatch(/^model\/[a-z-]+$/);
      expect(seen.has(kind.code)).toBe(false);
      seen.add(kind.code);
      expect(kind.fires.length).toBeGreaterThan(20);
      expect(kind.example.length).toBeGreaterThan(10);
    }
  });
});

describe('diagnostic reference', () => {
  it('renders every registered code as a table row', async () => {
    const { renderDiagnosticReference } = await import('../../server/src/model/diagnostics/reference');
    const markdown = renderDiagnosticReference([{ title: 'Model', kinds: modelDiagnosticKinds }]);
    for (const kind of modelDiagnosticKinds) expect(markdown).toContain(`| \`${kind.code}\` | ${kind.severity} |`);
    expect(markdown.split('\n').filter((line) => line.startsWith('| `model/')).length).toBe(modelDiagnosticKinds.length);
  });
});
