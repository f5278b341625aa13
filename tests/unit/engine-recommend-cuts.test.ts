import { describe, expect, it } from 'vitest';
import { computeEvidence, scaleAlphaOracle } from '../../src/lib/engine/compute-evidence';
import { DEFAULT_ENGINE_SETTINGS, resolveEngineSettings, type EngineSettings } from '../../src/lib/engine/engine-settings';
import { findOverlapClusters } from '../../src/lib/engine/overlap-clusters';
import { keeperScores, recommendCuts, type Recommendation } from '../../src/lib/engine/recommend-cuts';
import { simulateCut } from '../../src/lib/engine/simulate-cut';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { squareMatrixFromRows, type ItemMatrix } from '../../src/lib/stats/types';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { randomWaveSpec } from '../../src/lib/synth/random-wave-spec';
import type { EngineEvidence, EngineItem } from '../../src/lib/engine/types';
import { engineReference as ref, referenceInput } from './engine-fixture';
import { cautionSentence, reasonSentence } from '../../src/lib/words';

// Reference figures: R 4.2.2 via scripts/reference/engine-evidence.R. Scale S1 (A1..A5, pairwise)
// has alpha 0.8007 and 0.7160 without A5; the twin pair A1-A5 has r = 0.934.
const S1_ALPHA = ref.pairwise.scales[0].alpha; // R: alpha of S1
const S1_ALPHA_WITHOUT_A5 = ref.whatIf.pairwise.scales[0].alpha; // R: alpha of S1 without A5

function recommend(
  settings: Partial<EngineSettings> = {},
  locked: string[] = [],
  wordingOf?: (a: string, b: string) => number | null,
): { recommendation: Recommendation; removed: string[]; budget: number; evidence: EngineEvidence } {
  const { matrix, items } = referenceInput(locked);
  const resolved = resolveEngineSettings(settings);
  const evidence = computeEvidence(matrix, items, resolved);
  const wording = items.map((a) => items.map((b) => (wordingOf ? wordingOf(a.id, b.id) : null)));
  const { clusters } = findOverlapClusters(evidence, wording, resolved);
  const cuts = recommendCuts(evidence, clusters, resolved, scaleAlphaOracle(evidence, matrix));
  expect(cuts.recommendations).toHaveLength(1);
  return { recommendation: cuts.recommendations[0], removed: cuts.removed.map((index) => items[index].id), budget: cuts.cutBudget, evidence };
}

describe('keeperScores', () => {
  it('is item-rest − missing rate − 0.5 · larger end share − 0.05 · ln(VIF without partners)', () => {
    const { matrix, items } = referenceInput();
    const evidence = computeEvidence(matrix, items, DEFAULT_ENGINE_SETTINGS);
    const { clusters } = findOverlapClusters(evidence, items.map(() => items.map(() => null)), DEFAULT_ENGINE_SETTINGS);
    const scores = keeperScores(evidence, clusters[0]);
    for (const [id, k, vifIndex] of [['A1', 0, 'A1'], ['A5', 4, 'A5']] as const) {
      const descriptive = ref.descriptives.find((entry) => entry.id === id)!;
      const expected =
        ref.pairwise.scales[0].itemRest[k] - // R: item-rest within S1
        descriptive.missingRate - // R: mean(is.na(x))
        0.5 * Math.max(descriptive.floor, descriptive.ceiling) - // R: mean(x == 1), mean(x == 5)
        0.05 * Math.log(ref.keeperVif[vifIndex]); // R: diag(solve(R without the partner))
      const score = scores.find((entry) => entry.item === id)!;
      expect(score.score).toBeCloseTo(expected, 10);
      expect(score.vifWithoutPartners).toBeCloseTo(ref.keeperVif[vifIndex], 10);
      expect(score.fitSource).toBe('item-rest');
    }
  });
});

