/**
 * `control/observer-slower` (warning): The slowest observer pole decays more slowly than the slowest controller pole, so estimation error, not the design, sets the response.
 *
 * Example message: the observer's slowest pole decays at 0.8 1/s, slower than the controller's 1.2 1/s; place the observer poles 2–6 times faster
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const observerSlowerThanController = defineDiagnostic({
  code: 'control/observer-slower',
  severity: 'warning',
  fires: 'The slowest observer pole decays more slowly than the slowest controller pole, so estimation error, not the design, sets the response.',
  example: "the observer's slowest pole decays at 0.8 1/s, slower than the controller's 1.2 1/s; place the observer poles 2–6 times faster",
  message: (observerRate: number, controllerRate: number): string =>
    `the observer's slowest pole decays at ${fmt(observerRate)} 1/s, slower than the controller's ${fmt(controllerRate)} 1/s; place the observer poles 2–6 times faster`,
});
