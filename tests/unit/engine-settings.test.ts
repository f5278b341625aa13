import { describe, expect, it } from 'vitest';
import { DEFAULT_ENGINE_SETTINGS, ENGINE_SETTING_RULES, closestName, resolveEngineSettings } from '../../src/lib/engine/engine-settings';

describe('resolveEngineSettings', () => {
  it('fills the stated defaults', () => {
    const settings = resolveEngineSettings();
    expect(settings).toEqual(DEFAULT_ENGINE_SETTINGS);
    expect(settings.strongPairThreshold).toBe(0.8); // issue 5 default
    expect(settings.conditionIndexThreshold).toBe(30); // Belsley, Kuh & Welsch 1980
    expect(settings.varianceProportionThreshold).toBe(0.5); // Belsley, Kuh & Welsch 1980
    expect(settings.minItemsPerScale).toBe(3); // issue 5 default
    expect(settings.alphaFloor).toBe(0.7); // Nunnally 1978
    expect(settings.maxAlphaDrop).toBe(0.1); // house figure, docs/decisions/003
    expect(settings.maxCutShare).toBe(0.25); // house figure, docs/decisions/003
    expect(settings.secondsPerItem).toBe(8); // house figure, docs/decisions/003
    expect(settings.bootstrap).toBe(200); // issue 5 default
    expect(settings.stabilityThreshold).toBe(0.7); // house figure, docs/decisions/003
    expect(Object.isFrozen(settings)).toBe(true);
  });

  it('keeps what the caller sets', () => {
    expect(resolveEngineSettings({ alphaFloor: 0.8, bootstrap: 0, method: 'spearman' })).toMatchObject({ alphaFloor: 0.8, bootstrap: 0, method: 'spearman', missing: 'pairwise' });
  });

  it('names the setting that is out of range', () => {
    expect(() => resolveEngineSettings({ strongPairThreshold: 1.2 })).toThrow('resolveEngineSettings: strongPairThreshold must be a number above 0 and at most 1, got 1.2');
    expect(() => resolveEngineSettings({ strongPairThreshold: 0 })).toThrow(/strongPairThreshold must be a number above 0 and at most 1, got 0$/);
    expect(() => resolveEngineSettings({ conditionIndexThreshold: 0.5 })).toThrow(/conditionIndexThreshold/);
    expect(() => resolveEngineSettings({ minItemsPerScale: 2.5 })).toThrow(/minItemsPerScale/);
    expect(() => resolveEngineSettings({ bootstrap: -1 })).toThrow(/bootstrap/);
    expect(() => resolveEngineSettings({ seed: 1.5 })).toThrow('seed must be a whole number from -2147483648 to 2147483647, got 1.5');
    expect(() => resolveEngineSettings({ secondsPerItem: 0 })).toThrow(/secondsPerItem/);
    expect(() => resolveEngineSettings({ confidenceLevel: 1 })).toThrow(/confidenceLevel/);
    expect(() => resolveEngineSettings({ dependencyVifThreshold: 0.5 })).toThrow(/dependencyVifThreshold/);
    expect(() => resolveEngineSettings({ method: 'kendall' as never })).toThrow(/method must be pearson, spearman or polychoric/);
    expect(() => resolveEngineSettings({ missing: 'mean' as never })).toThrow(/missing must be pairwise or listwise/);
    expect(() => resolveEngineSettings({ bootstrap: 10_001 })).toThrow('bootstrap must be a whole number from 0 to 10000, got 10001');
  });

  it('refuses a key that is not a setting, naming the closest one', () => {
    expect(() => resolveEngineSettings({ strongPairThresold: 0.3 } as never)).toThrow('resolveEngineSettings: "strongPairThresold" is not an engine setting; did you mean "strongPairThreshold"?');
    expect(() => resolveEngineSettings({ outcome: null } as never)).toThrow(/"outcome" is not an engine setting/);
  });

  it('keeps the stored key order of its rules', () => {
    expect(Object.keys(resolveEngineSettings({ seed: 4, method: 'spearman' }))).toEqual(Object.keys(ENGINE_SETTING_RULES));
  });
});

describe('closestName', () => {
  it('finds a misspelt name and gives up on a stranger', () => {
    expect(closestName('bootstrp', ['bootstrap', 'seed'])).toBe('bootstrap');
    expect(closestName('SEED', ['bootstrap', 'seed'])).toBe('seed');
    expect(closestName('colour', ['bootstrap', 'seed'])).toBeNull();
  });
});
