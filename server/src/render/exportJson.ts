// JSON export of a controller for controller code: the same record as the C header, with the
// control law and the estimator form stated, so a generator or a test can read the gains back.
import type { ImplementationReport } from '../control/design';
import { CONTROL_LAW, estimatorStatement, type ExportIdentity } from './cHeader';
import { jsonSafe } from './json';

export function renderExportJson(implementation: ImplementationReport, identity: ExportIdentity): string {
  const record = {
    tool: identity.tool,
    version: identity.version,
    plant: identity.plant,
    controller: identity.controller,
    sourceSha256: identity.sourceHash,
    controlLaw: CONTROL_LAW,
    estimator: estimatorStatement(implementation.observer?.form ?? null),
    integratorConvention: "xi' = r - y (continuous); xi[k+1] = xi[k] + T (r - y) (discrete); u = -Kx x - Ki xi",
    caution: 'Valid for the linear model only: verify with saturation, delays and safety interlocks before use.',
    ...implementation,
  };
  return `${JSON.stringify(jsonSafe(record), null, 2)}\n`;
}
