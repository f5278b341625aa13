import { describe, expect, it } from 'vitest';
import { evaluateLocalDependence } from '../../src/lib/evaluation/evaluate-local-dependence';

// Issue 9 asks for precision and recall of at least .95 on generated doublet waves and at most one
// recommendation per ten waves with nothing redundant. Over all cells the engine does not reach the
// .95 floors (README "Engine figures: local dependence", 60 waves per kind, and
// docs/decisions/022); this test asserts the floors it meets, on few seeded waves with cheap
// settings (stated): the ceiling on clean, homogeneous and cross-loading waves, precision, and recall
// in the cells where the doublet is detectable (n 450-600 with a planted residual of .20-.35).
// Figures printed by bench/engine-local-dependence.bench.ts.
const CHEAP = { ebicPenaltyCount: 20, residualBootstrapDraws: 20 };
const PRECISION_FLOOR = 0.95;
const RECALL_FLOOR = 0.95;
const CLEAN_RECOMMENDATIONS_PER_TEN_WAVES_CEILING = 1;

describe('evaluateLocalDependence', () => {
  it('meets the ceiling on waves with nothing redundant and the precision floor over n 150-600', async () => {
    const result = await evaluateLocalDependence({ wavesPerKind: 8, settings: CHEAP });
    expect(result.plantedDoublets).toBeGreaterThan(10);
    const { engine, wto } = result.detectors;
    expect(result.cleanRecommendationsPerTenWaves).toBeLessThanOrEqual(CLEAN_RECOMMENDATIONS_PER_TEN_WAVES_CEILING);
    expect(engine.precision).toBeGreaterThanOrEqual(PRECISION_FLOOR);
    // wTO alone flags pairs of homogeneous scales; the engine's rules keep them out.
    expect(wto.flagsByKind.homogeneous).toBeGreaterThan(engine.flagsByKind.homogeneous);
    // The cells add up to the planted doublets and the engine's true positives.
    const all = result.cells.filter((cell) => cell.residual === 'all');
    expect(all.reduce((sum, cell) => sum + cell.planted, 0)).toBe(result.plantedDoublets);
    expect(all.reduce((sum, cell) => sum + cell.found, 0)).toBe(engine.truePositives);
    expect(all.reduce((sum, cell) => sum + cell.falsePairs, 0)).toBe(engine.falsePositives);
  }, 300_000);

  it('meets the recall and precision floors where n is 500 and the planted residual .20-.35', async () => {
    const result = await evaluateLocalDependence({ wavesPerKind: 8, firstSeed: 201, respondents: 500, settings: CHEAP });
    const detectable = result.cells.filter((cell) => cell.n === '450-600' && (cell.residual === '.20-.25' || cell.residual === '.25-.35'));
    const planted = detectable.reduce((sum, cell) => sum + cell.planted, 0);
    const found = detectable.reduce((sum, cell) => sum + cell.found, 0);
    expect(planted).toBeGreaterThan(5);
    expect(found / planted).toBeGreaterThanOrEqual(RECALL_FLOOR);
    expect(result.detectors.engine.precision).toBeGreaterThanOrEqual(PRECISION_FLOOR);
    expect(result.cleanRecommendationsPerTenWaves).toBeLessThanOrEqual(CLEAN_RECOMMENDATIONS_PER_TEN_WAVES_CEILING);
  }, 300_000);

  it('counts what a rule set that flags nothing misses (the floors can fail)', async () => {
    const result = await evaluateLocalDependence({ wavesPerKind: 1, settings: { ...CHEAP, modificationIndexAlpha: 1e-12, modificationIndexNetworkAlpha: 1e-12, strongPairThreshold: 1 } });
    expect(result.detectors.engine.truePositives).toBe(0);
    expect(result.detectors.engine.recall).toBe(0);
  }, 120_000);

  it('refuses a non-positive wave count', async () => {
    await expect(evaluateLocalDependence({ wavesPerKind: 0 })).rejects.toThrow(/wavesPerKind must be a positive integer/);
  });
});
