// One entry point for every face (CLI, language server, report, export):
//   text → parse (grammar) → checked model (model) → analyses (control) → one record.
// The fast part (syntax, names, shapes) runs on every keystroke; the slow part (placement,
// Riccati, simulation) is separate so the server can run it in a worker with a budget.
import { parsePlantText } from '../../grammar/src/index';
import type { ParseResult } from '../../grammar/src/ast';
import { checkDocument, checkPlant } from './model/check';
import type { PlantDecl } from '../../grammar/src/ast';
import type { CheckedController, CheckedDocument, CheckedPlant, Diagnostic } from './model/types';
import { resolveSettings, type AnalysisSettings } from './control/settings';
import { analyzePlant, designController, type PlantReport, type ControllerReport } from './control/design';
import {
  prepareFragilityPlants,
  runFragility,
  type DesignContext,
  type FragilityRequest,
  type RebuiltPlants,
  type RiccatiConditionRequest,
  type RiccatiRole,
  type RiccatiStartSlot,
} from './control/controllerDesign';
import type { FragilityResult } from './control/fragility';
import type { RiccatiStart } from './control/lqr';

export type { PlantReport, ControllerReport } from './control/design';

/** Result of the fast checks: syntax, names, parameters, shapes. */
export interface FastCheck {
  text: string;
  parse: ParseResult;
  model: CheckedDocument;
  /** Syntax and model diagnostics, sorted by position. */
  diagnostics: Diagnostic[];
}

/** The whole verdict on a document. Arrays are aligned with `model.plants` / `model.controllers`. */
export interface DocumentAnalysis extends FastCheck {
  settings: AnalysisSettings;
  plants: PlantReport[];
  controllers: ControllerReport[];
  /** Present when slow analyses were skipped (model too large for live analysis, cancelled). */
  skipped?: { reason: 'too-large' | 'cancelled'; detail: string };
}

export function byPosition(a: Diagnostic, b: Diagnostic): number {
  return (
    a.range.start.line - b.range.start.line ||
    a.range.start.character - b.range.start.character ||
    a.range.end.line - b.range.end.line ||
    a.range.end.character - b.range.end.character
  );
}

/** Fast checks only: never throws (each stage returns a value plus diagnostics). */
export function checkText(text: string): FastCheck {
  const parse = parsePlantText(text);
  const model = checkDocument(parse);
  const diagnostics = [
    ...parse.diagnostics.map((d): Diagnostic => ({ ...d })),
    ...model.diagnostics,
  ].sort(byPosition);
  return { text, parse, model, diagnostics };
}

export interface SlowOptions {
  /** Called between analyses; returning true abandons the rest (a newer edit arrived). */
  isCancelled?: () => boolean;
  /**
   * Another thread analysing the same text (lsp/analysisHelper.ts): it computes the plant
   * reports and the controllers' fragility studies while this one designs. Its answers are the
   * same pure functions of the text and settings; a null answer means "compute it here".
   */
  helper?: AnalysisHelper;
  /**
   * The helper is used only for documents with a plant of at least this many states (default
   * HELPER_FROM_STATES): below, handing work over costs more than it saves. Never changes a result.
   */
  helperFromStates?: number;
  /**
   * Riccati solutions (and chord bases) kept from earlier versions of the same document (keys: `riccatiStartKey`): LQR
   * and Kalman designs of plants with at least WARM_START_FROM_STATES states start from them (the solvers'
   * warm start) and keep their new ones there. The route changes, not the equation: results agree
   * with a fresh analysis to the solver's residual target (n·ε), not bit for bit, so only the
   * editor's worker passes a store; the CLI and the report never do.
   */
  riccatiStarts?: Map<string, RiccatiStart>;
  /**
   * false: LQR designs leave the Riccati condition estimate out (NaN; two more n×n Schur-form
   * solves). The editor passes false: no editor view shows the estimate, only the CLI's JSON.
   */
  riccatiConditionEstimate?: boolean;
}

/**
 * Smallest plant whose LQR design starts from the previous version's Riccati solution. Measured
 * (one Newton step from a start 10⁻⁴ away against the Schur route): 30 states equal, 100 states
 * 0.35× the time; below, the fresh solve costs a few milliseconds and stays bit-for-bit.
 */
