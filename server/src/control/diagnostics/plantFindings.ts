// Plant-level findings of the open-loop analysis, pointed at the matrices that cause them.
import type { CheckedPlant, Diagnostic } from '../../model/types';
import type { ModesResult } from '../modes';
import { matrixRelated, plantAnchor } from '../plantReport';
import type { AnalysisSettings } from '../settings';
import type { ControllabilityResult, ObservabilityResult } from '../structure';
import { isNearlyUncontrollable, nearlyUncontrollableDiagnostic } from './nearly-uncontrollable';
import { openLoopUnstableDiagnostic } from './open-loop-unstable';
import { uncontrollableDiagnostic } from './uncontrollable';
import { unobservableDiagnostic } from './unobservable';

export function plantDiagnostics(
  plant: CheckedPlant,
  modes: ModesResult,
  controllability: ControllabilityResult,
  observability: ObservabilityResult,
  settings: AnalysisSettings,
): Diagnostic[] {
  const out: Diagnostic[] = [];
  // Open-loop instability is information, once per mode (conjugates folded).
  for (const mode of modes.modes) {
    if (mode.stability === 'stable' || mode.value.im < 0) continue;
    out.push(
      openLoopUnstableDiagnostic(plant.nameRange, {
        mode: mode.value,
        marginal: mode.stability === 'marginal',
        timeConstant: mode.timeConstant,
      }),
    );
  }
  for (const mode of controllability.uncontrollableModes) {
    if (mode.value.im < 0) continue;
    out.push(uncontrollableDiagnostic(plantAnchor(plant, 'B'), { mode: mode.value, stable: mode.stable }, matrixRelated(plant, ['A', 'B'])));
  }
  for (const mode of observability.unobservableModes) {
    if (mode.value.im < 0) continue;
    out.push(unobservableDiagnostic(plantAnchor(plant, 'C'), { mode: mode.value, stable: mode.stable }, matrixRelated(plant, ['A', 'C'])));
  }
  if (controllability.controllable && controllability.marginMode && isNearlyUncontrollable(controllability.margin, settings.placementConditionLimit)) {
    out.push(
      nearlyUncontrollableDiagnostic(
        plantAnchor(plant, 'B'),
        { mode: controllability.marginMode, margin: controllability.margin as number },
        matrixRelated(plant, ['A', 'B']),
      ),
    );
  }
  return out;
}
