// Hover and lenses render the engine's records: fed here with hand-made reports so the display
// is checked independently of the engine (values chosen by hand, not computed).
import { describe, expect, it } from 'vitest';
import { checkText } from '../../server/src/analyze';
import type { ControllerReport, PlantReport } from '../../server/src/control/design';
import { defaultSettings } from '../../server/src/control/settings';
import { codeLenses, hoverAt } from '../../server/src/ide/index';
import type { AnalysisView } from '../../server/src/ide/view';
import { cursor, HOIST } from './markers';

const plantReport = {
  name: 'hoist',
  analysed: true,
  diagnostics: [],
  eigenvalues: [{ re: 0, im: 0 }, { re: -1 / 3, im: 0 }],
  modes: [
    { value: { re: 0, im: 0 }, naturalFrequency: 0, dampingRatio: 1, timeConstant: null, stability: 'marginal' },
    { value: { re: -1 / 3, im: 0 }, naturalFrequency: 1 / 3, dampingRatio: 1, timeConstant: 3, stability: 'stable' },
  ],
  stability: 'marginal',
  controllable: true,
  observable: true,
  stabilisable: true,
  detectable: true,
  uncontrollableModes: [],
  unobservableModes: [],
  controllabilityMargin: 0.0123456,
  observabilityMargin: null,
  transferFunctions: [{ input: 'current', output: 'height', numerator: [0, 0, 0.3333333], denominator: [1, 1 / 3, 0], zeros: [], poles: [] }],
  invariantZeros: [],
} as unknown as PlantReport;

const controllerReport = {
  name: 'lift',
  plant: 'hoist',
  designed: true,
  diagnostics: [],
  method: 'poles',
  domain: 'continuous',
  samplePeriod: null,
  K: [[3.75, 0.2166667]],
  Ki: null,
  closedLoopPoles: [{ re: -4, im: 3 }, { re: -4, im: -3 }],
  trackedOutputs: ['height'],
  dcGain: [[1]],
  prescaler: [[75]],
  Nx: null,
  Nu: null,
  details: {},
  step: [
    {
      steppedOutput: 'height',
      time: [],
      outputs: [],
      inputs: [],
      metrics: {
        output: 'height',
        setpoint: 0.2,
        finalValue: 0.2,
        riseTime: 0.4261,
        settlingTime: 1.1234,
        overshootPercent: 1.52,
        undershootPercent: 0,
        steadyStateError: 0,
        peakInput: [],
      },
    },
  ],
  implementation: null,
} as unknown as ControllerReport;

function view(text: string): AnalysisView {
  return { ...checkText(text), plants: [plantReport], controllers: [controllerReport], settings: defaultSettings };
}

describe('rendering engine records', () => {
  it('shows the modes of a plant as a table with ωn, ζ, τ and the structural properties', () => {
    const { text, position } = cursor(HOIST.replace('plant hoist', 'plant ho|ist'));
    const markdown = hoverAt(view(text), position)!.markdown;
    expect(markdown).toContain('2 states, 1 input, 1 output (matrix form)');
    expect(markdown).toContain('Open loop: **marginal**');
    expect(markdown).toContain('| -0.33333 | 0.33333 | 1 | 3 | stable |');
    expect(markdown).toContain('| 0 | 0 | 1 | — | marginal |');
    expect(markdown).toContain('| controllable | yes |');
    expect(markdown).toContain('| controllability margin | 0.01235 |');
    expect(markdown).toContain('| invariant zeros | none |');
    expect(markdown).toContain('height ← current: (0.3333) / (s^2 + 0.3333 s)');
  });

  it('shows gains, prescaler, poles and step metrics of a controller', () => {
    const { text, position } = cursor(HOIST.replace('controller lift', 'controller li|ft'));
    const markdown = hoverAt(view(text), position)!.markdown;
    expect(markdown).toContain('Designed by pole placement.');
    expect(markdown).toContain('K = [3.75, 0.21667]');
    expect(markdown).toContain('N = [75]');
    expect(markdown).toContain('| -4 + 3j | 5 | 0.8 |');
    expect(markdown).toContain('rise 0.4261 s, settling 1.123 s, overshoot 1.52 %');
  });

  it('puts a verdict above the plant', () => {
    const lenses = codeLenses(view(HOIST)).filter((lens) => lens.range.start.line === 0);
    expect(lenses.map((lens) => lens.title)).toEqual(['marginal · controllable · observable']);
  });

  it('puts one lens per figure above the controller, with the ControllerRef argument', () => {
    const lenses = codeLenses(view(HOIST)).filter((lens) => lens.range.start.line !== 0);
    expect(lenses.map((lens) => lens.title)).toEqual([
      'K = [3.75, 0.2167]',
      'N = [75]',
      'poles -4 + 3j, -4 - 3j',
      'step height: rise 0.426 s, settling 1.12 s, overshoot 1.52 %',
    ]);
    expect(lenses.map((lens) => lens.command)).toEqual(['loopwright.copyGains', 'loopwright.exportGains', 'loopwright.showResponse', 'loopwright.showResponse']);
    expect(lenses.every((lens) => lens.range.start.line === 16 && JSON.stringify(lens.arguments) === '[{"controller":"lift"}]')).toBe(true);
  });

  it('says the analysis is pending when only the fast check is in', () => {
    const lenses = codeLenses(checkText(HOIST));
    expect(lenses).toEqual([{ range: { start: { line: 16, character: 0 }, end: { line: 16, character: 0 } }, title: 'Analysis in progress…', command: '', arguments: [] }]);
  });
});
