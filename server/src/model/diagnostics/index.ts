// Registry of every diagnostic the model layer reports (docs/diagnostics.md is generated from it).
import { internalError } from './internal-error';
import { duplicateName } from './duplicate-name';
import { unknownName } from './unknown-name';
import { unknownPlant } from './unknown-plant';
import { shadowedName } from './shadowed-name';
import { reservedName } from './reserved-name';
import { unknownFunction } from './unknown-function';
import { wrongArity } from './wrong-arity';
import { signalInValue } from './signal-in-value';
import { parameterCycle } from './parameter-cycle';
import { divisionByZero } from './division-by-zero';
import { nonFinite } from './non-finite';
import { notReal } from './not-real';
import { shapeMismatch } from './shape-mismatch';
import { invalidArgument } from './invalid-argument';
import { unknownUnit } from './unknown-unit';
import { unexpectedUnit } from './unexpected-unit';
import { wrongUnit } from './wrong-unit';
import { missingUnit } from './missing-unit';
import { outOfRange } from './out-of-range';
import { sampleTooShort } from './sample-too-short';
import { mixedForms } from './mixed-forms';
import { noDynamics } from './no-dynamics';
import { unknownMatrix } from './unknown-matrix';
import { duplicateDefinition } from './duplicate-definition';
import { missingMatrix } from './missing-matrix';
import { matrixShape } from './matrix-shape';
import { raggedMatrix } from './ragged-matrix';
import { missingSignals } from './missing-signals';
import { inferredSignals } from './inferred-signals';
import { missingEquation } from './missing-equation';
import { outputReference } from './output-reference';
import { needsOperatingPoint } from './needs-operating-point';
import { notEquilibrium } from './not-equilibrium';
import { notDifferentiable } from './not-differentiable';
import { aroundMissingState } from './around-missing-state';
import { aroundDefaultInput } from './around-default-input';
import { aroundIgnored } from './around-ignored';
import { improperTransfer } from './improper-transfer';
import { notRational } from './not-rational';
import { transferSignals } from './transfer-signals';
import { staticTransfer } from './static-transfer';
import { noDesign } from './no-design';
import { conflictingDesign } from './conflicting-design';
import { poleCount } from './pole-count';
import { unpairedPole } from './unpaired-pole';
import { notSymmetric } from './not-symmetric';
import { unknownSetting } from './unknown-setting';
import { missingWeight } from './missing-weight';
import { trackingOffEquilibrium } from './tracking-off-equilibrium';
import { delayWithoutSample } from './delay-without-sample';
import { formWithoutSample } from './form-without-sample';

export { defineDiagnostic, code } from './define';
export type { DiagnosticKind, DiagnosticExtra } from './define';
export {
  internalError,
  duplicateName,
  unknownName,
  unknownPlant,
  shadowedName,
  reservedName,
  unknownFunction,
  wrongArity,
  signalInValue,
  parameterCycle,
  divisionByZero,
  nonFinite,
  notReal,
  shapeMismatch,
  invalidArgument,
  unknownUnit,
  unexpectedUnit,
  wrongUnit,
  missingUnit,
  outOfRange,
  sampleTooShort,
  mixedForms,
  noDynamics,
  unknownMatrix,
  duplicateDefinition,
  missingMatrix,
  matrixShape,
  raggedMatrix,
  missingSignals,
  inferredSignals,
  missingEquation,
  outputReference,
  needsOperatingPoint,
  notEquilibrium,
  notDifferentiable,
  aroundMissingState,
  aroundDefaultInput,
  aroundIgnored,
  improperTransfer,
  notRational,
  transferSignals,
  staticTransfer,
  noDesign,
  conflictingDesign,
  poleCount,
  unpairedPole,
  notSymmetric,
  unknownSetting,
  missingWeight,
  trackingOffEquilibrium,
  delayWithoutSample,
  formWithoutSample,
};

/** Every model diagnostic kind, in the order of the reference. */
export const modelDiagnosticKinds = [
  internalError,
  duplicateName,
  unknownName,
  unknownPlant,
  shadowedName,
  reservedName,
  unknownFunction,
  wrongArity,
  signalInValue,
  parameterCycle,
  divisionByZero,
  nonFinite,
  notReal,
  shapeMismatch,
  invalidArgument,
  unknownUnit,
  unexpectedUnit,
  wrongUnit,
  missingUnit,
  outOfRange,
  sampleTooShort,
  mixedForms,
  noDynamics,
  unknownMatrix,
  duplicateDefinition,
  missingMatrix,
  matrixShape,
  raggedMatrix,
  missingSignals,
  inferredSignals,
  missingEquation,
  outputReference,
  needsOperatingPoint,
  notEquilibrium,
  notDifferentiable,
  aroundMissingState,
  aroundDefaultInput,
  aroundIgnored,
  improperTransfer,
  notRational,
  transferSignals,
  staticTransfer,
  noDesign,
  conflictingDesign,
  poleCount,
  unpairedPole,
  notSymmetric,
  unknownSetting,
  missingWeight,
  trackingOffEquilibrium,
  delayWithoutSample,
  formWithoutSample,
] as const;
