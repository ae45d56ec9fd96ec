import { describe, expect, it } from 'vitest';
import { loopMargins, outputFeedbackLoop, stateFeedbackLoop } from '../../server/src/control/margins';
import { bandwidth, frequencyResponse, logarithmicGrid } from '../../server/src/control/frequencyResponse';
import { poleSetDistance } from './controlTestHelpers';
import { combinedClosedLoop, observerController } from '../../server/src/control/combinedClosedLoop';
import { eigenvaluesOf, multiplyRows } from '../../server/src/control/controlLinearAlgebra';
import { solveLinear } from '../../server/src/numeric';

// L(s) = 1/(s(s+1)) realised as K(sI − A)⁻¹B with A = [[0, 1], [0, −1]], B = [0; 1], K = [1 0].
const integratorLag = stateFeedbackLoop([[0, 1], [0, -1]], [[0], [1]], [[1, 0]]);

describe('loop margins against closed forms', () => {
  it('L(s) = 1/(s(s+1)): crossover, phase margin, delay margin, no finite gain margin', () => {
    // |L(jω)| = 1 ⇔ ω⁴ + ω² − 1 = 0 ⇔ ω_c² = (√5 − 1)/2, ω_c = 0.78615 rad/s;
    // ∠L = −90° − atan(ω_c) ⇒ PM = 90° − atan(ω_c) = 51.83°; delay margin PM[rad]/ω_c = 1.1507 s.
    const wc = Math.sqrt((Math.sqrt(5) - 1) / 2);
    const pm = 90 - (Math.atan(wc) * 180) / Math.PI;
    const result = loopMargins(integratorLag, 'continuous');
    const loop = result.perInput[0];
    expect(result.closedLoopStable).toBe(true);
    expect(loop.gainCrossover as number).toBeCloseTo(wc, 10);
    expect(wc).toBeCloseTo(0.786, 3);
    expect(loop.phaseMarginDeg as number).toBeCloseTo(pm, 8);
    expect(pm).toBeCloseTo(51.83, 2);
    expect(loop.delayMargin as number).toBeCloseTo(((pm * Math.PI) / 180) / wc, 8);
    expect(loop.upperGainMarginDb).toBe(Infinity);
    expect(loop.lowerGainMarginDb).toBe(-Infinity);
  });

  it('L(s) = 1/(s(s+1)): peak sensitivity equals the maximum of the closed form |s(s+1)/(s² + s + 1)|', () => {
    // Brute force on the closed form, independent of the state-space evaluation.
    let peak = 0;
    for (let k = 0; k <= 400000; k++) {
      const w = 1e-3 * Math.pow(10, (5 * k) / 400000);
      const numerator = Math.hypot(-w * w, w);
      const denominator = Math.hypot(1 - w * w, w);
      peak = Math.max(peak, numerator / denominator);
    }
    const loop = loopMargins(integratorLag, 'continuous').perInput[0];
    expect(loop.peakSensitivity).toBeCloseTo(peak, 6);
  });

  it('L(s) = 2/(s+1)³: phase crossover at ω = √3 with gain margin 20·log10(4) = 12.04 dB', () => {
    // ∠L = −3 atan ω = −180° at ω = √3, |L| = 2/(1 + 3)^{3/2} = 1/4.
    // Controllable companion realisation of 1/(s+1)³ with gain 2 in K.
    const A = [[0, 1, 0], [0, 0, 1], [-1, -3, -3]];
    const result = loopMargins(stateFeedbackLoop(A, [[0], [0], [1]], [[2, 0, 0]]), 'continuous');
    const loop = result.perInput[0];
    expect(loop.upperGainMarginDb).toBeCloseTo(20 * Math.log10(4), 8);
    expect(loop.upperGainCrossover as number).toBeCloseTo(Math.sqrt(3), 8);
  });

  it('L(s) = 2/(s − 1): open-loop unstable, lower gain margin 1/2 (−6.02 dB) at ω = 0', () => {
    // 1 + kL has the root s = 1 − 2k: stable exactly for k > 1/2.
    const result = loopMargins(stateFeedbackLoop([[1]], [[1]], [[2]]), 'continuous');
    const loop = result.perInput[0];
    expect(result.closedLoopStable).toBe(true);
    expect(loop.lowerGainMarginDb).toBeCloseTo(20 * Math.log10(0.5), 10);
    expect(loop.lowerGainCrossover).toBe(0);
    expect(loop.upperGainMarginDb).toBe(Infinity);
  });

  it('discrete L(z) = 0.5/(z − 1): PM = 90° − θ_c/2 with θ_c = 2 asin(1/4), gain margin 4 at Nyquist', () => {
    // e^{jθ} − 1 = 2j sin(θ/2) e^{jθ/2}: |L| = 0.25/sin(θ/2), ∠L = −90° − θ/2; L(−1) = −1/4.
    const T = 0.1;
    const thetaC = 2 * Math.asin(0.25);
    const result = loopMargins(stateFeedbackLoop([[1]], [[1]], [[0.5]]), 'discrete', T);
    const loop = result.perInput[0];
    expect(loop.phaseMarginDeg as number).toBeCloseTo(90 - (thetaC * 90) / Math.PI, 8);
    expect(loop.gainCrossover as number).toBeCloseTo(thetaC / T, 8);
    expect(loop.upperGainMarginDb).toBeCloseTo(20 * Math.log10(4), 8);
    expect(loop.upperGainCrossover as number).toBeCloseTo(Math.PI / T, 10);
  });

  it('gives each of two decoupled inputs the margins of its own loop', () => {
    const A = [[0, 1, 0, 0], [0, -1, 0, 0], [0, 0, 0, 1], [0, 0, 0, -1]];
    const B = [[0, 0], [1, 0], [0, 0], [0, 1]];
    const K = [[1, 0, 0, 0], [0, 0, 1, 0]];
    const result = loopMargins(stateFeedbackLoop(A, B, K), 'continuous');
    const single = loopMargins(integratorLag, 'continuous').perInput[0];
    for (const loop of result.perInput) expect(loop.phaseMarginDeg as number).toBeCloseTo(single.phaseMarginDeg as number, 8);
  });

  it('breaks an output-feedback loop at the plant input: a static controller u = −y equals state feedback K = C', () => {
    const plant = { A: [[0, 1], [0, -1]], B: [[0], [1]], C: [[1, 0]], D: [[0]] };
    const controller = { A: [] as number[][], B: [] as number[][], C: [[]] as number[][], D: [[-1]] };
    const loop = outputFeedbackLoop(plant, controller);
    const viaOutput = loopMargins(loop, 'continuous').perInput[0];
    const viaState = loopMargins(integratorLag, 'continuous').perInput[0];
    expect(viaOutput.phaseMarginDeg as number).toBeCloseTo(viaState.phaseMarginDeg as number, 8);
  });
});

