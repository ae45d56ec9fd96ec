// The explicit settings record every analysis takes. Defaults marked "common practice" are
// rules of thumb, documented in docs/engine.md and overridable from the CLI and the editor.

export interface AnalysisSettings {
  /** ± percent error applied to each parameter (and to B) in the fragility check. */
  parameterErrorPercent: number;
  /** Default observer poles are this factor faster than the controller's (common practice: 2–6). */
  observerSpeedFactor: number;
  /** With `spec`, non-dominant poles are this factor faster than the dominant pair (common practice: 3–5). */
  fastPoleFactor: number;
  /**
   * A tracking design is called fragile when the ± parameterErrorPercent study moves the settled
   * output by more than this percent of the set-point (common practice: a few percent).
   */
  fragilityTolerancePercent: number;
  /** Placement is called fragile above this eigenvector condition number. */
  placementConditionLimit: number;
  /** Set-point gains larger than this multiple of the model scale are called ill-conditioned. */
  setpointGainLimit: number;
  /** Samples per fastest closed-loop time constant advised (common practice: 6–20 samples per rise time). */
  samplesPerTimeConstant: number;
  /** Largest number of states for which the slow analyses run live in the editor. */
  maxLiveStates: number;
  /** Iteration budget multiplier for iterative methods (QR sweeps, Newton steps, sign iterations). */
  iterationBudget: number;
  /** Points on the simulation grid of a step response. */
  simulationPoints: number;
}

export const defaultSettings: AnalysisSettings = {
  parameterErrorPercent: 10,
  observerSpeedFactor: 4,
  fastPoleFactor: 4,
  fragilityTolerancePercent: 2,
  placementConditionLimit: 1e6,
  setpointGainLimit: 1e6,
  samplesPerTimeConstant: 10,
  maxLiveStates: 200,
  iterationBudget: 1,
  simulationPoints: 2000,
};

export function resolveSettings(overrides: Partial<AnalysisSettings> = {}): AnalysisSettings {
  return { ...defaultSettings, ...overrides };
}
