import { describe, expect, it } from 'vitest';
import {
  characteristicPolynomial,
  polynomialEvaluate,
  polynomialEvaluateComplex,
  polynomialFromRoots,
  polynomialRoots,
} from '../../server/src/numeric/polynomial';

const EPS = Number.EPSILON;

describe('polynomials', () => {
  it('finds roots of (s+1)(s+2)(s+3) = s³ + 6s² + 11s + 6', () => {
    const roots = polynomialRoots([1, 6, 11, 6]);
    [-3, -2, -1].forEach((expected, i) => {
      expect(roots[i].re).toBeCloseTo(expected, 13);
      expect(roots[i].im).toBe(0);
    });
  });

  it('strips leading zeros and keeps zero roots', () => {
    const roots = polynomialRoots([0, 0, 2, 0, 8, 0, 0]); // 2s⁴ + 8s² = 2s²(s² + 4)
    expect(roots.length).toBe(4);
    expect(roots.filter((r) => r.re === 0 && r.im === 0).length).toBe(2);
    const nonzero = roots.filter((r) => r.im !== 0).map((r) => r.im).sort((a, b) => a - b);
    expect(nonzero[0]).toBeCloseTo(-2, 13);
    expect(nonzero[1]).toBeCloseTo(2, 13);
    expect(polynomialRoots([0, 0, 5])).toEqual([]);
    expect(polynomialRoots([])).toEqual([]);
  });

  it('round-trips roots → coefficients → roots for a conjugate-closed set', () => {
    const roots = [{ re: -1, im: 2 }, { re: -1, im: -2 }, { re: -0.5, im: 0 }, { re: 3, im: 0 }];
    const coefficients = polynomialFromRoots(roots);
    expect(coefficients[0]).toBe(1);
    const back = polynomialRoots(coefficients);
    const expected = [{ re: -1, im: -2 }, { re: -1, im: 2 }, { re: -0.5, im: 0 }, { re: 3, im: 0 }];
    back.forEach((root, i) => {
      expect(root.re).toBeCloseTo(expected[i].re, 12);
      expect(root.im).toBeCloseTo(expected[i].im, 12);
    });
    for (const root of roots) {
      const value = polynomialEvaluateComplex(coefficients, root);
      expect(Math.hypot(value.re, value.im)).toBeLessThan(100 * EPS * 30);
    }
  });

  it('evaluates by Horner and builds characteristic polynomials', () => {
    expect(polynomialEvaluate([1, -3, 2], 2)).toBe(0);
    expect(polynomialEvaluate([2, 0, 1], 3)).toBe(19);
    // det(sI − A) of the companion-form matrix below is s² + 3s + 2 (by expansion).
    const p = characteristicPolynomial([[0, 1], [-2, -3]]);
    expect(p[0]).toBe(1);
    expect(p[1]).toBeCloseTo(3, 13);
    expect(p[2]).toBeCloseTo(2, 13);
  });

  it('handles the Wilkinson polynomial of degree 10 to a few digits (ill-conditioned roots)', () => {
    const roots = Array.from({ length: 10 }, (_, i) => ({ re: i + 1, im: 0 }));
    const found = polynomialRoots(polynomialFromRoots(roots));
    found.forEach((root, i) => expect(Math.abs(root.re - (i + 1))).toBeLessThan(1e-6));
  });
});
