// Requested poles as real values and conjugate pairs (the real representation every placement
// method here works with), plus matching of computed poles to requested ones.
import type { Complex } from '../numeric/types';
import { EPS } from './controlLinearAlgebra';

export type PoleSlot = { kind: 'real'; value: number } | { kind: 'pair'; re: number; im: number };

/**
 * Group poles into real values and conjugate pairs. Imaginary parts below 100·n·ε·max|λ| count as
 * real; a complex pole without its conjugate (within the same tolerance) fails.
 */
export function groupConjugatePairs(poles: Complex[]): { slots: PoleSlot[] } | { unpaired: Complex } {
  const n = poles.length;
  const scale = Math.max(1, ...poles.map((p) => Math.hypot(p.re, p.im)));
  const tolerance = 100 * Math.max(1, n) * EPS * scale;
  const slots: PoleSlot[] = [];
  const used = new Array<boolean>(n).fill(false);
  for (let i = 0; i < n; i++) {
    if (used[i]) continue;
    const p = poles[i];
    used[i] = true;
    if (Math.abs(p.im) <= tolerance) {
      slots.push({ kind: 'real', value: p.re });
      continue;
    }
    let partner = -1;
    for (let j = i + 1; j < n; j++) {
      if (!used[j] && Math.abs(poles[j].re - p.re) <= tolerance && Math.abs(poles[j].im + p.im) <= tolerance) {
        partner = j;
        break;
      }
    }
    if (partner < 0) return { unpaired: p };
    used[partner] = true;
    slots.push({ kind: 'pair', re: (p.re + poles[partner].re) / 2, im: Math.abs(p.im - poles[partner].im) / 2 });
  }
  return { slots };
}

export function slotsToPoles(slots: PoleSlot[]): Complex[] {
  return slots.flatMap((slot) =>
    slot.kind === 'real'
      ? [{ re: slot.value, im: 0 }]
      : [
          { re: slot.re, im: slot.im },
          { re: slot.re, im: -slot.im },
        ],
  );
}

export function slotWidth(slot: PoleSlot): number {
  return slot.kind === 'real' ? 1 : 2;
}

/**
 * Greedy closest-pair matching of `computed` to `requested` (same length): returns for each
 * computed value the index of its requested partner.
 */
export function matchPoles(computed: Complex[], requested: Complex[]): number[] {
  const pairs: { i: number; j: number; d: number }[] = [];
  computed.forEach((c, i) =>
    requested.forEach((r, j) => pairs.push({ i, j, d: Math.hypot(c.re - r.re, c.im - r.im) })),
  );
  pairs.sort((a, b) => a.d - b.d);
  const partner = new Array<number>(computed.length).fill(-1);
  const taken = new Array<boolean>(requested.length).fill(false);
  for (const { i, j } of pairs) {
    if (partner[i] >= 0 || taken[j]) continue;
    partner[i] = j;
    taken[j] = true;
  }
  return partner;
}

/** Largest multiplicity of any requested pole (values within 100·n·ε·max|λ| count as equal). */
export function largestMultiplicity(poles: Complex[]): number {
  return Math.max(0, ...poles.map((p) => multiplicityOf(p, poles)));
}

/** How many of `poles` coincide with `pole` to the tolerance of largestMultiplicity. */
export function multiplicityOf(pole: Complex, poles: Complex[]): number {
  const scale = Math.max(1, ...poles.map((p) => Math.hypot(p.re, p.im)));
  const tolerance = 100 * Math.max(1, poles.length) * EPS * scale;
  return poles.filter((q) => Math.hypot(q.re - pole.re, q.im - pole.im) <= tolerance).length;
}
