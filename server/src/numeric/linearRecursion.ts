// Outputs of a linear recursion x_{k+1} = Φ·x_k + f, x_0 = 0, without forming every state.
// Over a block of s steps x_{k+j} = Φ^j·x_k + S_j with S_j = Σ_{i<j} Φ^i·f, so the outputs are
// O·x_{k+j} = (O·Φ^j)·x_k + O·S_j and the next block starts from x_{k+s} = Φ^s·x_k + S_s. With r
// output rows that is r·n + n²/s multiply–adds per step instead of the n² of stepping the state
// (s = 16: about a quarter at n = 100), plus log₂ s products for Φ^s by repeated squaring. The
// values are those of the step-by-step recursion in exact arithmetic; in floating point the two
// differ by rounding of the order ε·n·max_j ‖Φ^j‖·‖x‖ (checked against it and against SciPy).
import { type Dense, multiplyDense } from './dense';

/**
 * O·x_k for k = 0..count−1, one after another (count × rows, row-major). phi: size×size and
 * outputs: rows×size, both row-major; blockSize a power of two.
 */
export function outputsOfLinearRecursion(
  phi: Float64Array,
  forcing: Float64Array,
  size: number,
  count: number,
  outputs: Float64Array,
  rows: number,
  blockSize = 16,
): Float64Array {
  const s = blockSize;
  // M_j = O·Φ^j (rows × size) for j < s, one after another.
  const M = new Float64Array(s * rows * size);
  M.set(outputs.subarray(0, rows * size), 0);
  for (let j = 1; j < s; j++) {
    const previous = (j - 1) * rows * size;
    const current = j * rows * size;
    for (let r = 0; r < rows; r++) {
      const from = previous + r * size;
      const to = current + r * size;
      for (let l = 0; l < size; l++) {
        const coefficient = M[from + l];
        if (coefficient === 0) continue;
        const phiRow = l * size;
        for (let c = 0; c < size; c++) M[to + c] += coefficient * phi[phiRow + c];
      }
    }
  }
  // S_j = Φ·S_{j−1} + f (S_0 = 0) and the offsets O·S_j for j < s.
  const offsets = new Float64Array(s * rows);
  let sum = new Float64Array(size);
  let next = new Float64Array(size);
  for (let j = 0; j < s; j++) {
    for (let r = 0; r < rows; r++) {
      let value = 0;
      for (let c = 0; c < size; c++) value += outputs[r * size + c] * sum[c];
      offsets[j * rows + r] = value;
    }
    for (let i = 0; i < size; i++) {
      let value = forcing[i];
      for (let c = 0; c < size; c++) value += phi[i * size + c] * sum[c];
      next[i] = value;
    }
    [sum, next] = [next, sum];
  }
  const blockForcing = sum; // S_s
  let power: Dense = { rows: size, cols: size, data: phi.slice() };
  for (let e = 1; e < s; e *= 2) power = multiplyDense(power, power);
  const phiBlock = power.data;

  const result = new Float64Array(count * rows);
  let x = new Float64Array(size);
  let following = new Float64Array(size);
  for (let k = 0; k < count; k += s) {
    const steps = Math.min(s, count - k);
    for (let j = 0; j < steps; j++) {
      const block = j * rows * size;
      for (let r = 0; r < rows; r++) {
        const row = block + r * size;
        let value = offsets[j * rows + r];
        for (let c = 0; c < size; c++) value += M[row + c] * x[c];
        result[(k + j) * rows + r] = value;
      }
    }
    if (k + s >= count) break;
    for (let i = 0; i < size; i++) {
      let value = blockForcing[i];
      const row = i * size;
      for (let c = 0; c < size; c++) value += phiBlock[row + c] * x[c];
      following[i] = value;
    }
    [x, following] = [following, x];
  }
  return result;
}
