// Small helpers for model tests: parse and check a text, pick a plant or controller.
import { parsePlantText } from '../../grammar/src/index';
import { checkDocument, type CheckOptions } from '../../server/src/model/check';
import type { CheckedDocument, CheckedPlant, CheckedController, Diagnostic } from '../../server/src/model/types';

export function check(text: string, options?: CheckOptions): CheckedDocument {
  const parse = parsePlantText(text);
  if (parse.diagnostics.length > 0) {
    throw new Error(`test text has syntax errors: ${parse.diagnostics.map((d) => d.message).join('; ')}`);
  }
  return checkDocument(parse, options);
}

export function plantOf(doc: CheckedDocument, name: string): CheckedPlant {
  const plant = doc.plants.find((p) => p.name === name);
  if (!plant) throw new Error(`no plant ${name}`);
  return plant;
}

export function controllerOf(doc: CheckedDocument, name: string): CheckedController {
  const controller = doc.controllers.find((c) => c.name === name);
  if (!controller) throw new Error(`no controller ${name}`);
  return controller;
}

export function problems(doc: CheckedDocument): Diagnostic[] {
  return doc.diagnostics.filter((d) => d.severity !== 'info');
}

export function codes(doc: CheckedDocument): string[] {
  return doc.diagnostics.map((d) => d.code);
}

/** Mulberry32: a small seeded PRNG so random checks are reproducible. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Parameters of one plant by name. */
export function parameterValues(plant: CheckedPlant): Record<string, number> {
  return Object.fromEntries(plant.parameters.map((p) => [p.name, p.value]));
}
