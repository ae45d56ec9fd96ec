// Registry of every diagnostic the control layer reports (docs/diagnostics.md is generated from it).
// The kinds are listed once, in kinds.ts; the registry is read off that module.
import * as kinds from './kinds';

export * from './kinds';

/** Every control diagnostic kind, by code (the order of the reference). */
export const controlDiagnosticKinds = Object.values(kinds).sort((a, b) => (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
