// Registry of every diagnostic the control layer reports (docs/diagnostics.md is generated from it).
// Each kind lives in its own file; a test fails when a file here defines a kind this list misses.
import { currentFormFeedthrough } from './current-form-feedthrough';
import { dcGainUndefinedKind } from './dc-gain-undefined';
import { defectiveClosedLoopKind } from './defective-closed-loop';
import { float32Rounding } from './float32-rounding';
import { fragilePlacementKind } from './fragile-placement';
import { fragilePrescalerKind } from './fragile-prescaler';
import { fullStateWithoutObserverKind } from './full-state-without-observer';
import { illConditionedSetpointKind } from './ill-conditioned-setpoint';
import { integralInfeasibleKind } from './integral-infeasible';
import { kalmanNoSolution } from './kalman-no-solution';
import { lqrNoStabilisingSolution } from './lqr-no-stabilising-solution';
import { lqrNotDetectableOnAxis } from './lqr-not-detectable-on-axis';
import { lqrQNotPositiveSemidefinite } from './lqr-q-not-positive-semidefinite';
import { lqrRNotPositiveDefinite } from './lqr-r-not-positive-definite';
import { lqrWeightShape } from './lqr-weight-shape';
import { marginSmall } from './margin-small';
import { nearlyUncontrollableKind } from './nearly-uncontrollable';
import { noInputs } from './no-inputs';
import { observerImpossible } from './observer-impossible';
import { observerPoleCount } from './observer-pole-count';
import { observerSlowerThanController } from './observer-slower-than-controller';
import { observerUnobservableUnstable } from './observer-unobservable-unstable';
import { openLoopUnstableKind } from './open-loop-unstable';
import { placementImpossibleKind } from './placement-impossible';
import { samplingPathological } from './sampling-pathological';
import { samplingTooLong } from './sampling-too-long';
import { saturationLimitExceeded } from './saturation-limit-exceeded';
import { saturationWindup } from './saturation-windup';
import { specUnusable } from './spec-unusable';
import { specViolation } from './spec-violation';
import { uncontrollableKind } from './uncontrollable';
import { unobservableKind } from './unobservable';
import { zeroDcGainKind } from './zero-dc-gain';
import { defineDiagnostic } from '../../model/diagnostics/define';

/**
 * `control/too-many-setpoints` (error): designFindings.ts builds this one by renaming a zero-DC-gain
 * diagnostic, without a kind file of its own; it is defined here so the reference lists it.
 */

import { tooManySetpointsKind } from './too-many-setpoints';
import { gainOverflowKind } from './gain-overflow';

export {
  gainOverflowKind,
  currentFormFeedthrough,
  dcGainUndefinedKind,
  defectiveClosedLoopKind,
  float32Rounding,
  fragilePlacementKind,
  fragilePrescalerKind,
  fullStateWithoutObserverKind,
  illConditionedSetpointKind,
  integralInfeasibleKind,
  kalmanNoSolution,
  lqrNoStabilisingSolution,
  lqrNotDetectableOnAxis,
  lqrQNotPositiveSemidefinite,
  lqrRNotPositiveDefinite,
  lqrWeightShape,
  marginSmall,
  nearlyUncontrollableKind,
  noInputs,
  observerImpossible,
  observerPoleCount,
  observerSlowerThanController,
  observerUnobservableUnstable,
  openLoopUnstableKind,
  placementImpossibleKind,
  samplingPathological,
  samplingTooLong,
  saturationLimitExceeded,
  saturationWindup,
  specUnusable,
  specViolation,
  uncontrollableKind,
  unobservableKind,
  zeroDcGainKind,
};

/** Every control diagnostic kind, in the order of the reference (by file name). */
export const controlDiagnosticKinds = [
  currentFormFeedthrough,
  dcGainUndefinedKind,
  defectiveClosedLoopKind,
  float32Rounding,
  fragilePlacementKind,
  fragilePrescalerKind,
  fullStateWithoutObserverKind,
  illConditionedSetpointKind,
  integralInfeasibleKind,
  kalmanNoSolution,
  lqrNoStabilisingSolution,
  lqrNotDetectableOnAxis,
  lqrQNotPositiveSemidefinite,
  lqrRNotPositiveDefinite,
  lqrWeightShape,
  marginSmall,
  nearlyUncontrollableKind,
  noInputs,
  observerImpossible,
  observerPoleCount,
  observerSlowerThanController,
  observerUnobservableUnstable,
  openLoopUnstableKind,
  placementImpossibleKind,
  samplingPathological,
  samplingTooLong,
  saturationLimitExceeded,
  saturationWindup,
  specUnusable,
  specViolation,
  tooManySetpointsKind,
  gainOverflowKind,
  uncontrollableKind,
  unobservableKind,
  zeroDcGainKind,
] as const;
