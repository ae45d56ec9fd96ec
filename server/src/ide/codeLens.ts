// Code lenses above each controller: the gains, the prescaler, the closed-loop poles and the
// step metrics, each with a command the client implements (copy, show the response, export).
import type { Range } from '../../../grammar/src/ast';
import { formatComplex, formatNumber, formatRowsInline } from './numbers';
import { controllerReportAt, pendingNote, plantReportAt, type AnalysisView } from './view';
import { defaultLensSettings, type LensSettings } from './lensSettings';
import { observerGainOf } from './hover';

export type LensCommand = 'loopwright.copyGains' | 'loopwright.showResponse' | 'loopwright.exportGains' | '';

/** What a lens command receives; the server adds the document `uri` (the client's ControllerRef). */
export interface LensArgument {
  controller: string;
}

export interface CodeLensRecord {
  range: Range;
  title: string;
  command: LensCommand;
  arguments: LensArgument[];
}

const MAX_TITLE = 90;

function clip(text: string): string {
  return text.length > MAX_TITLE ? text.slice(0, MAX_TITLE - 1) + '…' : text;
}

export function codeLenses(view: AnalysisView, settings: LensSettings = defaultLensSettings): CodeLensRecord[] {
  const lenses: CodeLensRecord[] = [];
  if (!settings.plant && !settings.gains && !settings.prescaler && !settings.poles && !settings.step) return lenses;
  if (settings.plant) {
    view.model.plants.forEach((plant, plantIndex) => {
      const report = plantReportAt(view, plantIndex);
      if (!report?.analysed) return;
      const range: Range = { start: plant.range.start, end: plant.range.start };
      const verdict = (flag: boolean | null, yes: string, no: string) => (flag === null ? null : flag ? yes : no);
      const pieces = [
        report.stability,
        verdict(report.controllable, 'controllable', report.stabilisable ? 'not controllable (stabilisable)' : 'not controllable'),
        verdict(report.observable, 'observable', report.detectable ? 'not observable (detectable)' : 'not observable'),
      ].filter((piece): piece is string => !!piece);
      if (pieces.length > 0) lenses.push({ range, title: pieces.join(' · '), command: '', arguments: [] });
    });
  }
  if (!settings.gains && !settings.prescaler && !settings.poles && !settings.step) return lenses;
  view.model.controllers.forEach((controller, controllerIndex) => {
    const range: Range = { start: controller.range.start, end: controller.range.start };
    const report = controllerReportAt(view, controllerIndex);
    if (!report) {
      lenses.push({ range, title: pendingNote(view), command: '', arguments: [] });
      return;
    }
    if (!report.designed) {
      lenses.push({ range, title: 'not designed — see problems', command: '', arguments: [] });
      return;
    }
    const argument: LensArgument = { controller: report.name };
    const observerGain = observerGainOf(report);
    if (settings.gains && report.K) {
      let title = `K = ${formatRowsInline(report.K)}`;
      if (report.Ki) title += `  Ki = ${formatRowsInline(report.Ki)}`;
      if (observerGain) title += `  L = ${formatRowsInline(observerGain)}`;
      lenses.push({ range, title: clip(title), command: 'loopwright.copyGains', arguments: [argument] });
    }
    if (settings.prescaler && report.prescaler) {
      lenses.push({
        range,
        title: clip(`N = ${formatRowsInline(report.prescaler)}`),
        command: 'loopwright.exportGains',
        arguments: [argument],
      });
    }
    if (settings.poles && report.closedLoopPoles.length > 0) {
      lenses.push({
        range,
        title: clip(`poles ${report.closedLoopPoles.map((pole) => formatComplex(pole, 4)).join(', ')}`),
        command: 'loopwright.showResponse',
        arguments: [argument],
      });
    }
    if (settings.step) {
      for (const step of report.step) {
        const metrics = step.metrics;
        const pieces = [
          metrics.riseTime !== null ? `rise ${formatNumber(metrics.riseTime, 3)} s` : null,
          metrics.settlingTime !== null ? `settling ${formatNumber(metrics.settlingTime, 3)} s` : 'does not settle',
          metrics.overshootPercent !== null ? `overshoot ${formatNumber(metrics.overshootPercent, 3)} %` : null,
        ].filter((piece): piece is string => piece !== null);
        lenses.push({
          range,
          title: clip(`step ${step.steppedOutput}: ${pieces.join(', ')}`),
          command: 'loopwright.showResponse',
          arguments: [argument],
        });
      }
      if (report.step.length === 0 && (report.K || report.Ki)) {
        lenses.push({ range, title: 'show response', command: 'loopwright.showResponse', arguments: [argument] });
      }
    }
  });
  return lenses;
}