describe('frequency response', () => {
  it('returns the magnitude and unwrapped phase of 1/(s+1)³ (−270° at high frequency)', () => {
    const A = [[0, 1, 0], [0, 0, 1], [-1, -3, -3]];
    const omegas = logarithmicGrid(0.01, 100, 20);
    const response = frequencyResponse(A, [[0], [0], [1]], [[1, 0, 0]], [[0]], omegas, 'continuous');
    const channel = response.channels[0];
    omegas.forEach((w, k) => {
      // Closed form: |G| = (1 + ω²)^{−3/2}, ∠G = −3 atan ω.
      expect(channel.magnitudeDb[k]).toBeCloseTo(-30 * Math.log10(1 + w * w), 9);
      expect(channel.phaseDeg[k]).toBeCloseTo((-3 * Math.atan(w) * 180) / Math.PI, 8);
    });
  });

  it('finds the −3 dB bandwidth of 1/(s+1) at 1 rad/s', () => {
    const omegas = logarithmicGrid(0.01, 100, 20);
    expect(bandwidth([[-1]], [[1]], [[1]], [[0]], omegas, 'continuous') as number).toBeCloseTo(1, 8);
  });
});

describe('margins with an observer in the loop', () => {
  it('closes the output-feedback loop at the poles of the composite plant + observer (separation)', async () => {
    const { combinedClosedLoop } = await import('../../server/src/control/combinedClosedLoop');
    const { eigenvaluesOf } = await import('../../server/src/control/controlLinearAlgebra');
    const plant = { A: [[0, 1], [3, -0.5]], B: [[0], [2]], C: [[1, 0]], D: [[0]] };
    const K = [[6, 2]];
    const L = [[20], [150]];
    const loop = combinedClosedLoop(plant.A, plant.B, plant.C, plant.D, K, L, 'continuous');
    const open = outputFeedbackLoop(plant, loop.controller);
    // Closed by v = −L v: A_L − B_L C_L (D_L = 0 here).
    const closed = open.A.map((row, i) => row.map((v, j) => v - open.B[i].reduce((sum, b, k) => sum + b * open.C[k][j], 0)));
    const expected = [...loop.controllerPoles, ...loop.observerPoles];
    expect(poleSetDistance(eigenvaluesOf(closed), expected)).toBeLessThan(1e-9 * 150);
    const margins = loopMargins(open, 'continuous');
    expect(margins.closedLoopStable).toBe(true);
    expect(margins.perInput[0].phaseMarginDeg).not.toBeNull();
  });
});

