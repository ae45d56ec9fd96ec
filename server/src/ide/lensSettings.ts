// Which code lenses show above a controller (workspace setting `loopwright.lenses`).
export interface LensSettings {
  gains: boolean;
  prescaler: boolean;
  poles: boolean;
  step: boolean;
}

export const defaultLensSettings: LensSettings = { gains: true, prescaler: true, poles: true, step: true };
