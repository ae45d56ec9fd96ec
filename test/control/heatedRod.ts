// A generated scenario for tests of large models: a heated rod of n segments under an LQR design
// (the same shape as the benchmark's rod, test/bench/lsp.mjs). Line 1 holds `  param k = …`.
/**
 * A heated rod of n segments (conduction k between neighbours, loss h at both ends), heater at one
 * end, temperature measured at the other; with `estimator` the controller also carries a Kalman
 * observer line (process noise W = I on the states, measurement noise V = 0.01).
 */
export function heatedRodModel(n: number, k: string, estimator = false): string {
  const states = Array.from({ length: n }, (_, i) => `T${i + 1}`);
  const rows = states.map((_, i) =>
    states.map((__, j) => (i === j ? (i === 0 || i === n - 1 ? '-k - h' : '-2*k') : Math.abs(i - j) === 1 ? 'k' : '0')).join(', '),
  );
  return [
    'plant rod {',
    `  param k = ${k}`,
    '  param h = 0.05',
    `  states ${states.join(', ')}`,
    '  inputs heater',
    '  outputs tip',
    `  A = [${rows.join('; ')}]`,
    `  B = [${states.map((_, i) => (i === 0 ? '1' : '0')).join('; ')}]`,
    `  C = [${states.map((_, i) => (i === n - 1 ? '1' : '0')).join(', ')}]`,
    '}',
    'controller warm for rod {',
    `  lqr Q = identity(${n}), R = 1`,
    '  track tip',
    ...(estimator ? ['  observer noise W = identity(' + n + '), V = 0.01'] : []),
    '}',
    '',
  ].join('\n');
}
