// Number formatting shared by the control diagnostics of the analyses in this folder
// (observer*, sampling*, float32*, lqr*, spec*, saturation*, margin*): 3 significant digits.
import type { Complex } from '../../model/types';

export function fmt(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return '0';
  return String(Number(value.toPrecision(3)));
}

export function complexText(value: Complex): string {
  if (value.im === 0) return fmt(value.re);
  const sign = value.im < 0 ? '-' : '+';
  return `${fmt(value.re)}${sign}${fmt(Math.abs(value.im))}j`;
}
