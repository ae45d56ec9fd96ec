// Hover: what the engineer wants to know about the name under the cursor, as Markdown.
// Reads the fast check and, when present for this text, the slow reports; computes nothing
// beyond display conversions (ωn = |λ|, ζ = −Re λ / |λ|, τ = −1 / Re λ for a typed pole).
import type { Position, Range } from '../../../grammar/src/ast';
import type { Complex, Rows } from '../model/types';
import type { ControllerReport, ModeReport, PlantReport } from '../control/design';
import { escapeMarkdown, formatComplex, formatNumber, formatPolynomial, formatRows, shapeOf, withUnit } from './numbers';
import { declarationAtOffset, occurrenceAtOffset, symbolIndex, type Definition } from './symbolIndex';
import { lineText, offsetAt, rangeContains, rangesOverlap } from './text';
import {
  checkedControllerIndex,
  checkedPlantIndex,
  controllerReportAt,
  pendingNote,
  plantReportAt,
  staleNote,
  type AnalysisView,
} from './view';

export interface HoverResult {
  markdown: string;
  range: Range;
}

export function hoverAt(view: AnalysisView, position: Position): HoverResult | null {
  const document = view.parse.document;
  const offset = offsetAt(view.text, position);
  const index = symbolIndex(document);
  const occurrence = occurrenceAtOffset(index, offset);
  if (occurrence) {
    const range = occurrence.range;
    if (occurrence.definition) {
      const markdown = definitionHover(view, occurrence.definition);
      return markdown ? { markdown, range } : null;
    }
    switch (occurrence.role) {
      case 'matrix': {
        const markdown = matrixHover(view, occurrence.declarationIndex, occurrence.name);
        return markdown ? { markdown, range } : null;
      }
      case 'function':
        return { markdown: FUNCTION_DOCS[occurrence.name] ?? `function \`${occurrence.name}\``, range };
      case 'unit':
        return { markdown: UNIT_DOCS[occurrence.name] ?? `unit \`${occurrence.name}\``, range };
      case 'constant':
        return { markdown: '`pi` = 3.14159…', range };
      case 'laplace':
        return { markdown: '`s`: the Laplace variable of the transfer function.', range };
      case 'spec':
        return { markdown: SPEC_DOCS[occurrence.name] ?? `\`${occurrence.name}\`: unknown specification`, range };
      case 'weight':
        return { markdown: WEIGHT_DOCS[occurrence.name] ?? `\`${occurrence.name}\``, range };
      case 'form':
        return { markdown: FORM_DOCS[occurrence.name] ?? `\`${occurrence.name}\``, range };
      default:
        return null;
    }
  }
  const pole = poleAt(view, position);
  if (pole) return pole;
  return keywordHover(view, position);
}

function definitionHover(view: AnalysisView, definition: Definition): string | null {
  switch (definition.kind) {
    case 'plant':
      return plantHover(view, definition);
    case 'controller':
      return controllerHover(view, definition);
    case 'param':
      return paramHover(view, definition);
    default:
      return signalHover(view, definition);
  }
}

/** The trailing `# comment` on a declaration's line: engineers put units and meanings there. */
function trailingComment(view: AnalysisView, line: number): string | null {
  const match = /#\s*(.*)$/.exec(lineText(view.text, line));
  return match && match[1].trim() ? match[1].trim() : null;
}

/** The errors inside a block, as the reason it was not analysed (at most three). */
function reasons(view: AnalysisView, range: Range): string {
  const errors = view.diagnostics.filter((d) => d.severity === 'error' && rangesOverlap(d.range, range));
  if (errors.length === 0) return ' (see the diagnostics).';
  const shown = errors.slice(0, 3).map((d) => `- line ${d.range.start.line + 1}: ${escapeMarkdown(d.message)}`);
  if (errors.length > 3) shown.push(`- … ${errors.length - 3} more`);
  return ':\n\n' + shown.join('\n');
}