describe('recommendCuts', () => {
  it('keeps the better-scoring twin and removes the other within the default constraints', () => {
    const { recommendation, removed } = recommend();
    expect(recommendation.cluster).toEqual(['A1', 'A5']);
    const scores = recommendation.evidence.keeperScores;
    const best = scores.reduce((a, b) => (a.score >= b.score ? a : b));
    expect(recommendation.keep).toBe(best.item);
    expect(removed).toHaveLength(1);
    expect(recommendation.actions[0].action).toBe('drop'); // r = 0.934 < 0.95 and no wording: drop
    expect(recommendation.evidence.vifBefore).toBeCloseTo(Math.max(ref.pairwise.vif[0], ref.pairwise.vif[4]), 10); // R: diag(solve(R))
    expect(recommendation.evidence.vifAfter).toBeLessThan(recommendation.evidence.vifBefore!);
    expect(reasonSentence(recommendation.because)).toMatch(/^A1 and A5 correlate strongly \(r = 0\.93, 95% interval 0\.91 to 0\.95, n = 211\), shown by [^;]*a strong correlation; keep A\d .* and drop A\d, which lowers the cluster's highest VIF from [\d.]+ to [\d.]+\.$/);
    expect(recommendation.cautions).toHaveLength(3);
    // n = 211 is not small (SMALL_PAIR_N = 200): the caution says what the figure means instead.
    expect(recommendation.cautions.map(cautionSentence).join(' ')).toMatch(/not proof.*rests on 211 respondents, so each r is precise.*validated instrument/);
  });

  it('never proposes a locked item, and a locked item always wins the keeper', () => {
    const unlocked = recommend();
    const other = unlocked.recommendation.actions[0].item;
    const { recommendation, removed } = recommend({}, [other]);
    expect(recommendation.keep).toBe(other);
    expect(removed).not.toContain(other);
    const both = recommend({}, ['A1', 'A5']);
    expect(both.removed).toEqual([]);
    expect(both.recommendation.actions[0]).toMatchObject({ action: 'keep', blockedBy: ['locked'] });
    expect(reasonSentence(both.recommendation.because)).toMatch(/; no change is proposed: A5 stays because it is locked\.$/);
  });

  it('merges when the pair is nearly perfect or the wording nearly identical, and drops interchangeable items whatever their spelling', () => {
    expect(recommend({ mergeCorrelation: 0.93 }).recommendation.actions[0]).toMatchObject({ action: 'merge' }); // r = 0.9335 (R)
    const merged = recommend({}, [], () => 0.85).recommendation;
    expect(merged.actions[0]).toMatchObject({ action: 'merge', into: merged.keep });
    // Synonyms share few 3-grams ("Get angry easily" / "Lose my temper"): low similarity is no reason to reword.
    expect(recommend({}, [], () => 0.1).recommendation.actions[0].action).toBe('drop');
    expect(recommend({}, [], () => 0.5).recommendation.actions[0].action).toBe('drop');
  });

  it('rewords only an item of another scale than the keeper, and never an item marked not rewordable', () => {
    const run = (rewordable: boolean): { recommendation: Recommendation; removed: string[] } => {
      const { matrix, items } = referenceInput();
      // A5 moved to its own scale: the codebook says it measures something else than A1.
      const moved = items.map((item) => (item.id === 'A5' ? { ...item, scale: 'S9', rewordable } : item));
      const resolved = resolveEngineSettings({});
      const evidence = computeEvidence(matrix, moved, resolved);
      const { clusters } = findOverlapClusters(evidence, moved.map(() => moved.map(() => null)), resolved);
      const cuts = recommendCuts(evidence, clusters, resolved, scaleAlphaOracle(evidence, matrix));
      const recommendation = cuts.recommendations.find((entry) => entry.cluster.includes('A5'))!;
      return { recommendation, removed: cuts.removed.map((index) => moved[index].id) };
    };
    const reworded = run(true);
    expect(reworded.recommendation.actions[0]).toMatchObject({ action: 'reword', into: null });
    expect(reworded.removed).toEqual([]); // a reword removes nothing
    const licensed = run(false);
    expect(licensed.recommendation.actions.every((action) => action.action !== 'reword' && action.proposed !== 'reword')).toBe(true);
  });

  it('blocks a cut that would leave a scale below its minimum number of items', () => {
    const { recommendation, removed } = recommend({ minItemsPerScale: 5 }); // S1 has 5 usable items
    expect(removed).toEqual([]);
    expect(recommendation.actions[0]).toMatchObject({ action: 'keep', proposed: 'drop', blockedBy: ['min-items'] });
    expect(recommend({ minItemsPerScale: 4 }).removed).toHaveLength(1);
  });

  it('blocks a cut that would take the alpha below its floor or drop it by more than allowed', () => {
    const keeper = recommend().recommendation.keep;
    if (keeper !== 'A1') throw new Error('the reference data should keep A1');
    // Without A5, S1's alpha is 0.7160 (from 0.8007): a drop of 0.0847.
    expect(recommend({ alphaFloor: S1_ALPHA_WITHOUT_A5 + 0.001 }).recommendation.actions[0].blockedBy).toEqual(['alpha-floor']);
    expect(recommend({ alphaFloor: S1_ALPHA_WITHOUT_A5 - 0.001 }).removed).toEqual(['A5']);
    const drop = S1_ALPHA - S1_ALPHA_WITHOUT_A5;
    expect(recommend({ maxAlphaDrop: drop - 0.001 }).recommendation.actions[0].blockedBy).toEqual(['max-alpha-drop']);
    expect(recommend({ maxAlphaDrop: drop + 0.001 }).removed).toEqual(['A5']);
  });

  it('respects the cap on the share of items cut', () => {
    const capped = recommend({ maxCutShare: 0.05 }); // 10 usable items: floor(0.5) = 0 cuts allowed
    expect(capped.budget).toBe(0);
    expect(capped.removed).toEqual([]);
    expect(capped.recommendation.actions[0].blockedBy).toEqual(['cut-cap']);
    expect(reasonSentence(capped.recommendation.because)).toMatch(/the cap on the share of items cut is reached/);
    expect(recommend({ maxCutShare: 0.1 }).removed).toHaveLength(1);
  });

  it('cuts only as many items of a near-dependency as it takes to break it', () => {
    // X is nearly (A + B) / 2 (written by hand: no strong pair, one confirmed near-dependency).
    const ids = ['A', 'B', 'X'];
    const correlation = squareMatrixFromRows([[1, 0.1, 0.72], [0.1, 1, 0.7], [0.72, 0.7, 1]]);
    const items: EngineItem[] = ids.map((id) => ({ id, scale: null, text: null, locked: false, min: 1, max: 5 }));
    const evidence: EngineEvidence = {
      localDependence: null, items, method: 'pearson', missing: 'pairwise', rows: 300, completeData: true, usable: [0, 1, 2],
      correlation, pairN: squareMatrixFromRows(ids.map(() => ids.map(() => 300))), correlationRows: 300, repaired: false, covariance: correlation,
      vif: [6, 6, 12], tolerance: [null, null, null], r2: [null, null, null], topPartner: [null, null, null], exactDependencies: [], eigenvalues: [], conditionNumber: null,
      collinearity: { columns: [-1, 0, 1, 2], conditionIndices: [1, 40], varianceProportions: [[0.5, 0.1, 0.1, 0.1], [0.1, 0.9, 0.9, 0.9]], rowsUsed: 300 },
      itemRest: [null, null, null], alphaIfDeleted: [null, null, null], scales: [],
      descriptives: ids.map(() => ({ n: 300, mean: 3, sd: 1, missingRate: 0, floor: 0.05, ceiling: 0.05 })), warnings: [],
    };
    const { clusters } = findOverlapClusters(evidence, ids.map(() => ids.map(() => null)), DEFAULT_ENGINE_SETTINGS);
    const cuts = recommendCuts(evidence, clusters, { ...DEFAULT_ENGINE_SETTINGS, maxCutShare: 0.34 }, () => new Map()); // 3 items: one cut allowed
    expect(cuts.removed).toHaveLength(1);
    const [recommendation] = cuts.recommendations;
    expect(recommendation.evidence.keeperScores.every((score) => score.fitSource === 'multiple-correlation')).toBe(true);
    expect(recommendation.actions.filter((action) => action.action === 'keep')).toEqual([
      expect.objectContaining({ proposed: null, blockedBy: [] }),
    ]);
    expect(reasonSentence(recommendation.because)).toMatch(/nearly linearly dependent \(condition index 40\)/);
  });

  it('never breaks a constraint on random waves with random constraints (checked by the what-if)', () => {
    const random = createSeededRandom(99);
    const blockedBy = new Set<string>();
    let cut = 0;
    for (let seed = 1; seed <= 24; seed++) {
      const wave = generateWave(randomWaveSpec(seed), seed + 100_000);
      const base = engineInputFromSyntheticWave(wave);
      const lockedIds = base.items.filter(() => random.next() < 0.15).map((item) => item.id);
      const { matrix, items } = engineInputFromSyntheticWave(wave, lockedIds);
      const settings = resolveEngineSettings({
        missing: random.next() < 0.5 ? 'pairwise' : 'listwise',
        minItemsPerScale: 2 + random.nextInt(7),
        alphaFloor: 0.6 + 0.25 * random.next(),
        maxAlphaDrop: 0.01 + 0.1 * random.next(),
        maxCutShare: 0.02 + 0.2 * random.next(),
        // Local dependence on, kept cheap: the fixed relative-residual rule and a short EBIC path.
        residualBootstrapDraws: 0,
        ebicPenaltyCount: 10,
      });
      const evidence = computeEvidence(matrix, items, settings);
      const { clusters } = findOverlapClusters(evidence, items.map(() => items.map(() => null)), settings);
      const cuts = recommendCuts(evidence, clusters, settings, scaleAlphaOracle(evidence, matrix));
      const removedIds = cuts.removed.map((index) => items[index].id);
      checkConstraints(matrix, evidence, settings, removedIds, lockedIds, cuts.recommendations);
      cut += removedIds.length;
      for (const recommendation of cuts.recommendations) for (const action of recommendation.actions) action.blockedBy.forEach((name) => blockedBy.add(name));
    }
    // The run must exercise both sides: cuts made, and every constraint blocking at least once.
    expect(cut).toBeGreaterThan(0);
    expect([...blockedBy].sort()).toEqual(['alpha-floor', 'cut-cap', 'locked', 'max-alpha-drop', 'min-items']);
  });
});

function checkConstraints(
  matrix: ItemMatrix,
  evidence: EngineEvidence,
  settings: EngineSettings,
  removedIds: string[],
  lockedIds: string[],
  recommendations: readonly Recommendation[],
): void {
  for (const id of lockedIds) expect(removedIds).not.toContain(id);
  for (const recommendation of recommendations) {
    for (const action of recommendation.actions) if (lockedIds.includes(action.item)) expect(action.action).toBe('keep');
  }
  expect(removedIds.length).toBeLessThanOrEqual(Math.floor(settings.maxCutShare * evidence.usable.length + 1e-9));
  const after = simulateCut(evidence, matrix, removedIds, settings);
  for (const scale of after.scales) {
    if (scale.items === scale.itemsBefore) continue; // the scale lost nothing
    expect(scale.items).toBeGreaterThanOrEqual(settings.minItemsPerScale);
    expect(scale.alpha!).toBeGreaterThanOrEqual(settings.alphaFloor);
    expect(scale.alphaBefore! - scale.alpha!).toBeLessThanOrEqual(settings.maxAlphaDrop + 1e-12);
  }
}