describe('margins with an observer and integral action in the loop', () => {
  // Separation principle (any textbook on state feedback, e.g. Franklin, Powell & Workman,
  // "Digital Control of Dynamic Systems", ch. 8): plant + estimator + integrators closed through
  // the controller have the poles of A_aug − B_aug·[Kx Ki] together with the estimator's error
  // poles (A − LC, or Φ − ΦMC for the current estimator) — for any gains, so arbitrary ones here.
  const plant = { A: [[0, 1, 0], [-2, -0.3, 1], [0, 0, -4]], B: [[0, 0], [0, 1], [3, 0.5]], C: [[1, 0, 0], [0, 0, 1]], D: [[0, 0], [0.2, 0]] };
  const Kx = [[1.5, 0.4, 0.2], [-0.3, 2.1, 0.7]];
  const Ki = [[-0.8], [0.35]];
  const L = [[2, 0.1], [5, -0.4], [0.3, 3]];
  const integrated = [0];
  const closedMatrix = (loop: { A: number[][]; B: number[][]; C: number[][]; D: number[][] }): number[][] => {
    // v = −L v with feedthrough: A_L − B_L (I + D_L)⁻¹ C_L.
    const m = loop.D.length;
    const IplusD = loop.D.map((row, i) => row.map((v, j) => v + (i === j ? 1 : 0)));
    const gain = solveLinear(IplusD, loop.C).X;
    return loop.A.map((row, i) => row.map((v, j) => v - Array.from({ length: m }, (_, k) => loop.B[i][k] * gain[k][j]).reduce((a, b) => a + b, 0)));
  };
  const augmented = (T: number | null) => {
    // ξ' = −y_I (continuous) or ξ[k+1] = ξ[k] − T·y_I[k], y_I = C_I x + D_I u.
    const step = T ?? 1;
    const A = [...plant.A.map((row) => [...row, 0]), [...plant.C[0].map((v) => -step * v), T === null ? 0 : 1]];
    const B = [...plant.B, plant.D[0].map((v) => -step * v)];
    const K = Kx.map((row, i) => [...row, ...Ki[i]]);
    return A.map((row, i) => row.map((v, j) => v - B[i].reduce((sum, b, k) => sum + b * K[k][j], 0)));
  };
  const LC = multiplyRows(L, plant.C);

  it('continuous predictor estimator: loop poles = eig(A_aug − B_aug K) ∪ eig(A − LC)', () => {
    const controller = observerController(plant, Kx, L, 'continuous', 'predictor', { Ki, outputs: integrated });
    const loop = outputFeedbackLoop(plant, controller);
    const expected = [...eigenvaluesOf(augmented(null)), ...eigenvaluesOf(plant.A.map((row, i) => row.map((v, j) => v - LC[i][j])))];
    expect(poleSetDistance(eigenvaluesOf(closedMatrix(loop)), expected)).toBeLessThan(1e-9 * 10);
  });

  it('discrete current estimator: loop poles = eig(Φ_aug − Γ_aug K) ∪ eig(Φ − ΦMC)', () => {
    const T = 0.05;
    const controller = observerController(plant, Kx, L, 'discrete', 'current', { Ki, outputs: integrated }, T);
    const loop = outputFeedbackLoop(plant, controller);
    const PhiMC = multiplyRows(plant.A, LC);
    const expected = [...eigenvaluesOf(augmented(T)), ...eigenvaluesOf(plant.A.map((row, i) => row.map((v, j) => v - PhiMC[i][j])))];
    expect(poleSetDistance(eigenvaluesOf(closedMatrix(loop)), expected)).toBeLessThan(1e-9 * 10);
  });

  it('without integrators equals the controller of the combined closed loop', () => {
    for (const [domain, form] of [['continuous', 'predictor'], ['discrete', 'predictor'], ['discrete', 'current']] as const) {
      const combined = combinedClosedLoop(plant.A, plant.B, plant.C, plant.D, Kx, L, domain, form);
      const closed = eigenvaluesOf(closedMatrix(outputFeedbackLoop(plant, combined.controller)));
      expect(poleSetDistance(closed, combined.combinedPoles)).toBeLessThan(1e-9 * 10);
    }
  });
});