function count(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

function stabilityWord(stability: string | null): string {
  return stability ?? '—';
}

function yesNo(value: boolean | null): string {
  return value === null ? '—' : value ? 'yes' : 'no';
}

function modesTable(modes: ModeReport[]): string {
  const lines = ['| eigenvalue | ωn (rad/s) | ζ | τ (s) | |', '|---|---|---|---|---|'];
  for (const mode of modes) {
    lines.push(
      `| ${formatComplex(mode.value)} | ${formatNumber(mode.naturalFrequency)} | ${formatNumber(mode.dampingRatio, 4)} | ${
        mode.timeConstant === null ? '—' : formatNumber(mode.timeConstant)
      } | ${mode.stability} |`,
    );
  }
  return lines.join('\n');
}

function plantHover(view: AnalysisView, definition: Definition): string {
  const plantIndex = checkedPlantIndex(view, definition);
  const plant = view.model.plants[plantIndex];
  const parts = [`**plant ${escapeMarkdown(definition.name)}**`];
  if (!plant) return parts.join('\n\n');
  const formWord = { matrix: 'matrix form', equations: 'equation form', transfer: 'transfer function' }[plant.form];
  parts[0] += ` — ${count(plant.states.length, 'state')}, ${count(plant.inputs.length, 'input')}, ${count(plant.outputs.length, 'output')} (${formWord}${
    plant.linearised ? ', linearised' : ''
  })`;
  const point = plant.operatingPoint;
  if (point) {
    const values = [
      ...plant.states.map((signal, i) => `${signal.name} = ${formatNumber(point.states[i] ?? NaN)}`),
      ...plant.inputs.map((signal, i) => `${signal.name} = ${formatNumber(point.inputs[i] ?? NaN)}`),
    ];
    parts.push(
      `Linearised about ${escapeMarkdown(values.join(', '))}` +
        (point.isEquilibrium ? ' (an equilibrium).' : ' — **not an equilibrium**' + (point.holdingInput ? `; holding input ${escapeMarkdown(point.holdingInput.map((u) => formatNumber(u)).join(', '))}.` : '.')),
    );
  }
  const report = plantReportAt(view, plantIndex);
  if (!report || !report.analysed) {
    parts.push(report ? `Not analysed${reasons(view, plant.range)}` : pendingNote(view));
    return parts.join('\n\n');
  }
  parts.push(plantReportMarkdown(report));
  return parts.join('\n\n') + staleNote(view);
}

export function plantReportMarkdown(report: PlantReport): string {
  const parts: string[] = [];
  parts.push(`Open loop: **${stabilityWord(report.stability)}**`);
  if (report.modes.length > 0) parts.push(modesTable(report.modes));
  else if (report.eigenvalues.length > 0) parts.push('Eigenvalues: ' + report.eigenvalues.map((v) => formatComplex(v)).join(', '));
  const structure = [
    '| | |',
    '|---|---|',
    `| controllable | ${yesNo(report.controllable)}${report.controllable === false ? ` (stabilisable: ${yesNo(report.stabilisable)})` : ''} |`,
    `| observable | ${yesNo(report.observable)}${report.observable === false ? ` (detectable: ${yesNo(report.detectable)})` : ''} |`,
  ];
  if (report.controllabilityMargin !== null) structure.push(`| controllability margin | ${formatNumber(report.controllabilityMargin, 4)} |`);
  if (report.observabilityMargin !== null) structure.push(`| observability margin | ${formatNumber(report.observabilityMargin, 4)} |`);
  if (report.uncontrollableModes.length > 0)
    structure.push(`| uncontrollable modes | ${report.uncontrollableModes.map((m) => formatComplex(m.value)).join(', ')} |`);
  if (report.unobservableModes.length > 0)
    structure.push(`| unobservable modes | ${report.unobservableModes.map((m) => formatComplex(m.value)).join(', ')} |`);
  if (report.invariantZeros !== null)
    structure.push(
      `| invariant zeros | ${report.invariantZeros.length === 0 ? 'none' : report.invariantZeros.map((z) => formatComplex(z)).join(', ')} |`,
    );
  parts.push(structure.join('\n'));
  const shown = report.transferFunctions.slice(0, 4);
  if (shown.length > 0) {
    const lines = shown.map(
      (tf) => `${tf.output} ← ${tf.input}: (${formatPolynomial(tf.numerator)}) / (${formatPolynomial(tf.denominator)})`,
    );
    if (report.transferFunctions.length > shown.length) lines.push(`… ${report.transferFunctions.length - shown.length} more`);
    parts.push('Transfer functions:\n```\n' + lines.join('\n') + '\n```');
  }
  return parts.join('\n\n');
}

function codeBlock(text: string): string {
  return '```plant\n' + text + '\n```';
}

function matrixHover(view: AnalysisView, declarationIndex: number, name: string): string | null {
  const declaration = view.parse.document.declarations[declarationIndex];
  if (!declaration || declaration.kind !== 'plant') return null;
  const plantIndex = checkedPlantIndex(view, { name: declaration.name.name, range: declaration.name.range });
  const plant = view.model.plants[plantIndex];
  const rows = plant ? matrixOf(plant, name) : undefined;
  const title = `**${escapeMarkdown(name)}** — ${MATRIX_ROLES[name] ?? 'not a model matrix (A, B, C, D or E)'}`;
  if (!rows) return title;
  if (!plant!.usable) return `${title}\n\nNot evaluated (the model has errors).`;
  return `${title}, ${shapeOf(rows)}\n\n${codeBlock(`${name} = ${formatRows(rows, 5, ' '.repeat(name.length + 3))}`)}`;
}

const MATRIX_ROLES: Record<string, string> = {
  A: 'state matrix',
  B: 'input matrix',
  C: 'output matrix',
  D: 'feedthrough matrix',
  E: 'disturbance input matrix',
};

function matrixOf(plant: { A: Rows; B: Rows; C: Rows; D: Rows; E: Rows }, name: string): Rows | undefined {
  switch (name) {
    case 'A':
      return plant.A;
    case 'B':
      return plant.B;
    case 'C':
      return plant.C;
    case 'D':
      return plant.D;
    case 'E':
      return plant.E;
    default:
      return undefined;
  }
}

function paramHover(view: AnalysisView, definition: Definition): string {
  const declaration = view.parse.document.declarations[definition.declarationIndex];
  const plantName = declaration?.kind === 'plant' ? declaration.name.name : undefined;
  const plant = view.model.plants.find((p) => p.name === plantName);
  const parameter = plant?.parameters.find(
    (p) => p.name === definition.name && p.range.start.line === definition.range.start.line,
  ) ?? plant?.parameters.find((p) => p.name === definition.name);
  const lines = [`**param ${escapeMarkdown(definition.name)}**${plantName ? ` of plant ${escapeMarkdown(plantName)}` : ''}`];
  if (parameter) lines.push(`= ${formatNumber(parameter.value, 6)}`);
  else lines.push('(not evaluated)');
  const comment = trailingComment(view, definition.range.start.line);
  if (comment) lines.push(escapeMarkdown(comment));
  return lines.join('\n\n');
}

const KIND_WORD: Record<string, string> = {
  state: 'state',
  input: 'input',
  output: 'output',
  disturbance: 'disturbance',
};

function signalHover(view: AnalysisView, definition: Definition): string {
  const declaration = view.parse.document.declarations[definition.declarationIndex];
  const plantName = declaration?.kind === 'plant' ? declaration.name.name : '?';
  const plant = view.model.plants.find((p) => p.name === plantName);
  const list =
    definition.kind === 'state'
      ? plant?.states
      : definition.kind === 'input'
        ? plant?.inputs
        : definition.kind === 'output'
          ? plant?.outputs
          : plant?.disturbances;
  const position = list ? list.findIndex((signal) => signal.name === definition.name) : -1;
  const symbol = { state: 'x', input: 'u', output: 'y', disturbance: 'w' }[definition.kind as 'state'] ?? '';
  const lines = [
    `**${KIND_WORD[definition.kind]} ${escapeMarkdown(definition.name)}**${position >= 0 ? ` (${symbol}${position + 1})` : ''} of plant ${escapeMarkdown(plantName)}`,
    `Declared on line ${definition.range.start.line + 1}.`,
  ];
  const point = plant?.operatingPoint;
  if (point && position >= 0) {
    const value =
      definition.kind === 'state'
        ? point.states[position]
        : definition.kind === 'input'
          ? point.inputs[position]
          : definition.kind === 'output'
            ? point.outputs[position]
            : point.disturbances[position];
    if (value !== undefined) lines.push(`Operating point: ${formatNumber(value, 6)}`);
  }
  const comment = trailingComment(view, definition.range.start.line);
  if (comment) lines.push(escapeMarkdown(comment));
  return lines.join('\n\n');
}

function polesLine(poles: Complex[], samplePeriod: number | null): string {
  const lines = ['| pole | ωn (rad/s) | ζ |', '|---|---|---|'];
  for (const pole of poles) {
    const s = samplePeriod ? zToS(pole, samplePeriod) : pole;
    const { naturalFrequency, dampingRatio } = frequencyAndDamping(s);
    lines.push(`| ${formatComplex(pole)} | ${formatNumber(naturalFrequency)} | ${formatNumber(dampingRatio, 4)} |`);
  }
  return lines.join('\n');
}

/** s = ln(z) / T (principal branch): the continuous-time equivalent of a discrete pole. */
function zToS(z: Complex, period: number): Complex {
  const magnitude = Math.hypot(z.re, z.im);
  return { re: Math.log(magnitude) / period, im: Math.atan2(z.im, z.re) / period };
}

function frequencyAndDamping(pole: Complex): { naturalFrequency: number; dampingRatio: number } {
  const naturalFrequency = Math.hypot(pole.re, pole.im);
  return { naturalFrequency, dampingRatio: naturalFrequency === 0 ? 1 : -pole.re / naturalFrequency };
}

export function controllerReportMarkdown(report: ControllerReport): string {
  const parts: string[] = [];
  const method = report.method ? ` by ${report.method === 'poles' ? 'pole placement' : report.method === 'lqr' ? 'LQR' : 'specification'}` : '';
  const domain = report.domain === 'discrete' && report.samplePeriod ? `, sampled every ${withUnit(report.samplePeriod, 's')}` : '';
  parts.push(`Designed${method}${domain}.`);
  if (report.K) parts.push(codeBlock(`K = ${formatRows(report.K, 5, '    ')}`));
  if (report.Ki) parts.push(codeBlock(`Ki = ${formatRows(report.Ki, 5, '     ')}`));
  const observerGain = observerGainOf(report);
  if (observerGain) parts.push(codeBlock(`L = ${formatRows(observerGain, 5, '    ')}`));
  if (report.prescaler) parts.push(codeBlock(`N = ${formatRows(report.prescaler, 5, '    ')}`) + (report.trackedOutputs.length ? `\nprescaler for ${report.trackedOutputs.join(', ')}` : ''));
  if (report.dcGain) parts.push(`Closed-loop DC gain: \`${formatRows(report.dcGain).replace(/\n\s*/g, ' ')}\``);
  if (report.closedLoopPoles.length > 0) {
    parts.push('Closed-loop poles' + (report.domain === 'discrete' ? ' (z-plane)' : '') + ':\n\n' + polesLine(report.closedLoopPoles, report.domain === 'discrete' ? report.samplePeriod : null));
  }
  for (const step of report.step) {
    const m = step.metrics;
    parts.push(
      `Step on ${escapeMarkdown(step.steppedOutput)} to ${formatNumber(m.setpoint)}: rise ${withUnit(m.riseTime, 's', 4)}, settling ${withUnit(
        m.settlingTime,
        's',
        4,
      )}, overshoot ${m.overshootPercent === null ? '—' : formatNumber(m.overshootPercent, 3) + ' %'}`,
    );
  }
  return parts.join('\n\n');
}

/** Observer gain, when the engine reports one under `details` (name `L` or `observerGain`). */
export function observerGainOf(report: ControllerReport): Rows | null {
  const details = report.details as Record<string, unknown>;
  const candidate = details.L ?? details.observerGain ?? (details.observer as Record<string, unknown> | undefined)?.L;
  return isRows(candidate) ? candidate : null;
}

function isRows(value: unknown): value is Rows {
  return Array.isArray(value) && value.every((row) => Array.isArray(row) && row.every((x) => typeof x === 'number'));
}

function controllerHover(view: AnalysisView, definition: Definition): string {
  const controllerIndex = checkedControllerIndex(view, definition);
  const controller = view.model.controllers[controllerIndex];
  const header = `**controller ${escapeMarkdown(definition.name)}**${controller ? ` for ${escapeMarkdown(controller.plantName)}` : ''}`;
  const report = controllerIndex >= 0 ? controllerReportAt(view, controllerIndex) : undefined;
  if (!report) return `${header}\n\n${pendingNote(view)}`;
  if (!report.designed) return `${header}\n\nNot designed${reasons(view, controller!.range)}`;
  return `${header}\n\n${controllerReportMarkdown(report)}${staleNote(view)}`;
}

/** A typed pole (in `poles`, `integral … pole`, `observer poles`): its ωn and ζ. */
function poleAt(view: AnalysisView, position: Position): HoverResult | null {
  const offset = offsetAt(view.text, position);
  const declarationIndex = declarationAtOffset(view.parse.document, offset);
  if (declarationIndex === null) return null;
  const declaration = view.parse.document.declarations[declarationIndex];
  if (declaration.kind !== 'controller') return null;
  const controller = view.model.controllers[checkedControllerIndex(view, { name: declaration.name.name, range: declaration.name.range })];
  if (!controller) return null;
  const specs = [
    controller.poles && { spec: controller.poles, what: 'closed-loop pole' },
    controller.integral?.poles && { spec: controller.integral.poles, what: 'integrator pole' },
    controller.observer?.kind === 'poles' && { spec: controller.observer.poles, what: 'observer pole' },
  ];
  for (const item of specs) {
    if (!item) continue;
    const entry = item.spec.entryRanges.findIndex((range) => rangeContains(range, position));
    if (entry < 0 || !item.spec.values[entry]) continue;
    const value = item.spec.values[entry];
    const { naturalFrequency, dampingRatio } = frequencyAndDamping(value);
    const lines = [`**${item.what}** ${formatComplex(value)}`, '| ωn (rad/s) | ζ | τ (s) |', '|---|---|---|'];
    const timeConstant = value.re === 0 ? '—' : formatNumber(-1 / value.re);
    lines.push(`| ${formatNumber(naturalFrequency)} | ${formatNumber(dampingRatio, 4)} | ${timeConstant} |`);
    return { markdown: lines[0] + '\n\n' + lines.slice(1).join('\n'), range: item.spec.entryRanges[entry] };
  }
  return null;
}

function keywordHover(view: AnalysisView, position: Position): HoverResult | null {
  const line = lineText(view.text, position.line);
  const wordPattern = /[A-Za-z_]+/g;
  let match: RegExpExecArray | null;
  while ((match = wordPattern.exec(line))) {
    const start = match.index;
    const end = start + match[0].length;
    if (position.character < start || position.character > end) continue;
    if (line.slice(0, start).includes('#')) return null;
    const doc = KEYWORD_DOCS[match[0]];
    if (!doc) return null;
    return {
      markdown: doc,
      range: { start: { line: position.line, character: start }, end: { line: position.line, character: end } },
    };
  }
  return null;
}

export const FUNCTION_DOCS: Record<string, string> = {
  sin: '`sin(x)`: sine (radians)',
  cos: '`cos(x)`: cosine (radians)',
  tan: '`tan(x)`: tangent (radians)',
  exp: '`exp(x)`: natural exponential',
  log: '`log(x)`: natural logarithm',
  sqrt: '`sqrt(x)`: square root',
  tanh: '`tanh(x)`: hyperbolic tangent',
  abs: '`abs(x)`: absolute value',
  diag: '`diag(a, b, …)`: square matrix with a, b, … on the diagonal',
  identity: '`identity(n)`: n×n identity matrix',
  zeros: '`zeros(rows, cols)`: matrix of zeros',
};

const UNIT_DOCS: Record<string, string> = {
  s: 'unit: seconds',
  ms: 'unit: milliseconds (10⁻³ s)',
  us: 'unit: microseconds (10⁻⁶ s)',
  ns: 'unit: nanoseconds (10⁻⁹ s)',
  min: 'unit: minutes (60 s)',
  Hz: 'unit: hertz; `sample 200 Hz` is a period of 5 ms',
  kHz: 'unit: kilohertz',
  '%': 'unit: percent',
};

const SPEC_DOCS: Record<string, string> = {
  settling: '`settling`: 2 % settling time of the step response (seconds)',
  overshoot: '`overshoot`: largest overshoot of the step response (percent)',
  rise: '`rise`: 10–90 % rise time of the step response (seconds)',
};

const WEIGHT_DOCS: Record<string, string> = {
  Q: '`Q`: LQR state weight (n×n, symmetric positive semidefinite)',
  R: '`R`: LQR input weight (m×m, symmetric positive definite)',
  N: '`N`: LQR state–input cross weight (n×m)',
  W: '`W`: process noise covariance for the observer',
  V: '`V`: measurement noise covariance for the observer',
};

const FORM_DOCS: Record<string, string> = {
  current: '`current`: discrete estimator that uses the current measurement',
  predictor: '`predictor`: discrete estimator that predicts from the previous measurement (default)',
};

const KEYWORD_DOCS: Record<string, string> = {
  plant: '`plant name { … }`: a linear(ised) plant model',
  controller: '`controller name for plant { … }`: a state-feedback design for a plant',
  param: '`param name = value`: a named constant (may use other params)',
  states: '`states x1, x2, …`: the state variables',
  inputs: '`inputs u1, …`: the manipulated inputs',
  outputs: '`outputs y1, …`: the measured or controlled outputs',
  disturbances: '`disturbances w1, …`: disturbance inputs (matrix `E`)',
  output: '`output y = expression`: defines an output in equation form',
  transfer: '`transfer = num(s) / den(s)`: a SISO plant as a transfer function',
  around: '`around x = value, u = value`: the operating point for linearisation',
  poles: '`poles = [...]`: desired closed-loop poles (one per state, conjugate pairs complete)',
  pole: '`pole p`: integrator pole(s)',
  lqr: '`lqr Q = ..., R = ...`: optimal state feedback by the algebraic Riccati equation',
  spec: '`spec settling <= t, overshoot <= p %`: poles chosen from time-domain specifications',
  track: '`track y`: reference prescaler so the output settles at the set-point',
  integral: '`integral y [pole p]`: integral action on an output (zero steady-state error)',
  observer: '`observer poles = [...]` or `observer noise W = ..., V = ...`: a state estimator',
  noise: '`noise W = ..., V = ...`: noise covariances for a steady-state Kalman filter',
  sample: '`sample 5 ms` / `sample 200 Hz`: discrete-time design with this sample period',
  delay: '`delay n sample`: computation delay of whole sample periods',
  limit: '`limit u in [lo, hi]`: actuator limits for the step response',
  step: '`step y to value`: the set-point step simulated for the metrics',
};

