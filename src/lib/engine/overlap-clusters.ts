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
import { WTO_BANDS, type EngineSettings } from './engine-settings';
import type { DependencyEvidence, EngineEvidence, EngineWarning, OverlapCluster, PairEvidence, PairRule, ScaleResidualEvidence } from './types';

/** The clusters and the warnings that finding them raised. */
export interface OverlapClusterResult {
  /** Clusters ordered by their first item (items[] order). */
  readonly clusters: readonly OverlapCluster[];
  /** Every near-dependency found (including any whose items also form strong pairs). */
  readonly dependencies: readonly DependencyEvidence[];
  /** Every linked pair (indices into items[], a < b) with the rules that fired, whether or not it ended in a cluster. */
  readonly linkedPairs: readonly { readonly a: number; readonly b: number; readonly rules: readonly PairRule[] }[];
  readonly warnings: readonly EngineWarning[];
}

/** The thresholds `findOverlapClusters` reads from the engine settings. */
export type OverlapThresholds = Pick<
  EngineSettings,
  | 'strongPairThreshold'
  | 'conditionIndexThreshold'
  | 'varianceProportionThreshold'
  | 'dependencyVifThreshold'
  | 'confidenceLevel'
  | 'residualRelativeThreshold'
  | 'residualAboutZeroShare'
  | 'wtoThreshold'
  | 'interceptDominanceThreshold'
>;

/** Rules that link a pair on the pair's own evidence (clustered by complete linkage). */
const PAIR_EVIDENCE_RULES: readonly PairRule[] = ['strong-pair', 'local-dependence-mi', 'local-dependence-residual', 'local-dependence-wto'];

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
  thresholds: Pick<EngineSettings, 'conditionIndexThreshold' | 'varianceProportionThreshold' | 'dependencyVifThreshold'> & Partial<Pick<EngineSettings, 'interceptDominanceThreshold'>>,
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
    const interceptDominated = interceptProportion >= (thresholds.interceptDominanceThreshold ?? Infinity);
    found.push({ dimension, conditionIndex: index, items, proportions: shares, interceptProportion, confirmed, interceptDominated });
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

/** Local-dependence figures of one pair (null where they do not exist). */
export interface PairLocalFigures {
  readonly residual: number | null;
  readonly relativeResidual: number | null;
  readonly residualCritical: number | null;
  readonly wto: number | null;
  readonly partial: number | null;
  /** r minus the mean correlation of the two items with the other items of their scale; null across scales or in a two-item scale. */
  readonly standOut: number | null;
  /** Modification index of the pair's residual covariance (same scale of four or more items), its scale's critical value and the SEPC; null otherwise. */
  readonly mi: number | null;
  readonly miCritical: number | null;
  readonly sepc: number | null;
  /** Whether the scale's sequential modification-index test flagged the pair: at the strict level, at the network level only, or not. */
  readonly miFlagged: 'strict' | 'network' | null;
}

/**
 * The local-dependence figures of pairs of usable items: residual, relative residual and its
 * critical value (same scale of four or more items), wTO and partial correlation (when the
 * network exists), and how far r stands out of the two items' other correlations in their scale.
 * @param evidence The engine's evidence.
 * @returns A reader taking two indices into items[] (both usable).
 * References: Yen 1984 (Q3); Christensen, Makransky & Horton 2017; Nowick et al. 2009.
 */
