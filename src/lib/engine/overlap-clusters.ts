/**
 * Overlap clusters: groups of items tied together by statistical evidence that they measure the
 * same thing. How a cluster is formed (docs/decisions/003-redundancy-engine.md):
 *
 * 1. Every usable item is a node of a graph.
 * 2. Strong pairs: an edge joins two items whose correlation (on the recoded values, so a
 *    reverse-worded twin counts as positive) has |r| at or above `strongPairThreshold`
 *    (default 0.80).
 * 3. Near-dependencies: a Belsley-Kuh-Welsch dimension with a condition index at or above
 *    `conditionIndexThreshold` (default 30; an exact dependency counts as infinite) on which two
 *    or more items (not the intercept) have a variance proportion at or above
 *    `varianceProportionThreshold` (default 0.5). The diagnostics use the complete rows only, so
 *    an item takes part only when the full-sample correlation matrix confirms it: its VIF is at
 *    or above `dependencyVifThreshold` (default 5) or infinite. Each confirmed item that has no
 *    strong pair of its own is then joined to the other confirmed item of the same dependency it
 *    correlates with most strongly (|r|). So a near-dependency adds the items the strong pairs
 *    missed (an item that is nearly the sum of others), but never joins two strong-pair clusters
 *    to each other: separate near-duplicate pairs with similar condition indices spread their
 *    proportions over the same dimensions (Belsley's "competing dependencies"), and a dimension
 *    can show one item of each pair.
 * 4. Exact dependencies of the correlation matrix (its null space: exact copies, a column that is
 *    the sum of others) join all their items, unless the matrix is singular by construction
 *    (listwise deletion with no more complete rows than items).
 * 5. The clusters are the connected components with two or more items. Wording similarity never
 *    creates or joins a cluster; it is carried beside every pair as evidence.
 *
 * Each cluster keeps its evidence separately: the strong pairs with r and Fisher-z interval from
 * the pair's own n, the near-dependencies with dimension, condition index and proportions, the
 * exact dependencies, and the wording similarity of every pair.
 */
import { fisherZInterval } from '../stats/fisher-z-interval';
import { waldCorrelationInterval } from '../stats/wald-correlation-interval';
import type { EngineSettings } from './engine-settings';
import type { DependencyEvidence, EngineEvidence, EngineWarning, OverlapCluster, PairEvidence } from './types';

/** The clusters and the warnings that finding them raised. */
export interface OverlapClusterResult {
  /** Clusters ordered by their first item (items[] order). */
  readonly clusters: readonly OverlapCluster[];
  /** Every near-dependency found (including any whose items also form strong pairs). */
  readonly dependencies: readonly DependencyEvidence[];
  readonly warnings: readonly EngineWarning[];
}

/** The thresholds `findOverlapClusters` reads from the engine settings. */
export type OverlapThresholds = Pick<
  EngineSettings,
  'strongPairThreshold' | 'conditionIndexThreshold' | 'varianceProportionThreshold' | 'dependencyVifThreshold' | 'confidenceLevel'
>;

/** Union-find over item indices (path halving, union by size). */
class DisjointSets {
  private readonly parent: number[];
  private readonly size: number[];

  constructor(count: number) {
    this.parent = Array.from({ length: count }, (_, i) => i);
    this.size = new Array<number>(count).fill(1);
  }

  find(item: number): number {
    let node = item;
    while (this.parent[node] !== node) {
      this.parent[node] = this.parent[this.parent[node]];
      node = this.parent[node];
    }
    return node;
  }

  join(a: number, b: number): void {
    let rootA = this.find(a);
    let rootB = this.find(b);
    if (rootA === rootB) return;
    if (this.size[rootA] < this.size[rootB]) [rootA, rootB] = [rootB, rootA];
    this.parent[rootB] = rootA;
    this.size[rootA] += this.size[rootB];
  }
}

