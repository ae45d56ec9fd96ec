// Public entry point of the numeric layer.
export * from './types';
export * from './dense';
export * from './lu';
export * from './cholesky';
export * from './linearRecursion';
export * from './householder';
export * from './hessenberg';
export * from './schur';
export * from './schurReorder';
export * from './balance';
export * from './eigenvectors';
export * from './quasiTriangularModes';
export * from './modalStepOutputs';
export * from './qr';
export * from './svd';
export * from './rank';
export * from './polynomial';

// ---- control-equation solvers (owned separately; added at integration) ----
export { matrixExponential, matrixExponentialDense, matrixExponentialIntegral, type MatrixExponentialIntegral } from './expm';
export { solveSylvester, solveSylvesterDense, type SylvesterSolution } from './sylvester';
export {
  solveLyapunovContinuous,
  solveLyapunovContinuousDense,
  solveLyapunovDiscrete,
  solveLyapunovDiscreteDense,
  type LyapunovSolution,
} from './lyapunov';
export { matrixSign, matrixSignDense, type MatrixSignResult } from './matrixSign';
export {
  continuousRiccatiConditionEstimate,
  solveContinuousRiccati,
  type ChordBasis,
  type ContinuousRiccatiOptions,
  type RiccatiFailure,
  type RiccatiSolution,
} from './riccatiContinuous';
export { discreteRiccatiConditionEstimate, solveDiscreteRiccati, type DiscreteRiccatiOptions } from './riccatiDiscrete';
export {
  eigenvaluesByQz,
  finiteGeneralizedEigenvalues,
  generalizedEigenvalues,
  generalizedEigenvaluesDense,
  type GeneralizedEigenvalues,
} from './qz';
export { invariantZeros, type InvariantZerosResult } from './invariantZeros';
export * from './iterationCount';
export * from './originCluster';
