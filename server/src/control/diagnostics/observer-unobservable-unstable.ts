/**
 * `control/unobservable-unstable-mode` (error): An unstable (or boundary) mode cannot be seen from the measured outputs, so no observer can estimate it and its estimation error never decays.
 *
 * Example message: the unstable mode 1.5 cannot be seen from the measured outputs; no observer can estimate it — measure another output
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import type { Complex } from '../../model/types';
import { complexText, fmt } from './spec-number-format';

export const observerUnobservableUnstable = defineDiagnostic({
  code: 'control/unobservable-unstable-mode',
  severity: 'error',
  fires: 'An unstable (or boundary) mode cannot be seen from the measured outputs, so no observer can estimate it and its estimation error never decays.',
  example: 'the unstable mode 1.5 cannot be seen from the measured outputs; no observer can estimate it — measure another output',
  message: (mode: Complex): string =>
    `the unstable mode ${complexText(mode)} cannot be seen from the measured outputs; no observer can estimate it — measure another output`,
});
