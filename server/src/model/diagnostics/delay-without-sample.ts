/**
 * `model/delay-without-sample` (error): `delay` counts whole sample periods but the controller has no `sample` line.
 *
 * Example message: `delay` counts sample periods but the controller has no `sample` line
 */
import { defineDiagnostic } from './define';

export const delayWithoutSample = defineDiagnostic({
  code: 'model/delay-without-sample',
  severity: 'error',
  fires: '`delay` counts whole sample periods but the controller has no `sample` line.',
  example: '`delay` counts sample periods but the controller has no `sample` line',
  message: (): string =>
    '`delay` counts sample periods but the controller has no `sample` line',
});
