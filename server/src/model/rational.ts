// Rational functions in the Laplace variable s with real coefficients, stored lowest power
// first: num[k] is the coefficient of s^k. Sums over a shared denominator keep it as is, so
// `1/(s+1) + 2/(s+1)` stays first order; other sums multiply denominators (no cancellation of
// common factors: the realisation has as many states as the denominator's degree as written).

export type Polynomial = number[];

export interface Rational {
  num: Polynomial;
  den: Polynomial;
}

export function trim(p: Polynomial): Polynomial {
  let end = p.length;
  while (end > 1 && p[end - 1] === 0) end--;
  return p.slice(0, Math.max(end, 1));
}

export function degree(p: Polynomial): number {
  const t = trim(p);
  return t.length === 1 && t[0] === 0 ? -Infinity : t.length - 1;
}

export function isZeroPolynomial(p: Polynomial): boolean {
  return p.every((c) => c === 0);
}

export function polyAdd(a: Polynomial, b: Polynomial, sign = 1): Polynomial {
  const result = new Array<number>(Math.max(a.length, b.length)).fill(0);
  a.forEach((c, k) => (result[k] = result[k]! + c));
  b.forEach((c, k) => (result[k] = result[k]! + sign * c));
  return trim(result);
}

export function polyMul(a: Polynomial, b: Polynomial): Polynomial {
  const result = new Array<number>(a.length + b.length - 1).fill(0);
  a.forEach((x, i) => b.forEach((y, j) => (result[i + j] = result[i + j]! + x * y)));
  return trim(result);
}

function samePolynomial(a: Polynomial, b: Polynomial): boolean {
  const x = trim(a);
  const y = trim(b);
  return x.length === y.length && x.every((c, k) => c === y[k]);
}

export const constant = (c: number): Rational => ({ num: [c], den: [1] });
export const laplaceVariable = (): Rational => ({ num: [0, 1], den: [1] });

export function isConstant(r: Rational): boolean {
  return trim(r.num).length === 1 && trim(r.den).length === 1;
}

export function constantValue(r: Rational): number {
  return trim(r.num)[0]! / trim(r.den)[0]!;
}

export function add(a: Rational, b: Rational, sign = 1): Rational {
  if (samePolynomial(a.den, b.den)) return { num: polyAdd(a.num, b.num, sign), den: trim(a.den) };
  return { num: polyAdd(polyMul(a.num, b.den), polyMul(b.num, a.den), sign), den: polyMul(a.den, b.den) };
}

export function mul(a: Rational, b: Rational): Rational {
  return { num: polyMul(a.num, b.num), den: polyMul(a.den, b.den) };
}

/** The caller rejects a zero divisor first. */
export function div(a: Rational, b: Rational): Rational {
  if (samePolynomial(a.den, b.den)) return { num: trim(a.num), den: trim(b.num) };
  return { num: polyMul(a.num, b.den), den: polyMul(a.den, b.num) };
}

export function neg(a: Rational): Rational {
  return { num: a.num.map((c) => -c), den: a.den };
}

/** Whole powers only; negative powers invert. */
export function power(a: Rational, k: number): Rational {
  let result = constant(1);
  const base = k < 0 ? { num: a.den, den: a.num } : a;
  for (let i = 0; i < Math.abs(k); i++) result = mul(result, base);
  return result;
}

export function evaluatePolynomialAt(p: Polynomial, re: number, im: number): { re: number; im: number } {
  let accRe = 0;
  let accIm = 0;
  for (let k = p.length - 1; k >= 0; k--) {
    const nextRe = accRe * re - accIm * im + p[k]!;
    const nextIm = accRe * im + accIm * re;
    accRe = nextRe;
    accIm = nextIm;
  }
  return { re: accRe, im: accIm };
}
