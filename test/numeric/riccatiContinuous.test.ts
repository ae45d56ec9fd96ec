import { describe, expect, it } from 'vitest';
import fixture from '../fixtures/reference/numeric_solvers.json';
import { continuousRiccatiConditionEstimate, solveContinuousRiccati } from '../../server/src/numeric/riccatiContinuous';
import { eigenvaluesWithStatus, sortComplex } from '../../server/src/numeric/eigenvectors';
import { matrixSign } from '../../server/src/numeric/matrixSign';
import { EPS, add, checkWarmStartsNearReference, eye, frob, maxAbsDiff, mul, randomMatrix, scale, seededRandom, sub, tr } from './solverTestMatrices';

/** ‖AᵀX + XA − XBR⁻¹BᵀX + Q‖_F / (‖Q‖ + 2‖A‖‖X‖ + ‖X‖²‖BR⁻¹Bᵀ‖), recomputed independently (N = 0, R = r·I). */
function independentResidual(A: number[][], B: number[][], Q: number[][], r: number, X: number[][]): number {
  const G = scale(mul(B, tr(B)), 1 / r);
  const res = add(mul(tr(A), X), mul(X, A), scale(mul(mul(X, G), X), -1), Q);
  return frob(res) / (frob(Q) + 2 * frob(A) * frob(X) + frob(X) ** 2 * frob(G));
}

const eigenvaluesOfA = (A: number[][]) => eigenvaluesWithStatus(A).values;

