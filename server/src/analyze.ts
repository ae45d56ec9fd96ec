// One entry point for every face (CLI, language server, report, export):
//   text → parse (grammar) → checked model (model) → analyses (control) → one record.
// The fast part (syntax, names, shapes) runs on every keystroke; the slow part (placement,
// Riccati, simulation) is separate so the server can run it in a worker with a budget.
import { parsePlantText } from '../../grammar/src/index';
import type { ParseResult } from '../../grammar/src/ast';
import { checkDocument, checkPlant } from './model/check';
import type { PlantDecl } from '../../grammar/src/ast';
import type { CheckedDocument, Diagnostic } from './model/types';
import { resolveSettings, type AnalysisSettings } from './control/settings';
import { analyzePlant, designController, type PlantReport, type ControllerReport } from './control/design';

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
  const largest = Math.max(0, ...fast.model.plants.map((p) => p.states.length));
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
  for (const plant of fast.model.plants) {
    if (options.isCancelled?.()) return { ...fast, settings, plants, controllers, skipped: { reason: 'cancelled', detail: 'a newer edit arrived' } };
    const report = analyzePlant(plant, settings);
    plants.push(report);
    diagnostics.push(...report.diagnostics);
  }
  for (const controller of fast.model.controllers) {
    if (options.isCancelled?.()) return { ...fast, settings, plants, controllers, skipped: { reason: 'cancelled', detail: 'a newer edit arrived' } };
    const plant = controller.plantIndex === null ? undefined : fast.model.plants[controller.plantIndex];
    const declaration = controller.plantIndex === null ? undefined : plantDeclarations(fast)[controller.plantIndex];
    const report = designController(controller, plant, settings, {
      // Fragility: the same plant text re-checked with parameters moved (nothing is re-parsed).
      rebuildPlant: declaration
        ? (overrides) => {
            try {
              return checkPlant(declaration, [], overrides).checked;
            } catch {
              return null;
            }
          }
        : undefined,
    });
    controllers.push(report);
    diagnostics.push(...report.diagnostics);
  }
  diagnostics.sort(byPosition);
  return { ...fast, diagnostics, settings, plants, controllers };
}

/** The whole job on one text. */
export function analyze(text: string, overrides: Partial<AnalysisSettings> = {}): DocumentAnalysis {
  return analyzeFastCheck(checkText(text), overrides);
}
