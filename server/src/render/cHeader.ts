// Export of a controller for firmware: a self-contained C99 header with the gains, the
// sample time, the estimator matrices, the operating point and a step function that runs the
// control law exactly as documented (and as Loopwright simulates it).
import type { ImplementationReport } from '../control/design';
import type { Rows } from '../model/types';

export interface ExportIdentity {
  tool: string;
  version: string;
  plant: string;
  controller: string;
  /** sha256 of the model source text, hex. */
  sourceHash: string;
}

export const CONTROL_LAW =
  'u = u0 - K (xhat - x0) - Ki xi + N (r - y0);  xi[k+1] = xi[k] + T (r - y) for the integrated outputs';

export function estimatorStatement(form: 'predictor' | 'current' | null): string {
  if (form === 'predictor') {
    return 'predictor form: xhat[k+1] = Phi xhat[k] + Gamma (u[k] - u0) + L (y[k] - y0 - C xhat[k] - D (u[k] - u0)), xhat in deviation variables';
  }
  if (form === 'current') {
    return 'current form: xbar[k] = Phi xhat[k-1] + Gamma (u[k-1] - u0); xhat[k] = xbar[k] + L (y[k] - y0 - C xbar[k]), xhat in deviation variables';
  }
  return 'no estimator: xhat - x0 is the measured state deviation';
}

/** A C identifier from a model name: letters, digits and underscores, not starting with a digit. */
export function cIdentifier(name: string): string {
  const cleaned = name.replace(/[^A-Za-z0-9_]/g, '_');
  return /^[0-9]/.test(cleaned) ? `_${cleaned}` : cleaned;
}

/** Shortest text that reads back to the same double (17 significant digits at most). */
function literal(value: number, precision: 'float' | 'double'): string {
  if (!Number.isFinite(value)) throw new Error('non-finite value reached the C export');
  let text = String(value);
  if (!/[.eE]/.test(text)) text += '.0';
  return precision === 'float' ? `${text}f` : text;
}

function arrayInitialiser(rows: Rows, precision: 'float' | 'double'): string {
  return `{\n${rows.map((row) => `    { ${row.map((v) => literal(v, precision)).join(', ')} }`).join(',\n')}\n}`;
}

function vectorInitialiser(values: number[], precision: 'float' | 'double'): string {
  return `{ ${values.map((v) => literal(v, precision)).join(', ')} }`;
}

