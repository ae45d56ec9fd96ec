// Flat row-major dense matrices and small elementwise/product helpers.
// Every algorithm in numeric/ works on `Dense` internally (one Float64Array, entry (i, j) at
// data[i * cols + j]) and converts to and from `Rows` only at its public boundary.

import type { Rows } from './types';

export interface Dense {
  rows: number;
  cols: number;
  /** Row-major storage: entry (i, j) is data[i * cols + j]. */
  data: Float64Array;
}

// ---------------------------------------------------------------- Dense level

export function zerosDense(rows: number, cols: number): Dense {
  return { rows, cols, data: new Float64Array(rows * cols) };
}

export function identityDense(n: number): Dense {
  const result = zerosDense(n, n);
  for (let i = 0; i < n; i++) result.data[i * n + i] = 1;
  return result;
}

export function denseFromRows(matrix: Rows): Dense {
  const rows = matrix.length;
  const cols = rows === 0 ? 0 : matrix[0].length;
  const result = zerosDense(rows, cols);
  for (let i = 0; i < rows; i++) {
    const row = matrix[i];
    if (row.length !== cols) throw new Error(`denseFromRows: row ${i} has ${row.length} entries, expected ${cols}`);
    result.data.set(row, i * cols);
  }
  return result;
}

export function denseToRows(matrix: Dense): Rows {
  const { rows, cols, data } = matrix;
  const result: Rows = new Array(rows);
  // A plain copy loop: Array.from on a subarray costs about a microsecond per row, which
  // dominated for tall thin matrices (a 100 × 1 column: 100 rows).
  for (let i = 0; i < rows; i++) {
    const row = new Array<number>(cols);
    for (let j = 0, k = i * cols; j < cols; j++, k++) row[j] = data[k];
    result[i] = row;
  }
  return result;
}

export function copyDense(matrix: Dense): Dense {
  return { rows: matrix.rows, cols: matrix.cols, data: matrix.data.slice() };
}

/**
 * Product a·b, i-k-j order with 2×2 register blocking: two rows of a against two rows of b per
 * pass, so each load of b and of the result serves two multiply-adds (2.5–3× the plain loop at
 * n = 100–200, measured in test/bench). Pairs of zero entries of a are skipped (sparse B·K terms).
 */
export function multiplyDense(a: Dense, b: Dense): Dense {
  if (a.cols !== b.rows) throw new Error(`multiplyDense: ${a.rows}×${a.cols} times ${b.rows}×${b.cols}`);
  return blockedProduct(a, b, false);
}

/**
 * The kernel of multiplyDense. With `fromDiagonal`, row i is computed from column i on only (the
 * upper triangle of a square product, and a few entries below it in rows not divisible by 4).
 * Register blocking: four rows of the result take four rows of b per pass, so each loaded entry of b
 * serves four rows and each result entry is read and written once per four products (1.8× the
 * two-by-two kernel at n = 100 and 200, measured side by side). Blocks of `a` that are all zero are
 * skipped (sparse physical models).
 */
function blockedProduct(a: Dense, b: Dense, fromDiagonal: boolean): Dense {
  const m = a.rows;
  const inner = a.cols;
  const n = b.cols;
  const result = zerosDense(m, n);
  const ad = a.data;
  const bd = b.data;
  const rd = result.data;
  let i = 0;
  for (; i + 3 < m; i += 4) {
    const first = fromDiagonal ? i : 0;
    const r0 = i * n;
    const r1 = r0 + n;
    const r2 = r1 + n;
    const r3 = r2 + n;
    const a0 = i * inner;
    const a1 = a0 + inner;
    const a2 = a1 + inner;
    const a3 = a2 + inner;
    let k = 0;
    for (; k + 3 < inner; k += 4) {
      const x00 = ad[a0 + k], x01 = ad[a0 + k + 1], x02 = ad[a0 + k + 2], x03 = ad[a0 + k + 3];
      const x10 = ad[a1 + k], x11 = ad[a1 + k + 1], x12 = ad[a1 + k + 2], x13 = ad[a1 + k + 3];
      const x20 = ad[a2 + k], x21 = ad[a2 + k + 1], x22 = ad[a2 + k + 2], x23 = ad[a2 + k + 3];
      const x30 = ad[a3 + k], x31 = ad[a3 + k + 1], x32 = ad[a3 + k + 2], x33 = ad[a3 + k + 3];
      if (
        x00 === 0 && x01 === 0 && x02 === 0 && x03 === 0 &&
        x10 === 0 && x11 === 0 && x12 === 0 && x13 === 0 &&
        x20 === 0 && x21 === 0 && x22 === 0 && x23 === 0 &&
        x30 === 0 && x31 === 0 && x32 === 0 && x33 === 0
      ) continue;
      const b0 = k * n;
      const b1 = b0 + n;
      const b2 = b1 + n;
      const b3 = b2 + n;
      for (let j = first; j < n; j++) {
        const p = bd[b0 + j];
        const q = bd[b1 + j];
        const r = bd[b2 + j];
        const t = bd[b3 + j];
        rd[r0 + j] += x00 * p + x01 * q + x02 * r + x03 * t;
        rd[r1 + j] += x10 * p + x11 * q + x12 * r + x13 * t;
        rd[r2 + j] += x20 * p + x21 * q + x22 * r + x23 * t;
        rd[r3 + j] += x30 * p + x31 * q + x32 * r + x33 * t;
      }
    }
    for (; k < inner; k++) {
      const x0 = ad[a0 + k];
      const x1 = ad[a1 + k];
      const x2 = ad[a2 + k];
      const x3 = ad[a3 + k];
      if (x0 === 0 && x1 === 0 && x2 === 0 && x3 === 0) continue;
      const b0 = k * n;
      for (let j = first; j < n; j++) {
        const p = bd[b0 + j];
        rd[r0 + j] += x0 * p;
        rd[r1 + j] += x1 * p;
        rd[r2 + j] += x2 * p;
        rd[r3 + j] += x3 * p;
      }
    }
  }
  for (; i < m; i++) {
    const first = fromDiagonal ? i : 0;
    const r0 = i * n;
    for (let k = 0; k < inner; k++) {
      const x = ad[i * inner + k];
      if (x === 0) continue;
      const b0 = k * n;
      for (let j = first; j < n; j++) rd[r0 + j] += x * bd[b0 + j];
    }
  }
  return result;
}

