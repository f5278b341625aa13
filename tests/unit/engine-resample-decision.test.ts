/**
 * The bootstrap's per-resample decision (resample-decision.ts) against the earlier path kept in
 * bootstrap-reference.ts: for the same respondents, the same recommendations (signature and
 * cluster) exactly, on generated waves under each correlation method and missing-data policy and
 * on the demo wave; the Schur-complement VIF against a fresh eigen-decomposition to 1e-10; and
 * the stability shares of `bootstrapStability` equal to the ones the reference resamples give,
 * whatever runner decides them.
 */
import { describe, expect, it } from 'vitest';
import { bootstrapStability, type ResampleRunner } from '../../src/lib/engine/bootstrap-stability';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { resolveEngineSettings, type EngineSettings } from '../../src/lib/engine/engine-settings';
import { localDependenceReuse } from '../../src/lib/engine/local-dependence';
import { findOverlapClusters } from '../../src/lib/engine/overlap-clusters';
import { networkCanDecide, resampleDecision, type ResampleContext } from '../../src/lib/engine/resample-decision';
import { runEngine } from '../../src/lib/engine/run-engine';
import type { EngineItem } from '../../src/lib/engine/types';
import { eigenVifAfterRemoval, schurVifAfterRemoval } from '../../src/lib/engine/vif-after-removal';
import { wordingSimilarity } from '../../src/lib/engine/wording-similarity';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { randomWaveSpec } from '../../src/lib/synth/random-wave-spec';
import { selectRespondents, type ItemMatrix } from '../../src/lib/stats/types';
import { referenceResampleDecision, referenceResampleRows } from './bootstrap-reference';
import { demoWaveInput } from './demo-wave-input';

interface Case {
  readonly matrix: ItemMatrix;
  readonly items: readonly EngineItem[];
  readonly settings: EngineSettings;
}

function contextOf({ matrix, items, settings }: Case): ResampleContext {
  const evidence = computeEvidence(matrix, items, settings);
  return {
    items,
    settings,
    wording: wordingSimilarity(items.map((item) => item.text)),
    reuse: evidence.localDependence === null ? null : localDependenceReuse(evidence.localDependence),
  };
}

function generated(seed: number, settings: Partial<EngineSettings> = {}): Case {
  const { matrix, items } = engineInputFromSyntheticWave(generateWave(randomWaveSpec(seed), seed));
  return {
    matrix,
    items,
    settings: resolveEngineSettings({ seed, ...settings }),
  };
}

async function demoCase(settings: Partial<EngineSettings>): Promise<Case> {
  const input = await demoWaveInput();
  return {
    matrix: input.matrix,
    items: input.items,
    settings: resolveEngineSettings({ seed: 2027, ...settings }),
  };
}

/** Resamples that fitted the network, and that did not, over every comparison (both must occur). */
const networkBranches = { fitted: 0, skipped: 0 };

/** Every resample decided both ways must agree; returns how many made at least one recommendation. */
async function compareResamples(testCase: Case, resamples: number): Promise<number> {
  const context = contextOf(testCase);
  let withRecommendations = 0;
  for (const rows of referenceResampleRows(testCase.matrix.rows, testCase.settings.seed, resamples)) {
    const sample = selectRespondents(testCase.matrix, rows);
    const expected = referenceResampleDecision(testCase.matrix, rows, testCase.items, testCase.settings, context.wording, context.reuse);
    const actual = resampleDecision(testCase.matrix, rows, context);
    expect(actual).toEqual(expected);
    if (actual.made.length > 0) withRecommendations++;
    // Long synchronous stretches starve Vitest's worker messages: let them through between resamples.
    await new Promise((resolve) => setTimeout(resolve, 0));
    if (context.reuse !== null) {
      const withoutNetwork = computeEvidence(sample, testCase.items, testCase.settings, {
        detail: 'decision',
        localDependence: { reuse: context.reuse, network: false },
      });
      networkBranches[networkCanDecide(withoutNetwork, testCase.settings) ? 'fitted' : 'skipped']++;
    }
  }
  return withRecommendations;
}

