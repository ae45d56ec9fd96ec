// Public entry point of the numeric layer.
export * from './types';
export * from './dense';
export * from './lu';
export * from './householder';
export * from './hessenberg';
export * from './schur';
export * from './schurReorder';
export * from './balance';
export * from './eigenvectors';
export * from './qr';
export * from './svd';
export * from './rank';
export * from './polynomial';

// ---- control-equation solvers (owned separately; added at integration) ----
