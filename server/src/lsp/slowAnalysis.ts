// The slow part of one document version, as a structured-clone-safe record: what the worker
// thread posts back (the main thread already holds the syntax tree and checked model of that
// version, so only diagnostics and reports travel).
import { analyzeFastCheck, checkText, riccatiStartKey, type SlowOptions } from '../analyze';
import type { AnalysisSettings } from '../control/settings';
import type { ControllerReport, PlantReport } from '../control/design';
import type { Diagnostic } from '../model/types';
import type { RiccatiStart } from '../control/lqr';

export interface SlowResult {
  /** All diagnostics of the version, in the order `analyze` gives them. */
  diagnostics: Diagnostic[];
  /** Those the slow analyses added (carried over, shifted, while the next version analyses). */
  slowDiagnostics: Diagnostic[];
  plants: PlantReport[];
  controllers: ControllerReport[];
  settings: AnalysisSettings;
  skipped?: { reason: 'too-large' | 'cancelled'; detail: string };
  /** The LQR and Kalman designs' Riccati solutions (keys: `riccatiStartKey`): the next version's warm starts. */
  riccatiStarts: Map<string, PackedRiccatiStart>;
}

/**
 * A Riccati start as it travels between threads, X in one Float64Array: structured clone copies
 * that in one piece, where a 100 × 100 array of arrays took about 1.4 ms each way (and a start
 * crosses twice per edit: back with the result, out again with the next job). Same numbers.
 */
export interface PackedRiccatiStart {
  order: number;
  X: Float64Array;
  chordBasis?: RiccatiStart['chordBasis'];
}

export function packRiccatiStart(start: RiccatiStart): PackedRiccatiStart {
  const order = start.X.length;
  const X = new Float64Array(order * order);
  start.X.forEach((row, i) => X.set(row, i * order));
  return { order, X, ...(start.chordBasis ? { chordBasis: start.chordBasis } : {}) };
}

/** The start again; undefined for a malformed one (then that design starts afresh). */
export function unpackRiccatiStart(packed: PackedRiccatiStart): RiccatiStart | undefined {
  const { order, X } = packed;
  if (!Number.isInteger(order) || order < 0 || !(X instanceof Float64Array) || X.length !== order * order) return undefined;
  const rows = Array.from({ length: order }, (_, i) => Array.from(X.subarray(i * order, (i + 1) * order)));
  return { X: rows, ...(packed.chordBasis ? { chordBasis: packed.chordBasis } : {}) };
}

export interface AnalysisJob {
  job: number;
  uri: string;
  version: number;
  text: string;
  settings: Partial<AnalysisSettings>;
  /**
   * States of the document's largest plant by the server's latest fast check (of this text or the
   * one before): a hint to start the helper thread before the worker's own parse, so the two parses
   * overlap. The worker's own check still decides whether the helper's answers are used.
   */
  largestPlantStates?: number;
  /** Riccati solutions of an earlier version of the document (SlowResult.riccatiStarts). */
  riccatiStarts?: Map<string, PackedRiccatiStart>;
}

export type AnalysisReply =
  | { job: number; uri: string; version: number; result: SlowResult }
  | { job: number; uri: string; version: number; error: string };

export function runSlowAnalysis(
  text: string,
  settings: Partial<AnalysisSettings>,
  options: Omit<SlowOptions, 'riccatiStarts' | 'riccatiConditionEstimate'> & { riccatiStarts?: ReadonlyMap<string, PackedRiccatiStart> } = {},
): SlowResult {
  const fast = checkText(text);
  const riccatiStarts = new Map<string, RiccatiStart>();
  for (const [key, packed] of options.riccatiStarts ?? []) {
    const start = unpackRiccatiStart(packed);
    if (start) riccatiStarts.set(key, start);
  }
  // No editor view shows the Riccati condition estimate (only the CLI's JSON does): left out.
  const analysis = analyzeFastCheck(fast, settings, { ...options, riccatiStarts, riccatiConditionEstimate: false });
  // Starts of controllers no longer in the document are dropped.
  const keys = new Set(fast.model.controllers.flatMap((controller) => [riccatiStartKey(controller.name, 'regulator'), riccatiStartKey(controller.name, 'estimator')]));
  for (const key of [...riccatiStarts.keys()]) if (!keys.has(key)) riccatiStarts.delete(key);
  const fastSet = new Set(fast.diagnostics);
  const result: SlowResult = {
    diagnostics: analysis.diagnostics,
    slowDiagnostics: analysis.diagnostics.filter((diagnostic) => !fastSet.has(diagnostic)),
    plants: analysis.plants,
    controllers: analysis.controllers,
    settings: analysis.settings,
    riccatiStarts: new Map([...riccatiStarts].map(([key, start]) => [key, packRiccatiStart(start)])),
  };
  if (analysis.skipped) result.skipped = analysis.skipped;
  return result;
}

/** Drops what structured clone cannot carry (functions), keeping every plain field. */
export function cloneable<T>(value: T): T {
  return JSON.parse(
    JSON.stringify(value, (_key, item) => {
      if (typeof item === 'function') return undefined;
      if (typeof item === 'number' && !Number.isFinite(item)) return { __nonFinite: String(item) };
      return item;
    }),
    (_key, item) => {
      if (item && typeof item === 'object' && typeof item.__nonFinite === 'string') return Number(item.__nonFinite);
      return item;
    },
  ) as T;
}
