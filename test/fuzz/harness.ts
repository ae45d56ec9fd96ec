// Fuzzing harness shared by the vitest suite (test/fuzz/pipeline.test.ts) and the standalone
// full-size run (test/fuzz/run.mjs): three input generators (random token streams, grammar-aware
// random models, mutations of the samples) and one invariant check of the whole pipeline
// text → parse → check → analyse → JSON. docs/robustness.md lists the invariants.
import fc from 'fast-check';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { checkText, analyzeFastCheck, type DocumentAnalysis } from '../../server/src/analyze';
import { documentJson, fileJson } from '../../server/src/render/json';
import { KEYWORDS, UNIT_NAMES, FUNCTION_NAMES, CONSTANT_NAMES } from '../../grammar/src/index';
import { documentIterationBudget, iterationTally, resetIterationTally } from '../../server/src/numeric/iterationCount';
import type { AnalysisSettings } from '../../server/src/control/settings';
import type { Diagnostic, Range } from '../../server/src/model/types';

// ------------------------------------------------------------------------------------ numbers

/** Numbers as written in a model: ordinary, zero, huge, tiny, overflowing and subnormal. */
export const numberText: fc.Arbitrary<string> = fc.oneof(
  { weight: 6, arbitrary: fc.integer({ min: -20, max: 20 }).map(String) },
  { weight: 6, arbitrary: fc.integer({ min: -100_000, max: 100_000 }).map((v) => String(v / 1000)) },
  { weight: 1, arbitrary: fc.double({ min: -100, max: 100, noNaN: true, noDefaultInfinity: true }).map((v) => formatNumber(v)) },
  { weight: 3, arbitrary: fc.constant('0') },
  {
    weight: 2,
    arbitrary: fc.constantFrom('1e300', '-1e300', '1e-300', '-1e-300', '1e308', '1e309', '1e-320', '1e12', '1e-12', '0.0', '4.9e-324', '1.7976931348623157e308'),
  },
);

function formatNumber(value: number): string {
  const text = String(Math.abs(value) < 1e-6 && value !== 0 ? value.toExponential(3) : Number(value.toPrecision(6)));
  return text;
}

const signedNumber = (text: string) => (text.startsWith('-') ? `(${text})` : text);

// ------------------------------------------------------------------------------- token streams

const PUNCTUATION = ['{', '}', '[', ']', '(', ')', ',', ';', '=', '+', '-', '*', '/', '^', "'", '<=', '<', '%'];
const IDENTIFIERS = ['A', 'B', 'C', 'D', 'E', 'Q', 'R', 'N', 'W', 'V', 'x', 'y', 'u', 'x1', 'y1', 'u1', 'p', 'settling', 'overshoot', 'rise', 'current', 'predictor', 's', 'z', 'ω'];
const LEXEMES = [
  ...KEYWORDS,
  ...UNIT_NAMES,
  ...FUNCTION_NAMES,
  ...CONSTANT_NAMES,
  ...PUNCTUATION,
  ...IDENTIFIERS,
  '3j', '2.5i', '1e300j', '.5', '1.', '# comment', '\n', '\r\n', '\r', '\t',
];

/** (a) Random token streams: lexemes of every token kind, numbers and line breaks, in random order. */
export const tokenStream: fc.Arbitrary<string> = fc
  .array(fc.oneof({ weight: 4, arbitrary: fc.constantFrom(...LEXEMES) }, { weight: 1, arbitrary: numberText }), { minLength: 0, maxLength: 80 })
  .chain((lexemes) => fc.array(fc.constantFrom(' ', '', '\n', '  '), { minLength: lexemes.length, maxLength: lexemes.length }).map((gaps) => lexemes.map((lexeme, i) => lexeme + gaps[i]).join('')));

// ----------------------------------------------------------------------- grammar-aware models

const matrixText = (rows: number, cols: number): fc.Arbitrary<string> =>
  fc.array(fc.array(numberText, { minLength: cols, maxLength: cols }), { minLength: rows, maxLength: rows }).chain((entries) =>
    fc.constantFrom(';', ';\n   ', '\n   ').map((rowBreak) => `[${entries.map((row) => row.join(', ')).join(rowBreak)}]`),
  );

