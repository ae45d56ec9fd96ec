// What the benchmark calls, bundled by test/bench/run.mjs (not part of the product).
export { eigenvalues, singularValues, matrixExponential, solveContinuousRiccati, solveDiscreteRiccati } from '../../server/src/numeric';
export { placePoles } from '../../server/src/control/placement';
export { checkText, analyze } from '../../server/src/analyze';
export { resolveSettings } from '../../server/src/control/settings';
export { analyzeModes } from '../../server/src/control/modes';
export { analyzeControllability } from '../../server/src/control/structure';
export { setpointGains } from '../../server/src/control/setpoint';
export { designLqr } from '../../server/src/control/lqr';
export { discretiseZeroOrderHold } from '../../server/src/control/discretise';
export { simulateStepResponses } from '../../server/src/control/stepResponse';
export { loopMargins, stateFeedbackLoop } from '../../server/src/control/margins';
export { invariantZeros } from '../../server/src/numeric';
export { forgetRecentEigenvalues } from '../../server/src/numeric/eigenvectors';
