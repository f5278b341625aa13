import { describe, expect, it } from 'vitest';
import { evaluateEngineOnWaves } from '../../src/lib/evaluation/evaluate-engine';

// The floors of issue 5 ("How it is checked"); bench/engine.bench.ts prints the exact figures.
const PRECISION_FLOOR = 0.95;
const RECALL_FLOOR = 0.95;
const CLEAN_RECOMMENDATIONS_PER_TEN_WAVES_CEILING = 1;

describe('evaluateEngineOnWaves', () => {
  it('finds the planted pairs of 50 random waves with precision and recall of at least 0.95, and at most one recommendation per ten clean waves', async () => {
    // Near-copies only: the local-dependence evidence is off here to keep the run affordable
    // (tests/unit/engine-evaluate-local-dependence.test.ts covers it).
    const result = await evaluateEngineOnWaves({ plantedWaves: 50, cleanWaves: 50, localDependence: false });
    expect(result.plantedPairs).toBeGreaterThan(50); // the generator plants 0-3 clusters per wave
    expect(result.precision).toBeGreaterThanOrEqual(PRECISION_FLOOR);
    expect(result.recall).toBeGreaterThanOrEqual(RECALL_FLOOR);
    expect(result.cleanRecommendationsPerTenWaves).toBeLessThanOrEqual(CLEAN_RECOMMENDATIONS_PER_TEN_WAVES_CEILING);
  });

  it('holds the floors with the bootstrap on (few waves, 20 resamples), which must not change the clusters', async () => {
    const cheap = { ebicPenaltyCount: 20, residualBootstrapDraws: 20 };
    const off = await evaluateEngineOnWaves({ plantedWaves: 3, cleanWaves: 3, firstSeed: 101, settings: cheap });
    const on = await evaluateEngineOnWaves({ plantedWaves: 3, cleanWaves: 3, firstSeed: 101, settings: { ...cheap, bootstrap: 10 } });
    expect(on.truePositives).toBe(off.truePositives);
    expect(on.falsePositives).toBe(off.falsePositives);
    expect(on.cleanRecommendations).toBe(off.cleanRecommendations);
  });

  it('counts a missed pair against recall (a threshold no planted pair reaches finds nothing)', async () => {
    const result = await evaluateEngineOnWaves({ plantedWaves: 3, cleanWaves: 0, localDependence: false, settings: { strongPairThreshold: 1, conditionIndexThreshold: 1e6, residualBootstrapDraws: 0, ebicPenaltyCount: 20, residualRelativeThreshold: 1, wtoThreshold: 1 } });
    expect(result.truePositives).toBe(0);
    expect(result.recall).toBe(0);
    expect(result.misses.every((line) => line.includes('missed pair'))).toBe(true);
  });

  it('refuses a negative wave count', async () => {
    await expect(evaluateEngineOnWaves({ plantedWaves: -1, cleanWaves: 0 })).rejects.toThrow(/plantedWaves must be a non-negative integer/);
  });
});
