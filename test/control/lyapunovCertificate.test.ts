// The quadratic Lyapunov certificate (control/lyapunovCertificate.ts) used by the fragility study:
// it must hold for an LQR closed loop with the Riccati solution (SciPy's X from the reference
// fixture, test/reference/control_response.py), never hold for a loop that is not stable, never
// hold on the stability boundary (where only rounding could make it pass), and leave the fragility
// study's outcome exactly as the eigenvalue test gives it.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeFastCheck, checkText, fragilityOf } from '../../server/src/analyze';
import type { FragilityRequest } from '../../server/src/control/controllerDesign';
import { certifiesStability, lyapunovCertificate } from '../../server/src/control/lyapunovCertificate';
import { isPositiveDefiniteShifted } from '../../server/src/numeric/cholesky';
import { eigenvalues } from '../../server/src/numeric';
import type { Rows } from '../../server/src/numeric/types';
import { reference } from './controlTestHelpers';

const root = join(__dirname, '..', '..');
const product = (a: Rows, b: Rows): Rows => a.map((row) => b[0].map((_, j) => row.reduce((sum, v, k) => sum + v * b[k][j], 0)));
const minus = (a: Rows, b: Rows): Rows => a.map((row, i) => row.map((v, j) => v - b[i][j]));
const identityRows = (n: number): Rows => Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));

function seeded(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32 - 0.5;
  };
}

describe('Cholesky positive-definiteness test', () => {
  it('agrees with the eigenvalues of symmetric 2×2 matrices around the shift', () => {
    // [[2, 1], [1, 2]] has eigenvalues 1 and 3 (by hand): definite for shifts below 1 only.
    const a = Float64Array.from([2, 1, 1, 2]);
    expect(isPositiveDefiniteShifted(a, 2, 0)).toBe(true);
    expect(isPositiveDefiniteShifted(a, 2, 0.999)).toBe(true);
    expect(isPositiveDefiniteShifted(a, 2, 1.001)).toBe(false);
    expect(isPositiveDefiniteShifted(Float64Array.from([1, 2, 2, 1]), 2, 0)).toBe(false); // eigenvalues −1, 3
    expect(isPositiveDefiniteShifted(Float64Array.from([NaN, 0, 0, 1]), 2, 0)).toBe(false);
  });
});

describe('Lyapunov stability certificate', () => {
  it('SciPy LQR solutions certify their own closed loops (continuous and discrete)', () => {
    let cases = 0;
    for (const entry of reference.lqr) {
      if (entry.N) continue; // the cross-term cases have a semidefinite decrease by design
      const continuous = lyapunovCertificate(entry.continuousX);
      const discrete = lyapunovCertificate(entry.discreteX);
      expect(continuous).not.toBeNull();
      expect(discrete).not.toBeNull();
      expect(certifiesStability(continuous!, minus(entry.A, product(entry.B, entry.continuousK)), 'continuous')).toBe(true);
      expect(certifiesStability(discrete!, minus(entry.A, product(entry.B, entry.discreteK)), 'discrete')).toBe(true);
      cases++;
    }
    expect(cases).toBeGreaterThan(2);
  });

  it('never certifies a perturbed loop that has an eigenvalue on or beyond the boundary', () => {
    const random = seeded(20261202);
    let certified = 0;
    let refused = 0;
    for (const entry of reference.lqr.filter((e) => !e.N)) {
      const certificate = lyapunovCertificate(entry.continuousX)!;
      const closedLoop = minus(entry.A, product(entry.B, entry.continuousK));
      const scale = Math.max(...closedLoop.flat().map(Math.abs));
      for (let trial = 0; trial < 40; trial++) {
        const size = (trial / 10) * scale; // from small to large perturbations
        const perturbed = closedLoop.map((row) => row.map((v) => v + size * random()));
        const stable = eigenvalues(perturbed).every((lambda) => lambda.re < 0);
        const proof = certifiesStability(certificate, perturbed, 'continuous');
        if (proof) {
          certified++;
          expect(stable).toBe(true);
        } else refused++;
      }
    }
    expect(certified).toBeGreaterThan(10); // small perturbations keep the certificate
    expect(refused).toBeGreaterThan(10); // large ones lose it
  });

  it('a loop differing from the reference loop in a few entries gets the verdict the full product gives', () => {
    const random = seeded(7);
    let agreed = 0;
    let certified = 0;
    for (const entry of reference.lqr.filter((e) => !e.N)) {
      const closedLoop = minus(entry.A, product(entry.B, entry.continuousK));
      const withReference = lyapunovCertificate(entry.continuousX, closedLoop)!;
      const without = lyapunovCertificate(entry.continuousX)!;
      expect(withReference.reference).toBeDefined();
      const scale = Math.max(...closedLoop.flat().map(Math.abs));
      for (let trial = 0; trial < 30; trial++) {
        const moved = closedLoop.map((row) => row.slice());
        const entries = 1 + (trial % 3);
        for (let e = 0; e < entries; e++) {
          const i = Math.floor((random() + 0.5) * entry.n) % entry.n;
          const j = Math.floor((random() + 0.5) * entry.n) % entry.n;
          moved[i][j] += (trial / 6) * scale * random();
        }
        const sparse = certifiesStability(withReference, moved, 'continuous');
        expect(sparse).toBe(certifiesStability(without, moved, 'continuous'));
        if (sparse) {
          certified++;
          expect(eigenvalues(moved).every((lambda) => lambda.re < 0)).toBe(true);
        }
        agreed++;
      }
    }
    expect(agreed).toBeGreaterThan(60);
    expect(certified).toBeGreaterThan(10);
  });

  it('refuses the stability boundary, where only rounding could decide', () => {
    // Lossless oscillator ẋ = [0 1; −1 0]x: eigenvalues ±i, AᵀX + XA = 0 for X = I.
    const certificate = lyapunovCertificate(identityRows(2))!;
    expect(certifiesStability(certificate, [[0, 1], [-1, 0]], 'continuous')).toBe(false);
    expect(certifiesStability(certificate, [[-1e-18, 1], [-1, -1e-18]], 'continuous')).toBe(false); // decay far below rounding
    expect(certifiesStability(certificate, [[-1e-3, 1], [-1, -1e-3]], 'continuous')).toBe(true);
    // Discrete rotation by 0.3 rad: |λ| = 1, X − AᵀXA = 0; scaled by 0.999 it is stable.
    const c = Math.cos(0.3);
    const s = Math.sin(0.3);
    expect(certifiesStability(certificate, [[c, -s], [s, c]], 'discrete')).toBe(false);
    expect(certifiesStability(certificate, [[0.999 * c, -0.999 * s], [0.999 * s, 0.999 * c]], 'discrete')).toBe(true);
    // X must itself be positive definite beyond rounding.
    expect(lyapunovCertificate([[1, 0], [0, 0]])).toBeNull();
    expect(lyapunovCertificate([[1, 2], [2, 1]])).toBeNull();
  });
});

