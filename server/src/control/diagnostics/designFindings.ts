// Controller-level findings: turns analysis records into diagnostics at the design line that
// causes them (poles, lqr, spec, track, integral, observer, sample, limit), with related
// information pointing at the plant text behind the cause.
import type { CheckedController, CheckedPlant, Complex, Diagnostic, Range } from '../../model/types';
import type { FragilityResult } from '../fragility';
import type { LqrResult } from '../lqr';
import type { LoopMarginsResult } from '../margins';
import type { PlacementResult } from '../placement';
import { multiplicityOf } from '../poleSlots';
import { matrixRelated, plantAnchor } from '../plantReport';
import type { StepResponseReport } from '../reportTypes';
import type { SamplingAdvice } from '../samplingAdvice';
import type { SetpointResult } from '../setpoint';
import type { Float32Check } from '../float32Check';
import type { KalmanResult } from '../kalman';
import type { StepResponseResult } from '../stepResponse';
import { currentFormFeedthrough } from './current-form-feedthrough';
import { dcGainUndefinedDiagnostic } from './dc-gain-undefined';
import { defectiveClosedLoopDiagnostic } from './defective-closed-loop';
import { float32Rounding } from './float32-rounding';
import { fragilePlacementDiagnostic } from './fragile-placement';
import { fragilePrescalerDiagnostic } from './fragile-prescaler';
import { unstableUnderParameterErrorDiagnostic } from './unstable-under-parameter-error';
import { fullStateWithoutObserverDiagnostic } from './full-state-without-observer';
import { illConditionedSetpointDiagnostic } from './ill-conditioned-setpoint';
import { integralInfeasibleDiagnostic } from './integral-infeasible';
import { kalmanNoSolution } from './kalman-no-solution';
import { lqrNoStabilisingSolution } from './lqr-no-stabilising-solution';
import { lqrNotDetectableOnAxis } from './lqr-not-detectable-on-axis';
import { lqrQNotPositiveSemidefinite } from './lqr-q-not-positive-semidefinite';
import { lqrRNotPositiveDefinite } from './lqr-r-not-positive-definite';
import { lqrWeightShape } from './lqr-weight-shape';
import { marginSmall } from './margin-small';
import { noInputs } from './no-inputs';
import { observerImpossible } from './observer-impossible';
import { observerPoleCount } from './observer-pole-count';
import { observerSlowerThanController } from './observer-slower-than-controller';
import { placementImpossibleDiagnostic } from './placement-impossible';
import { samplingPathological } from './sampling-pathological';
import { samplingTooLong } from './sampling-too-long';
import { saturationLimitExceeded } from './saturation-limit-exceeded';
import { saturationWindup } from './saturation-windup';
import { specUnusable } from './spec-unusable';
import { specViolation } from './spec-violation';
import { uncontrollableDiagnostic } from './uncontrollable';
import { zeroDcGainDiagnostic } from './zero-dc-gain';
import { tooManySetpointsKind } from './too-many-setpoints';
import { gainOverflowKind } from './gain-overflow';
import { suggestIntegralPole } from '../integralAction';
import type { IntegralFeasibility } from '../integralAction';

type Domain = 'continuous' | 'discrete';

/** Common practice: a phase margin below 30° or a gain margin within 6 dB is small. */
const SMALL_PHASE_MARGIN_DEG = 30;
const SMALL_GAIN_MARGIN_DB = 6;
/** A steady-state error above this fraction of the set-point under the parameter box is fragile (setting). */

function designLine(controller: CheckedController): Range {
  return controller.poles?.range ?? controller.lqr?.range ?? controller.spec?.range ?? controller.nameRange;
}

function outputNames(plant: CheckedPlant, indices: number[]): string[] {
  return indices.map((i) => plant.outputs[i]?.name ?? String(i));
}

function inputNames(plant: CheckedPlant): string[] {
  return plant.inputs.map((s) => s.name);
}

function poleText(value: Complex): string {
  const re = Number(value.re.toPrecision(4));
  const im = Number(Math.abs(value.im).toPrecision(4));
  return im === 0 ? `${re}` : `${re} ${value.im < 0 ? '-' : '+'} ${im}j`;
}

