/**
 * `control/too-many-setpoints` (error): More outputs are tracked than the plant has inputs, so the set-point equations [A B; C_t D_t]·[Nx; Nu] = [0; I] have no solution.
 *
 * Example message: 2 outputs cannot all follow independent set-points with 1 input: track at most 1
 */
import { defineDiagnostic } from '../../model/diagnostics/define';

export const tooManySetpointsKind = defineDiagnostic({
  code: 'control/too-many-setpoints',
  severity: 'error',
  fires: 'More outputs are tracked than the plant has inputs, so the set-point equations [A B; C_t D_t]·[Nx; Nu] = [0; I] have no solution.',
  example: '2 outputs cannot all follow independent set-points with 1 input: track at most 1',
  message: (outputs: number, inputs: number): string =>
    `${outputs} outputs cannot all follow independent set-points with ${inputs} input${inputs === 1 ? '' : 's'}: track at most ${inputs}`,
});

