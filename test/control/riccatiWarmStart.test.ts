// The editor's warm start of LQR designs (analyze.ts `riccatiStarts`): a document version starts
// its Riccati solve from the previous version's solution. The route changes, not the result: the
// verdicts equal a fresh analysis, the gains agree to the solver's accuracy, and the gain itself is
// checked against SciPy's solve_continuous_are on the same plant (SciPy 1.17.1, Python 3).
import { describe, expect, it } from 'vitest';
import { analyzeFastCheck, checkText, WARM_START_FROM_STATES } from '../../server/src/analyze';
import type { Rows } from '../../server/src/model/types';
import type { RiccatiStart } from '../../server/src/control/lqr';
import { packRiccatiStart, runSlowAnalysis, unpackRiccatiStart } from '../../server/src/lsp/slowAnalysis';
import { heatedRodModel as rodModel } from './heatedRod';

const lqrDetails = (analysis: ReturnType<typeof analyzeFastCheck>) => analysis.controllers[0].details.lqr as { warmStarted: boolean; conditionEstimate: number };
const relativeGap = (a: Rows, b: Rows) => Math.max(...a[0].map((value, j) => Math.abs(value - b[0][j]))) / Math.max(...b[0].map(Math.abs));

describe('warm-started LQR designs between document versions', () => {
  it('the next version starts from the kept solution; verdicts equal a fresh analysis and gains agree to the solver accuracy', () => {
    const n = WARM_START_FROM_STATES;
    const starts = new Map<string, RiccatiStart>();
    const first = analyzeFastCheck(checkText(rodModel(n, '0.5')), {}, { riccatiStarts: starts });
    expect(lqrDetails(first).warmStarted).toBe(false);
    expect(starts.get('warm')?.X).toHaveLength(n);

    const nudged = rodModel(n, '0.5001');
    const warm = analyzeFastCheck(checkText(nudged), {}, { riccatiStarts: starts });
    const fresh = analyzeFastCheck(checkText(nudged));
    expect(lqrDetails(warm).warmStarted).toBe(true);
    expect(lqrDetails(fresh).warmStarted).toBe(false);
    expect(warm.diagnostics.map((d) => `${d.code} ${d.message}`)).toEqual(fresh.diagnostics.map((d) => `${d.code} ${d.message}`));
    // Both solutions meet the residual target n·ε; their gap is bounded by the condition of the
    // equation (about 10⁵ here) times that target.
    expect(relativeGap(warm.controllers[0].K!, fresh.controllers[0].K!)).toBeLessThan(1e5 * n * Number.EPSILON);
    expect(relativeGap(warm.controllers[0].prescaler!, fresh.controllers[0].prescaler!)).toBeLessThan(1e5 * n * Number.EPSILON);
  });

  it('a large edit falls back to the fresh solve, with the same gains bit for bit', () => {
    const n = WARM_START_FROM_STATES;
    const starts = new Map<string, RiccatiStart>();
    analyzeFastCheck(checkText(rodModel(n, '0.5')), {}, { riccatiStarts: starts });
    // Twenty times the conduction: the old gain is far outside Newton's quadratic phase.
    const changed = rodModel(n, '10');
    const warm = analyzeFastCheck(checkText(changed), {}, { riccatiStarts: starts });
    expect(lqrDetails(warm).warmStarted).toBe(false);
    expect(warm.controllers[0].K).toEqual(analyzeFastCheck(checkText(changed)).controllers[0].K);
  });

  it('a Kalman estimator starts from its previous solution too; its gain matches SciPy', () => {
    const n = WARM_START_FROM_STATES;
    const starts = new Map<string, RiccatiStart>();
    analyzeFastCheck(checkText(rodModel(n, '0.5', true)), {}, { riccatiStarts: starts });
    expect([...starts.keys()].sort()).toEqual(['warm', 'warm estimator']);
    const nudged = rodModel(n, '0.5001', true);
    const warm = analyzeFastCheck(checkText(nudged), {}, { riccatiStarts: starts });
    const fresh = analyzeFastCheck(checkText(nudged));
    const observer = (analysis: typeof warm) => analysis.controllers[0].details.observer as { warmStarted: boolean; L: Rows };
    expect(observer(warm).warmStarted).toBe(true);
    expect(observer(fresh).warmStarted).toBe(false);
    expect(warm.diagnostics.map((d) => `${d.code} ${d.message}`)).toEqual(fresh.diagnostics.map((d) => `${d.code} ${d.message}`));
    const column = (L: Rows) => [L.map((row) => row[0])];
    expect(relativeGap(column(observer(warm).L), column(observer(fresh).L))).toBeLessThan(1e5 * n * Number.EPSILON);
    for (const [index, value] of SCIPY_ROD40_KALMAN_GAIN) expect(Math.abs(observer(warm).L[index][0] - value)).toBeLessThan(1e-9 * Math.max(1, Math.abs(value)));
  });

  it('plants below WARM_START_FROM_STATES states neither use nor fill the store', () => {
    const starts = new Map<string, RiccatiStart>();
    analyzeFastCheck(checkText(rodModel(WARM_START_FROM_STATES - 1, '0.5')), {}, { riccatiStarts: starts });
    expect(starts.size).toBe(0);
  });

  it('the warm-started gain (chord steps on the previous version\'s basis) matches SciPy on the 40-segment rod', () => {
    const starts = new Map<string, RiccatiStart>();
    analyzeFastCheck(checkText(rodModel(40, '0.5')), {}, { riccatiStarts: starts });
    // A version between: its Newton step leaves a chord basis, which the last version's solve uses.
    analyzeFastCheck(checkText(rodModel(40, '0.50005')), {}, { riccatiStarts: starts });
    expect(starts.get('warm')?.chordBasis?.schur.T.rows).toBe(40);
    const warm = analyzeFastCheck(checkText(rodModel(40, '0.5001')), {}, { riccatiStarts: starts });
    expect(lqrDetails(warm).warmStarted).toBe(true);
    const K = warm.controllers[0].K![0];
    const reference = SCIPY_ROD40_GAIN;
    for (const [index, value] of reference) expect(Math.abs(K[index] - value)).toBeLessThan(1e-9 * Math.max(1, Math.abs(value)));
  });
});

