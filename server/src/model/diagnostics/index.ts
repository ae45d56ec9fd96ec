// Registry of every diagnostic the model layer reports (docs/diagnostics.md is generated from it).
// The kinds are listed once, in kinds.ts; the registry is read off that module.
import * as kinds from './kinds';

export * from './kinds';
export { defineDiagnostic, code } from './define';
export type { DiagnosticKind, DiagnosticExtra } from './define';

/** Every model diagnostic kind, by code (the order of the reference). */
export const modelDiagnosticKinds = Object.values(kinds).sort((a, b) => (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
