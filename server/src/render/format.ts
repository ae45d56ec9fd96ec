// Number formatting shared by the text renderers (CLI report, hovers use their own Markdown).
import type { Complex, Rows } from '../model/types';

/** A number to `digits` significant digits, without trailing noise; ∞ spelled out. */
export function formatNumber(value: number | null | undefined, digits = 5): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (value === Infinity) return '∞';
  if (value === -Infinity) return '−∞';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e6 || magnitude < 1e-4) return value.toExponential(digits - 1).replace(/\.?0+e/, 'e');
  return String(Number(value.toPrecision(digits)));
}

export function formatComplex(value: Complex, digits = 5): string {
  const tiny = 64 * Number.EPSILON * Math.max(1, Math.abs(value.re), Math.abs(value.im));
  if (Math.abs(value.im) <= tiny) return formatNumber(value.re, digits);
  const sign = value.im < 0 ? '−' : '+';
  const re = Math.abs(value.re) <= tiny ? '' : `${formatNumber(value.re, digits)} ${sign} `;
  const im = `${formatNumber(Math.abs(value.im), digits)}j`;
  return re ? `${re}${im}` : `${value.im < 0 ? '−' : ''}${im}`;
}

/** A sorted pole list with conjugate pairs folded: `−4 ± 3j, −10`. */
export function formatPoleList(values: Complex[], digits = 5): string {
  const parts: string[] = [];
  for (const value of values) {
    if (value.im < 0 && values.some((other) => other.im > 0 && Math.abs(other.re - value.re) <= 64 * Number.EPSILON * Math.max(1, Math.abs(value.re)) && Math.abs(other.im + value.im) <= 64 * Number.EPSILON * Math.max(1, Math.abs(value.im)))) continue;
    if (value.im > 0) parts.push(`${formatNumber(value.re, digits)} ± ${formatNumber(value.im, digits)}j`);
    else parts.push(formatComplex(value, digits));
  }
  return parts.join(', ');
}

export function formatRows(rows: Rows | null | undefined, digits = 5): string {
  if (!rows) return '—';
  return `[${rows.map((row) => row.map((entry) => formatNumber(entry, digits)).join(', ')).join('; ')}]`;
}
