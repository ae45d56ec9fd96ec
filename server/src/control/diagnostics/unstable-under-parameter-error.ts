/**
 * `control/unstable-under-parameter-error` (warning): moving the parameters together within
 * ±p % (the corners of the parameter box, or seeded samples of it — control/fragility.ts) makes
 * the closed loop unstable, although the nominal design is stable. Not reported where
 * `control/fragile-prescaler` already says a single parameter destabilises the loop.
 *
 * Example message: the loop loses stability within ±10 % parameter error: at `drag` = 0.55, `mass` = 1.8 it has a pole at s = 0.012
 */
import type { Complex } from '../../numeric/types';
import type { Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode, formatNumber, quote } from './control-values';

export const unstableUnderParameterErrorKind = defineDiagnostic({
  code: 'control/unstable-under-parameter-error',
  severity: 'warning',
  fires: 'Moving the parameters together within ±p % (corners or samples of the parameter box) makes the nominally stable closed loop unstable.',
  example: 'the loop loses stability within ±10 % parameter error: at `drag` = 0.55, `mass` = 1.8 it has a pole at s = 0.012',
  message: (percent: number, loop: 'prescaler' | 'integral', point: { name: string; value: number }[] | null, pole: string | null): string =>
    `the loop${loop === 'integral' ? ' with integral action' : ''} loses stability within ±${formatNumber(percent)} % parameter error` +
    (point && point.length ? `: at ${point.map((entry) => `${quote(entry.name)} = ${formatNumber(entry.value)}`).join(', ')}` + (pole ? ` it has a pole at ${pole}` : '') : ''),
});

export function unstableUnderParameterErrorDiagnostic(
  range: Range,
  details: {
    percent: number;
    loop: 'prescaler' | 'integral';
    /** Parameter values of an unstable point (names in declaration order), when known. */
    point: { name: string; value: number }[] | null;
    pole: Complex | null;
    domain: 'continuous' | 'discrete';
  },
  related?: RelatedInformation[],
): Diagnostic {
  return unstableUnderParameterErrorKind.create(range, [details.percent, details.loop, details.point, details.pole ? formatMode(details.pole, details.domain) : null], {
    related,
    data: { loop: details.loop, point: details.point },
  });
}