export const designDiagnostics = {
  weightShape: lqrWeightShape,
  gainOverflow: gainOverflowKind,
  specUnusable,
  specViolation,
  noInputs,
  currentFormFeedthrough,
  observerPoleCount,
  observerSlower: observerSlowerThanController,

  lqrFailure(range: Range, lqr: LqrResult): Diagnostic {
    switch (lqr.failure) {
      case 'r-not-positive-definite':
        return lqrRNotPositiveDefinite.create(range, ['R', lqr.smallest ?? NaN]);
      case 'q-not-positive-semidefinite':
        return lqrQNotPositiveSemidefinite.create(range, ['Q', lqr.smallest ?? NaN]);
      case 'not-stabilisable':
        return uncontrollableDiagnostic(range, { mode: lqr.mode ?? { re: NaN, im: 0 }, stable: false });
      case 'not-detectable-on-axis':
        return lqrNotDetectableOnAxis.create(range, [lqr.mode ?? { re: 0, im: 0 }]);
      case 'no-convergence':
        return lqrNoStabilisingSolution.create(range, ['no-convergence']);
      default:
        return lqrNoStabilisingSolution.create(range, ['no-stabilising-solution']);
    }
  },

  placementFailure(controller: CheckedController, placement: PlacementResult, domain: Domain, plant?: CheckedPlant): Diagnostic {
    const failure = placement.failure;
    return placementImpossibleDiagnostic(
      designLine(controller),
      {
        reason: failure?.reason ?? 'uncontrollable-mode-not-requested',
        mode: failure?.mode,
        requested: placement.requestedPoles.length,
        states: placement.K[0]?.length ?? placement.requestedPoles.length,
        domain,
      },
      plant ? matrixRelated(plant, ['A', 'B']) : undefined,
    );
  },

  placementWarnings(controller: CheckedController, placement: PlacementResult, domain: Domain): Diagnostic[] {
    const out: Diagnostic[] = [];
    const range = designLine(controller);
    if (placement.warnings.includes('defective-closed-loop')) {
      // Coincidence to the placement's own tolerance (poles e^{−50}, e^{−60} of a long sample
      // period count as one repeated pole there, so they must here too).
      const worst = placement.requestedPoles
        .map((pole) => ({ pole, count: multiplicityOf(pole, placement.requestedPoles) }))
        .sort((a, b) => b.count - a.count)[0];
      const inputRank = placement.K.length;
      if (worst) out.push(defectiveClosedLoopDiagnostic(range, { pole: worst.pole, multiplicity: worst.count, inputRank, domain }));
    }
    if (placement.fragile) {
      out.push(
        fragilePlacementDiagnostic(range, {
          eigenvectorCondition: placement.eigenvectorCondition,
          maxRelativePoleError: placement.maxRelativePoleError,
          gainNorm: placement.gainNorm,
        }),
      );
    }
    return out;
  },

  integralInfeasible(controller: CheckedController, plant: CheckedPlant, feasibility: IntegralFeasibility, domain: Domain): Diagnostic {
    const integral = controller.integral as NonNullable<CheckedController['integral']>;
    return integralInfeasibleDiagnostic(
      integral.range,
      {
        reason: feasibility.reason ?? 'zero-at-dc',
        outputs: outputNames(plant, integral.outputs),
        inputs: inputNames(plant),
        mode: feasibility.mode,
        domain,
      },
      matrixRelated(plant, ['A', 'B', 'C', 'D']),
    );
  },

  trackingFindings(
    controller: CheckedController,
    plant: CheckedPlant,
    setpoint: SetpointResult,
    integrated: number[],
    closedLoopPoles: Complex[],
    domain: Domain,
  ): Diagnostic[] {
    const track = controller.track as NonNullable<CheckedController['track']>;
    const outputs = outputNames(plant, track.outputs);
    const related = matrixRelated(plant, ['A', 'B', 'C', 'D']);
    if (setpoint.feasibility === 'zero-at-dc') {
      return [zeroDcGainDiagnostic(track.range, { outputs, inputs: inputNames(plant), domain, singularCombination: setpoint.singularCombination }, related)];
    }
    const out: Diagnostic[] = [];
    if (setpoint.feasibility === 'infeasible') {
      return [tooManySetpointsKind.create(track.range, [outputs.length, plant.inputs.length], { related })];
    }
    if (!setpoint.dcGainDefined) out.push(dcGainUndefinedDiagnostic(track.range, { domain }, related));
    if (setpoint.illConditioned) {
      out.push(
        illConditionedSetpointDiagnostic(track.range, {
          relativeGain: setpoint.conditionNumber,
          conditionNumber: setpoint.conditionNumber,
          domain,
        }),
      );
    }
    void integrated;
    void closedLoopPoles;
    return out;
  },

  fullStateWithoutObserver(controller: CheckedController, plant: CheckedPlant, measuredRank: number, suggestedPoles: string): Diagnostic {
    const diagnostic = fullStateWithoutObserverDiagnostic(controller.nameRange, { states: plant.states.length, measuredRank }, matrixRelated(plant, ['C']));
    return { ...diagnostic, data: { ...(diagnostic.data ?? {}), fix: 'add-observer-poles', poles: suggestedPoles } };
  },

  observerFailure(range: Range, mode: Complex | undefined): Diagnostic {
    return observerImpossible.create(range, [mode ?? null]);
  },

  kalmanFailure(range: Range, kalman: KalmanResult): Diagnostic {
    return kalmanNoSolution.create(range, [kalman.failure ?? 'no-stabilising-solution']);
  },

  responseFindings(controller: CheckedController, plant: CheckedPlant, raw: StepResponseResult, reports: StepResponseReport[]): Diagnostic[] {
    const out: Diagnostic[] = [];
    const seen = new Set<number>();
    for (const report of reports) {
      for (const peak of report.metrics.peakInput) {
        const index = plant.inputs.findIndex((s) => s.name === peak.input);
        const limit = controller.limits.find((entry) => entry.input === index);
        if (!limit || seen.has(index)) continue;
        if (peak.max > limit.high || peak.min < limit.low) {
          seen.add(index);
          const beyond = peak.max - limit.high >= limit.low - peak.min ? peak.max : peak.min;
          out.push(saturationLimitExceeded.create(limit.range, [peak.input, beyond, limit.low, limit.high]));
        }
      }
    }
    for (const experiment of raw.experiments) {
      if (experiment.windup?.windupSignificant && controller.integral) {
        out.push(saturationWindup.create(controller.integral.range, [experiment.windup.overshootWithoutPercent, experiment.windup.overshootWithPercent]));
        break;
      }
    }
    return out;
  },

  marginFindings(controller: CheckedController, plant: CheckedPlant, margins: LoopMarginsResult): Diagnostic[] {
    const out: Diagnostic[] = [];
    if (!margins.closedLoopStable) return out;
    for (const entry of margins.perInput) {
      const input = plant.inputs[entry.input]?.name ?? String(entry.input);
      if (entry.phaseMarginDeg !== null && entry.phaseMarginDeg < SMALL_PHASE_MARGIN_DEG) {
        out.push(marginSmall.create(designLine(controller), [input, 'phase', entry.phaseMarginDeg]));
      } else if (entry.upperGainMarginDb < SMALL_GAIN_MARGIN_DB) {
        out.push(marginSmall.create(designLine(controller), [input, 'gain-upper', entry.upperGainMarginDb]));
      } else if (entry.lowerGainMarginDb > -SMALL_GAIN_MARGIN_DB) {
        out.push(marginSmall.create(designLine(controller), [input, 'gain-lower', entry.lowerGainMarginDb]));
      }
    }
    return out;
  },

  samplingFindings(controller: CheckedController, advice: SamplingAdvice): Diagnostic[] {
    const sample = controller.sample as NonNullable<CheckedController['sample']>;
    const out: Diagnostic[] = [];
    if (advice.tooLongForFastestPole && advice.fastestPoleMagnitude !== null && advice.advisedMaximumPeriod !== null) {
      out.push(samplingTooLong.create(sample.range, [advice.samplePeriod, advice.fastestPoleMagnitude, advice.advisedMaximumPeriod]));
    }
    for (const pair of advice.pathologicalPairs) {
      // Report each pair once: skip the mirror image of a pair in the upper half plane (a
      // conjugate pair, imaginary parts summing to zero, is its own mirror and is kept).
      const imaginarySum = pair.first.im + pair.second.im;
      if (imaginarySum < -Math.sqrt(Number.EPSILON) * (Math.abs(pair.first.im) + Math.abs(pair.second.im))) continue;
      out.push(samplingPathological.create(sample.range, [advice.samplePeriod, pair.first, pair.second]));
    }
    return out;
  },

  float32Finding(controller: CheckedController, check: Float32Check): Diagnostic {
    const worst = [...check.flagged].sort((a, b) => Number(b.leftStabilityRegion) - Number(a.leftStabilityRegion) || b.relativeMove - a.relativeMove)[0];
    const range = controller.sample?.range ?? controller.nameRange;
    return float32Rounding.create(range, [worst.double, worst.single, worst.relativeMove, worst.leftStabilityRegion]);
  },

  /**
   * The prescaler is fragile when a ±p % parameter error moves the settled output by more than
   * settings-scaled fraction of the set-point (threshold: half the parameter error, common
   * practice for "the error is not attenuated") or destabilises the loop.
   */
  fragilityFindings(
    controller: CheckedController,
    plant: CheckedPlant,
    fragility: FragilityResult,
    parameterNames: string[],
    threshold: number,
    integralAlready: boolean,
    integralFeasible: boolean,
    closedLoopPoles: Complex[],
    domain: Domain,
  ): { diagnostics: Diagnostic[]; fixData: Record<string, unknown> | null } {
    const track = controller.track as NonNullable<CheckedController['track']>;
    if (integralAlready) return { diagnostics: [], fixData: null };
    if (!(fragility.worstTrackingError > threshold)) return { diagnostics: [], fixData: null };
    const worstIndex = fragility.worstParameters[0];
    const parameter =
      worstIndex === undefined
        ? 'the input gain B'
        : worstIndex >= parameterNames.length
          ? 'the input gain B'
          : parameterNames[worstIndex];
    const related = [
      ...(worstIndex !== undefined && plant.parameters[worstIndex]
        ? [{ message: `parameter ${parameterNames[worstIndex]} is declared here`, range: plant.parameters[worstIndex].range }]
        : []),
      { message: 'the plant this prescaler was computed for', range: plant.nameRange },
    ];
    const diagnostic = fragilePrescalerDiagnostic(
      track.range,
      {
        percent: fragility.percent,
        parameter,
        trackingError: fragility.worstTrackingError,
        outputs: outputNames(plant, track.outputs),
        integralError: fragility.worstIntegralError,
        integralFeasible,
      },
      related,
    );
    let fixData: Record<string, unknown> | null = null;
    if (integralFeasible) {
      const pole = suggestIntegralPole(closedLoopPoles, domain);
      const continuousPole = domain === 'discrete' ? null : pole;
      fixData = {
        fix: 'add-integral-action',
        output: outputNames(plant, track.outputs).join(', '),
        pole: continuousPole ? poleText(continuousPole) : null,
        insertAfter: track.range,
      };
      diagnostic.data = { ...(diagnostic.data ?? {}), ...fixData };
    }
    return { diagnostics: [diagnostic], fixData };
  },

  /**
   * The parameter box destabilises the loop that runs (the integral loop of an integral design,
   * else the prescaler loop), where no single parameter did: a single one is already named by
   * `control/fragile-prescaler`.
   */
  parameterBoxFindings(
    controller: CheckedController,
    plant: CheckedPlant,
    fragility: FragilityResult,
    parameterNames: string[],
    integralDesign: boolean,
    domain: Domain,
  ): Diagnostic[] {
    const { box, nominal } = fragility;
    // A nominal loop that is already unstable is reported by the design itself, not here.
    const nominallyStable = integralDesign ? nominal.integralStable === true : nominal.stable;
    const unstable = integralDesign ? box.integralAllStable === false : !box.allStable;
    if (!unstable || !nominallyStable) return [];
    if (!integralDesign && !Number.isFinite(fragility.worstTrackingError)) return [];
    const point = !integralDesign && box.worstPoint ? box.worstPoint.map((value, index) => ({ name: parameterNames[index] ?? `parameter ${index + 1}`, value })) : null;
    const related = [
      ...plant.parameters.slice(0, 3).map((parameter) => ({ message: `parameter ${parameter.name} is declared here`, range: parameter.range })),
      { message: 'the plant whose parameters move', range: plant.nameRange },
    ];
    return [
      unstableUnderParameterErrorDiagnostic(
        controller.nameRange,
        { percent: fragility.percent, loop: integralDesign ? 'integral' : 'prescaler', point, pole: integralDesign ? null : box.worstPole, domain },
        related,
      ),
    ];
  },

  plantAnchor,
};