/**
 * M·Nᵀ for a product known to be symmetric (for instance A·S·Aᵀ with S symmetric, M = A·S): only
 * the upper triangle is computed and then mirrored — about half the work of the full product, and
 * exactly symmetric.
 */
export function multiplyTransposeSymmetricDense(M: Dense, N: Dense): Dense {
  if (M.cols !== N.cols || M.rows !== N.rows) throw new Error(`multiplyTransposeSymmetricDense: ${M.rows}×${M.cols} times (${N.rows}×${N.cols})ᵀ`);
  return upperTriangleProduct(M, transposeDense(N));
}

/** Nᵀ·P for a product known to be symmetric (for instance Aᵀ·S·A with S symmetric, P = S·A), as above. */
export function transposeMultiplySymmetricDense(N: Dense, P: Dense): Dense {
  if (N.rows !== P.rows || N.cols !== P.cols) throw new Error(`transposeMultiplySymmetricDense: (${N.rows}×${N.cols})ᵀ times ${P.rows}×${P.cols}`);
  return upperTriangleProduct(transposeDense(N), P);
}

/** The upper triangle of the square product X·Y (blockedProduct from the diagonal), mirrored below. */
function upperTriangleProduct(X: Dense, Y: Dense): Dense {
  const result = blockedProduct(X, Y, true);
  const n = result.rows;
  const r = result.data;
  for (let row = 1; row < n; row++) for (let column = 0; column < row; column++) r[row * n + column] = r[column * n + row];
  return result;
}

export function transposeDense(matrix: Dense): Dense {
  const { rows, cols, data } = matrix;
  const result = zerosDense(cols, rows);
  const rd = result.data;
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < cols; j++) rd[j * rows + i] = data[i * cols + j];
  }
  return result;
}

function checkSameShape(a: Dense, b: Dense, operation: string): void {
  if (a.rows !== b.rows || a.cols !== b.cols) {
    throw new Error(`${operation}: shapes ${a.rows}×${a.cols} and ${b.rows}×${b.cols} differ`);
  }
}

export function addDense(a: Dense, b: Dense): Dense {
  checkSameShape(a, b, 'addDense');
  const result = zerosDense(a.rows, a.cols);
  for (let i = 0; i < a.data.length; i++) result.data[i] = a.data[i] + b.data[i];
  return result;
}

export function subtractDense(a: Dense, b: Dense): Dense {
  checkSameShape(a, b, 'subtractDense');
  const result = zerosDense(a.rows, a.cols);
  for (let i = 0; i < a.data.length; i++) result.data[i] = a.data[i] - b.data[i];
  return result;
}

export function scaleDense(matrix: Dense, factor: number): Dense {
  const result = zerosDense(matrix.rows, matrix.cols);
  for (let i = 0; i < matrix.data.length; i++) result.data[i] = matrix.data[i] * factor;
  return result;
}

/** Maximum absolute column sum. */
export function norm1Dense(matrix: Dense): number {
  const { rows, cols, data } = matrix;
  let best = 0;
  for (let j = 0; j < cols; j++) {
    let sum = 0;
    for (let i = 0; i < rows; i++) sum += Math.abs(data[i * cols + j]);
    if (sum > best || Number.isNaN(sum)) best = sum;
  }
  return best;
}