describe('solveContinuousRiccati (Laub Schur method + Newton–Kleinman)', () => {
  it('CAREX #1: double integrator gives X = [2 1; 1 2], K = [1 2]', () => {
    // Benner, Laub & Mehrmann, "A collection of benchmark examples for the numerical solution of
    // algebraic Riccati equations I: continuous-time case", TU Chemnitz report SPC 95-22 (number from memory), 1995, example 1
    // (values checked by substitution: the residual of the stated X is exactly zero).
    const s = solveContinuousRiccati([[0, 1], [0, 0]], [[0], [1]], [[1, 0], [0, 2]], [[1]]);
    expect(s.ok).toBe(true);
    expect(maxAbsDiff(s.X, [[2, 1], [1, 2]])).toBeLessThan(16 * EPS * 2);
    expect(maxAbsDiff(s.gain, [[1, 2]])).toBeLessThan(16 * EPS * 2);
    expect(s.residual).toBeLessThan(4 * EPS);
    expect(s.closedLoopEigenvalues.every((l) => l.re < 0)).toBe(true);
  });

  it('double integrator with position weight only (Q = diag(1, 0), singular but detectable)', () => {
    // X = [√2 1; 1 √2], K = [1 √2]: verified by substitution into the equation (from memory as the
    // classic √2-damping result; the substitution is the check).
    const s = solveContinuousRiccati([[0, 1], [0, 0]], [[0], [1]], [[1, 0], [0, 0]], [[1]]);
    expect(s.ok).toBe(true);
    expect(maxAbsDiff(s.X, [[Math.SQRT2, 1], [1, Math.SQRT2]])).toBeLessThan(16 * EPS * 2);
    expect(maxAbsDiff(s.gain, [[1, Math.SQRT2]])).toBeLessThan(16 * EPS * 2);
  });

  it('gives X = 0, K = 0 for a stable plant with Q = 0', () => {
    const s = solveContinuousRiccati([[-1, 2], [0, -3]], [[1], [1]], [[0, 0], [0, 0]], [[1]]);
    expect(s.ok).toBe(true);
    expect(frob(s.X)).toBeLessThan(10 * EPS);
    expect(frob(s.gain)).toBeLessThan(10 * EPS);
  });

  it('CAREX #2: X = (1 + √2)·Q', () => {
    // Benner, Laub & Mehrmann 1995 (CAREX), example 2; checked by substitution (residual ≈ 1e-14).
    const Q = [[9, 6], [6, 4]];
    const s = solveContinuousRiccati([[4, 3], [-4.5, -3.5]], [[1], [-1]], Q, [[1]]);
    expect(s.ok).toBe(true);
    const exact = scale(Q, 1 + Math.SQRT2);
    expect(maxAbsDiff(s.X, exact)).toBeLessThan(100 * EPS * s.conditionEstimate * frob(exact));
    expect(s.residual).toBeLessThan(10 * EPS);
  });

  it('handles the cross term N: equals the folded problem with Ā = A − BR⁻¹Nᵀ, Q̄ = Q − NR⁻¹Nᵀ', () => {
    const random = seededRandom(21);
    const n = 5;
    const A = randomMatrix(n, n, random);
    const B = randomMatrix(n, 2, random);
    const C = randomMatrix(n, n, random);
    const Q = add(mul(C, tr(C)), scale(eye(n), 2));
    const R = [[2, 0.3], [0.3, 1]];
    const N = scale(randomMatrix(n, 2, random), 0.2);
    const s = solveContinuousRiccati(A, B, Q, R, N);
    expect(s.ok).toBe(true);
    // Unfolded residual: AᵀX + XA − (XB + N)R⁻¹(BᵀX + Nᵀ) + Q with K = R⁻¹(BᵀX + Nᵀ), so (XB + N)K.
    const res = add(mul(tr(A), s.X), mul(s.X, A), scale(mul(add(mul(s.X, B), N), s.gain), -1), Q);
    expect(frob(res)).toBeLessThan(100 * n * EPS * (frob(Q) + 2 * frob(A) * frob(s.X) + frob(s.X) ** 2 * frob(B) ** 2));
    // Gain definition R·K = BᵀX + Nᵀ.
    expect(maxAbsDiff(mul(R, s.gain), add(mul(tr(B), s.X), tr(N)))).toBeLessThan(100 * EPS * frob(s.X) * frob(B));
  });

  it('agrees with SciPy on problems with a cross term N (fixture, argument s)', () => {
    for (const c of fixture.crossTerm) {
      const s = solveContinuousRiccati(c.A, c.B, c.Q, c.R, c.N);
      expect(s.ok, `n=${c.n} m=${c.m}`).toBe(true);
      expect(s.residual).toBeLessThan(10 * c.n * EPS);
      expect(maxAbsDiff(s.X, c.careX)).toBeLessThan(10 * c.n * EPS * s.conditionEstimate * frob(c.careX));
    }
  });

  it('agrees with scipy.linalg.solve_continuous_are on seeded stabilisable systems (fixture)', () => {
    for (const c of fixture.cases) {
      const s = solveContinuousRiccati(c.A, c.B, c.Q, c.R);
      expect(s.ok, `n=${c.n} m=${c.m}`).toBe(true);
      expect(s.residual).toBeLessThan(10 * c.n * EPS);
      // Both results are backward stable solutions: the gap is within c·n·ε·κ·‖X‖ with κ our
      // condition estimate; c = 10 (measured worst case of the ratio over this fixture: below 0.4).
      expect(maxAbsDiff(s.X, c.careX), `n=${c.n} m=${c.m}`).toBeLessThan(10 * c.n * EPS * s.conditionEstimate * frob(c.careX));
    }
  });

  it('the condition estimate left out and computed apart is the same number; X and K are unchanged (fixture)', () => {
    for (const c of fixture.cases) {
      const whole = solveContinuousRiccati(c.A, c.B, c.Q, c.R);
      const gainsFirst = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { conditionEstimate: false });
      expect(gainsFirst.conditionEstimate).toBeNaN();
      expect(gainsFirst.X).toEqual(whole.X);
      expect(gainsFirst.gain).toEqual(whole.gain);
      expect(continuousRiccatiConditionEstimate(c.A, c.B, c.Q, c.R, undefined, gainsFirst.X)).toBe(whole.conditionEstimate);
      // Closed-loop eigenvalues from the eigenvalue-only QR: the same to rounding of A − BK.
      const poles = sortComplex(gainsFirst.closedLoopEigenvalues);
      const reference = sortComplex(whole.closedLoopEigenvalues);
      const scale = frob(c.A) + frob(mul(c.B, whole.gain));
      poles.forEach((pole, i) => expect(Math.hypot(pole.re - reference[i].re, pole.im - reference[i].im)).toBeLessThan(1e3 * c.n * EPS * scale));
    }
  });

  it('warm start: Newton from a start 10⁻⁵ away reaches SciPy\'s solution (fixture), in at most 3 steps', () => {
    // Within Newton's quadratic phase (distance times the condition well below 1) the start must be
    // used; further out (κ up to 10⁸ in this fixture) the Schur route may take over.
    const warm = checkWarmStartsNearReference(
      fixture.cases,
      (c) => c.careX,
      (c, start) => solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start }),
      77,
      (actual, label) => expect(actual, label),
    );
    expect(warm).toBeGreaterThan(fixture.cases.length / 2);
  });

  it('warm start with a chord basis: chord steps on an earlier solve\'s Schur form reach SciPy\'s solution (fixture)', () => {
    // The basis comes from a warm solve of the same equation from another start 10⁻⁵ away (a
    // closed loop 10⁻⁵ out of date, as after an editor's small edit); the chord method must then
    // carry at least one step wherever the warm start is in its quadratic phase.
    const random = seededRandom(78);
    const nearby = (X: number[][]) => {
      const S = randomMatrix(X.length, X.length, random);
      const direction = add(S, tr(S));
      return add(X, scale(direction, (1e-5 * frob(X)) / frob(direction)));
    };
    let chorded = 0;
    for (const c of fixture.cases) {
      const label = `n=${c.n} m=${c.m}`;
      const first = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: nearby(c.careX) });
      if (!first.warmStarted || !first.chordBasis) continue;
      const second = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: nearby(c.careX), chordBasis: first.chordBasis });
      const { conditionEstimate } = solveContinuousRiccati(c.A, c.B, c.Q, c.R);
      expect(second.ok, label).toBe(true);
      expect(second.residual, label).toBeLessThan(10 * c.n * EPS);
      expect(maxAbsDiff(second.X, c.careX), label).toBeLessThan(10 * c.n * EPS * conditionEstimate * frob(c.careX));
      if ((second.chordSteps ?? 0) > 0) chorded++;
    }
    expect(chorded).toBeGreaterThan(fixture.cases.length / 2);
  });

  it('warm start with a chord basis: an unusable or far-off basis changes nothing but the route (fixture)', () => {
    for (const c of fixture.cases.slice(0, 12)) {
      const label = `n=${c.n} m=${c.m}`;
      const cold = solveContinuousRiccati(c.A, c.B, c.Q, c.R);
      const first = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: scale(c.careX, 1 + 1e-6) });
      if (!first.chordBasis) continue;
      // A basis that went through JSON (typed arrays lost) is refused outright.
      const mangled = JSON.parse(JSON.stringify(first.chordBasis));
      const refused = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: scale(c.careX, 1 + 1e-6), chordBasis: mangled });
      expect(refused.chordSteps ?? 0, label).toBe(0);
      // The closed loop of a design with ten times the input weight: chord steps fail or help; Newton finishes.
      const otherR = scale(c.R, 10);
      const other = solveContinuousRiccati(c.A, c.B, c.Q, otherR, undefined, { start: scale(solveContinuousRiccati(c.A, c.B, c.Q, otherR).X, 1 + 1e-6) });
      const farBasis = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: scale(c.careX, 1 + 1e-6), chordBasis: other.chordBasis });
      for (const s of [refused, farBasis]) {
        expect(s.ok, label).toBe(true);
        expect(s.residual, label).toBeLessThan(10 * c.n * EPS);
        expect(maxAbsDiff(s.X, c.careX), label).toBeLessThan(10 * c.n * EPS * cold.conditionEstimate * frob(c.careX));
      }
    }
  });

  it('warm start: a start that does not stabilise, is far away or has the wrong shape falls back to the Schur route (fixture)', () => {
    let unstable = 0;
    for (const c of fixture.cases) {
      const cold = solveContinuousRiccati(c.A, c.B, c.Q, c.R);
      // X₀ = 0 leaves the closed loop at A: a stabilising start only when A is stable.
      const fromZero = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: scale(c.careX, 0) });
      if (!eigenvaluesOfA(c.A).every((l) => l.re < 0)) {
        unstable++;
        expect(fromZero.warmStarted, `n=${c.n} m=${c.m}`).toBe(false);
      }
      // 10³·X: stabilising (more feedback) but outside the quadratic phase.
      const far = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: scale(c.careX, 1e3) });
      expect(far.warmStarted, `n=${c.n} m=${c.m}`).toBe(false);
      const wrongShape = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { start: eye(c.n + 1) });
      expect(wrongShape.warmStarted).toBe(false);
      for (const s of [fromZero, far, wrongShape]) {
        expect(s.ok).toBe(true);
        expect(maxAbsDiff(s.X, c.careX), `n=${c.n} m=${c.m}`).toBeLessThan(10 * c.n * EPS * cold.conditionEstimate * frob(c.careX));
      }
      expect(far.X).toEqual(cold.X);
    }
    expect(unstable).toBeGreaterThan(0);
  });

  it('gives the same X through the sign-function route (Roberts 1980) as through the Schur route', () => {
    for (const c of fixture.cases.filter((item) => item.n % 4 === 0)) {
      const viaSign = solveContinuousRiccati(c.A, c.B, c.Q, c.R, undefined, { method: 'sign' });
      expect(viaSign.ok).toBe(true);
      expect(viaSign.residual).toBeLessThan(10 * c.n * EPS);
      expect(maxAbsDiff(viaSign.X, c.careX)).toBeLessThan(10 * c.n * EPS * viaSign.conditionEstimate * frob(c.careX));
    }
  });

  it('reaches a normalised residual below 1e-12 for a 100-state random stabilisable system (Q = I, R = I)', () => {
    const random = seededRandom(100);
    const n = 100;
    // Random A/√n has spectral radius ≈ 1; the shift −0.5·I leaves a few unstable modes, which four
    // random inputs stabilise with a moderate X (SciPy gives ‖X‖_F ≈ 148 for the same data). Without
    // the shift, dozens of unstable modes and 4 inputs make the pair numerically uncontrollable.
    const A = sub(scale(randomMatrix(n, n, random), 1 / Math.sqrt(n)), scale(eye(n), 0.5));
    const B = randomMatrix(n, 4, random);
    const s = solveContinuousRiccati(A, B, eye(n), eye(4));
    expect(s.ok).toBe(true);
    expect(independentResidual(A, B, eye(n), 1, s.X)).toBeLessThan(1e-12);
    expect(s.closedLoopEigenvalues.every((l) => l.re < 0)).toBe(true);
  });

  it('reports an uncontrollable unstable mode as a failure, not a solution', () => {
    // Mode x₁ with λ = +1 is untouched by the input: (A, B) is not stabilisable.
    const s = solveContinuousRiccati([[1, 0], [0, -2]], [[0], [1]], eye(2), [[1]]);
    expect(s.ok).toBe(false);
    expect(['not-stabilisable', 'imaginary-axis-eigenvalues']).toContain(s.failure);
  });

  it('reports Hamiltonian eigenvalues on the imaginary axis (undamped oscillator, no input effect, Q = 0)', () => {
    const s = solveContinuousRiccati([[0, 1], [-1, 0]], [[0], [1e-30]], [[0, 0], [0, 0]], [[1]]);
    expect(s.ok).toBe(false);
    expect(s.failure).toBe('imaginary-axis-eigenvalues');
  });

  it('rejects an indefinite or singular R', () => {
    const A = [[0, 1], [0, 0]];
    const B = [[0, 0], [1, 1]];
    expect(solveContinuousRiccati(A, B, eye(2), [[1, 0], [0, -1]]).failure).toBe('r-not-positive-definite');
    expect(solveContinuousRiccati(A, B, eye(2), [[1, 1], [1, 1]]).failure).toBe('r-not-positive-definite');
  });

  it('never throws on malformed input', () => {
    const s = solveContinuousRiccati([[0, 1], [0, 0]], [[1]], eye(2), [[1]]);
    expect(s.ok).toBe(false);
  });
});

describe('matrixSign (scaled Newton iteration)', () => {
  it('gives sign(A)² = I and commutes with A for a matrix with eigenvalues off the axis', () => {
    const random = seededRandom(8);
    const A = add(randomMatrix(8, 8, random), scale(eye(8), 0.1));
    const { S, converged } = matrixSign(A);
    expect(converged).toBe(true);
    expect(maxAbsDiff(mul(S, S), eye(8))).toBeLessThan(1e4 * EPS * frob(S) ** 2);
    expect(frob(sub(mul(S, A), mul(A, S)))).toBeLessThan(1e4 * EPS * frob(S) * frob(A));
  });

  it('does not converge for eigenvalues ±i', () => {
    expect(matrixSign([[0, 1], [-1, 0]]).converged).toBe(false);
  });
});
