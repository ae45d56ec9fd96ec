// Editor features as pure functions: each test puts the cursor with a `|` marker.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyze, checkText } from '../../server/src/analyze';
import {
  codeActions,
  completions,
  definitionAt,
  documentSymbols,
  foldingRanges,
  formatText,
  hoverAt,
  inlayHints,
  prepareRename,
  referencesAt,
  renameAt,
  semanticTokens,
  signatureHelp,
} from '../../server/src/ide/index';
import type { Diagnostic } from '../../server/src/model/types';
import { seededRandom } from '../lsp/soak';
import { apply, cursor, HOIST } from './markers';

const labels = (marked: string) => {
  const { text, position } = cursor(marked);
  return completions(checkText(text), position).map((item) => item.label);
};

describe('hover', () => {
  it('shows a param value with the comment of its line', () => {
    const { text, position } = cursor(HOIST.replace('param J ', 'param |J '));
    const hover = hoverAt(analyze(text), position)!;
    expect(hover.markdown).toContain('param J');
    expect(hover.markdown).toContain('0.012');
    expect(hover.markdown).toContain('inertia, kg m^2');
    expect(hover.range).toEqual({ start: { line: 1, character: 8 }, end: { line: 1, character: 9 } });
  });

  it('gives ωn and ζ of a typed pole', () => {
    // |−4 + 3j| = 5 and ζ = 4/5 (hand computation).
    const { text, position } = cursor(HOIST.replace('[-4 + 3j,', '[-4 + 3|j,'));
    const hover = hoverAt(analyze(text), position)!;
    expect(hover.markdown).toContain('| 5 | 0.8 | 0.25 |');
  });

  it('shows the evaluated matrix with its shape', () => {
    const { text, position } = cursor(HOIST.replace('  A = [', '  |A = ['));
    const hover = hoverAt(analyze(text), position)!;
    expect(hover.markdown).toContain('state matrix, 2×2');
    expect(hover.markdown).toContain('-0.33333'); // −b/J = −0.004/0.012
  });

  it('shows a large all-number matrix (read in one piece by the parser) with its shape and values', () => {
    const n = 9; // 81 entries: folded into one token (grammar/src/plainMatrix.ts)
    const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? '-2.5' : j === i + 1 ? '1' : '0')).join(', '));
    const states = Array.from({ length: n }, (_, i) => `x${i + 1}`).join(', ');
    const text = `plant chain {\n  states ${states}\n  inputs u\n  outputs y\n  |A = [${rows.join(';\n       ')}]\n  B = [${Array(n).fill('1').join('; ')}]\n  C = [${Array(n).fill('1').join(', ')}]\n}\n`;
    const marked = cursor(text);
    const hover = hoverAt(analyze(marked.text), marked.position)!;
    expect(hover.markdown).toContain('state matrix, 9×9');
    expect(hover.markdown).toContain('-2.5');
  });

  it('tells where a signal was declared, also from a controller line', () => {
    const { text, position } = cursor(HOIST.replace('track height', 'track hei|ght'));
    const hover = hoverAt(analyze(text), position)!;
    expect(hover.markdown).toContain('output height');
    expect(hover.markdown).toContain('line 9');
  });

  it('answers nothing on blank space', () => {
    const { text, position } = cursor(HOIST.replace('\n\n  states', '\n|\n  states'));
    expect(hoverAt(analyze(text), position)).toBeNull();
  });
});