describe('warm starts crossing threads (lsp/slowAnalysis.ts packs X into one Float64Array)', () => {
  it('the packed start survives structured clone bit for bit, and the next version warm-starts from it exactly as in one thread', () => {
    const n = WARM_START_FROM_STATES;
    const first = runSlowAnalysis(rodModel(n, '0.5'), {});
    const packed = first.riccatiStarts.get('warm')!;
    expect(packed.X).toBeInstanceOf(Float64Array);
    const crossed = structuredClone(first.riccatiStarts); // to the main thread and back with the next job
    const unpacked = unpackRiccatiStart(crossed.get('warm')!)!;
    const direct = new Map<string, RiccatiStart>();
    analyzeFastCheck(checkText(rodModel(n, '0.5')), {}, { riccatiStarts: direct });
    // The same doubles as the solver's own X (Object.is also tells −0 from +0).
    direct.get('warm')!.X.forEach((row, i) => row.forEach((value, j) => expect(Object.is(unpacked.X[i][j], value)).toBe(true)));
    const nudged = rodModel(n, '0.5001');
    const acrossThreads = runSlowAnalysis(nudged, {}, { riccatiStarts: crossed });
    const inOneThread = analyzeFastCheck(checkText(nudged), {}, { riccatiStarts: direct });
    expect(lqrDetails({ controllers: acrossThreads.controllers } as ReturnType<typeof analyzeFastCheck>).warmStarted).toBe(true);
    expect(acrossThreads.controllers[0].K).toEqual(inOneThread.controllers[0].K);
  });

  it('a malformed start is dropped (the design starts afresh) instead of failing', () => {
    expect(unpackRiccatiStart({ order: 3, X: new Float64Array(8) })).toBeUndefined();
    expect(unpackRiccatiStart({ order: 2, X: [1, 0, 0, 1] as unknown as Float64Array })).toBeUndefined();
    expect(unpackRiccatiStart(packRiccatiStart({ X: [[2, 1], [1, 3]] }))).toEqual({ X: [[2, 1], [1, 3]] });
  });
});

// scipy.linalg.solve_continuous_are(A, B, np.eye(40), np.eye(1)) for the rod with k = 0.5001,
// h = 0.05, K = Bᵀ·X (SciPy 1.17.1): the first, middle and last entries, as [index, value].
const SCIPY_ROD40_GAIN: [number, number][] = [
  [0, 0.776912706835745],
  [19, 0.09046974676650446],
  [39, 0.027255179776031806],
];

// P = scipy.linalg.solve_continuous_are(A.T, C.T, np.eye(40), 0.01*np.eye(1)), L = P·Cᵀ/0.01 for the
// same rod (k = 0.5001, h = 0.05; SciPy 1.17.1): first, middle and last entries, as [index, value].
const SCIPY_ROD40_KALMAN_GAIN: [number, number][] = [
  [0, 0.27245138900507204],
  [19, 0.863888659662939],
  [39, 9.656687493442613],
];
