// Pole lists: complex numbers, one per entry of `[…]` (or a computed vector). Complex poles
// must come in conjugate pairs; partners are matched within a tolerance scaled to the
// largest pole magnitude (√ε · max|p|) and then made exactly conjugate, so computed poles
// such as `-a + b*1j` with rounding still pair up.
import type { Expr } from '../../../grammar/src/ast';
import * as Cx from './complex';
import { shapeMismatch, unpairedPole } from './diagnostics/index';
import { asScalar, evaluateValue, shapeText, type ValueScope } from './evaluate';
import type { Complex, Diagnostic, PoleSpec } from './types';

export function evaluatePoles(expr: Expr, scope: ValueScope, out: Diagnostic[]): PoleSpec | null {
  const values: Complex[] = [];
  const entryRanges = [];
  let failed = false;
  if (expr.kind === 'matrix') {
    const rows = expr.rows.filter((row) => row.entries.length > 0);
    for (const row of rows) {
      for (const entry of row.entries) {
        const value = evaluateValue(entry, scope, out);
        if (value === null) {
          failed = true;
          continue;
        }
        const z = asScalar(value);
        if (z === null) {
          out.push(shapeMismatch.create(entry.range, [`a pole must be a number, not ${shapeText(value)}`]));
          failed = true;
          continue;
        }
        values.push(z);
        entryRanges.push(entry.range);
      }
    }
  } else {
    const value = evaluateValue(expr, scope, out);
    if (value === null) return null;
    if (value.kind === 'scalar') {
      values.push(value.value);
      entryRanges.push(expr.range);
    } else if (value.rows === 1 || value.cols === 1) {
      for (const z of value.entries.flat()) {
        values.push(z);
        entryRanges.push(expr.range);
      }
    } else {
      out.push(shapeMismatch.create(expr.range, [`poles are a list, not ${shapeText(value)}`]));
      return null;
    }
  }
  if (failed) return null;
  const paired = pairConjugates(values);
  let ok = true;
  for (const index of paired.unpaired) {
    ok = false;
    const z = values[index]!;
    out.push(unpairedPole.create(entryRanges[index]!, [Cx.formatComplex(z), Cx.formatComplex({ re: z.re, im: -z.im })], { data: { fix: 'add-conjugate', conjugate: { re: z.re, im: -z.im } } }));
  }
  return ok ? { values: paired.values, range: expr.range, entryRanges } : null;
}

/** Matches complex poles with their conjugates; returns snapped values and indices left alone. */
export function pairConjugates(poles: Complex[]): { values: Complex[]; unpaired: number[] } {
  const scale = Math.max(0, ...poles.map(Cx.modulus));
  const tolerance = Math.sqrt(Number.EPSILON) * scale;
  const values = poles.map((z) => (Cx.isNearlyReal(z) ? { re: z.re, im: 0 } : { ...z }));
  const used = new Array<boolean>(values.length).fill(false);
  const unpaired: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const z = values[i]!;
    if (used[i] || z.im === 0) continue;
    used[i] = true;
    let best = -1;
    let bestDistance = Number.POSITIVE_INFINITY;
    for (let j = 0; j < values.length; j++) {
      const w = values[j]!;
      if (used[j] || w.im === 0 || Math.sign(w.im) === Math.sign(z.im)) continue;
      const distance = Math.hypot(w.re - z.re, w.im + z.im);
      if (distance < bestDistance) {
        best = j;
        bestDistance = distance;
      }
    }
    if (best >= 0 && bestDistance <= tolerance) {
      used[best] = true;
      values[best] = { re: z.re, im: -z.im };
    } else {
      unpaired.push(i);
    }
  }
  return { values, unpaired };
}
