// Number and pole formatting shared by the tracking/placement/structure diagnostics.
import type { Complex } from '../../numeric/types';

/** Up to 4 significant digits, plain notation when reasonable. */
export function formatNumber(value: number): string {
  if (!Number.isFinite(value)) return value > 0 ? '∞' : value < 0 ? '−∞' : 'NaN';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  const text = magnitude >= 1e-3 && magnitude < 1e6 ? String(Number(value.toPrecision(4))) : value.toExponential(2).replace('e+', 'e');
  return text.replace('-', '−');
}

/** A pole or zero as `s = −1 ± 2j` style text (`z = …` in the discrete domain). */
export function formatMode(value: Complex, domain: 'continuous' | 'discrete' = 'continuous'): string {
  const variable = domain === 'discrete' ? 'z' : 's';
  const im = Math.abs(value.im);
  if (im === 0 || im <= 1e-12 * Math.max(1, Math.abs(value.re))) return `${variable} = ${formatNumber(value.re)}`;
  return `${variable} = ${formatNumber(value.re)} ± ${formatNumber(im)}j`;
}

export function formatPercent(fraction: number): string {
  return `${formatNumber(100 * fraction)} %`;
}

export function quote(name: string): string {
  return '`' + name + '`';
}
