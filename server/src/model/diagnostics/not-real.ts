/**
 * `model/not-real` (error): A complex value appears where a real number is required (matrix entries, weights, parameters used in equations, limits, sample periods).
 *
 * Example message: `2 + 3j` is complex (2+3i); a matrix entry must be real
 */
import { defineDiagnostic, code } from './define';

export const notReal = defineDiagnostic({
  code: 'model/not-real',
  severity: 'error',
  fires: 'A complex value appears where a real number is required (matrix entries, weights, parameters used in equations, limits, sample periods).',
  example: '`2 + 3j` is complex (2+3i); a matrix entry must be real',
  message: (text: string, value: string, place: string): string =>
    `${code(text)} is complex (${value}); ${place} must be real`,
});