/**
 * The near-dependencies of the Belsley-Kuh-Welsch diagnostics under the given thresholds: each
 * dimension whose condition index is at or above the threshold (or null: a zero singular value)
 * and on which two or more ITEMS (the intercept is not counted) have a variance proportion at or
 * above the proportion threshold. Each lists which of its items the correlation matrix confirms
 * (VIF at or above `dependencyVifThreshold`, or infinite).
 * @param evidence The engine's evidence (its `collinearity` may be null).
 * @param thresholds `conditionIndexThreshold` (>= 1), `varianceProportionThreshold` (in (0, 1])
 *   and `dependencyVifThreshold` (>= 1).
 * @throws {RangeError} when a threshold is out of range.
 * @returns The near-dependencies, strongest (highest index) first; empty without diagnostics.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics", ch. 3 (index 30, proportion
 * 0.5); Belsley 1991, "Conditioning Diagnostics".
 */
export function nearDependencies(
  evidence: EngineEvidence,
  thresholds: Pick<EngineSettings, 'conditionIndexThreshold' | 'varianceProportionThreshold' | 'dependencyVifThreshold'>,
): DependencyEvidence[] {
  if (!(thresholds.conditionIndexThreshold >= 1)) throw new RangeError(`nearDependencies: conditionIndexThreshold must be >= 1, got ${thresholds.conditionIndexThreshold}`);
  if (!(thresholds.varianceProportionThreshold > 0 && thresholds.varianceProportionThreshold <= 1)) {
    throw new RangeError(`nearDependencies: varianceProportionThreshold must lie in (0, 1], got ${thresholds.varianceProportionThreshold}`);
  }
  if (!(thresholds.dependencyVifThreshold >= 1)) throw new RangeError(`nearDependencies: dependencyVifThreshold must be >= 1, got ${thresholds.dependencyVifThreshold}`);
  const diagnostics = evidence.collinearity;
  if (diagnostics === null) return [];
  const found: DependencyEvidence[] = [];
  diagnostics.conditionIndices.forEach((index, dimension) => {
    if (index !== null && index < thresholds.conditionIndexThreshold) return;
    const proportions = diagnostics.varianceProportions[dimension];
    const items: number[] = [];
    const shares: number[] = [];
    let interceptProportion = 0;
    diagnostics.columns.forEach((column, k) => {
      if (column < 0) {
        interceptProportion = proportions[k];
        return;
      }
      if (proportions[k] >= thresholds.varianceProportionThreshold) {
        items.push(column);
        shares.push(proportions[k]);
      }
    });
    if (items.length < 2) return;
    const confirmed = items.filter((item) => {
      const vif = evidence.vif[item];
      return vif === null || vif >= thresholds.dependencyVifThreshold;
    });
    found.push({ dimension, conditionIndex: index, items, proportions: shares, interceptProportion, confirmed });
  });
  return found.sort((a, b) => (b.conditionIndex ?? Infinity) - (a.conditionIndex ?? Infinity) || a.dimension - b.dimension);
}

/**
 * A pair's correlation with its pair n, Fisher-z interval and wording similarity.
 * @param evidence The engine's evidence.
 * @param wording Wording similarity in items[] order (from `wordingSimilarity`).
 * @param a Index into items[] of a usable item.
 * @param b Index into items[] of another usable item.
 * @param confidenceLevel Coverage of the interval, in (0, 1).
 * @throws {RangeError} when either item is not in the correlation matrix.
 * @returns r, n, the interval (null when n <= 3 or |r| = 1) and the wording similarity.
 * References: Fisher 1921, "On the 'probable error' of a coefficient of correlation deduced from
 * a small sample" (Metron 1:3-32).
 */