describe('resampleDecision equals the earlier per-resample path', () => {
  it.each([8, 34])('generated wave %i, Pearson pairwise (with missing answers)', async (seed) => {
    expect(await compareResamples(generated(seed), 6)).toBeGreaterThan(0);
  });

  it('generated wave 21 with its items outside any scale (no residuals: the network never decides)', async () => {
    const testCase = generated(21);
    expect(
      await compareResamples(
        {
          ...testCase,
          items: testCase.items.map((item) => ({ ...item, scale: null })),
        },
        4,
      ),
    ).toBeGreaterThan(0);
  });

  it('generated wave 5, Pearson listwise', async () => {
    expect(await compareResamples(generated(5, { missing: 'listwise' }), 5)).toBeGreaterThan(0);
  });

  it('generated wave 9, Spearman pairwise', async () => {
    expect(await compareResamples(generated(9, { method: 'spearman' }), 4)).toBeGreaterThan(0);
  });

  it('generated wave 4, polychoric pairwise', async () => {
    expect(await compareResamples(generated(4, { method: 'polychoric' }), 4)).toBeGreaterThan(0);
  });

  it('the demo wave, Pearson', async () => {
    expect(await compareResamples(await demoCase({}), 4)).toBeGreaterThan(0);
  });

  it('the demo wave, polychoric', async () => {
    expect(await compareResamples(await demoCase({ method: 'polychoric' }), 3)).toBeGreaterThan(0);
  });

  it('took both branches of the network: fitted where it can decide, skipped elsewhere', () => {
    expect(networkBranches.fitted).toBeGreaterThan(0);
    expect(networkBranches.skipped).toBeGreaterThan(0);
  });
});

describe('schurVifAfterRemoval', () => {
  it('equals a fresh eigen-decomposition per removal to 1e-10 (keeper scores and vifAfter of every cluster)', () => {
    for (const seed of [8, 34]) {
      const testCase = generated(seed);
      const [rows] = referenceResampleRows(testCase.matrix.rows, seed, 1);
      const evidence = computeEvidence(selectRespondents(testCase.matrix, rows), testCase.items, testCase.settings, { detail: 'decision', inverse: true, localDependence: false });
      expect(evidence.inverse).not.toBeNull();
      const schur = schurVifAfterRemoval(evidence);
      const eigen = eigenVifAfterRemoval(evidence);
      const { clusters } = findOverlapClusters(evidence, wordingSimilarity(testCase.items.map((item) => item.text)), testCase.settings);
      expect(clusters.length).toBeGreaterThan(0);
      for (const cluster of clusters) {
        for (const item of cluster.items) {
          const partners = cluster.items.filter((other) => other !== item);
          const [fast] = schur(partners, [item]);
          const [slow] = eigen(partners, [item]);
          expect(Math.abs((fast as number) - (slow as number)) / (slow as number)).toBeLessThan(1e-10);
        }
        const removed = cluster.items.slice(1);
        const left = evidence.usable.filter((j) => !removed.includes(j)).slice(0, 5);
        schur(removed, left).forEach((value, k) => expect(Math.abs((value as number) - (eigen(removed, left)[k] as number))).toBeLessThan(1e-10 * (value as number)));
      }
    }
  });

  it('falls back to the eigen path when the matrix is singular (an exact copy): null VIF for the copies', () => {
    const testCase = generated(3);
    const { matrix, items } = testCase;
    const data = new Float64Array(matrix.rows * (matrix.columns + 1));
    data.set(matrix.data);
    data.set(matrix.data.subarray(0, matrix.rows), matrix.rows * matrix.columns);
    const copy: ItemMatrix = {
      rows: matrix.rows,
      columns: matrix.columns + 1,
      data,
    };
    const copyItems = [...items, { ...items[0], id: `${items[0].id}_copy` }];
    const evidence = computeEvidence(copy, copyItems, testCase.settings, {
      detail: 'decision',
      inverse: true,
      localDependence: false,
    });
    expect(evidence.inverse).toBeNull();
    const last = copyItems.length - 1;
    expect(schurVifAfterRemoval(evidence)([], [0, last])).toEqual([null, null]);
    expect(schurVifAfterRemoval(evidence)([0], [last])[0]).toBeGreaterThanOrEqual(1);
  });
});

