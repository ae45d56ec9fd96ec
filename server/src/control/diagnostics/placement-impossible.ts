/**
 * `control/placement-impossible` (error): pole placement cannot proceed — an uncontrollable mode is
 * not among the requested poles, the pole count differs from the number of states, a complex pole
 * lacks its conjugate, or the plant has no input.
 *
 * Example message: cannot place these poles: mode s = −3 is uncontrollable, so it must appear in the requested list
 */
import type { Complex, Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode } from './control-values';

export type PlacementImpossibleReason = 'uncontrollable-mode-not-requested' | 'pole-count' | 'not-conjugate-closed' | 'no-input';

export const placementImpossibleKind = defineDiagnostic({
  code: 'control/placement-impossible',
  severity: 'error',
  fires: 'The requested poles cannot be assigned (uncontrollable mode not requested, wrong count, unpaired complex pole, no input).',
  example: 'cannot place these poles: mode s = −3 is uncontrollable, so it must appear in the requested list',
  message: (reason: PlacementImpossibleReason, mode: Complex | undefined, counts: { requested: number; states: number }, domain: 'continuous' | 'discrete'): string => {
    switch (reason) {
      case 'uncontrollable-mode-not-requested':
        return `cannot place these poles: mode ${mode ? formatMode(mode, domain) : ''} is uncontrollable, so it must appear in the requested list`;
      case 'pole-count':
        return `cannot place these poles: ${counts.requested} given for ${counts.states} states`;
      case 'not-conjugate-closed':
        return `cannot place these poles: ${mode ? formatMode(mode, domain).replace(' ±', ' +') : 'a complex pole'} has no conjugate partner, and a real gain needs both`;
      case 'no-input':
        return 'cannot place poles: the plant has no input';
    }
  },
});

export function placementImpossibleDiagnostic(
  range: Range,
  details: { reason: PlacementImpossibleReason; mode?: Complex; requested: number; states: number; domain?: 'continuous' | 'discrete' },
  related?: RelatedInformation[],
): Diagnostic {
  return placementImpossibleKind.create(range, [details.reason, details.mode, { requested: details.requested, states: details.states }, details.domain ?? 'continuous'], {
    related,
    data: { reason: details.reason },
  });
}