const weightText = (size: number): fc.Arbitrary<string> =>
  fc.oneof(
    matrixText(size, size),
    fc.constant(`identity(${size})`),
    fc.array(numberText, { minLength: size, maxLength: size }).map((values) => `diag(${values.map(signedNumber).join(', ')})`),
  );

/** Pole lists: real poles and complex pairs (occasionally an unpaired complex pole), count near n. */
const polesText = (count: number): fc.Arbitrary<string> =>
  fc
    .array(
      fc.oneof(
        { weight: 3, arbitrary: numberText.map((re) => [re]) },
        {
          weight: 2,
          arbitrary: fc.tuple(numberText, fc.integer({ min: 0, max: 50 })).map(([re, im]) => [`${re} + ${im}j`, `${re} - ${im}j`]),
        },
        { weight: 1, arbitrary: fc.tuple(numberText, fc.integer({ min: 1, max: 9 })).map(([re, im]) => [`${re} + ${im}j`]) },
      ),
      { minLength: 1, maxLength: count + 1 },
    )
    .map((groups) => `[${groups.flat().join(', ')}]`);

interface Shape {
  states: number;
  inputs: number;
  outputs: number;
}

const plantText = (shape: Shape): fc.Arbitrary<string> => {
  const states = Array.from({ length: shape.states }, (_, i) => `x${i + 1}`);
  const inputs = Array.from({ length: shape.inputs }, (_, i) => `u${i + 1}`);
  const outputs = Array.from({ length: shape.outputs }, (_, i) => `y${i + 1}`);
  const header = `plant rig {\n  param k = 2\n  states ${states.join(', ')}\n  inputs ${inputs.join(', ')}\n  outputs ${outputs.join(', ')}\n`;
  const matrixForm = fc
    .tuple(
      matrixText(shape.states, shape.states),
      matrixText(shape.states, shape.inputs),
      matrixText(shape.outputs, shape.states),
      fc.option(matrixText(shape.outputs, shape.inputs)),
    )
    .map(([A, B, C, D]) => `${header}  A = ${A}\n  B = ${B}\n  C = ${C}\n${D ? `  D = ${D}\n` : ''}}\n`);
  const term = (names: string[]) =>
    fc.tuple(numberText, fc.constantFrom(...names), fc.constantFrom('', 'sin', 'tanh', 'sqr')).map(([c, name, f]) =>
      f === '' ? `${signedNumber(c)}*${name}` : f === 'sqr' ? `${signedNumber(c)}*${name}^2` : `${signedNumber(c)}*${f}(${name})`,
    );
  const rhs = fc.array(term([...states, ...inputs]), { minLength: 1, maxLength: 3 }).map((terms) => terms.join(' + '));
  const equationForm = fc
    .tuple(
      fc.array(rhs, { minLength: shape.states, maxLength: shape.states }),
      fc.array(rhs, { minLength: shape.outputs, maxLength: shape.outputs }),
      fc.option(fc.array(numberText, { minLength: shape.states + shape.inputs, maxLength: shape.states + shape.inputs })),
    )
    .map(([derivatives, outs, around]) => {
      const lines = derivatives.map((d, i) => `  ${states[i]}' = ${d}`);
      const outLines = outs.map((o, i) => `  output ${outputs[i]} = ${o}`);
      const point = around ? `  around ${[...states, ...inputs].map((name, i) => `${name} = ${signedNumber(around[i])}`).join(', ')}\n` : '';
      return `${header}${lines.join('\n')}\n${outLines.join('\n')}\n${point}}\n`;
    });
  const transferForm = fc
    .tuple(fc.array(numberText, { minLength: 1, maxLength: 3 }), fc.array(numberText, { minLength: 1, maxLength: 4 }))
    .map(([num, den]) => {
      const poly = (coefficients: string[]) => coefficients.map((c, i) => `${signedNumber(c)}*s^${coefficients.length - 1 - i}`).join(' + ');
      return `plant rig {\n  inputs u1\n  outputs y1\n  transfer = (${poly(num)}) / (${poly(['1', ...den])})\n}\n`;
    });
  return fc.oneof({ weight: 6, arbitrary: matrixForm }, { weight: 2, arbitrary: equationForm }, { weight: 1, arbitrary: transferForm });
};

