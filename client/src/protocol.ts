// Custom requests between the editor client and the Loopwright language server. Names are
// plain strings so both sides (and tests) can share them without importing the LSP libraries.
// The server computes every number; the client only shows, copies or saves what it receives.
import type { ControllerReport, PlantReport } from '../../server/src/control/design';

/** Identifies one controller block in one open document. `uri` is the document URI string. */
export interface ControllerRef {
  uri: string;
  controller: string;
}

/** `loopwright/controllers`: the controllers of a document, for pickers in the command palette. */
export const ControllersRequest = 'loopwright/controllers';
export interface ControllersParams {
  uri: string;
}
export interface ControllerSummary {
  name: string;
  plant: string;
  designed: boolean;
  /** Zero-based line of the `controller` keyword. */
  line: number;
}
export interface ControllersResult {
  controllers: ControllerSummary[];
}

/** `loopwright/controllerData`: the whole analysis record of one controller (and its plant). */
export const ControllerDataRequest = 'loopwright/controllerData';
export type ControllerDataParams = ControllerRef;
export interface ControllerDataResult {
  /** Null when the document has no controller of that name (e.g. it was renamed meanwhile). */
  report: ControllerReport | null;
  plant: PlantReport | null;
  /** Document version the analysis belongs to. */
  version: number;
  /** Present when the slow analyses were skipped (model too large for live analysis, cancelled). */
  skipped?: { reason: string; detail: string };
}

/** Formats of `loopwright/export`: `text` is what "Copy Gains" puts on the clipboard. */
export type ExportFormat = 'text' | 'c' | 'json';

/** `loopwright/export`: the gains of one controller as text in the requested format. */
export const ExportRequest = 'loopwright/export';
export interface ExportParams extends ControllerRef {
  format: ExportFormat;
}
export interface ExportResult {
  /** Null with `reason` when the controller could not be designed. */
  text: string | null;
  reason?: string;
}

/** `loopwright/report`: a self-contained HTML design report of a whole document. */
export const ReportRequest = 'loopwright/report';
export interface ReportParams {
  uri: string;
}
export interface ReportResult {
  html: string;
}

/**
 * `loopwright/analysisUpdated` (notification, server → client, optional): sent after the slow
 * analyses of a document finished, so open response panels refresh without polling.
 */
export const AnalysisUpdatedNotification = 'loopwright/analysisUpdated';
export interface AnalysisUpdatedParams {
  uri: string;
  version: number;
}

/** Command identifiers contributed by the extension (code lenses use the first three with a ControllerRef). */
export const Commands = {
  copyGains: 'loopwright.copyGains',
  showResponse: 'loopwright.showResponse',
  exportGains: 'loopwright.exportGains',
  writeReport: 'loopwright.writeReport',
  restartServer: 'loopwright.restartServer',
} as const;
