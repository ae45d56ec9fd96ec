// Zeros (or eigenvalues) at the origin computed as a cloud around it. A k-fold root at 0 in a
// Jordan-like structure is perturbed by rounding to a circle of radius about (ε·‖M‖)^(1/k)·‖M‖^((k−1)/k)
// (a double zero of a 1e2-scaled model shows up as ±2e-9), while the MEAN of the cluster stays
// accurate to about ε·‖M‖: the trace of an invariant subspace is well conditioned (Kato 1966;
// Golub & Van Loan, "Matrix Computations", §7.2 on clusters). So the k values nearest 0 are
// reported as exactly 0 when they lie within that radius AND their mean is within rounding of 0.
import type { Complex } from './types';

const EPS = Number.EPSILON;
/** Slack on the rounding radius and on the mean (common practice: an order of magnitude). */
const SLACK = 10;

/**
 * @param values computed roots
 * @param scale a norm of the data they came from (e.g. ‖[A B; C D]‖_F)
 * @returns the values with the cluster at the origin (if any) replaced by exact zeros, in the
 *   original order; the count of values set to zero.
 */
export function snapOriginCluster(values: Complex[], scale: number): { values: Complex[]; atOrigin: number } {
  if (!(scale > 0) || !Number.isFinite(scale) || values.length === 0) return { values, atOrigin: 0 };
  const order = values
    .map((value, index) => ({ index, magnitude: Math.hypot(value.re, value.im) }))
    .filter((entry) => Number.isFinite(entry.magnitude))
    .sort((a, b) => a.magnitude - b.magnitude);
  for (let k = order.length; k >= 1; k--) {
    const cluster = order.slice(0, k);
    const radius = SLACK * Math.pow(k * EPS, 1 / k) * scale;
    if (cluster[k - 1].magnitude > radius) continue;
    let sumRe = 0;
    let sumIm = 0;
    for (const { index } of cluster) {
      sumRe += values[index].re;
      sumIm += values[index].im;
    }
    if (Math.hypot(sumRe, sumIm) / k > SLACK * k * EPS * scale) continue;
    const snapped = values.slice();
    for (const { index } of cluster) snapped[index] = { re: 0, im: 0 };
    return { values: snapped, atOrigin: k };
  }
  return { values, atOrigin: 0 };
}