export const WARM_START_FROM_STATES = 40;

/**
 * Smallest plant worth a second analysis thread. Measured with the bench's alternating blocks on
 * a 2-core machine: 10 states 1.17× slower with the helper, 20 states 0.93×, 40 states 0.81×.
 */
export const HELPER_FROM_STATES = 16;

export interface AnalysisHelper {
  /** Starts the helper on this document (its parse, plant reports…); called before anything else. */
  begin?(): void;
  /** Waits for the plant reports, in model order; null when the helper could not give them. */
  plantReports(): PlantReport[] | null;
  /** Hands a controller's fragility study over; the returned function waits for its result. */
  startFragility(controllerIndex: number, request: FragilityRequest): () => FragilityResult | null;
  /** Hands an LQR design's Riccati condition estimate over (optional: else computed here). */
  startRiccatiCondition?(controllerIndex: number, request: RiccatiConditionRequest): () => number | null;
}

/** Re-checks a controller's plant with parameters moved, without re-parsing (fragility study). */
function plantRebuilder(fast: FastCheck, controller: CheckedController): DesignContext['rebuildPlant'] {
  const declaration = controller.plantIndex === null ? undefined : plantDeclarations(fast)[controller.plantIndex];
  if (!declaration) return undefined;
  return (overrides) => {
    try {
      return checkPlant(declaration, [], overrides).checked;
    } catch {
      return null;
    }
  };
}

/** The key of one of a controller's Riccati solutions in a store (`SlowOptions.riccatiStarts`). */
export function riccatiStartKey(controllerName: string, role: RiccatiRole): string {
  // A space cannot occur in a name, so the two roles never collide with another controller's key.
  return role === 'regulator' ? controllerName : `${controllerName} estimator`;
}

function riccatiStartSlot(store: Map<string, RiccatiStart> | undefined, controller: CheckedController, plant: CheckedPlant | undefined): RiccatiStartSlot | undefined {
  if (!store || !plant || plant.states.length < WARM_START_FROM_STATES) return undefined;
  return {
    recall: (role) => store.get(riccatiStartKey(controller.name, role)),
    keep: (role, start) => {
      store.set(riccatiStartKey(controller.name, role), start);
    },
  };
}

/** Whether a document whose largest plant has `states` states gets the helper thread (analyzeFastCheck's rule). */
export function usesHelper(states: number, overrides: Partial<AnalysisSettings>, helperFromStates = HELPER_FROM_STATES): boolean {
  return states >= helperFromStates && states <= resolveSettings(overrides).maxLiveStates;
}

/** States of the largest plant of a fast-checked document. */
export function largestPlant(fast: FastCheck): number {
  return Math.max(0, ...fast.model.plants.map((plant) => plant.states.length));
}

/**
 * The helper's side: the plant reports (the records `analyzeFastCheck` computes), or null when
 * the document is beyond live analysis (`maxLiveStates`), where nothing is analysed at all.
 */
export function plantReportsOf(fast: FastCheck, overrides: Partial<AnalysisSettings>): PlantReport[] | null {
  const settings = resolveSettings(overrides);
  if (largestPlant(fast) > settings.maxLiveStates) return null;
  return fast.model.plants.map((plant) => analyzePlant(plant, settings));
}

/**
 * The helper's side: a controller's fragility study on the helper's own parse of the same text,
 * using the plants `prepareFragility` rebuilt ahead of the gains where it did.
 */
export function fragilityOf(fast: FastCheck, controllerIndex: number, request: FragilityRequest, prepared?: RebuiltPlants): FragilityResult | null {
  const controller = fast.model.controllers[controllerIndex];
  const plant = controller?.plantIndex === null || !controller ? undefined : fast.model.plants[controller.plantIndex];
  const rebuild = controller ? plantRebuilder(fast, controller) : undefined;
  if (!controller || !plant || !rebuild) return null;
  return runFragility(controller, plant, rebuild, request, prepared);
}