// A belt drive tracked by an LQR design without integral action (demo scenario), continuous and
// sampled, and the 100-state heated rod of the benchmark cut to 12 segments.
const beltDrive = (sampled: boolean) => `plant belt {
  param J = 0.35
  param c = 0.9
  param k = 1.8
  param r = 0.04
  states angle, rate
  inputs volts
  outputs position
  angle' = rate
  rate' = (k*volts - c*rate)/J
  output position = r*angle
}
controller stopper for belt {
  lqr Q = diag(400, 1), R = 1
${sampled ? '  sample 20 ms\n' : ''}  track position
}
`;
const rod = (n: number) => {
  const rows = Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => (i === j ? (i === 0 || i === n - 1 ? '-k - h' : '-2*k') : Math.abs(i - j) === 1 ? 'k' : '0')).join(', '),
  );
  const states = Array.from({ length: n }, (_, i) => `T${i + 1}`);
  return [
    'plant rod {', '  param k = 0.5', '  param h = 0.05', '  param g = 1', `  states ${states.join(', ')}`, '  inputs heater', '  outputs tip',
    `  A = [${rows.join('; ')}]`, `  B = [${states.map((_, i) => (i === 0 ? 'g' : '0')).join('; ')}]`, `  C = [${states.map((_, i) => (i === n - 1 ? '1' : '0')).join(', ')}]`, '}',
    'controller warm for rod {', `  lqr Q = identity(${n}), R = 1`, '  track tip', '}', '',
  ].join('\n');
};
const models: [string, string][] = [
  ['belt drive, continuous LQR', beltDrive(false)],
  ['belt drive, sampled LQR', beltDrive(true)],
  ['12-segment rod, continuous LQR', rod(12)],
  ...['hoist.plant', 'dosing-tank.plant', 'conveyor.plant', 'maglev-rig.plant'].map((name): [string, string] => [name, readFileSync(join(root, 'samples', name), 'utf8')]),
];

describe('fragility study with and without the certificate', () => {
  it.each(models)('%s: the same outcome either way', (name, text) => {
    const requests: { index: number; request: FragilityRequest }[] = [];
    const analysis = analyzeFastCheck(checkText(text), {}, {
      helper: { plantReports: () => null, startFragility: (index, request) => (requests.push({ index, request }), () => null) },
      helperFromStates: 0,
    });
    expect(analysis.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(requests.length).toBeGreaterThan(0);
    for (const { index, request } of requests) {
      // An LQR design without integral action hands its Riccati solution over; others do not.
      expect(request.lyapunovMatrix !== undefined).toBe(/\blqr\b/.test(text) && !/\bintegral\b/.test(text));
      const fast = checkText(text);
      const withCertificate = fragilityOf(fast, index, request)!;
      const without = fragilityOf(fast, index, { ...request, lyapunovMatrix: undefined })!;
      // Every verdict and error is the same; the box's worst pole covers only the points the
      // certificate did not settle (none of them when it settled all).
      const { worstPole, worstPoint, certified, ...boxVerdicts } = withCertificate.box;
      const { worstPole: allWorstPole, worstPoint: allWorstPoint, certified: noneCertified, ...allBoxVerdicts } = without.box;
      expect({ ...withCertificate, box: boxVerdicts }).toEqual({ ...without, box: allBoxVerdicts });
      expect(noneCertified).toBe(0);
      expect(allWorstPole).not.toBeNull();
      if (request.lyapunovMatrix) expect(certified).toBeGreaterThan(0);
      if (certified === withCertificate.box.points) expect([worstPole, worstPoint]).toEqual([null, null]);
      if (certified === 0) expect([worstPole, worstPoint]).toEqual([allWorstPole, allWorstPoint]);
    }
  });
});
