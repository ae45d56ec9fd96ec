// Workspace settings (section `loopwright`): the analysis settings the engine takes, plus
// editor-only ones (debounce, lenses). Unknown or mistyped fields fall back to defaults.
import { defaultSettings, type AnalysisSettings } from '../control/settings';
import { defaultLensSettings, type LensSettings } from '../ide/lensSettings';

export interface ServerSettings {
  analysis: Partial<AnalysisSettings>;
  /** Delay after the last edit before the slow analyses start, in milliseconds. */
  debounceMs: number;
  lenses: LensSettings;
}

/**
 * A number from the server's environment (the LOOPWRIGHT_* overrides used by tests and benchmarks);
 * undefined when the variable is unset, empty or not a finite number.
 */
export function numberFromEnvironment(name: string): number | undefined {
  const text = process.env[name]?.trim();
  if (!text) return undefined;
  const value = Number(text);
  return Number.isFinite(value) ? value : undefined;
}

export const DEFAULT_DEBOUNCE_MS = 150;

export const defaultServerSettings: ServerSettings = {
  analysis: {},
  debounceMs: DEFAULT_DEBOUNCE_MS,
  lenses: defaultLensSettings,
};

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Reads a settings object as a client sends it (nested `analysis` or flat fields both accepted). */
export function readServerSettings(raw: unknown): ServerSettings {
  if (!isRecord(raw)) return defaultServerSettings;
  const analysis: Partial<AnalysisSettings> = {};
  const sources = [raw, isRecord(raw.analysis) ? raw.analysis : {}];
  for (const source of sources) {
    for (const key of Object.keys(defaultSettings) as (keyof AnalysisSettings)[]) {
      const value = source[key];
      if (typeof value === 'number' && Number.isFinite(value)) analysis[key] = value;
    }
  }
  const debounce = raw.debounceMs;
  const lenses: LensSettings = { ...defaultLensSettings };
  if (isRecord(raw.lenses)) {
    for (const key of Object.keys(defaultLensSettings) as (keyof LensSettings)[]) {
      if (typeof raw.lenses[key] === 'boolean') lenses[key] = raw.lenses[key] as boolean;
    }
  } else if (raw.lenses === false) {
    for (const key of Object.keys(lenses) as (keyof LensSettings)[]) lenses[key] = false;
  }
  return {
    analysis,
    debounceMs: typeof debounce === 'number' && Number.isFinite(debounce) && debounce >= 0 ? Math.min(debounce, 10_000) : DEFAULT_DEBOUNCE_MS,
    lenses,
  };
}

/** initializationOptions may carry the settings directly or under `settings`. */
export function settingsFromInitializationOptions(options: unknown): ServerSettings {
  if (isRecord(options) && isRecord(options.settings)) return readServerSettings(options.settings);
  return readServerSettings(options);
}