export function pairEvidence(
  evidence: EngineEvidence,
  wording: readonly (readonly (number | null)[])[],
  a: number,
  b: number,
  confidenceLevel: number,
): PairEvidence {
  const position = positionsInMatrix(evidence);
  const i = position[a];
  const j = position[b];
  if (i < 0 || j < 0) throw new RangeError(`pairEvidence: items ${a} and ${b} must both be in the correlation matrix`);
  const order = evidence.correlation.order;
  const r = evidence.correlation.data[i * order + j];
  const n = evidence.pairN.data[i * order + j];
  const standardErrors = evidence.pairStandardErrors ?? null;
  if (standardErrors !== null) {
    // Polychoric: the estimator's own standard error; Fisher's 1/sqrt(n − 3) is a Pearson result.
    const se = standardErrors.data[i * order + j];
    const wald = Math.abs(r) < 1 && se > 0 && Number.isFinite(se) ? waldCorrelationInterval(r, se, confidenceLevel) : null;
    return {
      a: Math.min(a, b), b: Math.max(a, b), r, n,
      lower: wald === null ? null : wald.lower,
      upper: wald === null ? null : wald.upper,
      interval: 'estimator-se',
      se: Number.isFinite(se) ? se : null,
      wording: wording[a]?.[b] ?? null,
    };
  }
  const interval = n > 3 && Math.abs(r) < 1 ? fisherZInterval(r, n, confidenceLevel) : null;
  return {
    a: Math.min(a, b),
    b: Math.max(a, b),
    r,
    n,
    lower: interval === null ? null : interval.lower,
    upper: interval === null ? null : interval.upper,
    interval: 'fisher-z',
    wording: wording[a]?.[b] ?? null,
  };
}

/** Position of each item in the correlation matrix, or -1 when it is not there. */
function positionsInMatrix(evidence: EngineEvidence): number[] {
  const position = new Array<number>(evidence.items.length).fill(-1);
  evidence.usable.forEach((item, k) => {
    position[item] = k;
  });
  return position;
}

/**
 * Finds the overlap clusters (see the module comment for exactly how they are formed).
 * @param evidence The engine's evidence for one wave.
 * @param wording Wording similarity in items[] order (`wordingSimilarity` of the item texts).
 * @param thresholds Strong-pair, condition-index and proportion thresholds, and the interval's
 *   confidence level.
 * @throws {RangeError} when the wording matrix does not match the items or a threshold is out of range.
 * @returns The clusters with their evidence, every near-dependency, and warnings (a strong
 *   NEGATIVE pair after recoding suggests a reverse-keying mistake).
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics" (near-dependencies); Fisher
 * 1921 (interval of r); Tarjan 1975, "Efficiency of a good but not linear set union algorithm"
 * (connected components by union-find).
 */
