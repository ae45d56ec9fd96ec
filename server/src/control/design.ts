// Orchestrator entry: runs the pure analyses on one checked plant or controller and gathers
// their records and diagnostics (plantReport.ts, controllerDesign.ts); record shapes in reportTypes.ts.
export * from './reportTypes';
export { analyzePlant } from './plantReport';
export { designController, type DesignContext } from './controllerDesign';
