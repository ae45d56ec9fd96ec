// Number display for hovers, lenses and hints: 5 significant digits, exponent form for very
// large or very small magnitudes, complex values in the language's own `a + bj` notation.
import type { Complex, Rows } from '../model/types';

export function formatNumber(value: number, digits = 5): string {
  if (Number.isNaN(value)) return 'NaN';
  if (value === Infinity) return '∞';
  if (value === -Infinity) return '−∞';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e6 || magnitude < 1e-3) {
    const [mantissa, exponent] = value.toExponential(digits - 1).split('e');
    return `${trimZeros(mantissa)}e${exponent.replace('+', '')}`;
  }
  // Whole numbers wider than the digit budget print in full (45600, not 4.56e4): gains read better.
  if (magnitude >= 10 ** digits) return String(Math.round(value));
  return trimZeros(value.toPrecision(digits));
}

function trimZeros(text: string): string {
  return text.includes('.') ? text.replace(/\.?0+$/, '') : text;
}

/** Imaginary parts negligible against the real part (relative to machine precision) print as real. */
export function formatComplex(value: Complex, digits = 5): string {
  const scale = Math.max(Math.abs(value.re), Math.abs(value.im));
  if (Math.abs(value.im) <= 64 * Number.EPSILON * scale || value.im === 0) return formatNumber(value.re, digits);
  const imaginary = `${formatNumber(Math.abs(value.im), digits)}j`;
  if (Math.abs(value.re) <= 64 * Number.EPSILON * scale) return value.im < 0 ? `-${imaginary}` : imaginary;
  return `${formatNumber(value.re, digits)} ${value.im < 0 ? '-' : '+'} ${imaginary}`;
}

/** A value with an optional unit: `1.2 s`, `3.4 rad/s`. */
export function withUnit(value: number | null | undefined, unit: string, digits = 5): string {
  if (value === null || value === undefined) return '—';
  return unit ? `${formatNumber(value, digits)} ${unit}` : formatNumber(value, digits);
}

/** A matrix in the language's own notation with right-aligned columns (for code blocks). */
export function formatRows(rows: Rows, digits = 5, indent = ''): string {
  if (rows.length === 0) return '[]';
  const cells = rows.map((row) => row.map((value) => formatNumber(value, digits)));
  const columns = Math.max(...cells.map((row) => row.length));
  const widths = Array.from({ length: columns }, (_, column) =>
    Math.max(...cells.map((row) => (row[column] ?? '').length)),
  );
  const lines = cells.map((row) => row.map((cell, column) => cell.padStart(widths[column])).join(', '));
  return '[' + lines.join(`;\n${indent} `) + ']';
}

/** A compact one-line matrix: `[1.2, 3.4]` for a row, `[1; 2]` for a column. */
export function formatRowsInline(rows: Rows, digits = 4): string {
  return '[' + rows.map((row) => row.map((value) => formatNumber(value, digits)).join(', ')).join('; ') + ']';
}

export function shapeOf(rows: Rows): string {
  const columns = rows.length === 0 ? 0 : rows[0].length;
  return `${rows.length}×${columns}`;
}

/** Escapes characters Markdown would interpret inside a table cell or text. */
export function escapeMarkdown(text: string): string {
  return text.replace(/([\\`*_{}\[\]<>|])/g, '\\$1');
}

/** A polynomial in s from coefficients, highest power first: `0.5 s + 2`, `s^2 + 4 s + 5`. */
export function formatPolynomial(coefficients: number[], digits = 4): string {
  const degree = coefficients.length - 1;
  const terms: string[] = [];
  coefficients.forEach((coefficient, index) => {
    if (coefficient === 0) return;
    const power = degree - index;
    const magnitude = Math.abs(coefficient);
    const number = magnitude === 1 && power > 0 ? '' : formatNumber(magnitude, digits);
    const variable = power === 0 ? '' : power === 1 ? 's' : `s^${power}`;
    const body = [number, variable].filter(Boolean).join(' ');
    if (terms.length === 0) terms.push(coefficient < 0 ? `-${body}` : body);
    else terms.push(coefficient < 0 ? `- ${body}` : `+ ${body}`);
  });
  return terms.length === 0 ? '0' : terms.join(' ');
}