/** Maximum absolute row sum. */
export function normInfDense(matrix: Dense): number {
  const { rows, cols, data } = matrix;
  let best = 0;
  for (let i = 0; i < rows; i++) {
    let sum = 0;
    for (let j = 0; j < cols; j++) sum += Math.abs(data[i * cols + j]);
    if (sum > best || Number.isNaN(sum)) best = sum;
  }
  return best;
}

/** Frobenius norm, accumulated with scaling so that huge or tiny entries neither overflow nor underflow. */
export function normFrobeniusDense(matrix: Dense): number {
  return scaledNorm2(matrix.data);
}

/** Euclidean norm of a vector with LAPACK dnrm2-style scaling. */
export function scaledNorm2(values: ArrayLike<number>, start = 0, end = values.length, stride = 1): number {
  let scale = 0;
  let sumOfSquares = 1;
  for (let i = start; i < end; i += stride) {
    const value = values[i];
    if (value !== 0) {
      const magnitude = Math.abs(value);
      if (Number.isNaN(magnitude)) return NaN;
      if (scale < magnitude) {
        const ratio = scale / magnitude;
        sumOfSquares = 1 + sumOfSquares * ratio * ratio;
        scale = magnitude;
      } else {
        const ratio = magnitude / scale;
        sumOfSquares += ratio * ratio;
      }
    }
  }
  return scale * Math.sqrt(sumOfSquares);
}

// ---------------------------------------------------------------- Rows level

export function zeros(rows: number, cols: number): Rows {
  const result: Rows = new Array(rows);
  for (let i = 0; i < rows; i++) result[i] = new Array<number>(cols).fill(0);
  return result;
}

export function identity(n: number): Rows {
  const result = zeros(n, n);
  for (let i = 0; i < n; i++) result[i][i] = 1;
  return result;
}

export function multiply(a: Rows, b: Rows): Rows {
  return denseToRows(multiplyDense(denseFromRows(a), denseFromRows(b)));
}

export function transpose(matrix: Rows): Rows {
  const rows = matrix.length;
  const cols = rows === 0 ? 0 : matrix[0].length;
  const result = zeros(cols, rows);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) result[j][i] = matrix[i][j];
  return result;
}

function elementwise(a: Rows, b: Rows, operation: string, combine: (x: number, y: number) => number): Rows {
  if (a.length !== b.length || (a.length > 0 && a[0].length !== b[0].length)) {
    throw new Error(`${operation}: shapes differ`);
  }
  return a.map((row, i) => row.map((value, j) => combine(value, b[i][j])));
}

export function add(a: Rows, b: Rows): Rows {
  return elementwise(a, b, 'add', (x, y) => x + y);
}

export function subtract(a: Rows, b: Rows): Rows {
  return elementwise(a, b, 'subtract', (x, y) => x - y);
}

export function scale(matrix: Rows, factor: number): Rows {
  return matrix.map((row) => row.map((value) => value * factor));
}

/** Side-by-side concatenation [A B …]; all blocks must have the same number of rows. */
export function hstack(...blocks: Rows[]): Rows {
  if (blocks.length === 0) return [];
  const rows = blocks[0].length;
  for (const block of blocks) {
    if (block.length !== rows) throw new Error('hstack: blocks have different row counts');
  }
  const result: Rows = [];
  for (let i = 0; i < rows; i++) result.push(blocks.flatMap((block) => block[i]));
  return result;
}

/** Stacked concatenation [A; B; …]; all blocks must have the same number of columns. */
export function vstack(...blocks: Rows[]): Rows {
  const nonEmpty = blocks.filter((block) => block.length > 0);
  if (nonEmpty.length === 0) return [];
  const cols = nonEmpty[0][0].length;
  for (const block of nonEmpty) {
    if (block[0].length !== cols) throw new Error('vstack: blocks have different column counts');
  }
  return nonEmpty.flatMap((block) => block.map((row) => row.slice()));
}

export function blockDiagonal(...blocks: Rows[]): Rows {
  const widths = blocks.map((block) => (block.length === 0 ? 0 : block[0].length));
  const totalRows = blocks.reduce((sum, block) => sum + block.length, 0);
  const totalCols = widths.reduce((sum, width) => sum + width, 0);
  const result = zeros(totalRows, totalCols);
  let rowOffset = 0;
  let colOffset = 0;
  blocks.forEach((block, index) => {
    for (let i = 0; i < block.length; i++) {
      for (let j = 0; j < widths[index]; j++) result[rowOffset + i][colOffset + j] = block[i][j];
    }
    rowOffset += block.length;
    colOffset += widths[index];
  });
  return result;
}

export function norm1(matrix: Rows): number {
  return norm1Dense(denseFromRows(matrix));
}

export function normInf(matrix: Rows): number {
  return normInfDense(denseFromRows(matrix));
}

export function normFrobenius(matrix: Rows): number {
  return normFrobeniusDense(denseFromRows(matrix));
}

export function isFiniteMatrix(matrix: Rows): boolean {
  return matrix.every((row) => row.every((value) => Number.isFinite(value)));
}
