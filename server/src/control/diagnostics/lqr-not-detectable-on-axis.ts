/**
 * `control/lqr-mode-unweighted` (error): A mode on the stability boundary (imaginary axis or unit circle) is not seen by Q, so LQR has no stabilising solution.
 *
 * Example message: the mode 0 + 2j lies on the stability boundary and Q does not weight it; add weight on the states of that mode
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import type { Complex } from '../../model/types';
import { complexText, fmt } from './spec-number-format';

export const lqrNotDetectableOnAxis = defineDiagnostic({
  code: 'control/lqr-mode-unweighted',
  severity: 'error',
  fires: 'A mode on the stability boundary (imaginary axis or unit circle) is not seen by Q, so LQR has no stabilising solution.',
  example: 'the mode 0 + 2j lies on the stability boundary and Q does not weight it; add weight on the states of that mode',
  message: (mode: Complex): string =>
    `the mode ${complexText(mode)} lies on the stability boundary and Q does not weight it; add weight on the states of that mode`,
});
