import { describe, expect, it } from 'vitest';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { DEFAULT_ENGINE_SETTINGS } from '../../src/lib/engine/engine-settings';
import { findOverlapClusters, nearDependencies } from '../../src/lib/engine/overlap-clusters';
import type { CollinearityEvidence, EngineEvidence } from '../../src/lib/engine/types';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { engineReference as ref, referenceInput } from './engine-fixture';

const thresholds = DEFAULT_ENGINE_SETTINGS;

/**
 * Evidence written by hand for rule tests: the correlations, VIFs and diagnostics are chosen to
 * put each rule on its edge; nothing here is a statistic to check.
 */
function handEvidence(
  ids: string[],
  correlations: [string, string, number][],
  options: { vif?: Record<string, number | null>; collinearity?: CollinearityEvidence | null; exact?: number[][] } = {},
): EngineEvidence {
  const p = ids.length;
  const rows: number[][] = ids.map((_, i) => ids.map((__, j) => (i === j ? 1 : 0)));
  for (const [a, b, r] of correlations) {
    rows[ids.indexOf(a)][ids.indexOf(b)] = r;
    rows[ids.indexOf(b)][ids.indexOf(a)] = r;
  }
  const nothing = ids.map(() => null);
  return {
    localDependence: null,
    items: ids.map((id) => ({ id, scale: 'S', text: null, locked: false, min: 1, max: 5 })),
    method: 'pearson',
    missing: 'pairwise',
    rows: 200,
    completeData: true,
    usable: ids.map((_, j) => j),
    correlation: squareMatrixFromRows(rows),
    pairN: squareMatrixFromRows(ids.map(() => ids.map(() => 200))),
    correlationRows: 200,
    repaired: false,
    covariance: squareMatrixFromRows(rows),
    vif: ids.map((id) => (options.vif && id in options.vif ? options.vif[id] : 1.5)),
    tolerance: nothing,
    r2: nothing,
    topPartner: nothing,
    exactDependencies: options.exact ?? [],
    eigenvalues: [],
    conditionNumber: null,
    collinearity: options.collinearity ?? null,
    itemRest: nothing,
    alphaIfDeleted: nothing,
    scales: [],
    descriptives: ids.map(() => ({ n: 200, mean: 3, sd: 1, missingRate: 0, floor: 0.05, ceiling: 0.05 })),
    warnings: [],
  };
}

const noWording = (count: number): null[][] => Array.from({ length: count }, () => new Array<null>(count).fill(null));
const idsOf = (evidence: EngineEvidence, list: readonly number[]): string[] => list.map((index) => evidence.items[index].id);

/** One dimension per row: [condition index, proportions by column (intercept first)]. */
function diagnostics(ids: string[], dimensions: [number | null, number[]][]): CollinearityEvidence {
  return {
    columns: [-1, ...ids.map((_, j) => j)],
    conditionIndices: dimensions.map(([index]) => index),
    varianceProportions: dimensions.map(([, proportions]) => proportions),
    rowsUsed: 200,
  };
}

