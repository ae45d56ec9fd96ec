// Open-loop verdicts on one checked plant: modes, stability, controllability, observability,
// transfer functions and invariant zeros, with the diagnostics they imply.
import type { CheckedPlant, Diagnostic, Range, RelatedInformation } from '../model/types';
import { invariantZeros, snapOriginCluster } from '../numeric';
import type { Rows } from '../numeric/types';
import { plantDiagnostics } from './diagnostics/plantFindings';
import { analyzeModes } from './modes';
import type { PlantReport } from './reportTypes';
import type { AnalysisSettings } from './settings';
import { analyzeControllability, analyzeObservability } from './structure';
import { transferFunctionsOf } from './transferFunctions';

/**
 * The PBH margin costs one SVD of an n × (n + m) matrix per eigenvalue (O(n⁴) in all); above this
 * size it is left out of live analysis (reported null) and only the staircase rank test runs.
 */
export const MARGIN_STATE_LIMIT = 60;
/** Transfer functions per input–output pair are listed up to this many states and pairs. */
export const TRANSFER_STATE_LIMIT = 40;
export const TRANSFER_PAIR_LIMIT = 36;

export function emptyPlantReport(name: string): PlantReport {
  return {
    name,
    analysed: false,
    diagnostics: [],
    eigenvalues: [],
    modes: [],
    stability: null,
    controllable: null,
    observable: null,
    stabilisable: null,
    detectable: null,
    uncontrollableModes: [],
    unobservableModes: [],
    controllabilityMargin: null,
    observabilityMargin: null,
    transferFunctions: [],
    invariantZeros: null,
  };
}

/** Where a plant-level finding points: the B (or C) matrix when written, else the plant name. */
export function plantAnchor(plant: CheckedPlant, matrix: 'A' | 'B' | 'C'): Range {
  return plant.sources[matrix]?.range ?? plant.sources.transfer?.range ?? plant.nameRange;
}

export function matrixRelated(plant: CheckedPlant, names: ('A' | 'B' | 'C' | 'D')[]): RelatedInformation[] {
  const related: RelatedInformation[] = [];
  for (const name of names) {
    const source = plant.sources[name];
    if (source) related.push({ message: `${name} is defined here`, range: source.range });
  }
  if (plant.equationRanges && related.length === 0) {
    plant.equationRanges.states.forEach((range, i) => related.push({ message: `equation of ${plant.states[i]?.name ?? 'a state'}`, range }));
  }
  return related;
}

export function analyzePlant(plant: CheckedPlant, settings: AnalysisSettings): PlantReport {
  const report = emptyPlantReport(plant.name);
  if (!plant.usable || plant.states.length === 0) return report;
  const n = plant.states.length;
  const { A, B, C, D } = plant;
  const modes = analyzeModes(A, 'continuous');
  const withMargin = n <= MARGIN_STATE_LIMIT;
  const controllability = analyzeControllability(A, B, 'continuous', { computeMargin: withMargin });
  const observability = analyzeObservability(A, C, 'continuous', { computeMargin: withMargin });
  const pairs = plant.inputs.length * plant.outputs.length;
  const transfer = n <= TRANSFER_STATE_LIMIT && pairs <= TRANSFER_PAIR_LIMIT ? transferFunctionsOf(A, B, C, D) : [];
  const zeros = plant.inputs.length > 0 && plant.outputs.length > 0 ? invariantZeros(A, B, C, D) : null;

  Object.assign(report, {
    analysed: true,
    eigenvalues: modes.eigenvalues,
    modes: modes.modes.map((mode) => ({
      value: mode.value,
      naturalFrequency: mode.naturalFrequency ?? 0,
      dampingRatio: mode.dampingRatio ?? 1,
      timeConstant: mode.timeConstant,
      stability: mode.stability,
    })),
    stability: modes.stability,
    controllable: controllability.controllable,
    observable: observability.observable,
    stabilisable: controllability.stabilisable,
    detectable: observability.detectable,
    uncontrollableModes: controllability.uncontrollableModes.map((mode) => ({ value: mode.value, stable: mode.stable })),
    unobservableModes: observability.unobservableModes.map((mode) => ({ value: mode.value, stable: mode.stable })),
    controllabilityMargin: controllability.margin,
    observabilityMargin: observability.margin,
    transferFunctions: transfer.map((entry) => ({
      input: plant.inputs[entry.input]?.name ?? String(entry.input),
      output: plant.outputs[entry.output]?.name ?? String(entry.output),
      numerator: entry.numerator,
      denominator: entry.denominator,
      zeros: entry.zeros,
      poles: entry.poles,
    })),
    invariantZeros: zeros && zeros.normalRank >= 0 ? snapOriginCluster(zeros.zeros, systemNorm(A, B, C, D)).values : null,
  } satisfies Partial<PlantReport>);

  const diagnostics: Diagnostic[] = plantDiagnostics(plant, modes, controllability, observability, settings);
  report.diagnostics = diagnostics;
  return report;
}

/** ‖[A B; C D]‖_F: the scale of the data the zeros are computed from. */
function systemNorm(A: Rows, B: Rows, C: Rows, D: Rows): number {
  let sum = 0;
  for (const matrix of [A, B, C, D]) for (const row of matrix) for (const value of row) sum += value * value;
  return Math.sqrt(sum);
}
