// The documented JSON output of `loopwright check --json` (docs/json-output.md).
// Ranges are 0-based with `character` in UTF-16 code units, as in the editor protocol.
// Infinity is written "inf" / "-inf"; a quantity that applies but could not be computed is null.
import type { DocumentAnalysis } from '../analyze';
import type { Diagnostic } from '../model/types';

export const JSON_SCHEMA_VERSION = 1;

/** Replaces non-finite numbers so the output is valid JSON with no NaN or Infinity. */
export function jsonSafe(value: unknown): unknown {
  if (typeof value === 'number') {
    if (Number.isNaN(value)) return null;
    if (value === Infinity) return 'inf';
    if (value === -Infinity) return '-inf';
    return value;
  }
  if (Array.isArray(value)) return value.map(jsonSafe);
  if (value && typeof value === 'object') {
    if (ArrayBuffer.isView(value)) return Array.from(value as unknown as ArrayLike<number>).map(jsonSafe);
    const out: Record<string, unknown> = {};
    for (const [key, entry] of Object.entries(value)) {
      if (entry === undefined || typeof entry === 'function') continue;
      out[key] = jsonSafe(entry);
    }
    return out;
  }
  return value;
}

function diagnosticJson(diagnostic: Diagnostic) {
  return {
    severity: diagnostic.severity,
    code: diagnostic.code,
    message: diagnostic.message,
    range: diagnostic.range,
    ...(diagnostic.related?.length ? { related: diagnostic.related } : {}),
    ...(diagnostic.data ? { data: diagnostic.data } : {}),
  };
}

export interface JsonOptions {
  /** Include the sampled step-response series (time, outputs, inputs); metrics are always included. */
  series?: boolean;
}

export function fileJson(path: string, analysis: DocumentAnalysis, options: JsonOptions = {}) {
  const plants = analysis.model.plants.map((plant, index) => {
    const report = analysis.plants[index];
    const names = (signals: { name: string }[]) => signals.map((signal) => signal.name);
    const base: Record<string, unknown> = {
      name: plant.name,
      form: plant.form,
      states: names(plant.states),
      inputs: names(plant.inputs),
      outputs: names(plant.outputs),
      ...(plant.disturbances.length ? { disturbances: names(plant.disturbances) } : {}),
      A: plant.usable ? plant.A : null,
      B: plant.usable ? plant.B : null,
      C: plant.usable ? plant.C : null,
      D: plant.usable ? plant.D : null,
      ...(plant.disturbances.length ? { E: plant.usable ? plant.E : null } : {}),
      parameters: Object.fromEntries(plant.parameters.map((parameter) => [parameter.name, parameter.value])),
    };
    if (plant.operatingPoint) {
      const point = plant.operatingPoint;
      base.operatingPoint = {
        deviationVariables: true,
        states: point.states,
        inputs: point.inputs,
        outputs: point.outputs,
        ...(plant.disturbances.length ? { disturbances: point.disturbances } : {}),
        drift: point.drift,
        isEquilibrium: point.isEquilibrium,
        holdingInput: point.holdingInput,
      };
      base.linearised = plant.linearised;
    }
    if (!report) {
      return { ...base, eigenvalues: null, controllable: null, observable: null, skipped: analysis.skipped ?? null };
    }
    const { diagnostics: _diagnostics, name: _name, analysed: _analysed, ...analyses } = report;
    return { ...base, ...analyses };
  });
  const controllers = analysis.model.controllers.map((controller, index) => {
    const report = analysis.controllers[index];
    if (!report) {
      return { name: controller.name, plant: controller.plantName, K: null, closedLoopPoles: null, dcGain: null, prescaler: null, skipped: analysis.skipped ?? null };
    }
    const { diagnostics: _diagnostics, details, step, designed: _designed, ...rest } = report;
    const stepJson = step.map((response) =>
      options.series ? response : { steppedOutput: response.steppedOutput, metrics: response.metrics },
    );
    const out: Record<string, unknown> = { ...rest, ...details, step: stepJson };
    if (report.Ki === null && !controller.integral) delete out.Ki;
    if (!controller.track && !controller.integral) {
      for (const key of ['dcGain', 'prescaler', 'Nx', 'Nu']) if (out[key] === null) delete out[key];
    }
    if (!controller.sample) delete out.samplePeriod;
    return out;
  });
  return {
    path,
    diagnostics: analysis.diagnostics.map(diagnosticJson),
    plants,
    controllers,
    ...(analysis.skipped ? { skipped: analysis.skipped } : {}),
  };
}

export function documentJson(files: { path: string; analysis: DocumentAnalysis }[], version: string, options: JsonOptions = {}) {
  return jsonSafe({
    tool: 'loopwright',
    version,
    schema: JSON_SCHEMA_VERSION,
    files: files.map((file) => fileJson(file.path, file.analysis, options)),
  });
}
