// Public face of the model layer: syntax tree → checked model + diagnostics.
export { checkDocument, checkPlant, type CheckOptions } from './check';
export { modelDiagnosticKinds, defineDiagnostic, code, type DiagnosticKind, type DiagnosticExtra } from './diagnostics/index';
export { renderDiagnosticReference, type ReferenceSection } from './diagnostics/reference';
export { builtinFunctions, builtinConstants, scalarFunctions, matrixFunctions } from './evaluate';
export { unitNames, unitInfo, shortestSamplePeriod, type UnitInfo, type UnitKind } from './units';
export { suggestName, editDistance } from './names';
export { printExpr } from './printExpr';
export type * from './types';
