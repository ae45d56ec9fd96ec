// Public types of the numeric layer. The layer imports nothing of ours; at its boundary a real
// matrix is an array of rows (`Rows`), and each algorithm works internally on flat,
// row-major Float64Array storage (see dense.ts) for speed.

export type Rows = number[][];

export interface Complex {
  re: number;
  im: number;
}

/** A complex matrix as separate real and imaginary parts, each an array of rows. */
export interface ComplexRows {
  re: Rows;
  im: Rows;
}