describe('completion', () => {
  it('offers skeletons at the top level', () => {
    expect(labels('|')).toEqual(expect.arrayContaining(['plant', 'controller', 'plant … { }', 'controller … for … { }']));
  });

  it('offers plant statements inside a plant and design statements inside a controller', () => {
    const inPlant = labels(HOIST.replace('  states  theta', '  |\n  states  theta'));
    expect(inPlant).toEqual(expect.arrayContaining(['param', 'states', 'inputs', 'around', 'A = [...]']));
    expect(inPlant).not.toContain('poles');
    const inController = labels(HOIST.replace('  track height', '  |\n  track height'));
    expect(inController).toEqual(expect.arrayContaining(['poles', 'lqr', 'spec', 'observer', 'limit']));
    expect(inController).not.toContain('param');
  });

  it('offers the plants after `for`, the inputs after `limit`, the outputs after `step`', () => {
    expect(labels(HOIST + '\ncontroller c for |')).toEqual(['hoist']);
    expect(labels(HOIST.replace('  step height to 0.2', '  limit |'))).toEqual(['current']);
    expect(labels(HOIST.replace('  step height to 0.2', '  step |'))).toEqual(['height']);
  });

  it('offers names and functions in an expression, specification names after spec, units after a number', () => {
    const expression = labels(HOIST.replace('param r  = 0.05', 'param r  = |'));
    expect(expression).toEqual(expect.arrayContaining(['J', 'b', 'kt', 'theta', 'current', 'sqrt', 'pi']));
    expect(labels(HOIST.replace('  step height to 0.2', '  spec |'))).toEqual(['settling', 'overshoot', 'rise']);
    expect(labels(HOIST.replace('  step height to 0.2', '  sample 5 |'))).toEqual(expect.arrayContaining(['ms', 'Hz']));
  });

  it('offers nothing inside a comment', () => {
    expect(labels(HOIST.replace('# inertia', '# iner|tia'))).toEqual([]);
  });
});

const TWO_PLANTS = `plant left {
  param k = 2
  states x
  inputs u
  outputs y
  x' = -k*x + u
  output y = x
}

plant right {
  param k = 3
  states x
  inputs u
  outputs y
  x' = -k*x + u
  output y = x
}

controller c1 for left {
  poles = [-5]
  track y
}

controller c2 for right {
  poles = [-6]
  track y
  step y to 1
}
`;

