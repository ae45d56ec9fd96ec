/**
 * `model/form-without-sample` (info): `observer … current` / `predictor` chooses a discrete estimator form, but the controller is continuous (no `sample`), so the choice has no effect.
 *
 * Example message: the estimator form `current` only matters for a sampled controller (add `sample …`)
 */
import { defineDiagnostic, code } from './define';

export const formWithoutSample = defineDiagnostic({
  code: 'model/form-without-sample',
  severity: 'info',
  fires: '`observer … current` / `predictor` chooses a discrete estimator form, but the controller is continuous (no `sample`), so the choice has no effect.',
  example: 'the estimator form `current` only matters for a sampled controller (add `sample …`)',
  message: (form: string): string =>
    `the estimator form ${code(form)} only matters for a sampled controller (add ${code('sample …')})`,
});