describe('frequency evaluation', () => {
  it.each(['schur', 'hessenberg', 'modal'] as const)(
    'the %s route agrees with NumPy (LAPACK zgesv) on C(jωI − A)⁻¹B + D, including beside a ζ = 0.01 resonance',
    async (route) => {
      const { schurTransferEvaluator, hessenbergTransferEvaluator } = await import('../../server/src/control/frequencyResponse');
      const { reference } = await import('./controlTestHelpers');
      // The modal route is forced on at every size (modalFromStates 0); the Schur route kept off.
      const build =
        route === 'hessenberg'
          ? hessenbergTransferEvaluator
          : (A: number[][], B: number[][], C: number[][], D: number[][]) => schurTransferEvaluator(A, B, C, D, undefined, route === 'modal' ? 0 : Infinity);
      expect(reference.frequencyResponse.length).toBe(4);
      for (const c of reference.frequencyResponse) {
        const evaluate = build(c.A, c.B, c.C, c.D)!;
        // The random A of the fixture are far from defective: each route is the one asked for.
        expect(evaluate.route).toBe(route);
        c.omegas.forEach((omega, k) => {
          const { value, singular } = evaluate({ re: 0, im: omega });
          expect(singular).toBe(false);
          const expected = c.G[k];
          let size = 0;
          for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) size = Math.max(size, Math.hypot(expected.re[i][j], expected.im[i][j]));
          for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) {
            // Both solves are backward stable: agreement to a modest multiple of n·ε relative to
            // the largest entry, times ‖(jωI − A)⁻¹‖-driven growth near the resonance (ω = 4.99).
            const tolerance = (omega === 4.99 && c.n === 8 ? 1e4 : 1e3) * c.n * Number.EPSILON * size;
            expect(Math.hypot(value.re[i][j] - expected.re[i][j], value.im[i][j] - expected.im[i][j])).toBeLessThan(tolerance);
          }
        });
      }
    },
  );

  it('evaluating many points at once (four per pass) gives exactly the one-point values and flags, on the NumPy fixture', async () => {
    const { schurTransferEvaluator } = await import('../../server/src/control/frequencyResponse');
    const { reference } = await import('./controlTestHelpers');
    for (const c of reference.frequencyResponse) {
      const evaluate = schurTransferEvaluator(c.A, c.B, c.C, c.D)!;
      // Seven points: one full batch and a short one; one of them on the imaginary axis pole-free,
      // one off the axis (discrete-style points are complex too).
      const points = [...c.omegas.map((omega) => ({ re: 0, im: omega })), { re: -0.3, im: 2 }, { re: 0.5, im: -1 }].slice(0, 7);
      const together = evaluate.many!(points);
      expect(together).toHaveLength(points.length);
      points.forEach((point, k) => expect(together[k]).toEqual(evaluate(point)));
    }
    // A point on an eigenvalue inside a batch is flagged there alone.
    const A = [[-1, 0, 0], [0, 0, 5], [0, -5, 0]];
    const evaluate = schurTransferEvaluator(A, [[1], [1], [1]], [[1, 1, 1]], [[0]])!;
    expect(evaluate.many!([{ re: 0, im: 4 }, { re: 0, im: 5 }, { re: 0, im: 6 }, { re: -1, im: 0 }, { re: 0, im: 1 }]).map((r) => r.singular)).toEqual([false, true, false, true, false]);
  });

  it('flags an evaluation point on an eigenvalue as singular (Schur route, real and complex blocks)', async () => {
    const { schurTransferEvaluator } = await import('../../server/src/control/frequencyResponse');
    // Poles at −1 and ±5j.
    const A = [[-1, 0, 0], [0, 0, 5], [0, -5, 0]];
    const evaluate = schurTransferEvaluator(A, [[1], [1], [1]], [[1, 1, 1]], [[0]])!;
    expect(evaluate({ re: 0, im: 5 }).singular).toBe(true);
    expect(evaluate({ re: -1, im: 0 }).singular).toBe(true);
    expect(evaluate({ re: 0, im: 4 }).singular).toBe(false);
  });

  it('agrees with a dense complex LU solve of (jωI − A) X = B', async () => {
    const { transferEvaluator } = await import('../../server/src/control/frequencyResponse');
    const { solveComplexLinear } = await import('../../server/src/numeric');
    const { reference } = await import('./controlTestHelpers');
    for (const c of reference.zeroOrderHold) {
      const C = [c.A[0].map((_, j) => Math.cos(j + 1)), c.A[0].map((_, j) => Math.sin(j + 1))];
      const D = [new Array(c.m).fill(0.5), new Array(c.m).fill(0)];
      const evaluate = transferEvaluator(c.A, c.B, C, D);
      for (const omega of [0.1, 1, 7]) {
        const dense = solveComplexLinear(
          { re: c.A.map((row) => row.map((v) => -v)), im: c.A.map((row, i) => row.map((_, j) => (i === j ? omega : 0))) },
          { re: c.B, im: c.B.map((row) => row.map(() => 0)) },
        );
        const fast = evaluate({ re: 0, im: omega }).value;
        for (let i = 0; i < 2; i++) for (let j = 0; j < c.m; j++) {
          let re = D[i][j];
          let im = 0;
          for (let k = 0; k < c.n; k++) {
            re += C[i][k] * dense.X.re[k][j];
            im += C[i][k] * dense.X.im[k][j];
          }
          const size = Math.max(1, Math.hypot(re, im));
          expect(Math.hypot(fast.re[i][j] - re, fast.im[i][j] - im)).toBeLessThan(1e3 * c.n * Number.EPSILON * size / Math.max(dense.rcond, Number.EPSILON));
        }
      }
    }
  });
});

