// Real polynomials with coefficients listed highest power first. Roots are the eigenvalues of the
// balanced companion matrix (Edelman & Murakami, Math. Comp. 64, 1995: backward stable for the
// polynomial after balancing); characteristic polynomials are formed from the eigenvalues.

import { eigenvaluesWithStatus, sortComplex } from './eigenvectors';
import type { Complex, Rows } from './types';

/** Roots of c₀·sⁿ + c₁·sⁿ⁻¹ + … + cₙ, sorted by real part then imaginary part. Leading zeros are dropped. */
export function polynomialRoots(coeffsHighestFirst: number[]): Complex[] {
  let start = 0;
  while (start < coeffsHighestFirst.length && coeffsHighestFirst[start] === 0) start++;
  let end = coeffsHighestFirst.length;
  while (end > start && coeffsHighestFirst[end - 1] === 0) end--;
  const zeroRoots = coeffsHighestFirst.length - end;
  const coefficients = coeffsHighestFirst.slice(start, end);
  const degree = coefficients.length - 1;
  if (start === coeffsHighestFirst.length) return [];
  const roots: Complex[] = Array.from({ length: zeroRoots }, () => ({ re: 0, im: 0 }));
  if (degree >= 1) {
    if (!coefficients.every(Number.isFinite)) {
      for (let i = 0; i < degree; i++) roots.push({ re: NaN, im: NaN });
      return roots;
    }
    const lead = coefficients[0];
    const companion: Rows = Array.from({ length: degree }, (_, i) => {
      const row = new Array<number>(degree).fill(0);
      if (i === 0) for (let j = 0; j < degree; j++) row[j] = -coefficients[j + 1] / lead;
      else row[i - 1] = 1;
      return row;
    });
    roots.push(...eigenvaluesWithStatus(companion).values);
  }
  return sortComplex(roots);
}

/** Monic coefficients (highest first) of ∏(s − rᵢ); real for conjugate-closed root sets (imaginary parts dropped). */
export function polynomialFromRoots(roots: Complex[]): number[] {
  let re = [1];
  let im = [0];
  for (const root of roots) {
    const nextRe = new Array<number>(re.length + 1).fill(0);
    const nextIm = new Array<number>(re.length + 1).fill(0);
    for (let k = 0; k < re.length; k++) {
      nextRe[k] += re[k];
      nextIm[k] += im[k];
      // − root · coefficient k, shifted one power down.
      nextRe[k + 1] -= root.re * re[k] - root.im * im[k];
      nextIm[k + 1] -= root.re * im[k] + root.im * re[k];
    }
    re = nextRe;
    im = nextIm;
  }
  return re;
}

/** p(x) by Horner's rule. */
export function polynomialEvaluate(coeffsHighestFirst: number[], x: number): number {
  let value = 0;
  for (const coefficient of coeffsHighestFirst) value = value * x + coefficient;
  return value;
}

/** p(z) for complex z by Horner's rule. */
export function polynomialEvaluateComplex(coeffsHighestFirst: number[], z: Complex): Complex {
  let re = 0;
  let im = 0;
  for (const coefficient of coeffsHighestFirst) {
    const nextRe = re * z.re - im * z.im + coefficient;
    im = re * z.im + im * z.re;
    re = nextRe;
  }
  return { re, im };
}

/** Monic det(s·I − A), coefficients highest first, formed from the eigenvalues of A. */
export function characteristicPolynomial(A: Rows): number[] {
  return polynomialFromRoots(eigenvaluesWithStatus(A).values);
}
