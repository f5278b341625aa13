import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluateLocalDependence } from '../../src/lib/evaluation/evaluate-local-dependence';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { localDependenceWaveSpec, type LocalDependenceWaveKind } from '../../src/lib/synth/local-dependence-spec';

// Issue 9 asks for precision and recall of at least .95 on generated doublet waves and at most one
// recommendation per ten waves with nothing redundant. Over all cells the engine does not reach the
// .95 floors (README "Engine figures: local dependence", 60 waves per kind, and
// docs/decisions/022); this test asserts the floors it meets, on few seeded waves with cheap
// settings (stated): the ceiling on clean, homogeneous and cross-loading waves, precision, and recall
// in the cells where the doublet is detectable (n 450-600 with a planted residual of .20-.35).
// Figures printed by bench/engine-local-dependence.bench.ts.
// The published detectors on the same files: scripts/reference/local-dependence-recall.R (lavaan
// 0.6-14, psych 2.2.9) on the waves scripts/reference/local-dependence-waves.ts writes, every wave's
// flagged pairs in fixtures/reference/local-dependence-recall.json. None of them reaches .95 recall
// with .95 precision either (README, docs/decisions/024-doublet-recall-against-r.md).
const reference = JSON.parse(readFileSync(new URL('../../fixtures/reference/local-dependence-recall.json', import.meta.url), 'utf8')) as {
  waves: { kind: LocalDependenceWaveKind; seed: number; respondents: number; flags: Record<string, string | string[]> }[];
};
/** R's flags on seeds 1..last of every kind, scored against the generator's planted doublets. */
function referenceScore(detector: string, last: number): { truePositives: number; falsePositives: number; planted: number } {
  let truePositives = 0;
  let falsePositives = 0;
  let planted = 0;
  for (const wave of reference.waves.filter((entry) => entry.seed <= last)) {
    const spec = localDependenceWaveSpec(wave.seed, wave.kind);
    const generated = generateWave(spec, wave.seed + 500_000);
    // The fixture was written from these very waves (same respondents, same planted pairs).
    expect(engineInputFromSyntheticWave(generated).matrix.rows).toBe(wave.respondents);
    const truth = new Set(generated.truth.doublets.map(([a, b]) => (a < b ? `${a}|${b}` : `${b}|${a}`)));
    planted += truth.size;
    const flags = wave.flags[detector]; // a list of one pair is stored as a bare string
    for (const pair of typeof flags === 'string' ? [flags] : flags) {
      if (truth.has(pair)) truePositives++;
      else falsePositives++;
    }
  }
  return { truePositives, falsePositives, planted };
}
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
    // On the same eight waves per kind, lavaan's sequential modification-index test at the engine's
    // level (Bonferroni .001 per scale; R: 13 of the 19 planted found, no false pair) finds no more doublets than the engine.
    const lavaanSequential = referenceScore('mi_ml_seq_001', 8);
    expect(lavaanSequential).toEqual({ truePositives: 13, falsePositives: 0, planted: 19 });
    expect(lavaanSequential.planted).toBe(result.plantedDoublets);
    expect(engine.truePositives).toBeGreaterThanOrEqual(lavaanSequential.truePositives);
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
