// What the editor features read: the latest fast check, plus the slow reports when they belong
// to the same text (the server never mixes reports of an older version into a newer view).
import type { DocumentAnalysis, FastCheck } from '../analyze';
import type { CheckedController, CheckedPlant } from '../model/types';
import type { ControllerReport, PlantReport } from '../control/design';
import type { Definition } from './symbolIndex';

export type AnalysisView = FastCheck &
  Partial<Pick<DocumentAnalysis, 'plants' | 'controllers' | 'settings' | 'skipped'>> & {
    /**
     * True when the reports belong to an earlier version (matched by name) while the analysis
     * of this one runs: lenses keep their figures instead of flickering; hovers say so.
     */
    stale?: boolean;
  };

function samePosition(a: { line: number; character: number }, b: { line: number; character: number }) {
  return a.line === b.line && a.character === b.character;
}

/** The checked plant declared by a plant definition (matched by name and place, duplicates apart). */
export function checkedPlantIndex(view: AnalysisView, definition: Pick<Definition, 'name' | 'range'>): number {
  const plants = view.model.plants;
  const exact = plants.findIndex((p) => p.name === definition.name && samePosition(p.nameRange.start, definition.range.start));
  return exact >= 0 ? exact : plants.findIndex((p) => p.name === definition.name);
}

export function checkedControllerIndex(view: AnalysisView, definition: Pick<Definition, 'name' | 'range'>): number {
  const controllers = view.model.controllers;
  const exact = controllers.findIndex(
    (c) => c.name === definition.name && samePosition(c.nameRange.start, definition.range.start),
  );
  return exact >= 0 ? exact : controllers.findIndex((c) => c.name === definition.name);
}

export function checkedPlantByName(view: AnalysisView, name: string): CheckedPlant | undefined {
  return view.model.plants.find((plant) => plant.name === name);
}

export function plantReportAt(view: AnalysisView, plantIndex: number): PlantReport | undefined {
  const plant = view.model.plants[plantIndex];
  const report = view.plants?.[plantIndex];
  if (plant && report && report.name === plant.name) return report;
  return plant ? view.plants?.find((r) => r?.name === plant.name) : undefined;
}

export function controllerReportAt(view: AnalysisView, controllerIndex: number): ControllerReport | undefined {
  const controller = view.model.controllers[controllerIndex];
  const report = view.controllers?.[controllerIndex];
  if (controller && report && report.name === controller.name) return report;
  return controller ? view.controllers?.find((r) => r?.name === controller.name) : undefined;
}

export function checkedControllerAt(view: AnalysisView, controllerIndex: number): CheckedController | undefined {
  return view.model.controllers[controllerIndex];
}

/** One line on why slow results are missing, for hovers and lenses. */
export function pendingNote(view: AnalysisView): string {
  if (view.skipped) return `Analysis skipped: ${view.skipped.detail}.`;
  if (!view.plants) return 'Analysis in progress…';
  return 'Not analysed (the model has errors).';
}

/** A note for hovers built from an earlier version's reports. */
export function staleNote(view: AnalysisView): string {
  return view.stale ? '\n\n_From the previous edit; the analysis is updating._' : '';
}
