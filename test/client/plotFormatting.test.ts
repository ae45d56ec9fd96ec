import { describe, expect, it } from 'vitest';
import { niceTicks } from '../../client/src/plots/poleMap';
import { formatNumber } from '../../client/src/plots/types';

describe('formatNumber', () => {
  it('keeps four significant digits and a typographic minus', () => {
    expect(formatNumber(3.14159)).toBe('3.142');
    expect(formatNumber(-0.3333333)).toBe('−0.3333');
    expect(formatNumber(1200)).toBe('1200');
  });
  it('switches to exponent form for very large and very small magnitudes', () => {
    expect(formatNumber(2.5e-5)).toBe('2.500e−5');
    expect(formatNumber(-123456)).toBe('−1.235e+5');
  });
  it('names missing and infinite values instead of printing NaN', () => {
    expect(formatNumber(null)).toBe('—');
    expect(formatNumber(Number.NaN)).toBe('—');
    expect(formatNumber(Number.POSITIVE_INFINITY)).toBe('∞');
    expect(formatNumber(0)).toBe('0');
  });
});

describe('niceTicks', () => {
  it('steps by 1, 2 or 5 times a power of ten and covers the range', () => {
    const ticks = niceTicks(-17.3, 2.1);
    const step = ticks[1] - ticks[0];
    expect([1, 2, 5, 10]).toContain(Number((step / 10 ** Math.floor(Math.log10(step))).toFixed(6)));
    expect(ticks[0]).toBeGreaterThanOrEqual(-17.3);
    expect(ticks[0] - step).toBeLessThan(-17.3);
    expect(ticks.at(-1)!).toBeLessThanOrEqual(2.1 + step * 1e-9);
    expect(ticks.at(-1)! + step).toBeGreaterThan(2.1);
    expect(ticks).toContain(0);
  });
  it('returns the single value of an empty range', () => {
    expect(niceTicks(3, 3)).toEqual([3]);
  });
});