/** Plants rebuilt ahead per controller are kept up to this many numbers in all (32 MB). */
const PREPARED_NUMBERS_LIMIT = 1 << 22;

/**
 * The helper's side, while the coordinator still computes the gains: rebuilds the plants each
 * controller's fragility study will need, for `fragilityOf` (one map per controller).
 */
export function prepareFragility(fast: FastCheck, overrides: Partial<AnalysisSettings>): RebuiltPlants[] {
  const settings = resolveSettings(overrides);
  if (largestPlant(fast) > settings.maxLiveStates) return [];
  return fast.model.controllers.map((controller) => {
    const prepared: RebuiltPlants = new Map();
    const plant = controller.plantIndex === null ? undefined : fast.model.plants[controller.plantIndex];
    const rebuild = plantRebuilder(fast, controller);
    if (!plant?.usable || !rebuild) return prepared;
    const size = Math.max(1, plant.states.length + plant.inputs.length) ** 2;
    prepareFragilityPlants(controller, plant, rebuild, settings, prepared, Math.max(1, Math.floor(PREPARED_NUMBERS_LIMIT / size / Math.max(1, fast.model.controllers.length))));
    return prepared;
  });
}

function plantDeclarations(fast: FastCheck): PlantDecl[] {
  return fast.parse.document.declarations.filter((declaration): declaration is PlantDecl => declaration.kind === 'plant');
}

/** Slow analyses on a fast-checked document. */
export function analyzeFastCheck(
  fast: FastCheck,
  overrides: Partial<AnalysisSettings> = {},
  options: SlowOptions = {},
): DocumentAnalysis {
  const settings = resolveSettings(overrides);
  const plants: PlantReport[] = [];
  const controllers: ControllerReport[] = [];
  const diagnostics = [...fast.diagnostics];
  const largest = largestPlant(fast);
  if (largest > settings.maxLiveStates) {
    return {
      ...fast,
      settings,
      plants,
      controllers,
      skipped: {
        reason: 'too-large',
        detail: `a plant has ${largest} states; live analysis is limited to ${settings.maxLiveStates} (setting maxLiveStates)`,
      },
    };
  }
  const helper = options.helper && usesHelper(largest, overrides, options.helperFromStates) ? options.helper : undefined;
  helper?.begin?.();
  if (!helper) {
    for (const plant of fast.model.plants) {
      if (options.isCancelled?.()) return { ...fast, settings, plants, controllers, skipped: { reason: 'cancelled', detail: 'a newer edit arrived' } };
      plants.push(analyzePlant(plant, settings));
    }
  }
  for (const [index, controller] of fast.model.controllers.entries()) {
    if (options.isCancelled?.()) return { ...fast, settings, plants, controllers, skipped: { reason: 'cancelled', detail: 'a newer edit arrived' } };
    const plant = controller.plantIndex === null ? undefined : fast.model.plants[controller.plantIndex];
    const report = designController(controller, plant, settings, {
      // Fragility: the same plant text re-checked with parameters moved (nothing is re-parsed).
      rebuildPlant: plantRebuilder(fast, controller),
      startFragility: helper ? (request) => helper.startFragility(index, request) : undefined,
      startRiccatiCondition: helper?.startRiccatiCondition ? (request) => helper.startRiccatiCondition!(index, request) : undefined,
      riccatiStart: riccatiStartSlot(options.riccatiStarts, controller, plant),
      riccatiConditionEstimate: options.riccatiConditionEstimate,
    });
    controllers.push(report);
  }
  if (helper) {
    const reports = helper.plantReports();
    for (const [index, plant] of fast.model.plants.entries()) plants.push(reports?.[index] ?? analyzePlant(plant, settings));
  }
  // Plant findings first, then controller findings, as the single-thread order gives them.
  for (const report of plants) diagnostics.push(...report.diagnostics);
  for (const report of controllers) diagnostics.push(...report.diagnostics);
  diagnostics.sort(byPosition);
  return { ...fast, diagnostics, settings, plants, controllers };
}

/** The whole job on one text. */
export function analyze(text: string, overrides: Partial<AnalysisSettings> = {}): DocumentAnalysis {
  return analyzeFastCheck(checkText(text), overrides);
}