describe('findOverlapClusters', () => {
  it('forms clusters by complete linkage of the linked pairs, strongest pair first: a chain does not join its ends', () => {
    const ids = ['A', 'B', 'C', 'D', 'E', 'F'];
    // A-B and B-C are strong, A-C is not: single linkage would chain A, B and C.
    const evidence = handEvidence(ids, [['A', 'B', 0.85], ['B', 'C', 0.82], ['A', 'C', 0.7], ['D', 'E', 0.9], ['E', 'F', 0.79]]);
    const { clusters } = findOverlapClusters(evidence, noWording(6), thresholds);
    expect(clusters.map((cluster) => idsOf(evidence, cluster.items))).toEqual([['A', 'B'], ['D', 'E']]);
    expect(clusters[0].strongPairs.map((pair) => pair.r)).toEqual([0.85]);
    expect(clusters[0].links.map((pair) => pair.rules)).toEqual([['strong-pair']]);
    expect(clusters[0].maxR).toBe(0.85);
    // With A-C strong as well, the three form one clique.
    const clique = handEvidence(ids, [['A', 'B', 0.85], ['B', 'C', 0.82], ['A', 'C', 0.81]]);
    expect(findOverlapClusters(clique, noWording(6), thresholds).clusters.map((cluster) => idsOf(clique, cluster.items))).toEqual([['A', 'B', 'C']]);
  });

  it('does not count a strong pair that does not stand out of a homogeneous scale', () => {
    // Every pair of a four-item scale correlates .81-.84 (loadings near .9): nothing is redundant.
    const ids = ['A', 'B', 'C', 'D'];
    const evidence = handEvidence(ids, [['A', 'B', 0.84], ['A', 'C', 0.82], ['A', 'D', 0.81], ['B', 'C', 0.83], ['B', 'D', 0.82], ['C', 'D', 0.81]]);
    expect(findOverlapClusters(evidence, noWording(4), thresholds).clusters).toHaveLength(0);
  });

  it('skips a near-dependency whose variance the intercept carries (an item-mean effect)', () => {
    const ids = ['A', 'B', 'C'];
    const base = handEvidence(ids, [['A', 'B', 0.1], ['A', 'C', 0.1], ['B', 'C', 0.1]]);
    const evidence = {
      ...base,
      vif: [8, 8, 1],
      collinearity: { columns: [-1, 0, 1, 2], conditionIndices: [1, 45], varianceProportions: [[0.1, 0.1, 0.1, 0.9], [0.9, 0.9, 0.9, 0.1]], rowsUsed: 300 },
    };
    const result = findOverlapClusters(evidence, noWording(3), thresholds);
    expect(result.dependencies[0].interceptDominated).toBe(true);
    expect(result.clusters).toHaveLength(0);
    const centred = { ...evidence, collinearity: { ...evidence.collinearity, varianceProportions: [[0.9, 0.1, 0.1, 0.9], [0.1, 0.9, 0.9, 0.1]] } };
    expect(findOverlapClusters(centred, noWording(3), thresholds).clusters.map((cluster) => idsOf(centred, cluster.items))).toEqual([['A', 'B']]);
  });

  it('takes the strong-pair threshold from the settings', () => {
    const evidence = handEvidence(['A', 'B'], [['A', 'B', 0.9]]);
    expect(findOverlapClusters(evidence, noWording(2), { ...thresholds, strongPairThreshold: 0.95 }).clusters).toHaveLength(0);
    expect(findOverlapClusters(evidence, noWording(2), { ...thresholds, strongPairThreshold: 0.9 }).clusters).toHaveLength(1);
  });

  it('counts a strong negative pair by |r| and warns that a reverse key may be missing', () => {
    const evidence = handEvidence(['A', 'B'], [['A', 'B', -0.88]]);
    const result = findOverlapClusters(evidence, noWording(2), thresholds);
    expect(result.clusters).toHaveLength(1);
    expect(result.warnings).toEqual([expect.objectContaining({ code: 'negative-strong-pair', items: ['A', 'B'] })]);
  });

  it('never forms a cluster from wording alone', () => {
    const evidence = handEvidence(['A', 'B'], [['A', 'B', 0.2]]);
    const wording = [[1, 1], [1, 1]];
    expect(findOverlapClusters(evidence, wording, thresholds).clusters).toHaveLength(0);
  });

  it('joins a near-dependency of items without strong pairs, when their VIFs confirm it', () => {
    // X is nearly (A + B) / 2: no strong pair, a high condition index, high VIFs.
    const ids = ['A', 'B', 'X', 'Y'];
    const correlations: [string, string, number][] = [['A', 'X', 0.72], ['B', 'X', 0.7], ['A', 'B', 0.1], ['Y', 'A', 0.3]];
    const collinearity = diagnostics(ids, [
      [1, [0.01, 0.02, 0.02, 0.01, 0.3]],
      [45, [0.1, 0.9, 0.85, 0.95, 0.6]],
    ]);
    const confirmed = handEvidence(ids, correlations, { vif: { A: 8, B: 7.5, X: 12, Y: 1.4 }, collinearity });
    const { clusters, dependencies } = findOverlapClusters(confirmed, noWording(4), thresholds);
    expect(dependencies).toHaveLength(1);
    expect(idsOf(confirmed, dependencies[0].items)).toEqual(['A', 'B', 'X', 'Y']);
    expect(idsOf(confirmed, dependencies[0].confirmed)).toEqual(['A', 'B', 'X']); // Y's VIF 1.4 < 5
    expect(dependencies[0].interceptProportion).toBe(0.1);
    expect(clusters.map((cluster) => idsOf(confirmed, cluster.items))).toEqual([['A', 'B', 'X']]);
    expect(clusters[0].conditionIndex).toBe(45);

    const unconfirmed = handEvidence(ids, correlations, { vif: { A: 2, B: 2, X: 3, Y: 1.4 }, collinearity });
    expect(findOverlapClusters(unconfirmed, noWording(4), thresholds).clusters).toHaveLength(0);
    const belowIndex = handEvidence(ids, correlations, { vif: { A: 8, B: 7.5, X: 12 }, collinearity });
    expect(findOverlapClusters(belowIndex, noWording(4), { ...thresholds, conditionIndexThreshold: 50 }).clusters).toHaveLength(0);
  });

  it('does not count the intercept as one of the two items a near-dependency needs', () => {
    const ids = ['A', 'B'];
    const collinearity = diagnostics(ids, [[1, [0.01, 0.1, 0.1]], [60, [0.99, 0.9, 0.2]]]);
    const evidence = handEvidence(ids, [['A', 'B', 0.5]], { vif: { A: 9, B: 9 }, collinearity });
    expect(nearDependencies(evidence, thresholds)).toHaveLength(0);
  });

  it('keeps two strong-pair clusters apart when one dimension shows items of both (competing dependencies)', () => {
    const ids = ['A', 'A2', 'B', 'B2', 'S'];
    const correlations: [string, string, number][] = [['A', 'A2', 0.93], ['B', 'B2', 0.91], ['A', 'B', 0.3], ['S', 'B', 0.6], ['S', 'A', 0.4]];
    const collinearity = diagnostics(ids, [
      [1, [0.01, 0.01, 0.01, 0.01, 0.01, 0.01]],
      [90, [0.02, 0.6, 0.2, 0.7, 0.3, 0.8]],
    ]);
    const evidence = handEvidence(ids, correlations, { vif: { A: 9, A2: 9, B: 8, B2: 8, S: 6 }, collinearity });
    const { clusters } = findOverlapClusters(evidence, noWording(5), thresholds);
    // A and B each have a strong partner, so the dimension does not join {A, A2} to {B, B2};
    // S has none and joins the confirmed item it correlates with most strongly (B, r = 0.6).
    expect(clusters.map((cluster) => idsOf(evidence, cluster.items))).toEqual([['A', 'A2'], ['B', 'B2', 'S']]);
  });

  it('joins an exact dependency (null condition index, null VIFs) whatever the correlations', () => {
    const ids = ['A', 'B', 'C', 'T'];
    const evidence = handEvidence(ids, [['A', 'T', 0.6], ['B', 'T', 0.6], ['C', 'T', 0.6]], { vif: { A: null, B: null, C: null, T: null }, exact: [[0, 1, 2, 3]] });
    const { clusters } = findOverlapClusters(evidence, noWording(4), thresholds);
    expect(clusters).toHaveLength(1);
    expect(clusters[0].exactDependencies).toEqual([[0, 1, 2, 3]]);
  });

  it('ignores the null space of a listwise matrix with no more complete rows than items', () => {
    const ids = ['A', 'B', 'C'];
    const evidence: EngineEvidence = { ...handEvidence(ids, [['A', 'B', 0.3]], { exact: [[0, 1, 2]] }), missing: 'listwise', correlationRows: 3 };
    const result = findOverlapClusters(evidence, noWording(3), thresholds);
    expect(result.clusters).toHaveLength(0);
    expect(result.warnings.map((warning) => warning.code)).toEqual(['too-few-complete-rows']);
    expect(findOverlapClusters({ ...evidence, correlationRows: 4 }, noWording(3), thresholds).clusters).toHaveLength(1);
  });

  it("gives each pair r, its own n and the Fisher-z interval (R reference data)", () => {
    const { matrix, items } = referenceInput();
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    const { clusters } = findOverlapClusters(evidence, noWording(items.length), thresholds);
    expect(clusters.map((cluster) => idsOf(evidence, cluster.items))).toEqual([['A1', 'A5']]); // the planted twin
    const [pair] = clusters[0].strongPairs;
    expect(pair.r).toBeCloseTo(ref.fisherZ.r, 12); // R: cor(A1, A5, use = "pairwise.complete.obs")
    expect(pair.n).toBe(ref.fisherZ.n); // R: sum(!is.na(A1) & !is.na(A5))
    expect(pair.lower).toBeCloseTo(ref.fisherZ.lower, 10); // R: tanh(atanh(r) - qnorm(.975)/sqrt(n - 3))
    expect(pair.upper).toBeCloseTo(ref.fisherZ.upper, 10); // R: tanh(atanh(r) + qnorm(.975)/sqrt(n - 3))
  });

  it('refuses a wording matrix of the wrong size', () => {
    const evidence = handEvidence(['A', 'B'], [['A', 'B', 0.9]]);
    expect(() => findOverlapClusters(evidence, noWording(3), thresholds)).toThrow(/findOverlapClusters: wording has 3 rows for 2 items/);
  });
});
