import { describe, expect, it } from 'vitest';
import { bootstrapStability, recommendationSignature } from '../../src/lib/engine/bootstrap-stability';
import { computeEvidence, scaleAlphaOracle } from '../../src/lib/engine/compute-evidence';
import { resolveEngineSettings } from '../../src/lib/engine/engine-settings';
import { findOverlapClusters } from '../../src/lib/engine/overlap-clusters';
import { recommendCuts, type Recommendation } from '../../src/lib/engine/recommend-cuts';
import { referenceInput } from './engine-fixture';

function setUp(bootstrap: number, seed = 11) {
  const { matrix, items } = referenceInput();
  const settings = resolveEngineSettings({ bootstrap, seed });
  const evidence = computeEvidence(matrix, items, settings);
  const wording = items.map(() => items.map(() => null));
  const { clusters } = findOverlapClusters(evidence, wording, settings);
  const { recommendations } = recommendCuts(evidence, clusters, settings, scaleAlphaOracle(evidence, matrix));
  // A recommendation no resample can make: B1 and B2 correlate far below 0.80 (R reference data).
  const impossible: Recommendation = { ...recommendations[0], cluster: ['B1', 'B2'], keep: 'B1', actions: [{ ...recommendations[0].actions[0], item: 'B2', action: 'drop' }] };
  return { matrix, items, settings, wording, recommendations: [...recommendations, impossible] };
}

describe('bootstrapStability', () => {
  it('repeats exactly for the same seed, and reports progress up to 1', async () => {
    const { matrix, items, settings, wording, recommendations } = setUp(30);
    const before = Float64Array.from(matrix.data);
    const fractions: number[] = [];
    const first = await bootstrapStability(matrix, items, settings, wording, recommendations, { onProgress: (stage, fraction) => fractions.push(stage === 'bootstrap' ? fraction : -1) });
    const second = await bootstrapStability(matrix, items, settings, wording, recommendations);
    expect(second.shares).toEqual(first.shares);
    expect(second.overlapShares).toEqual(first.overlapShares);
    expect(matrix.data).toEqual(before);
    expect(fractions).toHaveLength(30);
    expect(fractions[29]).toBe(1);
    expect(fractions.every((fraction, k) => k === 0 || fraction > fractions[k - 1])).toBe(true);
  });

  it('finds the twin pair in every resample and never makes an impossible recommendation', async () => {
    const { matrix, items, settings, wording, recommendations } = setUp(40);
    const result = await bootstrapStability(matrix, items, settings, wording, recommendations);
    // A1-A5: r = 0.934, 95% interval 0.914 to 0.949 (R reference data), far above 0.80.
    expect(result.overlapShares[0]).toBe(1);
    expect(result.shares[1]).toBe(0);
    expect(result.overlapShares[1]).toBe(0);
    expect(result.unstable).toEqual(result.shares.map((share) => share < 0.7));
    expect(result.unstable[1]).toBe(true);
    expect(result.failedResamples).toBe(0);
    expect(result.shares.every((share) => share * 40 === Math.round(share * 40))).toBe(true); // shares count whole resamples
  });

  it('stops when aborted', async () => {
    const { matrix, items, settings, wording, recommendations } = setUp(200);
    const controller = new AbortController();
    const pending = bootstrapStability(matrix, items, settings, wording, recommendations, {
      signal: controller.signal,
      onProgress: (_, fraction) => {
        if (fraction >= 0.05) controller.abort(new Error('stopped by the test'));
      },
    });
    await expect(pending).rejects.toThrow('stopped by the test');
  });

  it('refuses a resample count below 1', async () => {
    const { matrix, items, settings, wording, recommendations } = setUp(0);
    await expect(bootstrapStability(matrix, items, settings, wording, recommendations)).rejects.toThrow(/bootstrapStability: bootstrap must be a positive integer/);
  });
});

describe('recommendationSignature', () => {
  it('is the keeper and the sorted changed items, whatever the action label', () => {
    const base = { keep: 'Q1', actions: [
      { item: 'Q9', action: 'merge' as const, into: 'Q1', proposed: 'merge' as const, blockedBy: [], rWithKeeper: 1, wordingWithKeeper: null },
      { item: 'Q3', action: 'drop' as const, into: null, proposed: 'drop' as const, blockedBy: [], rWithKeeper: 1, wordingWithKeeper: null },
      { item: 'Q5', action: 'keep' as const, into: null, proposed: null, blockedBy: [], rWithKeeper: 1, wordingWithKeeper: null },
    ] };
    expect(recommendationSignature(base)).toBe('Q1|Q3,Q9');
  });
});
