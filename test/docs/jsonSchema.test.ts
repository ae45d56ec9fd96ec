// Drift test for docs/json-output.md: the JSON of `loopwright check --json` is produced for every
// bundled sample and a few extra documents (sampled LQR with delay, disturbances and a noise-based
// observer; a specification design; a transfer-function plant; a plant with errors; a skipped
// analysis), with and without the step-response series. Every key path found must be documented
// in docs/json-output.md as `path` (arrays collapsed as `[]`).
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../server/src/analyze';
import { documentJson } from '../../server/src/render/json';

const root = resolve(__dirname, '../..');

const extraDocuments: Record<string, string> = {
  'sampled-lqr.plant': `plant cart {
  param m = 2 kg
  param c = 0.5
  states pos, vel
  inputs force
  outputs pos_sensor
  disturbances push
  A = [0, 1; 0, -c/m]
  B = [0; 1/m]
  C = [1, 0]
  E = [0; 1/m]
}
controller hold for cart {
  lqr Q = diag(100, 1, 50), R = 0.1
  integral pos_sensor
  observer noise W = 0.01, V = 1e-4
  sample 10 ms
  delay 1 sample
  limit force in [-5, 5]
  step pos_sensor to 0.2
}
controller quick for cart {
  spec settling <= 2 s, overshoot <= 5 %
  track pos_sensor
  observer poles = [-20, -21]
}
`,
  'transfer-and-errors.plant': `plant lag {
  transfer = 2 / (s^2 + 3*s + 2)
}
controller pin for lag {
  poles = [-4, -5]
  track y
}
plant broken {
  states x
  inputs u
  A = [1, 2]
  B = [1]
}
controller none for broken {
  poles = [-1]
}
controller lost for nowhere {
  poles = [-1]
}
`,
  // Quick-fix data (rename, add-conjugate, pole count, missing operating-point values) and an
  // operating point with a disturbance.
  'fixes.plant': `plant tank {
  param a = 0.2
  states level, temp
  inputs flow
  outputs level_out
  disturbances leak
  level' = flow - a*sqrt(level) - leak
  temp' = -temp + flow
  output level_out = level
  around level = 1, temp = 0.2, flow = 0.2, leak = 0
}
controller keep for tank {
  poles = [-1 + 2j, -3]
  track level_ou
}
controller more for tank {
  poles = [-1, -2, -3]
}
plant pan {
  states h, v
  inputs q
  h' = v
  v' = -h*h + q
  around h = 1
}
`,
};

/**
 * Documented paths no document here produces: data of diagnostics that need a contrived model, and
 * the ready-edit format no diagnostic uses yet. Any other documented path must occur in the output,
 * so a renamed or removed key cannot linger in the document.
 */
const documentedButNotExercised = new Set([
  'diagnostics[].data.margin',
  'diagnostics[].data.edits',
  'diagnostics[].data.title',
  'controllers[].sampling.pathologicalPairs[].first',
  'controllers[].sampling.pathologicalPairs[].second',
  'controllers[].sampling.pathologicalPairs[].multiple',
]);

/** A value's key paths; complex numbers and ranges are leaves, `parameters` and `data` keys are open. */
export function keyPaths(value: unknown, prefix: string, out: Set<string>): void {
  if (Array.isArray(value)) {
    for (const entry of value) keyPaths(entry, `${prefix}[]`, out);
    return;
  }
  if (!value || typeof value !== 'object') return;
  const keys = Object.keys(value);
  const isComplex = keys.length === 2 && keys.includes('re') && keys.includes('im');
  const isRange = keys.length === 2 && keys.includes('start') && keys.includes('end');
  if ((isComplex || isRange) && prefix !== '') return;
  for (const key of keys) {
    if (prefix.endsWith('.parameters')) {
      out.add(`${prefix}.<name>`);
      continue;
    }
    const path = prefix ? `${prefix}.${key}` : key;
    out.add(path);
    if (prefix.endsWith('.data')) continue; // data fields differ per diagnostic; listed one level deep
    keyPaths((value as Record<string, unknown>)[key], path, out);
  }
}

function collectPaths(): Set<string> {
  const documents: { path: string; text: string; overrides?: Record<string, number> }[] = [];
  for (const name of readdirSync(join(root, 'samples')).filter((file) => file.endsWith('.plant')).sort()) {
    documents.push({ path: `samples/${name}`, text: readFileSync(join(root, 'samples', name), 'utf8') });
  }
  for (const [name, text] of Object.entries(extraDocuments)) documents.push({ path: name, text });
  documents.push({ path: 'skipped.plant', text: readFileSync(join(root, 'samples/hoist.plant'), 'utf8'), overrides: { maxLiveStates: 1 } });
  const paths = new Set<string>();
  for (const series of [false, true]) {
    const files = documents.map((document) => ({ path: document.path, analysis: analyze(document.text, document.overrides) }));
    const json = documentJson(files, '0.0.0', { series }) as { files: unknown[] };
    keyPaths({ ...json, files: [] }, '', paths);
    for (const file of json.files) keyPaths(file, '', paths);
  }
  return paths;
}

describe('docs/json-output.md', () => {
  const documentText = readFileSync(join(root, 'docs/json-output.md'), 'utf8');
  const paths = collectPaths();

  it('documents every key path the JSON output contains', () => {
    const undocumented = [...paths].filter((path) => !documentText.includes('`' + path + '`')).sort();
    expect(undocumented, 'key paths missing from docs/json-output.md').toEqual([]);
  });

  it('documents no path that the output no longer contains', () => {
    const documented = [...documentText.matchAll(/^\| `([^`]+)` \|/gm)].map((match) => match[1]);
    expect(documented.length).toBeGreaterThan(200);
    const stale = documented.filter((path) => !paths.has(path) && !documentedButNotExercised.has(path));
    expect(stale, 'documented paths that no document produces (renamed or removed keys?)').toEqual([]);
  });

  it('covers the main records (the corpus exercises the paths it claims to)', () => {
    for (const path of [
      'controllers[].margins.perInput[].phaseMarginDeg',
      'controllers[].implementation.observer.L',
      'controllers[].observer.riccatiResidual',
      'controllers[].disturbanceRejection.prescalerError',
      'controllers[].step[].time',
      'plants[].operatingPoint.drift',
      'skipped.reason',
    ]) {
      expect(paths.has(path), path).toBe(true);
    }
  });
});