describe('names: definition, references, rename', () => {
  it('keeps params and signals in their own plant', () => {
    const { text, position } = cursor(TWO_PLANTS.replace('param k = 2', 'param |k = 2'));
    const result = renameAt(checkText(text), position, 'stiffness');
    expect('edits' in result).toBe(true);
    const renamed = apply(text, (result as { edits: never[] }).edits);
    expect(renamed).toContain('param stiffness = 2');
    expect(renamed).toContain("x' = -stiffness*x + u\n  output y = x\n}\n\nplant right");
    expect(renamed).toContain('param k = 3');
    expect(renamed.match(/-k\*x/g)).toHaveLength(1);
  });

  it("follows a plant's output into the controllers of that plant only", () => {
    const { text, position } = cursor(TWO_PLANTS.replace('plant right {\n  param k = 3\n  states x\n  inputs u\n  outputs y', 'plant right {\n  param k = 3\n  states x\n  inputs u\n  outputs |y'));
    const fast = checkText(text);
    expect(referencesAt(fast, position)).toHaveLength(4); // outputs, output y =, track, step
    const renamed = apply(text, (renameAt(fast, position, 'level') as { edits: never[] }).edits);
    expect(renamed).toContain('controller c1 for left {\n  poles = [-5]\n  track y');
    expect(renamed).toContain('controller c2 for right {\n  poles = [-6]\n  track level\n  step level to 1');
    expect(checkText(renamed).diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
  });

  it('renames a plant in the controllers that name it', () => {
    const { text, position } = cursor(TWO_PLANTS.replace('plant left', 'plant le|ft'));
    const renamed = apply(text, (renameAt(checkText(text), position, 'west') as { edits: never[] }).edits);
    expect(renamed).toContain('plant west {');
    expect(renamed).toContain('controller c1 for west {');
  });

  it('refuses clashes, reserved words and non-names', () => {
    const { text, position } = cursor(TWO_PLANTS.replace('param k = 2', 'param |k = 2'));
    const fast = checkText(text);
    expect(renameAt(fast, position, 'x')).toMatchObject({ error: expect.stringContaining('already declared') });
    expect(renameAt(fast, position, 'sample')).toMatchObject({ error: expect.stringContaining('reserved') });
    expect(renameAt(fast, position, '2k')).toMatchObject({ error: expect.stringContaining('not a valid name') });
    expect(renameAt(fast, position, 'sqrt')).toMatchObject({ error: expect.stringContaining('function') });
  });

  it('goes to the definition from a use and refuses to rename keywords', () => {
    const { text, position } = cursor(TWO_PLANTS.replace("x' = -k*x + u\n  output y = x\n}\n\nplant right", "x' = -|k*x + u\n  output y = x\n}\n\nplant right"));
    expect(definitionAt(checkText(text), position)).toEqual({ start: { line: 1, character: 8 }, end: { line: 1, character: 9 } });
    const keyword = cursor(TWO_PLANTS.replace('param k = 2', 'pa|ram k = 2'));
    expect(prepareRename(checkText(keyword.text), keyword.position)).toBeNull();
  });
});

describe('formatting', () => {
  const samples = join(__dirname, '..', '..', 'samples');
  const files = readdirSync(samples).filter((name) => name.endsWith('.plant'));

  it.each(files)('is idempotent on %s and keeps its meaning', (name) => {
    const text = readFileSync(join(samples, name), 'utf8');
    const once = formatText(text);
    expect(formatText(once)).toBe(once);
    const strip = (t: string) => t.replace(/\s+/g, '');
    expect(strip(once)).toBe(strip(text));
  });

  it('is idempotent on broken text too (seeded random edits of the samples)', () => {
    const alphabet = "abxyzJKQR0123456789.,;=+-*/^'()[]{}#jis \n";
    for (const [index, name] of files.entries()) {
      const random = seededRandom(500 + index);
      let text = readFileSync(join(samples, name), 'utf8');
      for (let i = 0; i < 100; i++) {
        const offset = Math.floor(random() * (text.length + 1));
        if (random() < 0.55) text = text.slice(0, offset) + alphabet[Math.floor(random() * alphabet.length)] + text.slice(offset);
        else text = text.slice(0, offset) + text.slice(offset + 1 + Math.floor(random() * 3));
        const once = formatText(text);
        expect(formatText(once), `${name} after ${i + 1} edits`).toBe(once);
      }
    }
  });

  it('aligns matrix columns under the first entry and indents blocks', () => {
    const messy = 'plant p {\nstates a, b, c\n  inputs u\n      outputs a\n A = [1, 0, 0;\n0,-12.5,1; 0,0,   -3]\n}\n';
    expect(formatText(messy)).toBe(
      'plant p {\n  states a, b, c\n  inputs u\n  outputs a\n  A = [1,     0,  0;\n       0, -12.5,  1;\n       0,     0, -3]\n}\n',
    );
  });

  it('formats every matrix of a document in one go, also two on one line', () => {
    const messy =
      'plant p {\n states a,b\n inputs u, v\n outputs a\n disturbances w\n A=[0,1;0,0]\n B=[1,0;0,1]\n C=[1,0]\n D=[0,0]\n E=[1;0]\n}\n' +
      'controller c for p {\n lqr Q=[1,0;\n0,1], R=[1,0;\n0,2]\n}\n';
    const once = formatText(messy);
    expect(formatText(once)).toBe(once);
    expect(once).toContain('  A=[0, 1; 0, 0]\n  B=[1, 0; 0, 1]\n  C=[1, 0]\n  D=[0, 0]\n  E=[1; 0]');
    expect(once).toContain('  lqr Q=[1, 0;\n         0, 1], R=[1, 0;\n                   0, 2]');
  });

  it('leaves a matrix holding comments as written (re-indented only)', () => {
    const text = 'plant p {\n    A = [0, 1   # top\n         0, 0]\n}\n';
    expect(formatText(text)).toBe('plant p {\n  A = [0, 1   # top\n       0, 0]\n}\n');
  });

  it('only re-indents a document with syntax errors', () => {
    const broken = 'plant p {\n      A = [0,1;\n}\n';
    const formatted = formatText(broken);
    expect(formatted.split('\n')[1]).toBe('  A = [0,1;');
    expect(formatText(formatted)).toBe(formatted);
  });

  it('keeps CRLF line breaks', () => {
    expect(formatText('plant p {\r\nstates x\r\n}\r\n')).toBe('plant p {\r\n  states x\r\n}\r\n');
  });
});

function diagnosticAt(text: string, needle: string, data: Diagnostic['data'], code = 'test/fix'): Diagnostic {
  const offset = text.indexOf(needle);
  const before = text.slice(0, offset).split('\n');
  const start = { line: before.length - 1, character: before[before.length - 1].length };
  return { severity: 'warning', code, message: 'test', range: { start, end: { line: start.line, character: start.character + needle.length } }, data };
}

function fix(text: string, diagnostic: Diagnostic): string {
  const fixes = codeActions(analyze(text), diagnostic.range, [diagnostic]);
  expect(fixes.length).toBeGreaterThan(0);
  return apply(text, fixes[0].edits);
}

describe('quick fixes from diagnostic data', () => {
  it('adds integral action with the suggested output and pole', () => {
    const fixed = fix(HOIST, diagnosticAt(HOIST, 'track height', { fix: 'add-integral-action', output: 'height', pole: -6 }));
    expect(fixed).toContain('  step height to 0.2\n  integral height pole -6\n}');
    expect(checkText(fixed).parse.diagnostics).toEqual([]);
  });

  it('inserts after the line the engine names', () => {
    const track = diagnosticAt(HOIST, 'track height', {});
    const fixed = fix(HOIST, diagnosticAt(HOIST, 'track height', { fix: 'add-integral-action', output: 'height', pole: '-3.2', insertAfter: track.range }));
    expect(fixed).toContain('  track height\n  integral height pole -3.2\n  step height to 0.2');
  });

  it('adds a Kalman filter with identity covariances when no observer poles are given', () => {
    const fixed = fix(HOIST, diagnosticAt(HOIST, 'lift', { fix: 'add-observer' }));
    expect(fixed).toContain('  observer noise W = identity(2), V = 1\n}');
    expect(checkText(fixed).diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
  });

  it('completes a conjugate pair after the lone pole', () => {
    const text = HOIST.replace('[-4 + 3j, -4 - 3j]', '[-4 + 3j]');
    const fixed = fix(text, diagnosticAt(text, '-4 + 3j', { fix: 'complete-conjugate-pair', missing: '-4 - 3j' }));
    expect(fixed).toContain('poles = [-4 + 3j, -4 - 3j]');
  });

  it('reads the complex conjugate the model attaches', () => {
    const text = HOIST.replace('[-4 + 3j, -4 - 3j]', '[-4 + 3j]');
    const fixed = fix(text, diagnosticAt(text, '-4 + 3j', { fix: 'add-conjugate', conjugate: { re: -4, im: -3 } }));
    expect(fixed).toContain('poles = [-4 + 3j, -4 - 3j]');
  });

  it('resizes a matrix, keeping entries and padding with zeros', () => {
    const fixed = fix(HOIST, diagnosticAt(HOIST, 'B = [0; kt/J]', { fix: 'resize-matrix', expectedRows: 3, expectedCols: 2 }));
    expect(fixed).toContain('B = [   0, 0;\n       kt/J, 0;\n          0, 0]');
  });

  it('adds observer poles and replaces a spec by poles', () => {
    const observed = fix(HOIST, diagnosticAt(HOIST, 'lift', { fix: 'add-observer-poles', poles: [-20, -25] }));
    expect(observed).toContain('  observer poles = [-20, -25]\n}');
    const specText = HOIST.replace('poles = [-4 + 3j, -4 - 3j]', 'spec settling <= 1 s, overshoot <= 5 %');
    const fromSpec = fix(specText, diagnosticAt(specText, 'spec', { fix: 'poles-from-spec', poles: '[-4 + 3j, -4 - 3j]' }));
    expect(fromSpec).toContain('poles = [-4 + 3j, -4 - 3j]  # from: spec settling <= 1 s, overshoot <= 5 %');
  });

  it('holds an operating point with the given inputs', () => {
    const text = HOIST.replace('  C = [r, 0]\n', '  C = [r, 0]\n  around theta = 0, omega = 0\n');
    const fixed = fix(text, diagnosticAt(text, 'track height', { fix: 'hold-with-input', inputs: [0.25] }));
    expect(fixed).toContain('around theta = 0, omega = 0, current = 0.25');
  });

  it('suggests a starting design for a controller without one', () => {
    const text = HOIST.replace('  poles = [-4 + 3j, -4 - 3j]\n', '');
    const fixed = fix(text, diagnosticAt(text, 'lift', { fix: 'add-design' }));
    expect(fixed).toContain('lqr Q = identity(2), R = 1');
  });

  it('offers no fix for malformed data', () => {
    const diagnostic = diagnosticAt(HOIST, 'B = [0; kt/J]', { fix: 'resize-matrix', expectedRows: 'many' });
    expect(codeActions(analyze(HOIST), diagnostic.range, [diagnostic])).toEqual([]);
  });
});

describe('outline, folding, tokens, hints, signatures', () => {
  it('lists plants with their members and controllers with their lines', () => {
    const symbols = documentSymbols(checkText(HOIST));
    expect(symbols.map((s) => [s.name, s.kind])).toEqual([
      ['hoist', 'plant'],
      ['lift', 'controller'],
    ]);
    expect(symbols[0].children.filter((c) => c.kind === 'state').map((c) => c.name)).toEqual(['theta', 'omega']);
  });

  it('folds blocks up to the closing brace and multi-line matrices', () => {
    const folds = foldingRanges(checkText(HOIST));
    expect(folds).toEqual(expect.arrayContaining([{ startLine: 0, endLine: 13, kind: 'region' }, { startLine: 10, endLine: 11 }, { startLine: 16, endLine: 19, kind: 'region' }]));
  });

  it('classifies names by what they resolve to', () => {
    const tokens = semanticTokens(checkText(HOIST));
    const at = (line: number, character: number) => tokens.find((t) => t.line === line && t.character === character);
    expect(at(1, 8)).toMatchObject({ type: 'parameter', modifiers: ['declaration', 'readonly'] }); // J
    expect(at(6, 10)).toMatchObject({ type: 'variable', modifiers: ['declaration'] }); // theta
    expect(at(0, 0)).toMatchObject({ type: 'keyword' });
    expect(at(1, 24)).toMatchObject({ type: 'comment' });
    expect(at(11, 11)).toMatchObject({ type: 'parameter' }); // b in -b/J
  });

  it('shows the value of a param written as an expression and matrix shapes', () => {
    const text = HOIST.replace('param r  = 0.05', 'param r  = 2*pi*3');
    const hints = inlayHints(checkText(text));
    expect(hints.find((h) => h.position.line === 4)?.label).toBe('= 18.85'); // 6π = 18.8496 (hand computation)
    expect(hints.filter((h) => h.kind === 'type').map((h) => h.label)).toEqual(['2×2', '2×1', '1×2']);
  });

  it('tracks the active argument of a function', () => {
    const { text, position } = cursor(HOIST.replace('B = [0; kt/J]', 'B = zeros(2, |'));
    const help = signatureHelp(checkText(text), position)!;
    expect(help.label).toBe('zeros(rows, cols)');
    expect(help.activeParameter).toBe(1);
  });
});

describe('number display', () => {
  it('keeps 4–6 significant digits, whole numbers in full, exponents only far out', async () => {
    const { formatNumber, formatComplex } = await import('../../server/src/ide/numbers');
    expect(formatNumber(3.7500000000000013)).toBe('3.75');
    expect(formatNumber(0.333333333, 4)).toBe('0.3333');
    expect(formatNumber(39701.2, 4)).toBe('39701');
    expect(formatNumber(-36980.4)).toBe('-36980');
    expect(formatNumber(2.5e7)).toBe('2.5e7');
    expect(formatNumber(-4.6853e-5)).toBe('-4.6853e-5');
    expect(formatNumber(0)).toBe('0');
    expect(formatComplex({ re: -4, im: -3 })).toBe('-4 - 3j');
    expect(formatComplex({ re: 0, im: 2 })).toBe('2j');
    expect(formatComplex({ re: -2, im: 1e-20 })).toBe('-2');
  });
});