export function renderCHeader(
  implementation: ImplementationReport,
  identity: ExportIdentity,
  precision: 'float' | 'double',
): string {
  const prefix = cIdentifier(identity.controller);
  const upper = prefix.toUpperCase();
  const real = `${prefix}_real`;
  const n = implementation.states.length;
  const m = implementation.inputs.length;
  const p = implementation.outputs.length;
  const tracked = implementation.trackedOutputs.length;
  const integrators = implementation.integratedOutputs.length;
  const discrete = implementation.domain === 'discrete' && implementation.samplePeriod !== null;
  const observer = implementation.observer;
  const guard = `LOOPWRIGHT_${upper}_H`;
  const lines: string[] = [];
  const matrix = (name: string, rows: Rows, doc: string) => {
    lines.push(`/* ${doc} */`);
    lines.push(`static const ${real} ${prefix}_${name}[${rows.length}][${rows[0]?.length ?? 0}] = ${arrayInitialiser(rows, precision)};`);
  };
  const vector = (name: string, values: number[], doc: string) => {
    lines.push(`/* ${doc} */`);
    lines.push(`static const ${real} ${prefix}_${name}[${values.length}] = ${vectorInitialiser(values, precision)};`);
  };
  const outputIndex = (name: string) => implementation.outputs.indexOf(name);

  lines.push(`/* Controller "${identity.controller}" for plant "${identity.plant}", exported by ${identity.tool} ${identity.version}.`);
  lines.push(` * Model source sha256: ${identity.sourceHash}`);
  lines.push(` * Control law (physical units): ${CONTROL_LAW}`);
  lines.push(` * Estimator: ${estimatorStatement(observer?.form ?? null)}`);
  lines.push(` * States: ${implementation.states.join(', ')}; inputs: ${implementation.inputs.join(', ')}; outputs: ${implementation.outputs.join(', ')}.`);
  lines.push(` * Tracked outputs (r order): ${implementation.trackedOutputs.join(', ') || 'none'}; integrated outputs (xi order): ${implementation.integratedOutputs.join(', ') || 'none'}.`);
  lines.push(' * Valid for the linear model only: verify with saturation, delays and safety interlocks before use. */');
  lines.push(`#ifndef ${guard}`);
  lines.push(`#define ${guard}`);
  lines.push('');
  lines.push(`typedef ${precision} ${real};`);
  lines.push(`#define ${upper}_STATES ${n}`);
  lines.push(`#define ${upper}_INPUTS ${m}`);
  lines.push(`#define ${upper}_OUTPUTS ${p}`);
  lines.push(`#define ${upper}_TRACKED ${tracked}`);
  lines.push(`#define ${upper}_INTEGRATORS ${integrators}`);
  lines.push(`#define ${upper}_HAS_ESTIMATOR ${observer ? 1 : 0}`);
  if (discrete) lines.push(`#define ${upper}_SAMPLE_PERIOD ${literal(implementation.samplePeriod as number, precision)} /* s */`);
  lines.push('');
  matrix('K', implementation.K, 'state-feedback gain, inputs x states');
  if (implementation.Ki && integrators) matrix('Ki', implementation.Ki, 'integral gain, inputs x integrators');
  if (implementation.N && tracked) matrix('N', implementation.N, 'reference prescaler, inputs x tracked outputs');
  if (implementation.Nx && tracked) matrix('Nx', implementation.Nx, 'steady-state state per unit set-point, states x tracked outputs');
  if (implementation.Nu && tracked) matrix('Nu', implementation.Nu, 'steady-state input per unit set-point, inputs x tracked outputs');
  if (observer) {
    matrix('L', observer.L, `estimator gain (${observer.form} form), states x outputs`);
    if (discrete) {
      matrix('Phi', observer.Phi, 'zero-order-hold state transition over one sample');
      matrix('Gamma', observer.Gamma, 'zero-order-hold input matrix over one sample');
    }
    matrix('C', observer.C, 'output matrix');
    matrix('D', observer.D, 'feedthrough matrix');
  }
  vector('x0', implementation.x0, 'operating-point state (zero unless linearised)');
  vector('u0', implementation.u0, 'operating-point input');
  vector('y0', implementation.y0, 'operating-point output');
  lines.push('');

  if (discrete) {
    const stateFields = [
      observer ? `  ${real} xhat[${n}]; /* state estimate, deviation from x0 */` : '',
      integrators ? `  ${real} xi[${integrators}]; /* integrator states */` : '',
      observer || integrators ? '' : `  ${real} unused; /* no internal state */`,
    ].filter(Boolean);
    lines.push(`typedef struct {\n${stateFields.join('\n')}\n} ${prefix}_state;`);
    lines.push('');
    lines.push(`static inline void ${prefix}_reset(${prefix}_state *s) {`);
    if (observer) lines.push(`  for (int i = 0; i < ${n}; i++) s->xhat[i] = 0;`);
    if (integrators) lines.push(`  for (int i = 0; i < ${integrators}; i++) s->xi[i] = 0;`);
    if (!observer && !integrators) lines.push('  s->unused = 0;');
    lines.push('}');
    lines.push('');
    const measuredState = observer ? '' : `, const ${real} x[${n}]`;
    lines.push(`/* One sample: set-points r, measured outputs y${observer ? '' : ' and measured state x'}; writes the inputs u. */`);
    lines.push(`static inline void ${prefix}_step(${prefix}_state *s, const ${real} r[${Math.max(tracked, 1)}], const ${real} y[${p}]${measuredState}, ${real} u[${m}]) {`);
    lines.push(`  ${real} dx[${n}], du[${m}];`);
    if (!tracked) lines.push('  (void)r;');
    if (!observer && !integrators) lines.push('  (void)y; (void)s;');
    if (observer?.form === 'current') {
      lines.push(`  ${real} innovation[${p}];`);
      lines.push(`  for (int i = 0; i < ${p}; i++) { innovation[i] = y[i] - ${prefix}_y0[i]; for (int j = 0; j < ${n}; j++) innovation[i] -= ${prefix}_C[i][j] * s->xhat[j]; }`);
      lines.push(`  for (int i = 0; i < ${n}; i++) { for (int j = 0; j < ${p}; j++) s->xhat[i] += ${prefix}_L[i][j] * innovation[j]; }`);
    }
    if (observer) lines.push(`  for (int i = 0; i < ${n}; i++) dx[i] = s->xhat[i];`);
    else lines.push(`  for (int i = 0; i < ${n}; i++) dx[i] = x[i] - ${prefix}_x0[i];`);
    lines.push(`  for (int i = 0; i < ${m}; i++) {`);
    lines.push(`    du[i] = 0;`);
    lines.push(`    for (int j = 0; j < ${n}; j++) du[i] -= ${prefix}_K[i][j] * dx[j];`);
    if (integrators) lines.push(`    for (int j = 0; j < ${integrators}; j++) du[i] -= ${prefix}_Ki[i][j] * s->xi[j];`);
    if (implementation.N && tracked) {
      const y0Tracked = implementation.trackedOutputs.map((name) => `${prefix}_y0[${outputIndex(name)}]`);
      lines.push(`    { const ${real} r0[${tracked}] = { ${y0Tracked.join(', ')} };`);
      lines.push(`      for (int j = 0; j < ${tracked}; j++) du[i] += ${prefix}_N[i][j] * (r[j] - r0[j]); }`);
    }
    lines.push(`    u[i] = ${prefix}_u0[i] + du[i];`);
    lines.push('  }');
    implementation.integratedOutputs.forEach((name, index) => {
      const trackedIndex = implementation.trackedOutputs.indexOf(name);
      const reference = trackedIndex >= 0 ? `r[${trackedIndex}]` : `${prefix}_y0[${outputIndex(name)}]`;
      lines.push(`  s->xi[${index}] += ${prefix}_SAMPLE_PERIOD_VALUE * (${reference} - y[${outputIndex(name)}]);`);
    });
    if (observer) {
      lines.push(`  { ${real} next[${n}];`);
      lines.push(`    for (int i = 0; i < ${n}; i++) {`);
      lines.push(`      next[i] = 0;`);
      lines.push(`      for (int j = 0; j < ${n}; j++) next[i] += ${prefix}_Phi[i][j] * s->xhat[j];`);
      lines.push(`      for (int j = 0; j < ${m}; j++) next[i] += ${prefix}_Gamma[i][j] * du[j];`);
      if (observer.form === 'predictor') {
        lines.push(`      for (int k = 0; k < ${p}; k++) {`);
        lines.push(`        ${real} e = y[k] - ${prefix}_y0[k];`);
        lines.push(`        for (int j = 0; j < ${n}; j++) e -= ${prefix}_C[k][j] * s->xhat[j];`);
        lines.push(`        for (int j = 0; j < ${m}; j++) e -= ${prefix}_D[k][j] * du[j];`);
        lines.push(`        next[i] += ${prefix}_L[i][k] * e;`);
        lines.push('      }');
      }
      lines.push('    }');
      lines.push(`    for (int i = 0; i < ${n}; i++) s->xhat[i] = next[i]; }`);
    }
    lines.push('}');
    // The integrator update needs T as a typed constant (the macro above is documentation-friendly).
    const index = lines.findIndex((line) => line.startsWith(`#define ${upper}_SAMPLE_PERIOD`));
    lines.splice(index + 1, 0, `#define ${prefix}_SAMPLE_PERIOD_VALUE ((${real})${upper}_SAMPLE_PERIOD)`);
  } else {
    lines.push('/* Continuous-time design: add `sample <period>` to the controller for a sampled implementation');
    lines.push(' * (zero-order hold, exact discretisation) with a step function. */');
  }
  lines.push('');
  lines.push(`#endif /* ${guard} */`);
  return `${lines.join('\n')}\n`;
}