export function pairLocalFigures(evidence: EngineEvidence): (a: number, b: number) => PairLocalFigures {
  const position = positionsInMatrix(evidence);
  const order = evidence.correlation.order;
  const local = evidence.localDependence;
  const scaleOf = new Map<number, { scale: ScaleResidualEvidence; k: number }>();
  for (const scale of local?.scales ?? []) scale.items.forEach((item, k) => scaleOf.set(item, { scale, k }));
  const scaleMembers = new Map<string, number[]>();
  for (const item of evidence.usable) {
    const scale = evidence.items[item].scale;
    if (scale === null) continue;
    const list = scaleMembers.get(scale);
    if (list === undefined) scaleMembers.set(scale, [item]);
    else list.push(item);
  }
  const r = (a: number, b: number): number => evidence.correlation.data[position[a] * order + position[b]];
  return (a, b) => {
    const i = position[a];
    const j = position[b];
    const inA = scaleOf.get(a);
    const inB = scaleOf.get(b);
    let residual: number | null = null;
    let relativeResidual: number | null = null;
    let residualCritical: number | null = null;
    let mi: number | null = null;
    let miCritical: number | null = null;
    let sepc: number | null = null;
    let miFlagged: PairLocalFigures['miFlagged'] = null;
    if (inA !== undefined && inB !== undefined && inA.scale === inB.scale) {
      const scale = inA.scale;
      residual = scale.residuals[inA.k][inB.k];
      relativeResidual = residual - scale.meanResidual;
      residualCritical = scale.critical;
      mi = scale.modificationIndices?.[inA.k][inB.k] ?? null;
      sepc = scale.sepc?.[inA.k][inB.k] ?? null;
      miCritical = scale.miCritical;
      const [x, y] = inA.k < inB.k ? [inA.k, inB.k] : [inB.k, inA.k];
      const step = scale.miFlagged.findIndex((flag) => flag.a === x && flag.b === y);
      miFlagged = step < 0 ? null : step < scale.miStrictCount ? 'strict' : 'network';
    }
    let standOut: number | null = null;
    const scale = evidence.items[a].scale;
    if (scale !== null && scale === evidence.items[b].scale) {
      const others = (scaleMembers.get(scale) ?? []).filter((item) => item !== a && item !== b);
      if (others.length > 0) {
        let sum = 0;
        for (const other of others) sum += (r(a, other) + r(b, other)) / 2;
        standOut = r(a, b) - sum / others.length;
      }
    }
    return {
      residual,
      relativeResidual,
      residualCritical,
      wto: local?.wto === null || local === null ? null : local.wto.data[i * order + j],
      partial: local?.partial === null || local === null ? null : local.partial.data[i * order + j],
      standOut,
      mi,
      miCritical,
      sepc,
      miFlagged,
    };
  };
}

/**
 * The rules that fire for one pair, each vetoed where its known false alarm shows (see the
 * module comment and docs/decisions/022-engine-modification-indices.md):
 * - `local-dependence-mi`: the scale's sequential modification-index test flags the pair at the
 *   strict level (`modificationIndexAlpha`, Bonferroni over the scale's pairs). The score test
 *   accounts for the loadings the pair itself pulls toward it, where the raw residual does not.
 * - `local-dependence-wto`: wTO at or above `wtoThreshold`, and the sequential test flags the pair
 *   at the looser network level (`modificationIndexNetworkAlpha`): wTO is high for every pair of a
 *   small, tight factor, where the score test finds nothing. Across scales and in scales of three
 *   items (no identified residual covariance) wTO does not count on its own.
 * - `local-dependence-residual`: the relative residual exceeds the scale's bootstrap critical value
 *   (the fixed `residualRelativeThreshold` without one). Reported beside the two rules above when
 *   one of them fires; alone it does not link a pair (a wording factor gives positive residuals to
 *   every pair of like-worded items).
 * - `strong-pair`: |r| at or above `strongPairThreshold`, unless the pair does not stand out of its
 *   scale: its r exceeds the mean correlation of its two items with the rest of their scale by
 *   less than `residualRelativeThreshold`. In a homogeneous scale every pair passes 0.80.
 *   (A near-copy pair that dominates a small scale becomes the one factor itself; it is set aside
 *   from the residual and modification-index models, so this rule is what finds it.)
 */
export function pairRules(r: number, figures: PairLocalFigures, thresholds: OverlapThresholds): PairRule[] {
  const rules: PairRule[] = [];
  if (Math.abs(r) >= thresholds.strongPairThreshold && !(figures.standOut !== null && figures.standOut < thresholds.residualRelativeThreshold)) rules.push('strong-pair');
  if (figures.miFlagged === 'strict') rules.push('local-dependence-mi');
  const local: PairRule[] = [];
  if (figures.miFlagged !== null && figures.wto !== null && figures.wto >= thresholds.wtoThreshold) local.push('local-dependence-wto');
  if ((figures.miFlagged === 'strict' || local.length > 0) && figures.relativeResidual !== null) {
    const critical = figures.residualCritical ?? thresholds.residualRelativeThreshold;
    if (figures.relativeResidual > critical) rules.push('local-dependence-residual');
  }
  rules.push(...local);
  return rules;
}