const designLines = (shape: Shape): fc.Arbitrary<string[]> => {
  const n = shape.states;
  const line = fc.oneof(
    polesText(n).map((p) => `poles = ${p}`),
    fc
      .tuple(weightText(n), weightText(shape.inputs), fc.boolean())
      .map(([Q, R, cross]) => `lqr Q = ${Q}, R = ${R}${cross ? `, N = [${Array.from({ length: n }, () => Array(shape.inputs).fill('0').join(', ')).join('; ')}]` : ''}`),
    fc.tuple(numberText, fc.integer({ min: 0, max: 40 })).map(([t, o]) => `spec settling <= ${t} s, overshoot <= ${o} %`),
    numberText.map((t) => `spec rise <= ${t} s`),
    fc.constantFrom(`track y1`, `track y1, y2`, `track u1`),
    fc.option(fc.oneof(numberText, polesText(1))).map((pole) => `integral y1${pole === null ? '' : ` pole ${pole}`}`),
    fc.tuple(polesText(n), fc.constantFrom('', ' current', ' predictor')).map(([p, form]) => `observer poles = ${p}${form}`),
    fc.tuple(weightText(n), weightText(shape.outputs)).map(([W, V]) => `observer noise W = ${W}, V = ${V}`),
    fc.tuple(numberText, fc.constantFrom('ms', 's', 'Hz', 'kHz', 'ns', 'us', 'min')).map(([v, unit]) => `sample ${v} ${unit}`),
    fc.integer({ min: 0, max: 3 }).map((k) => `delay ${k} sample`),
    fc.tuple(numberText, numberText).map(([lo, hi]) => `limit u1 in [${lo}, ${hi}]`),
    numberText.map((v) => `step y1 to ${v}`),
  );
  return fc.array(line, { minLength: 0, maxLength: 6 });
};

/** (b) Grammar-aware random models: a plant with 1–6 states and a controller with random design lines. */
export const randomModel: fc.Arbitrary<string> = fc
  .record({ states: fc.integer({ min: 1, max: 6 }), inputs: fc.integer({ min: 1, max: 3 }), outputs: fc.integer({ min: 1, max: 3 }) })
  .chain((shape) =>
    fc.tuple(plantText(shape), designLines(shape), fc.boolean()).map(
      ([plant, lines, hasController]) => (hasController || lines.length ? `${plant}\ncontroller c for rig {\n${lines.map((l) => `  ${l}\n`).join('')}}\n` : plant),
    ),
  );

// ------------------------------------------------------------------------- sample mutations

export function readSamples(root: string): string[] {
  const folder = join(root, 'samples');
  return readdirSync(folder)
    .filter((name) => name.endsWith('.plant'))
    .sort()
    .map((name) => readFileSync(join(folder, name), 'utf8'));
}

type Mutation =
  | { kind: 'delete-token' | 'duplicate-token' | 'delete-line' | 'duplicate-line'; at: number }
  | { kind: 'swap-tokens' | 'swap-lines'; at: number; other: number }
  | { kind: 'number'; at: number; value: string }
  | { kind: 'long-line'; at: number; length: number }
  | { kind: 'deep-nesting'; at: number; depth: number; bracket: '(' | '[' };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constantFrom('delete-token', 'duplicate-token', 'delete-line', 'duplicate-line') as fc.Arbitrary<'delete-token'>, at: fc.nat() }),
  fc.record({ kind: fc.constantFrom('swap-tokens', 'swap-lines') as fc.Arbitrary<'swap-tokens'>, at: fc.nat(), other: fc.nat() }),
  fc.record({ kind: fc.constant('number' as const), at: fc.nat(), value: numberText }),
  fc.record({ kind: fc.constant('long-line' as const), at: fc.nat(), length: fc.integer({ min: 1000, max: 20000 }) }),
  fc.record({ kind: fc.constant('deep-nesting' as const), at: fc.nat(), depth: fc.integer({ min: 10, max: 400 }), bracket: fc.constantFrom('(', '[') as fc.Arbitrary<'(' | '['> }),
);

