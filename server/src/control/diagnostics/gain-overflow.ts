/**
 * `control/gain-overflow` (error): The computed feedback gain is not a finite number: the requested poles or the weights lie beyond the range of double-precision arithmetic for this plant.
 *
 * Example message: the feedback gain for plant `rig` overflows double precision: bring the requested poles or weights closer to the plant's own time scale
 */
import { code, defineDiagnostic } from '../../model/diagnostics/define';

export const gainOverflowKind = defineDiagnostic({
  code: 'control/gain-overflow',
  severity: 'error',
  fires: 'The computed feedback gain is not a finite number: the requested poles or the weights lie beyond the range of double-precision arithmetic for this plant.',
  example: "the feedback gain for plant `rig` overflows double precision: bring the requested poles or weights closer to the plant's own time scale",
  message: (plant: string): string =>
    `the feedback gain for plant ${code(plant)} overflows double precision: bring the requested poles or weights closer to the plant's own time scale`,
});