/**
 * Finds the overlap clusters (see the module comment for exactly how they are formed).
 * @param evidence The engine's evidence for one wave.
 * @param wording Wording similarity in items[] order (`wordingSimilarity` of the item texts).
 * @param thresholds Strong-pair, local-dependence, condition-index and proportion thresholds,
 *   and the interval's confidence level.
 * @throws {RangeError} when the wording matrix does not match the items or a threshold is out of range.
 * @returns The clusters with their evidence, every near-dependency, and warnings (a strong
 *   NEGATIVE pair after recoding suggests a reverse-keying mistake).
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics" (near-dependencies); Fisher
 * 1921 (interval of r); Christensen, Makransky & Horton 2017 (relative residual rule); Nowick et
 * al. 2009 and Christensen, Garrido & Golino 2023 (wTO); Sørensen 1948 and Sokal & Michener 1958
 * for complete and average linkage (complete linkage here).
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
  const warnings: EngineWarning[] = [];
  const figuresOf = pairLocalFigures(evidence);
  const key = (a: number, b: number): string => (a < b ? `${a},${b}` : `${b},${a}`);
  /** Rules per linked pair (key a,b with a < b). */
  const linkRules = new Map<string, Set<PairRule>>();
  const addRule = (a: number, b: number, rule: PairRule): void => {
    const k = key(a, b);
    const set = linkRules.get(k);
    if (set === undefined) linkRules.set(k, new Set([rule]));
    else set.add(rule);
  };

  const strong: PairEvidence[] = [];
  for (let i = 0; i < order; i++) {
    for (let j = i + 1; j < order; j++) {
      const r = correlation.data[i * order + j];
      const figures = figuresOf(usable[i], usable[j]);
      const rules = pairRules(r, figures, thresholds);
      for (const rule of rules) addRule(usable[i], usable[j], rule);
      if (rules.includes('strong-pair')) strong.push(pairEvidence(evidence, wording, usable[i], usable[j], thresholds.confidenceLevel));
      if (Math.abs(r) >= thresholds.strongPairThreshold && r < 0) {
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
    if (dependency.interceptDominated === true) continue;
    const confirmed = dependency.confirmed;
    if (confirmed.length < 2) continue;
    const free = confirmed.filter((item) => !hasStrongPartner.has(item));
    // Items of the dependency without a strong pair of their own are linked to each other (a
    // clique, so complete linkage keeps an item that is nearly the sum of others with them)...
    for (let x = 0; x < free.length; x++) for (let y = x + 1; y < free.length; y++) addRule(free[x], free[y], 'near-dependency');
    // ...and each to the confirmed item it correlates with most strongly.
    for (const item of free) {
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
      addRule(item, partner, 'near-dependency');
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
  for (const group of exactGroups) for (let x = 0; x < group.length; x++) for (let y = x + 1; y < group.length; y++) addRule(group[x], group[y], 'exact');

  // Pair evidence (strong pairs, local dependence) forms clusters by complete linkage; a near- or
  // exact dependency then joins the clusters of its items outright, since it ties several items
  // together without every pair of them being linked (an item nearly the sum of two others).
  const pairLinks = new Map([...linkRules].filter(([, rules]) => [...rules].some((rule) => PAIR_EVIDENCE_RULES.includes(rule))));
  const sets = new DisjointSets(items.length);
  for (const list of completeLinkage(pairLinks, (a, b) => Math.abs(correlation.data[position[a] * order + position[b]]))) for (const item of list.slice(1)) sets.join(list[0], item);
  for (const [text, rules] of linkRules) {
    if (![...rules].some((rule) => rule === 'near-dependency' || rule === 'exact')) continue;
    const [a, b] = text.split(',').map(Number);
    sets.join(a, b);
  }
  const grouped = new Map<number, number[]>();
  for (const item of usable) {
    const root = sets.find(item);
    const list = grouped.get(root);
    if (list === undefined) grouped.set(root, [item]);
    else list.push(item);
  }
  const lists = [...grouped.values()].filter((list) => list.length >= 2);
  const clusters: OverlapCluster[] = [];
  for (const list of lists) {
    const inCluster = new Set(list);
    const pairs: PairEvidence[] = [];
    const links: PairEvidence[] = [];
    for (let x = 0; x < list.length; x++) {
      for (let y = x + 1; y < list.length; y++) {
        const base = pairEvidence(evidence, wording, list[x], list[y], thresholds.confidenceLevel);
        const figures = figuresOf(list[x], list[y]);
        const rules = [...(linkRules.get(key(list[x], list[y])) ?? [])];
        const pair: PairEvidence = {
          ...base,
          residual: figures.residual,
          relativeResidual: figures.relativeResidual,
          residualCritical: figures.residualCritical,
          wto: figures.wto,
          partial: figures.partial,
          mi: figures.mi,
          miCritical: figures.miCritical,
          sepc: figures.sepc,
          rules,
        };
        pairs.push(pair);
        if (rules.length > 0) links.push(pair);
      }
    }
    const strongPairs = strong.filter((pair) => inCluster.has(pair.a) && inCluster.has(pair.b)).sort((p, q) => Math.abs(q.r) - Math.abs(p.r));
    const maxPair = pairs.reduce((best, pair) => (Math.abs(pair.r) > Math.abs(best.r) ? pair : best), pairs[0]);
    clusters.push({
      items: list,
      strongPairs,
      dependencies: dependencies.filter((dependency) => dependency.interceptDominated !== true && dependency.confirmed.filter((item) => inCluster.has(item)).length >= 2),
      exactDependencies: exactGroups.filter((group) => group.every((item) => inCluster.has(item))),
      pairs,
      links,
      maxR: maxPair.r,
      conditionIndex: clusterConditionIndex(evidence, list),
    });
  }
  clusters.sort((p, q) => p.items[0] - q.items[0]);
  const linkedPairs = [...linkRules].map(([text, rules]) => {
    const [a, b] = text.split(',').map(Number);
    return { a, b, rules: [...rules] };
  });
  return { clusters, dependencies, linkedPairs, warnings };
}

/**
 * Complete-linkage clustering of the linked pairs: every item starts alone; the two clusters
 * whose every cross pair is linked merge, strongest link (largest |r|) first, until no two
 * clusters can merge. So a cluster is a clique of linked pairs: an item joins only when it is
 * linked to every member, and a chain a–b–c never pulls a and c together (single linkage would).
 * @param links Linked pairs keyed `a,b` (a < b).
 * @param strength |r| of a pair, to order the merges.
 * @returns Clusters of two or more items (each ascending).
 * References: Sørensen 1948 (complete linkage); Everitt, Landau, Leese & Stahl 2011, "Cluster
 * Analysis", ch. 4.
 */
export function completeLinkage(links: ReadonlyMap<string, unknown>, strength: (a: number, b: number) => number): number[][] {
  const edges = [...links.keys()].map((text) => text.split(',').map(Number) as [number, number]);
  edges.sort((p, q) => strength(q[0], q[1]) - strength(p[0], p[1]) || p[0] - q[0] || p[1] - q[1]);
  const clusterOf = new Map<number, number[]>();
  for (const [a, b] of edges) {
    for (const item of [a, b]) if (!clusterOf.has(item)) clusterOf.set(item, [item]);
  }
  const linked = (a: number, b: number): boolean => links.has(a < b ? `${a},${b}` : `${b},${a}`);
  for (const [a, b] of edges) {
    const left = clusterOf.get(a) as number[];
    const right = clusterOf.get(b) as number[];
    if (left === right) continue;
    if (!left.every((x) => right.every((y) => linked(x, y)))) continue;
    const merged = [...left, ...right].sort((x, y) => x - y);
    for (const item of merged) clusterOf.set(item, merged);
  }
  const seen = new Set<number[]>();
  const result: number[][] = [];
  for (const list of clusterOf.values()) {
    if (seen.has(list) || list.length < 2) continue;
    seen.add(list);
    result.push(list);
  }
  return result;
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