/** Splits into tokens and the whitespace between them (joining the pieces gives the text back). */
function pieces(text: string): string[] {
  return text.match(/\s+|[A-Za-z_][A-Za-z_0-9]*|[0-9.]+(?:[eE][+-]?[0-9]+)?[ij]?|#[^\n]*|<=|./gs) ?? [];
}

export function applyMutation(text: string, change: Mutation): string {
  const isToken = (piece: string) => !/^\s+$/.test(piece);
  switch (change.kind) {
    case 'delete-line':
    case 'duplicate-line':
    case 'swap-lines': {
      const lines = text.split('\n');
      const i = change.at % lines.length;
      if (change.kind === 'delete-line') lines.splice(i, 1);
      else if (change.kind === 'duplicate-line') lines.splice(i, 0, lines[i]);
      else if (change.kind === 'swap-lines') {
        const j = change.other % lines.length;
        [lines[i], lines[j]] = [lines[j], lines[i]];
      }
      return lines.join('\n');
    }
    default: {
      const parts = pieces(text);
      const tokens = parts.map((piece, index) => (isToken(piece) ? index : -1)).filter((index) => index >= 0);
      if (tokens.length === 0) return text;
      const i = tokens[change.at % tokens.length];
      if (change.kind === 'delete-token') parts.splice(i, 1);
      else if (change.kind === 'duplicate-token') parts.splice(i, 0, parts[i], ' ');
      else if (change.kind === 'swap-tokens') {
        const j = tokens[change.other % tokens.length];
        [parts[i], parts[j]] = [parts[j], parts[i]];
      } else if (change.kind === 'number') {
        const numbers = parts.map((piece, index) => (/^[0-9.]/.test(piece) ? index : -1)).filter((index) => index >= 0);
        if (numbers.length) parts[numbers[change.at % numbers.length]] = change.value;
      } else if (change.kind === 'long-line') {
        const filler = change.at % 2 === 0 ? Array.from({ length: change.length >> 2 }, () => '1').join('+') : 'x'.repeat(change.length);
        parts.splice(i, 0, filler);
      } else if (change.kind === 'deep-nesting') {
        const close = change.bracket === '(' ? ')' : ']';
        parts.splice(i, 0, `${change.bracket.repeat(change.depth)}1${close.repeat(change.depth)}`);
      }
      return parts.join('');
    }
  }
}

export const sampleMutation = (samples: string[]): fc.Arbitrary<string> =>
  fc
    .tuple(fc.nat({ max: samples.length - 1 }), fc.array(mutation, { minLength: 1, maxLength: 5 }))
    .map(([index, changes]) => changes.reduce(applyMutation, samples[index]));

// ---------------------------------------------------------------------------------- invariants

export interface Verdict {
  threw: string | null;
  outOfRange: number;
  overBudget: boolean;
  iterations: number;
  nonConverged: number;
  silentNonConvergence: boolean;
  nonFiniteInJson: number;
  /** Numbers that were NaN before jsonSafe (written null) in K, poles, prescaler or eigenvalues without a diagnostic. */
  unexplainedNulls: string[];
  violations: string[];
}

function lineLengths(text: string): number[] {
  return text.split(/\r\n|\r|\n/).map((line) => line.length);
}

function rangeInside(range: Range, lengths: number[]): boolean {
  const inside = (p: { line: number; character: number }) =>
    Number.isInteger(p.line) && Number.isInteger(p.character) && p.line >= 0 && p.line < lengths.length && p.character >= 0 && p.character <= lengths[p.line];
  const ordered = range.start.line < range.end.line || (range.start.line === range.end.line && range.start.character <= range.end.character);
  return inside(range.start) && inside(range.end) && ordered;
}

function countNonFinite(value: unknown): number {
  if (typeof value === 'number') return Number.isFinite(value) ? 0 : 1;
  if (Array.isArray(value)) return value.reduce((sum: number, entry) => sum + countNonFinite(entry), 0);
  if (value && typeof value === 'object') return Object.values(value).reduce((sum: number, entry) => sum + countNonFinite(entry), 0);
  return 0;
}

const hasNaN = (value: unknown): boolean => {
  if (typeof value === 'number') return Number.isNaN(value);
  if (Array.isArray(value)) return value.some(hasNaN);
  if (value && typeof value === 'object') return Object.values(value).some(hasNaN);
  return false;
};

const explains = (diagnostics: Diagnostic[]) => diagnostics.some((d) => d.severity === 'error' || d.severity === 'warning');

/** Holes in the numbers a user acts on must come with a diagnostic saying why. */
function unexplainedNulls(analysis: DocumentAnalysis): string[] {
  const found: string[] = [];
  const documentError = analysis.diagnostics.some((d) => d.severity === 'error');
  analysis.plants.forEach((report, index) => {
    if (hasNaN(report.eigenvalues) && !explains(report.diagnostics) && !documentError) found.push(`plant ${index}: eigenvalue NaN`);
  });
  analysis.controllers.forEach((report, index) => {
    const controller = analysis.model.controllers[index];
    const holes: string[] = [];
    if (report.designed && (report.K === null || hasNaN(report.K))) holes.push('K');
    if (report.designed && hasNaN(report.closedLoopPoles)) holes.push('closedLoopPoles');
    if (report.designed && controller?.integral && (report.Ki === null || hasNaN(report.Ki))) holes.push('Ki');
    if (report.designed && controller?.track && (report.prescaler === null || hasNaN(report.prescaler)) && !controller.integral) holes.push('prescaler');
    if (!report.designed && report.K === null && !explains(report.diagnostics) && !documentError && controller) holes.push('K (not designed)');
    if (holes.length && !explains(report.diagnostics)) found.push(`controller ${index}: ${holes.join(', ')} missing without an error or warning`);
  });
  return found;
}

/** Runs the whole pipeline on one text and checks every invariant; never throws. */
export function checkPipeline(text: string, settings: Partial<AnalysisSettings>): Verdict {
  const verdict: Verdict = {
    threw: null,
    outOfRange: 0,
    overBudget: false,
    iterations: 0,
    nonConverged: 0,
    silentNonConvergence: false,
    nonFiniteInJson: 0,
    unexplainedNulls: [],
    violations: [],
  };
  try {
    const fast = checkText(text);
    resetIterationTally();
    const analysis = analyzeFastCheck(fast, settings);
    const tally = iterationTally();
    verdict.iterations = tally.iterations;
    verdict.nonConverged = tally.nonConverged;
    const largest = Math.max(0, ...analysis.model.plants.map((plant) => plant.states.length));
    const budget = documentIterationBudget(largest, analysis.model.plants.length + analysis.model.controllers.length);
    if (tally.iterations > budget) {
      verdict.overBudget = true;
      verdict.violations.push(`${tally.iterations} iterations over the budget ${budget}`);
    }
    // A kernel that ran out of budget must leave a trace the user sees: a warning or an error.
    const slowFindings = analysis.diagnostics.length > fast.diagnostics.length || analysis.diagnostics.some((d) => d.severity === 'error');
    if (tally.nonConverged > 0 && !slowFindings) {
      verdict.silentNonConvergence = true;
      verdict.violations.push(`non-converged kernel without a diagnostic: ${JSON.stringify(tally.nonConvergedBy)}`);
    }
    const lengths = lineLengths(text);
    for (const diagnostic of analysis.diagnostics) {
      const ranges = [diagnostic.range, ...(diagnostic.related ?? []).map((related) => related.range)];
      for (const range of ranges) {
        if (!rangeInside(range, lengths)) {
          verdict.outOfRange++;
          verdict.violations.push(`${diagnostic.code} range ${JSON.stringify(range)} outside the text`);
        }
      }
    }
    const json = documentJson([{ path: 'fuzz.plant', analysis }], 'fuzz');
    verdict.nonFiniteInJson = countNonFinite(json);
    const written = JSON.stringify(json);
    if (/\bNaN\b|\bInfinity\b/.test(written.replace(/"(?:[^"\\]|\\.)*"/g, '""'))) verdict.nonFiniteInJson++;
    if (verdict.nonFiniteInJson) verdict.violations.push(`${verdict.nonFiniteInJson} non-finite numbers in the JSON`);
    // The unsanitised record must serialise too (no cycles, no BigInt).
    fileJson('fuzz.plant', analysis);
    verdict.unexplainedNulls = unexplainedNulls(analysis);
    verdict.violations.push(...verdict.unexplainedNulls);
  } catch (error) {
    verdict.threw = error instanceof Error ? `${error.name}: ${error.message}\n${error.stack?.split('\n').slice(1, 4).join('\n')}` : String(error);
    verdict.violations.push(`threw ${verdict.threw}`);
  }
  return verdict;
}

/** Settings of the fuzz runs: a coarse simulation grid keeps each input cheap; everything else default. */
export const FUZZ_SETTINGS: Partial<AnalysisSettings> = { simulationPoints: 200 };

export interface RunFigures {
  inputs: number;
  byGenerator: Record<string, number>;
  uncaughtExceptions: number;
  overBudget: number;
  nonFiniteInJson: number;
  outOfRange: number;
  silentNonConvergence: number;
  unexplainedNulls: number;
  nonConvergedKernels: number;
  maxIterations: number;
  milliseconds: number;
  examples: { generator: string; text: string; violations: string[] }[];
}

/** Runs `count` inputs split over the three generators; seeded, so a run is repeatable. */
export function runFuzz(
  root: string,
  count: number,
  seed: number,
  onProgress?: (done: number, figures: RunFigures) => void,
  /** First input of this shard (a multiple of 100): a run split over processes gives the same inputs. */
  from = 0,
): RunFigures {
  const samples = readSamples(root);
  const generators: [string, fc.Arbitrary<string>, number][] = [
    ['token-stream', tokenStream, 0.35],
    ['random-model', randomModel, 0.35],
    ['sample-mutation', sampleMutation(samples), 0.3],
  ];
  const figures: RunFigures = {
    inputs: 0,
    byGenerator: {},
    uncaughtExceptions: 0,
    overBudget: 0,
    nonFiniteInJson: 0,
    outOfRange: 0,
    silentNonConvergence: 0,
    unexplainedNulls: 0,
    nonConvergedKernels: 0,
    maxIterations: 0,
    milliseconds: 0,
    examples: [],
  };
  const start = performance.now();
  // Rounds of 100 inputs, each split over the generators by share, so a partial run is representative.
  const round = 100;
  for (let roundStart = Math.floor(from / round) * round, roundIndex = Math.floor(from / round); roundStart < count; roundStart += round, roundIndex++) {
    const size = Math.min(round, count - roundStart);
    let used = 0;
    generators.forEach(([name, arbitrary, share], generatorIndex) => {
      const take = generatorIndex === generators.length - 1 ? size - used : Math.round(size * share);
      used += take;
      if (take <= 0) return;
      const texts = fc.sample(arbitrary, { seed: (seed * 1_000_003 + roundIndex * 7 + generatorIndex) | 0, numRuns: take });
      for (const text of texts) {
        const verdict = checkPipeline(text, FUZZ_SETTINGS);
        figures.inputs++;
        figures.byGenerator[name] = (figures.byGenerator[name] ?? 0) + 1;
        if (verdict.threw) figures.uncaughtExceptions++;
        if (verdict.overBudget) figures.overBudget++;
        if (verdict.nonFiniteInJson) figures.nonFiniteInJson++;
        if (verdict.outOfRange) figures.outOfRange++;
        if (verdict.silentNonConvergence) figures.silentNonConvergence++;
        if (verdict.unexplainedNulls.length) figures.unexplainedNulls++;
        figures.nonConvergedKernels += verdict.nonConverged;
        figures.maxIterations = Math.max(figures.maxIterations, verdict.iterations);
        if (verdict.violations.length && figures.examples.length < 20) figures.examples.push({ generator: name, text, violations: verdict.violations });
      }
    });
    figures.milliseconds = performance.now() - start;
    onProgress?.(figures.inputs, figures);
  }
  figures.milliseconds = performance.now() - start;
  return figures;
}