export function findOverlapClusters(
  evidence: EngineEvidence,
  wording: readonly (readonly (number | null)[])[],
  thresholds: OverlapThresholds,
): OverlapClusterResult {
  if (wording.length !== evidence.items.length) {
    throw new RangeError(`findOverlapClusters: wording has ${wording.length} rows for ${evidence.items.length} items`);
  }
  if (!(thresholds.strongPairThreshold > 0 && thresholds.strongPairThreshold <= 1)) {
    throw new RangeError(`findOverlapClusters: strongPairThreshold must lie in (0, 1], got ${thresholds.strongPairThreshold}`);
  }
  const { usable, correlation, items } = evidence;
  const order = correlation.order;
  const sets = new DisjointSets(items.length);
  const warnings: EngineWarning[] = [];

  const strong: PairEvidence[] = [];
  for (let i = 0; i < order; i++) {
    for (let j = i + 1; j < order; j++) {
      const r = correlation.data[i * order + j];
      if (Math.abs(r) < thresholds.strongPairThreshold) continue;
      sets.join(usable[i], usable[j]);
      strong.push(pairEvidence(evidence, wording, usable[i], usable[j], thresholds.confidenceLevel));
      if (r < 0) {
        warnings.push({
          code: 'negative-strong-pair',
          items: [items[usable[i]].id, items[usable[j]].id],
          message: `${items[usable[i]].id} and ${items[usable[j]].id} correlate at ${r.toFixed(2)} after reverse-keying; check whether one of them should be marked reverse-keyed.`,
        });
      }
    }
  }

  const dependencies = nearDependencies(evidence, thresholds);
  const position = positionsInMatrix(evidence);
  const hasStrongPartner = new Set(strong.flatMap((pair) => [pair.a, pair.b]));
  for (const dependency of dependencies) {
    const confirmed = dependency.confirmed;
    if (confirmed.length < 2) continue;
    for (const item of confirmed) {
      if (hasStrongPartner.has(item)) continue;
      let partner = -1;
      let strongest = -1;
      for (const other of confirmed) {
        if (other === item) continue;
        const r = Math.abs(correlation.data[position[item] * order + position[other]]);
        if (r > strongest) {
          strongest = r;
          partner = other;
        }
      }
      sets.join(item, partner);
    }
  }
  // Under listwise deletion with no more complete rows than items the matrix is singular by
  // construction: its null space says nothing about the items, so it joins nothing.
  const rankDeficient = evidence.missing === 'listwise' && evidence.correlationRows <= usable.length;
  if (rankDeficient && usable.length > 1) {
    warnings.push({
      code: 'too-few-complete-rows',
      items: [],
      message: `Only ${evidence.correlationRows} respondents answered every one of the ${usable.length} items, so the listwise correlation matrix is singular by construction and its exact dependencies were not used; pairwise deletion keeps more respondents.`,
    });
  }
  const exactGroups = rankDeficient ? [] : evidence.exactDependencies;
  for (const group of exactGroups) for (const item of group.slice(1)) sets.join(group[0], item);

  const members = new Map<number, number[]>();
  for (const item of usable) {
    const root = sets.find(item);
    const list = members.get(root);
    if (list === undefined) members.set(root, [item]);
    else list.push(item);
  }

  const clusters: OverlapCluster[] = [];
  for (const list of members.values()) {
    if (list.length < 2) continue;
    const inCluster = new Set(list);
    const pairs: PairEvidence[] = [];
    for (let x = 0; x < list.length; x++) {
      for (let y = x + 1; y < list.length; y++) pairs.push(pairEvidence(evidence, wording, list[x], list[y], thresholds.confidenceLevel));
    }
    const strongPairs = strong.filter((pair) => inCluster.has(pair.a)).sort((p, q) => Math.abs(q.r) - Math.abs(p.r));
    const maxPair = pairs.reduce((best, pair) => (Math.abs(pair.r) > Math.abs(best.r) ? pair : best), pairs[0]);
    clusters.push({
      items: list,
      strongPairs,
      dependencies: dependencies.filter((dependency) => dependency.confirmed.length >= 2 && dependency.confirmed.some((item) => inCluster.has(item))),
      exactDependencies: exactGroups.filter((group) => inCluster.has(group[0])),
      pairs,
      maxR: maxPair.r,
      conditionIndex: clusterConditionIndex(evidence, list),
    });
  }
  clusters.sort((p, q) => p.items[0] - q.items[0]);
  return { clusters, dependencies, warnings };
}

/**
 * Condition index of the dimension that carries the largest summed variance proportion of the
 * given items (for a near-duplicate pair: the dimension of their shared dependency). An exact
 * dependency (zero singular value) gives null, as it does in the diagnostics. Null as well
 * without diagnostics.
 */
function clusterConditionIndex(evidence: EngineEvidence, list: readonly number[]): number | null {
  const diagnostics = evidence.collinearity;
  if (diagnostics === null || diagnostics.conditionIndices.length === 0) return null;
  const columnOf = new Map<number, number>();
  diagnostics.columns.forEach((column, k) => {
    if (column >= 0) columnOf.set(column, k);
  });
  let best = -1;
  let bestShare = -1;
  diagnostics.varianceProportions.forEach((proportions, dimension) => {
    let share = 0;
    for (const item of list) {
      const k = columnOf.get(item);
      if (k !== undefined) share += proportions[k];
    }
    if (share > bestShare) {
      bestShare = share;
      best = dimension;
    }
  });
  return diagnostics.conditionIndices[best];
}
