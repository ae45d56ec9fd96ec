// Which code lenses show above a controller (workspace setting `loopwright.lenses`).
export interface LensSettings {
  /** A one-line verdict above each plant (stability, controllability, observability). */
  plant: boolean;
  gains: boolean;
  prescaler: boolean;
  poles: boolean;
  step: boolean;
}

export const defaultLensSettings: LensSettings = { plant: true, gains: true, prescaler: true, poles: true, step: true };
