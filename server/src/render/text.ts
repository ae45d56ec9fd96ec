// The compact human report of `loopwright check`: one block per plant and controller, then
// every diagnostic as `file:line:col severity code message` (1-based line and column).
import type { DocumentAnalysis } from '../analyze';
import type { Diagnostic } from '../model/types';
import { formatNumber, formatPoleList, formatRows } from './format';

export const SAFETY_CAUTION =
  'Results hold for the linear model only. Verify with actuator saturation, delays and safety interlocks before ' +
  'moving machinery, and defer to applicable functional-safety standards, local codes and licensed engineering practice.';

export function diagnosticLine(path: string, diagnostic: Diagnostic): string {
  const { line, character } = diagnostic.range.start;
  return `${path}:${line + 1}:${character + 1} ${diagnostic.severity} ${diagnostic.code} ${diagnostic.message}`;
}

function yesNo(value: boolean | null | undefined): string {
  return value === null || value === undefined ? 'unknown' : value ? 'yes' : 'no';
}

function plural(count: number, word: string): string {
  return `${count} ${word}${count === 1 ? '' : 's'}`;
}

export function renderText(path: string, analysis: DocumentAnalysis): string {
  const lines: string[] = [];
  analysis.model.plants.forEach((plant, index) => {
    const report = analysis.plants[index];
    lines.push(
      `plant ${plant.name} — ${plant.form} form, ${plural(plant.states.length, 'state')}, ` +
        `${plural(plant.inputs.length, 'input')}, ${plural(plant.outputs.length, 'output')}`,
    );
    if (plant.operatingPoint) {
      const point = plant.operatingPoint;
      lines.push(
        `  linearised about x0 = [${point.states.map((v) => formatNumber(v)).join(', ')}], ` +
          `u0 = [${point.inputs.map((v) => formatNumber(v)).join(', ')}]; the model is in deviation variables` +
          (point.isEquilibrium ? '' : ' (not an equilibrium)'),
      );
    }
    if (!plant.usable) {
      lines.push('  not analysed: the model has errors (see below)');
      return;
    }
    if (!report || !report.analysed) {
      lines.push(`  not analysed${analysis.skipped ? `: ${analysis.skipped.detail}` : ''}`);
      return;
    }
    lines.push(`  open-loop poles: ${formatPoleList(report.eigenvalues)}  (${report.stability})`);
    lines.push(
      `  controllable: ${yesNo(report.controllable)}   observable: ${yesNo(report.observable)}` +
        (report.controllabilityMargin !== null ? `   controllability margin: ${formatNumber(report.controllabilityMargin, 3)}` : ''),
    );
    if (report.invariantZeros && report.invariantZeros.length) lines.push(`  invariant zeros: ${formatPoleList(report.invariantZeros)}`);
  });
  analysis.model.controllers.forEach((controller, index) => {
    const report = analysis.controllers[index];
    const domain = controller.sample ? `discrete, T = ${formatNumber(controller.sample.period)} s` : 'continuous';
    lines.push(`controller ${controller.name} for ${controller.plantName} — ${domain}`);
    if (!report || !report.designed) {
      lines.push(`  not designed${analysis.skipped ? `: ${analysis.skipped.detail}` : ' (see diagnostics)'}`);
      return;
    }
    lines.push(`  K = ${formatRows(report.K)}`);
    if (report.Ki) lines.push(`  Ki = ${formatRows(report.Ki)}   (u = −K·x − Ki·ξ, ξ' = r − y)`);
    lines.push(`  closed-loop poles (${report.domain === 'discrete' ? 'z' : 's'}): ${formatPoleList(report.closedLoopPoles)}`);
    if (report.trackedOutputs.length) {
      lines.push(`  tracks ${report.trackedOutputs.join(', ')}: DC gain ${formatRows(report.dcGain)}, prescaler N = ${formatRows(report.prescaler)}`);
    }
    for (const response of report.step) {
      const m = response.metrics;
      lines.push(
        `  step ${response.steppedOutput} → ${formatNumber(m.setpoint)}: rise ${formatNumber(m.riseTime, 3)} s, ` +
          `settling (2 %) ${formatNumber(m.settlingTime, 3)} s, overshoot ${formatNumber(m.overshootPercent, 3)} %, ` +
          `steady-state error ${formatNumber(m.steadyStateError, 3)}`,
      );
    }
  });
  const errors = analysis.diagnostics.filter((d) => d.severity === 'error').length;
  const warnings = analysis.diagnostics.filter((d) => d.severity === 'warning').length;
  for (const diagnostic of analysis.diagnostics) lines.push(diagnosticLine(path, diagnostic));
  lines.push(`${path}: ${plural(errors, 'error')}, ${plural(warnings, 'warning')}`);
  return lines.join('\n');
}