describe('modal evaluation (models of MODAL_FROM_STATES states and more)', () => {
  it('is taken by default from MODAL_FROM_STATES states on, and many points at once equal one at a time', async () => {
    const { schurTransferEvaluator, MODAL_FROM_STATES } = await import('../../server/src/control/frequencyResponse');
    const { reference } = await import('./controlTestHelpers');
    const large = reference.frequencyResponse.find((c) => c.n === 60)!;
    const small = reference.frequencyResponse.find((c) => c.n === 20)!;
    expect(small.n).toBeLessThan(MODAL_FROM_STATES);
    expect(schurTransferEvaluator(small.A, small.B, small.C, small.D)!.route).toBe('schur');
    const evaluate = schurTransferEvaluator(large.A, large.B, large.C, large.D)!;
    expect(evaluate.route).toBe('modal');
    const points = [...large.omegas.map((omega) => ({ re: 0, im: omega })), { re: -0.3, im: 2 }];
    evaluate.many!(points).forEach((result, k) => expect(result).toEqual(evaluate(points[k])));
  });

  it('a nearly defective A (a Jordan chain split by 1e-9) is not summed modally: values still match a dense solve', async () => {
    const { schurTransferEvaluator } = await import('../../server/src/control/frequencyResponse');
    const { solveComplexLinear } = await import('../../server/src/numeric');
    // 30 states: a 6-long Jordan chain at −1 (eigenvalues split by 1e-9 on the diagonal, so the
    // eigenvector matrix is ill-conditioned far beyond 1/(n·ε)), plus stable distinct modes.
    const n = 30;
    const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => {
      if (i < 6) return j === i ? -1 - 1e-9 * i : j === i + 1 && i < 5 ? 1 : 0;
      return j === i ? -0.5 - i / 10 : j === i + 1 ? 0.3 : 0;
    }));
    const B = A.map((_, i) => [1 / (1 + i)]);
    const C = [A.map((_, j) => Math.cos(j))];
    const evaluate = schurTransferEvaluator(A, B, C, [[0]], undefined, 0)!;
    for (const omega of [0.01, 0.9, 3]) {
      const dense = solveComplexLinear(
        { re: A.map((row) => row.map((v) => -v)), im: A.map((row, i) => row.map((_, j) => (i === j ? omega : 0))) },
        { re: B, im: B.map(() => [0]) },
      );
      let re = 0;
      let im = 0;
      for (let k = 0; k < n; k++) {
        re += C[0][k] * dense.X.re[k][0];
        im += C[0][k] * dense.X.im[k][0];
      }
      const { value } = evaluate({ re: 0, im: omega });
      expect(Math.hypot(value.re[0][0] - re, value.im[0][0] - im)).toBeLessThan(1e4 * n * Number.EPSILON * Math.max(1, Math.hypot(re, im)));
    }
    expect(evaluate.route).toBe('schur');
  });
});

