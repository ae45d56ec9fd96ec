import { describe, expect, it } from 'vitest';
import { analyzeModes } from '../../server/src/control/modes';
import { analyzeControllability, analyzeObservability, measuresAllStates } from '../../server/src/control/structure';
import { setpointGains } from '../../server/src/control/setpoint';
import { placePoles } from '../../server/src/control/placement';
import { transferFunctions } from '../../server/src/control/transferFunctions';
import { designIntegralAction } from '../../server/src/control/integralAction';
import { disturbanceRejection } from '../../server/src/control/disturbanceRejection';
import { defaultSettings } from '../../server/src/control/settings';

describe('degenerate inputs return records, never throw', () => {
  it('a static plant (no states): y = 2u', () => {
    expect(analyzeModes([], 'continuous').stability).toBe('stable');
    expect(analyzeControllability([], [], 'continuous').controllable).toBe(true);
    expect(analyzeObservability([], [[]], 'continuous').observable).toBe(true);
    expect(measuresAllStates([[]], 0)).toBe(true);
    const tracking = setpointGains([], [], [[]], [[2]], [0], [[]], 'continuous');
    expect(tracking.feasibility).toBe('unique');
    expect(tracking.prescaler![0][0]).toBeCloseTo(0.5, 14);
    expect(transferFunctions([], [], [[]], [[2]]).pairs[0].numerator).toEqual([2]);
  });

  it('a plant without inputs', () => {
    const A = [[-1]];
    expect(placePoles(A, [[]], [{ re: -2, im: 0 }], defaultSettings).failure?.reason).toBe('no-input');
    expect(analyzeControllability(A, [[]], 'continuous').controllable).toBe(false);
    expect(setpointGains(A, [[]], [[1]], [[]], [0], [], 'continuous').feasibility).toBe('infeasible');
    expect(designIntegralAction(A, [[]], [[1]], [[]], [0], [{ re: -1, im: 0 }, { re: -2, im: 0 }], 'continuous', defaultSettings).reason).toBe('more-outputs-than-inputs');
  });

  it('no disturbances: empty rejection record', () => {
    const result = disturbanceRejection({ A: [[-1]], B: [[1]], C: [[1]], D: [[0]], E: [[]] }, [[1]], [0], 'continuous');
    expect(result.prescalerError).toEqual([]);
    expect(result.worstPrescalerError).toBe(0);
  });
});