describe('eigenVifAfterRemoval', () => {
  it('answers a removed set asked again (in any order) with the values a fresh oracle gives', () => {
    const testCase = generated(8);
    const evidence = computeEvidence(testCase.matrix, testCase.items, testCase.settings, { detail: 'decision', localDependence: false });
    const oracle = eigenVifAfterRemoval(evidence);
    const removed = evidence.usable.slice(0, 3);
    const of = evidence.usable.slice(3, 9);
    const first = oracle(removed, of);
    const again = oracle([...removed].reverse(), [...of].reverse());
    expect(again).toEqual([...first].reverse());
    expect(oracle(removed, of)).toEqual(eigenVifAfterRemoval(evidence)(removed, of));
    // Another set is another decomposition, not the one kept.
    const other = oracle(removed.slice(1), of);
    expect(other).not.toEqual(first);
    expect(other).toEqual(eigenVifAfterRemoval(evidence)(removed.slice(1), of));
  });
});

describe('bootstrapStability', () => {
  it('gives the shares of the reference resamples, on the calling thread and through a runner', async () => {
    const testCase = generated(8);
    const settings = { ...testCase.settings, bootstrap: 8 };
    const evidence = computeEvidence(testCase.matrix, testCase.items, settings);
    const engine = await runEngine(evidence, testCase.matrix, testCase.items, {
      ...settings,
      bootstrap: 0,
    });
    const context = contextOf({ ...testCase, settings });
    const recommendations = engine.recommendations;
    expect(recommendations.length).toBeGreaterThan(0);
    const expectedAgree = recommendations.map(() => 0);
    for (const rows of referenceResampleRows(testCase.matrix.rows, settings.seed, settings.bootstrap)) {
      const outcome = referenceResampleDecision(testCase.matrix, rows, testCase.items, settings, context.wording, context.reuse);
      recommendations.forEach((recommendation, k) => {
        if (
          outcome.made.includes(
            `${recommendation.keep}|${recommendation.actions
              .filter((a) => a.action !== 'keep')
              .map((a) => a.item)
              .sort()
              .join(',')}`,
          )
        )
          expectedAgree[k]++;
      });
    }
    const options = { reuse: context.reuse };
    const inThread = await bootstrapStability(testCase.matrix, testCase.items, settings, context.wording, recommendations, options);
    expect(inThread.shares).toEqual(expectedAgree.map((count) => count / settings.bootstrap));
    // A runner that answers out of order (the last resample first) gives the same shares.
    let shared: { matrix: ItemMatrix; context: ResampleContext } | null = null;
    let closed = 0;
    const runner: ResampleRunner = {
      parallelism: 3,
      start: async (matrix, runnerContext) => {
        shared = { matrix, context: runnerContext };
      },
      decide: (rows) => new Promise((resolve) => setTimeout(() => resolve(resampleDecision(shared!.matrix, rows, shared!.context)), rows[0] % 7)),
      close: async () => {
        closed++;
      },
    };
    const fractions: number[] = [];
    const threaded = await bootstrapStability(testCase.matrix, testCase.items, settings, context.wording, recommendations, {
      ...options,
      runner,
      onProgress: (_, fraction) => fractions.push(fraction),
    });
    expect(threaded).toEqual(inThread);
    expect(closed).toBe(1);
    expect(fractions.at(-1)).toBe(1);
  });
});