describe('plotted open-loop response of a design', () => {
  // A three-state chain with a closed form: L(s) = K(sI − A)⁻¹B for A = [0 1 0; 0 0 1; 0 −a −b],
  // B = [0; 0; 1] is (k₁ + k₂s + k₃s²)/(s³ + bs² + as) (controllable canonical form).
  const design = (poles: string) => `plant chain {
  states x1, x2, x3
  inputs u
  outputs y
  A = [0, 1, 0; 0, 0, 1; 0, -2, -3]
  B = [0; 0; 1]
  C = [1, 0, 0]
}

controller hold for chain {
  poles = [${poles}]
  track y
}
`;
  const closedForm = (K: number[], omega: number) => {
    const s = { re: 0, im: omega };
    const mul = (p: { re: number; im: number }, q: { re: number; im: number }) => ({ re: p.re * q.re - p.im * q.im, im: p.re * q.im + p.im * q.re });
    const s2 = mul(s, s);
    const s3 = mul(s2, s);
    const numerator = { re: K[0] + K[2] * s2.re, im: K[1] * omega };
    const denominator = { re: s3.re + 3 * s2.re, im: s3.im + 2 * omega };
    const d = denominator.re ** 2 + denominator.im ** 2;
    return { re: (numerator.re * denominator.re + numerator.im * denominator.im) / d, im: (numerator.im * denominator.re - numerator.re * denominator.im) / d };
  };

  it.each([
    ['-2, -3, -4', false],
    ['-0.001, -1000, -5', true], // poles over six decades: the grid is thinned to ≤ 400 points
  ])('poles %s: points on the margin grid, values equal the closed form', async (poles, thinned) => {
    const { analyze } = await import('../../server/src/analyze');
    const report = analyze(design(poles)).controllers[0];
    const margins = report.details.margins as { lowestFrequency: number; highestFrequency: number };
    const plotted = report.details.frequencyResponse as { omega: number[]; magnitudeDb: number[]; phaseDeg: number[] };
    const K = report.K![0];
    const grid = logarithmicGrid(margins.lowestFrequency, margins.highestFrequency, 60);
    expect(plotted.omega.length).toBeLessThanOrEqual(400);
    expect(plotted.omega.length < grid.length).toBe(thinned);
    expect(plotted.omega[0]).toBe(margins.lowestFrequency);
    expect(plotted.omega[plotted.omega.length - 1]).toBe(margins.highestFrequency);
    plotted.omega.forEach((omega, k) => {
      if (k > 0) expect(omega).toBeGreaterThan(plotted.omega[k - 1]);
      // Every point is one of the 60-per-decade grid's (to rounding of the recomputed grid).
      expect(Math.min(...grid.map((g) => Math.abs(g - omega) / omega))).toBeLessThan(1e-12);
      const value = closedForm(K, omega);
      const magnitude = 20 * Math.log10(Math.hypot(value.re, value.im));
      expect(Math.abs(plotted.magnitudeDb[k] - magnitude)).toBeLessThan(1e-8 * Math.max(1, Math.abs(magnitude)));
      const phase = (Math.atan2(value.im, value.re) * 180) / Math.PI;
      const wrapped = ((plotted.phaseDeg[k] - phase) % 360 + 540) % 360 - 180;
      expect(Math.abs(wrapped)).toBeLessThan(1e-6);
      if (k > 0) expect(Math.abs(plotted.phaseDeg[k] - plotted.phaseDeg[k - 1])).toBeLessThan(180);
    });
  });
});
