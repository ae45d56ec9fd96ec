import { describe, expect, it } from 'vitest';
import { numberFromEnvironment, readServerSettings, settingsFromInitializationOptions } from '../../server/src/lsp/settings';

describe('workspace settings', () => {
  it('reads analysis fields, debounce and lenses; ignores mistyped values', () => {
    const settings = readServerSettings({ maxLiveStates: 50, parameterErrorPercent: '20', debounceMs: 40, lenses: { step: false, poles: 1 } });
    expect(settings.analysis).toEqual({ maxLiveStates: 50 });
    expect(settings.debounceMs).toBe(40);
    expect(settings.lenses).toEqual({ plant: true, gains: true, prescaler: true, poles: true, step: false });
  });

  it('falls back to defaults for a negative debounce, and switches every lens off with `lenses: false`', () => {
    const settings = readServerSettings({ debounceMs: -5, lenses: false });
    expect(settings.debounceMs).toBe(150);
    expect(Object.values(settings.lenses).every((shown) => shown === false)).toBe(true);
  });

  it('accepts initialization options with or without a `settings` wrapper, and nested `analysis`', () => {
    expect(settingsFromInitializationOptions({ settings: { observerSpeedFactor: 6 } }).analysis).toEqual({ observerSpeedFactor: 6 });
    expect(settingsFromInitializationOptions({ analysis: { simulationPoints: 500 } }).analysis).toEqual({ simulationPoints: 500 });
    expect(settingsFromInitializationOptions(undefined).debounceMs).toBe(150);
  });
});

describe('environment overrides', () => {
  it('reads a finite number; unset, empty or malformed values count as unset', () => {
    const name = 'LOOPWRIGHT_TEST_NUMBER';
    const cases: [string | undefined, number | undefined][] = [[undefined, undefined], ['', undefined], ['  ', undefined], ['abc', undefined], ['Infinity', undefined], ['0', 0], [' 16 ', 16], ['2.5', 2.5]];
    for (const [text, expected] of cases) {
      if (text === undefined) delete process.env[name];
      else process.env[name] = text;
      expect(numberFromEnvironment(name)).toBe(expected);
    }
    delete process.env[name];
  });
});

