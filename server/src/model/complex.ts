// Complex scalar arithmetic for parameter and pole evaluation. Real inputs whose result is
// real take the real path (Math.*), so real models are computed exactly as written.
import type { Complex } from './types';

export const complex = (re: number, im = 0): Complex => ({ re, im });

export function isRealValue(z: Complex): boolean {
  return z.im === 0;
}

/** Real within rounding: the imaginary part is negligible against the real part. */
export function isNearlyReal(z: Complex): boolean {
  return z.im === 0 || Math.abs(z.im) <= 64 * Number.EPSILON * Math.abs(z.re);
}

export function isFiniteComplex(z: Complex): boolean {
  return Number.isFinite(z.re) && Number.isFinite(z.im);
}

export function add(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

export function sub(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

export function neg(a: Complex): Complex {
  return { re: -a.re, im: -a.im };
}

export function mul(a: Complex, b: Complex): Complex {
  if (a.im === 0 && b.im === 0) return { re: a.re * b.re, im: 0 };
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** Smith's algorithm (scaled to avoid overflow); the caller rejects a zero divisor first. */
export function div(a: Complex, b: Complex): Complex {
  if (b.im === 0) return { re: a.re / b.re, im: a.im === 0 ? 0 : a.im / b.re };
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const ratio = b.im / b.re;
    const denominator = b.re + b.im * ratio;
    return { re: (a.re + a.im * ratio) / denominator, im: (a.im - a.re * ratio) / denominator };
  }
  const ratio = b.re / b.im;
  const denominator = b.re * ratio + b.im;
  return { re: (a.re * ratio + a.im) / denominator, im: (a.im * ratio - a.re) / denominator };
}

export function modulus(a: Complex): number {
  return Math.hypot(a.re, a.im);
}

export function exp(a: Complex): Complex {
  if (a.im === 0) return { re: Math.exp(a.re), im: 0 };
  const scale = Math.exp(a.re);
  return { re: scale * Math.cos(a.im), im: scale * Math.sin(a.im) };
}

export function log(a: Complex): Complex {
  if (a.im === 0 && a.re > 0) return { re: Math.log(a.re), im: 0 };
  return { re: Math.log(modulus(a)), im: Math.atan2(a.im, a.re) };
}

export function sqrt(a: Complex): Complex {
  if (a.im === 0) {
    return a.re >= 0 ? { re: Math.sqrt(a.re), im: 0 } : { re: 0, im: Math.sqrt(-a.re) };
  }
  const r = modulus(a);
  const re = Math.sqrt((r + a.re) / 2);
  const im = Math.sign(a.im) * Math.sqrt((r - a.re) / 2);
  return { re, im };
}

export function sin(a: Complex): Complex {
  if (a.im === 0) return { re: Math.sin(a.re), im: 0 };
  return { re: Math.sin(a.re) * Math.cosh(a.im), im: Math.cos(a.re) * Math.sinh(a.im) };
}

export function cos(a: Complex): Complex {
  if (a.im === 0) return { re: Math.cos(a.re), im: 0 };
  return { re: Math.cos(a.re) * Math.cosh(a.im), im: -Math.sin(a.re) * Math.sinh(a.im) };
}

export function tan(a: Complex): Complex {
  if (a.im === 0) return { re: Math.tan(a.re), im: 0 };
  return div(sin(a), cos(a));
}

export function tanh(a: Complex): Complex {
  if (a.im === 0) return { re: Math.tanh(a.re), im: 0 };
  const twice = exp({ re: 2 * a.re, im: 2 * a.im });
  return div(sub(twice, { re: 1, im: 0 }), add(twice, { re: 1, im: 0 }));
}

/** a^b: real powers stay real when the result is real (negative base, integer exponent). */
export function pow(a: Complex, b: Complex): Complex {
  if (a.im === 0 && b.im === 0) {
    if (a.re >= 0 || Number.isInteger(b.re)) return { re: Math.pow(a.re, b.re), im: 0 };
  }
  if (a.re === 0 && a.im === 0) {
    return b.re > 0 ? { re: 0, im: 0 } : { re: Number.NaN, im: Number.NaN };
  }
  return exp(mul(b, log(a)));
}

/** Compact text for messages: `-4+3i`, `2`, `-1.5i`. */
export function formatComplex(z: Complex): string {
  const fmt = (x: number) => String(Number(x.toPrecision(6)));
  if (z.im === 0) return fmt(z.re);
  if (z.re === 0) return `${fmt(z.im)}i`;
  return `${fmt(z.re)}${z.im < 0 ? '-' : '+'}${fmt(Math.abs(z.im))}i`;
}
