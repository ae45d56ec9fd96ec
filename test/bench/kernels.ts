// What the benchmark calls, bundled by test/bench/run.mjs (not part of the product).
export { eigenvalues, singularValues, matrixExponential, solveContinuousRiccati, solveDiscreteRiccati } from '../../server/src/numeric';
export { placePoles } from '../../server/src/control/placement';
export { checkText, analyze } from '../../server/src/analyze';
export { resolveSettings } from '../../server/src/control/settings';
