/**
 * From overlap clusters to a constrained cut list: in each cluster one item is kept and the
 * others are proposed for `drop`, `merge` (into the keeper) or `reword`, unless a constraint the
 * designer set blocks it, in which case the item is `keep` with the blocking constraints named.
 *
 * The rules (docs/decisions/003-redundancy-engine.md):
 * - Keeper: a locked item always wins (the best-scoring one if several are locked); otherwise the
 *   highest keeper score
 *   `fit − missingRate − 0.5 · extremeShare − 0.05 · ln(VIF without partners)`, where fit is the
 *   item-rest correlation within its scale (or, when any cluster member has none, the multiple
 *   correlation with the items outside the cluster), extremeShare the larger of its floor and
 *   ceiling shares, and "VIF without partners" the VIF it would have once the other cluster
 *   members are gone. Ties: fewer missing answers, then the earlier item.
 * - The other members are taken worst score first. A member is changed only while it still
 *   overlaps what is left of the cluster (a linked pair with a remaining member: strong pair or
 *   local dependence, or a near/exact dependency whose members all remain); otherwise it stays
 *   with no change needed.
 * - Action: `merge` when |r| with the keeper is at or above `mergeCorrelation` (0.95) or the
 *   wording similarity at or above `mergeWordingSimilarity` (0.80); `reword` only when the two
 *   items belong to different scales of the codebook (their content is meant to differ) and the
 *   item is rewordable; `drop` otherwise. Spelling never sends an item for rewording: true
 *   synonyms share few character 3-grams (issue 9).
 * - Constraints, never broken: a locked item is never changed; a drop or merge must leave its
 *   scale at least `minItemsPerScale` usable items, every scale's raw alpha at or above
 *   `alphaFloor` (a scale already below it is only protected from cuts of its own items) and no
 *   more than `maxAlphaDrop` below its value before any cut, and the number of cut items within
 *   `maxCutShare` of the usable items, and no content facet (the codebook's `facet`) left without
 *   an item. A reword removes nothing, so only the lock applies to it.
 * - Clusters are handled strongest first (largest |r|), so the cut cap spends itself on the
 *   clearest duplicates.
 */
import type { EngineSettings } from './engine-settings';
import { KEEPER_SCORE_TIE, KEEPER_SCORE_WEIGHTS } from './engine-settings';
import { dependencyReport, pairReport } from './evidence-reports';
import { emptiesFacet } from './facet-coverage';
export { dependencyReport, pairReport } from './evidence-reports';
import { eigenVifAfterRemoval, type VifAfterRemoval } from './vif-after-removal';
import type { DependencyEvidence, EngineEvidence, OverlapCluster, PairEvidence, PairRule } from './types';

/** A change the engine can propose for an item. */
export type ChangeAction = 'drop' | 'merge' | 'reword';

/** What happens to an item of a cluster: a change, or `keep`. */
export type CutActionKind = ChangeAction | 'keep';

/** Names of the designer's constraints, as they appear in `blockedBy`. */
export type ConstraintName = 'locked' | 'min-items' | 'alpha-floor' | 'max-alpha-drop' | 'cut-cap' | 'facet';

/** A scale's raw alpha and usable item count after a set of items is removed. */
export interface ScaleAfterRemoval {
  readonly alpha: number | null;
  readonly items: number;
}

/**
 * Reliability of every scale after removing a set of items (indices into items[]), computed the
 * way a fresh audit of the reduced item set computes it (see `scaleAlphaOracle` in
 * compute-evidence.ts).
 */
export type ScaleAlphaOracle = (removed: ReadonlySet<number>) => ReadonlyMap<string, ScaleAfterRemoval>;

/** One item's line in a recommendation (audit-json `actions[]`, with keys added). */
export interface RecommendedAction {
  readonly item: string;
  readonly action: CutActionKind;
  /** The keeper for `merge`, else null. */
  readonly into: string | null;
  /** What the engine would propose without constraints; null when the item needs no change. */
  readonly proposed: ChangeAction | null;
  /** Constraints that turned the proposal into `keep` (empty when none did). */
  readonly blockedBy: readonly ConstraintName[];
  /** Correlation with the keeper (recoded values). */
  readonly rWithKeeper: number;
  /** Wording similarity with the keeper, null when either wording is unknown. */
  readonly wordingWithKeeper: number | null;
}

/** A pair's evidence with item ids, for the audit JSON. */
export interface PairReport {
  readonly items: readonly [string, string];
  readonly r: number;
  readonly n: number;
  readonly lower: number | null;
  readonly upper: number | null;
  /** Which interval: `fisher-z` (Pearson, Spearman) or `estimator-se` (polychoric: its likelihood's SE). */
  readonly interval?: 'fisher-z' | 'estimator-se';
  readonly se?: number | null;
  readonly wording: number | null;
  /** Residual correlation after the scale's one-factor model (null across scales or in scales of fewer than four items). */
  readonly residual?: number | null;
  /** Residual minus the scale's mean residual. */
  readonly relativeResidual?: number | null;
  /** The scale's critical value of the relative residual (null: the fixed rule applied, or no residual). */
  readonly residualCritical?: number | null;
  readonly wto?: number | null;
  readonly partial?: number | null;
  /** Modification index of the pair's residual covariance, its scale's critical value (strict level) and the standardized expected change (null across scales or in scales of fewer than four items). */
  readonly mi?: number | null;
  readonly miCritical?: number | null;
  readonly sepc?: number | null;
  /** Rules that fired for the pair. */
  readonly rules?: readonly PairRule[];
}

/** A near-dependency with item ids, for the audit JSON. */
export interface DependencyReport {
  readonly dimension: number;
  /** null for an exact dependency (zero singular value). */
  readonly conditionIndex: number | null;
  readonly items: readonly string[];
  readonly proportions: readonly number[];
  readonly interceptProportion: number;
  /** The items the correlation matrix confirms (VIF at or above the threshold, or infinite). */
  readonly confirmed: readonly string[];
}

/** The keeper score of one cluster member and its parts. */
export interface KeeperScore {
  readonly item: string;
  readonly locked: boolean;
  readonly score: number;
  /** The fit term and where it came from. */
  readonly fit: number | null;
  readonly fitSource: 'item-rest' | 'multiple-correlation';
  readonly missingRate: number;
  readonly extremeShare: number;
  /** VIF the item would have once its cluster partners are gone (null when undefined). */
  readonly vifWithoutPartners: number | null;
}

/** The evidence behind one recommendation (audit-json `evidence`, with keys added). */
export interface RecommendationEvidence {
  /** Largest |r| among the cluster's pairs, signed. */
  readonly maxR: number;
  /** Condition index of the dimension that carries the cluster most; null without diagnostics or for an exact dependency. */
  readonly conditionIndex: number | null;
  /** Largest VIF among the cluster's items; null when one of them is in an exact dependency. */
  readonly vifBefore: number | null;
  /** Largest VIF among the cluster's items left after this recommendation's drops and merges. */
  readonly vifAfter: number | null;
  /** True when a near-dependency (or exact dependency) ties the cluster, not only strong pairs. */
  readonly nearDependency: boolean;
  readonly strongPairs: readonly PairReport[];
  readonly pairs: readonly PairReport[];
  readonly dependencies: readonly DependencyReport[];
  readonly exactDependencies: readonly (readonly string[])[];
  readonly keeperScores: readonly KeeperScore[];
  /** Every rule that linked a pair of the cluster (which evidence fired). */
  readonly rules: readonly PairRule[];
  /** The linked pairs with all their evidence. */
  readonly links: readonly PairReport[];
}

/**
 * Why a recommendation says what it says, as data: the overlap it rests on, the keeper, what
 * happens to the other members and what blocked a change. src/lib/words/reasons.ts turns it into
 * the sentence a reader sees (audit-json `reason`); the audit JSON carries it as `because`.
 */
export interface CutReason {
  /**
   * `strong-pair`: a cluster of two items joined by a strong pair; `overlap`: more items around
   * their strongest pair; `local-dependence`: no strong pair, items sharing variance beyond their
   * scale's common factor (modification index, wTO, residual); `dependency`: no strong pair and no
   * local dependence, a near (or exact) linear dependency.
   */
  readonly code: 'strong-pair' | 'overlap' | 'local-dependence' | 'dependency';
  /** The cluster's items, in items[] order. */
  readonly items: readonly string[];
  /** The strongest pair; for `local-dependence` the link with the largest modification index (null for `dependency`). */
  readonly pair: PairReport | null;
  /** Every rule that fired inside the cluster, in report order (what the sentence names as its evidence). */
  readonly evidence?: readonly PairRule[];
  /** Coverage of the pair's interval (the settings' confidence level). */
  readonly confidenceLevel: number;
  /** The cluster's condition index; null without diagnostics or for an exact dependency. */
  readonly conditionIndex: number | null;
  readonly keep: string;
  /** The keeper is kept because it is locked (else: best keeper score). */
  readonly keeperLocked: boolean;
  readonly merge: readonly string[];
  readonly drop: readonly string[];
  readonly reword: readonly string[];
  /** Items that stay because a constraint blocked the change, with the constraints. */
  readonly blocked: readonly { readonly item: string; readonly by: readonly ConstraintName[] }[];
  /** The cluster's highest VIF before and after this recommendation's drops and merges. */
  readonly vifBefore: number | null;
  readonly vifAfter: number | null;
}

/**
 * A caution shown beside a recommendation, as data (src/lib/words/cautions.ts words it):
 * overlap is not proof; the pilot sample is small (smallest pair n); validated instruments; and,
 * after the bootstrap, an unstable choice (the overlap recurs, the keeper does not) or an
 * unstable recommendation.
 */
export type Caution =
  | { readonly code: 'overlap-not-proof' }
  | { readonly code: 'small-sample'; readonly smallestN: number }
  | { readonly code: 'validated-instrument' }
  | {
      readonly code: 'unstable-choice' | 'unstable';
      /** Share of resamples making the same recommendation. */
      readonly share: number;
      /** Share of resamples finding the cluster's items together again. */
      readonly overlapShare: number;
      readonly resamples: number;
      readonly threshold: number;
    };

/** One recommendation (audit-json `recommendations[]`, with keys added). */
export interface Recommendation {
  readonly cluster: readonly string[];
  readonly keep: string;
  /** One line per cluster member other than the keeper, in items[] order. */
  readonly actions: readonly RecommendedAction[];
  readonly evidence: RecommendationEvidence;
  /** Share of bootstrap resamples that make the same recommendation; null until measured or when the bootstrap is off. */
  readonly stability: number | null;
  /** stability below the settings' threshold; null when not measured. */
  readonly unstable: boolean | null;
  /** Share of bootstrap resamples that find the cluster's items together again (any keeper); null when not measured. */
  readonly overlapStability: number | null;
  /** Why, as data (worded by src/lib/words). */
  readonly because: CutReason;
  /** Cautions shown beside the recommendation, as data (worded by src/lib/words). */
  readonly cautions: readonly Caution[];
}

/** The constrained cut list. */
export interface CutRecommendations {
  readonly recommendations: readonly Recommendation[];
  /** Indices into items[] of every item dropped or merged, ascending. */
  readonly removed: readonly number[];
  /** Largest number of items the cut cap allows. */
  readonly cutBudget: number;
}

/** The settings `recommendCuts` reads. */
export type RecommendSettings = Pick<
  EngineSettings,
  | 'strongPairThreshold'
  | 'mergeCorrelation'
  | 'mergeWordingSimilarity'
  | 'minItemsPerScale'
  | 'alphaFloor'
  | 'maxAlphaDrop'
  | 'maxCutShare'
  | 'confidenceLevel'
>;

/** Everything about one cluster the decision needs, computed once. */
interface ClusterContext {
  readonly cluster: OverlapCluster;
  readonly scores: readonly KeeperScore[];
}

/** Reads r between two items of items[] from the evidence's correlation matrix. */
function correlationBetween(evidence: EngineEvidence, position: readonly number[], a: number, b: number): number {
  const order = evidence.correlation.order;
  return evidence.correlation.data[position[a] * order + position[b]];
}

/**
 * The keeper score of every member of a cluster (see the module comment for the formula).
 * @param evidence The engine's evidence.
 * @param cluster One overlap cluster.
 * @param vifAfterRemoval How "VIF without partners" is computed (default: a fresh decomposition
 *   per member; bootstrap resamples pass the Schur-complement oracle, vif-after-removal.ts).
 * @throws {RangeError} when a cluster item is not in the correlation matrix.
 * @returns One score per member, in the cluster's order.
 * References: Cronbach 1951 (item-rest correlation); Marquardt 1970 (VIF); Terwee et al. 2007,
 * "Quality criteria were proposed for measurement properties of health status questionnaires"
 * (J. Clin. Epidemiol. 60:34-42; floor and ceiling effects).
 */
export function keeperScores(evidence: EngineEvidence, cluster: OverlapCluster, vifAfterRemoval: VifAfterRemoval = eigenVifAfterRemoval(evidence)): KeeperScore[] {
  const position = positions(evidence);
  for (const item of cluster.items) if (position[item] < 0) throw new RangeError(`keeperScores: item ${item} is not in the correlation matrix`);
  const inCluster = new Set(cluster.items);
  const useItemRest = cluster.items.every((item) => evidence.itemRest[item] !== null);
  const keptCount = evidence.usable.filter((other) => !inCluster.has(other)).length + 1;
  return cluster.items.map((item) => {
    const partners = cluster.items.filter((other) => other !== item);
    const [vif] = keptCount >= 2 ? vifAfterRemoval(partners, [item]) : [1];
    const descriptives = evidence.descriptives[item];
    const fit = useItemRest ? evidence.itemRest[item] : vif === null ? null : Math.sqrt(Math.max(0, 1 - 1 / vif));
    const extremeShare = Math.max(descriptives.floor ?? 0, descriptives.ceiling ?? 0);
    const weights = KEEPER_SCORE_WEIGHTS;
    const score =
      weights.fit * (fit ?? 0) -
      weights.missingRate * descriptives.missingRate -
      weights.extremeShare * extremeShare -
      weights.logVif * (vif === null ? 0 : Math.log(vif));
    return {
      item: evidence.items[item].id,
      locked: evidence.items[item].locked,
      score,
      fit,
      fitSource: useItemRest ? 'item-rest' : 'multiple-correlation',
      missingRate: descriptives.missingRate,
      extremeShare,
      vifWithoutPartners: vif,
    };
  });
}

/** Position of each item of items[] in the correlation matrix, -1 when absent. */
function positions(evidence: EngineEvidence): number[] {
  const position = new Array<number>(evidence.items.length).fill(-1);
  evidence.usable.forEach((item, k) => {
    position[item] = k;
  });
  return position;
}

/** Orders two members for the keeper: locked first, then higher score, fewer missing, earlier. */
function betterKeeper(a: { index: number; score: KeeperScore }, b: { index: number; score: KeeperScore }): number {
  if (a.score.locked !== b.score.locked) return a.score.locked ? -1 : 1;
  if (Math.abs(a.score.score - b.score.score) > KEEPER_SCORE_TIE) return b.score.score - a.score.score;
  if (a.score.missingRate !== b.score.missingRate) return a.score.missingRate - b.score.missingRate;
  return a.index - b.index;
}

/**
 * The constrained cut list for a set of overlap clusters (see the module comment for every rule).
 * @param evidence The engine's evidence for the wave.
 * @param clusters Overlap clusters from `findOverlapClusters`.
 * @param settings Merge/reword thresholds and the designer's constraints.
 * @param scaleAlpha Reliability after a removal, computed as a fresh audit would (from `scaleAlphaOracle`).
 * @param vifAfterRemoval VIF once items are gone, for the keeper scores and `vifAfter` (default:
 *   a fresh decomposition per call; bootstrap resamples pass the Schur-complement oracle).
 * @throws {RangeError} when a cluster names an item outside the correlation matrix or a setting is out of range.
 * @returns One recommendation per cluster (strongest first), every removed item, and the cap.
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests"; Nunnally
 * 1978, "Psychometric Theory" (alpha 0.70); Marquardt 1970 (VIF); Fisher 1921 (interval of r).
 */
export function recommendCuts(
  evidence: EngineEvidence,
  clusters: readonly OverlapCluster[],
  settings: RecommendSettings,
  scaleAlpha: ScaleAlphaOracle,
  vifAfterRemoval: VifAfterRemoval = eigenVifAfterRemoval(evidence),
): CutRecommendations {
  if (!(settings.maxCutShare >= 0 && settings.maxCutShare <= 1)) throw new RangeError(`recommendCuts: maxCutShare must lie in [0, 1], got ${settings.maxCutShare}`);
  if (!(Number.isInteger(settings.minItemsPerScale) && settings.minItemsPerScale >= 1)) {
    throw new RangeError(`recommendCuts: minItemsPerScale must be an integer >= 1, got ${settings.minItemsPerScale}`);
  }
  const position = positions(evidence);
  const cutBudget = Math.floor(settings.maxCutShare * evidence.usable.length + 1e-9);
  const removed = new Set<number>();
  const before = new Map(evidence.scales.map((scale) => [scale.id, scale.alpha]));

  const contexts: ClusterContext[] = clusters.map((cluster) => ({ cluster, scores: keeperScores(evidence, cluster, vifAfterRemoval) }));
  const ordered = [...contexts].sort(
    (p, q) => Math.abs(q.cluster.maxR) - Math.abs(p.cluster.maxR) || p.cluster.items[0] - q.cluster.items[0],
  );

  const recommendations: Recommendation[] = [];
  for (const context of ordered) {
    recommendations.push(decideCluster(evidence, position, context, settings, scaleAlpha, removed, before, cutBudget, vifAfterRemoval));
  }
  return { recommendations, removed: [...removed].sort((a, b) => a - b), cutBudget };
}

/** Decides one cluster, adding its cuts to `removed`. */
function decideCluster(
  evidence: EngineEvidence,
  position: readonly number[],
  context: ClusterContext,
  settings: RecommendSettings,
  scaleAlpha: ScaleAlphaOracle,
  removed: Set<number>,
  alphaBefore: ReadonlyMap<string, number | null>,
  cutBudget: number,
  vifAfterRemoval: VifAfterRemoval,
): Recommendation {
  const { cluster, scores } = context;
  const members = cluster.items.map((index, k) => ({ index, score: scores[k] }));
  const keeper = [...members].sort(betterKeeper)[0].index;
  const candidates = members
    .filter((member) => member.index !== keeper)
    .sort((a, b) => a.score.score - b.score.score || b.index - a.index);

  const remaining = new Set(cluster.items);
  const inCluster = new Set(cluster.items);
  const groups: (readonly number[])[] = [
    ...cluster.dependencies.map((dependency) => dependency.confirmed.filter((item) => inCluster.has(item))).filter((group) => group.length >= 2),
    ...cluster.exactDependencies,
  ];
  // Pairs linked on their own evidence; near- and exact dependencies count through `groups`
  // (they overlap only while all their members remain).
  const linked = new Set(
    cluster.links
      .filter((pair) => (pair.rules ?? []).some((rule) => rule === 'strong-pair' || rule.startsWith('local-dependence-')))
      .map((pair) => `${pair.a},${pair.b}`),
  );
  const stillOverlaps = (item: number): boolean => {
    for (const other of remaining) {
      if (other !== item && linked.has(`${Math.min(item, other)},${Math.max(item, other)}`)) return true;
    }
    return groups.some((group) => group.includes(item) && group.every((member) => remaining.has(member)));
  };

  const decided = new Map<number, RecommendedAction>();
  const ownRemoved: number[] = [];
  const keeperId = evidence.items[keeper].id;
  for (const { index } of candidates) {
    const item = evidence.items[index];
    const rWithKeeper = correlationBetween(evidence, position, index, keeper);
    const wordingWithKeeper = cluster.pairs.find((pair) => pair.a === Math.min(index, keeper) && pair.b === Math.max(index, keeper))?.wording ?? null;
    const base = { item: item.id, rWithKeeper, wordingWithKeeper };
    if (!stillOverlaps(index)) {
      decided.set(index, { ...base, action: 'keep', into: null, proposed: null, blockedBy: [] });
      continue;
    }
    const proposed = proposeAction(rWithKeeper, wordingWithKeeper, item.scale !== evidence.items[keeper].scale, item.rewordable !== false, settings);
    const blockedBy: ConstraintName[] = [];
    if (item.locked) blockedBy.push('locked');
    else if (proposed !== 'reword') blockedBy.push(...violatedConstraints(evidence, index, settings, scaleAlpha, removed, alphaBefore, cutBudget));
    if (blockedBy.length > 0) {
      decided.set(index, { ...base, action: 'keep', into: null, proposed, blockedBy });
      continue;
    }
    decided.set(index, { ...base, action: proposed, into: proposed === 'merge' ? keeperId : null, proposed, blockedBy: [] });
    remaining.delete(index);
    if (proposed !== 'reword') {
      removed.add(index);
      ownRemoved.push(index);
    }
  }

  const actions = cluster.items.filter((index) => index !== keeper).map((index) => decided.get(index) as RecommendedAction);
  const vifBefore = maxOrNull(cluster.items.map((index) => evidence.vif[index]));
  const left = cluster.items.filter((index) => !ownRemoved.includes(index));
  const vifAfter = ownRemoved.length === 0 ? vifBefore : maxOrNull(vifAfterRemoval(ownRemoved, left));
  const ids = (list: readonly number[]): string[] => list.map((index) => evidence.items[index].id);
  const evidenceOut: RecommendationEvidence = {
    maxR: cluster.maxR,
    conditionIndex: cluster.conditionIndex,
    vifBefore,
    vifAfter,
    nearDependency: cluster.dependencies.length > 0 || cluster.exactDependencies.length > 0,
    strongPairs: cluster.strongPairs.map((pair) => pairReport(evidence, pair)),
    pairs: cluster.pairs.map((pair) => pairReport(evidence, pair)),
    dependencies: cluster.dependencies.map((dependency) => dependencyReport(evidence, dependency)),
    exactDependencies: cluster.exactDependencies.map(ids),
    keeperScores: scores,
    rules: PAIR_RULE_ORDER.filter((rule) => cluster.links.some((pair) => pair.rules?.includes(rule))),
    links: cluster.links.map((pair) => pairReport(evidence, pair)),
  };
  return {
    cluster: ids(cluster.items),
    keep: keeperId,
    actions,
    evidence: evidenceOut,
    stability: null,
    unstable: null,
    overlapStability: null,
    because: cutReason(evidence, cluster, keeper, actions, evidenceOut, settings),
    cautions: standardCautions(cluster),
  };
}

/**
 * merge, reword or drop (see the module comment). Statistically interchangeable items are
 * dropped (or merged), whatever their spelling: synonyms share few 3-grams. `reword` only where
 * the content is known to differ: the codebook puts the two items in different scales, so the
 * designer meant them to measure different things and the overlap says the wording does not yet
 * separate them. An item marked not rewordable is never sent for rewording.
 */
function proposeAction(r: number, wording: number | null, otherScale: boolean, rewordable: boolean, settings: RecommendSettings): ChangeAction {
  if (Math.abs(r) >= settings.mergeCorrelation || (wording !== null && wording >= settings.mergeWordingSimilarity)) return 'merge';
  if (otherScale && rewordable) return 'reword';
  return 'drop';
}

/**
 * The constraints that block removing one more item on top of a cut, for candidates found outside
 * the overlap clusters (weak or cross-loading items of the exploratory view): the same rules as
 * the cut list, with the cap counted from the usable items.
 * @param evidence the engine's evidence.
 * @param index the item (index into items[]).
 * @param settings the designer's constraints.
 * @param scaleAlpha reliability after a removal (`scaleAlphaOracle`).
 * @param removed the items the cut already removes.
 * @returns the constraints broken (empty: the removal is allowed).
 * References: as recommendCuts.
 */
export function blockingConstraints(evidence: EngineEvidence, index: number, settings: RecommendSettings, scaleAlpha: ScaleAlphaOracle, removed: ReadonlySet<number>): ConstraintName[] {
  if (evidence.items[index].locked) return ['locked'];
  const cutBudget = Math.floor(settings.maxCutShare * evidence.usable.length + 1e-9);
  const before = new Map(evidence.scales.map((scale) => [scale.id, scale.alpha]));
  return violatedConstraints(evidence, index, settings, scaleAlpha, removed, before, cutBudget);
}

/** Every constraint that removing `index` (on top of `removed`) would break. */
function violatedConstraints(
  evidence: EngineEvidence,
  index: number,
  settings: RecommendSettings,
  scaleAlpha: ScaleAlphaOracle,
  removed: ReadonlySet<number>,
  alphaBefore: ReadonlyMap<string, number | null>,
  cutBudget: number,
): ConstraintName[] {
  const violated: ConstraintName[] = [];
  if (removed.size + 1 > cutBudget) violated.push('cut-cap');
  const ownScale = evidence.items[index].scale;
  const trial = new Set(removed);
  trial.add(index);
  const after = scaleAlpha(trial);
  const current = scaleAlpha(removed);
  if (ownScale !== null && (after.get(ownScale)?.items ?? 0) < settings.minItemsPerScale) violated.push('min-items');
  if (emptiesFacet(evidence.items, index, removed)) violated.push('facet');
  let floorBroken = false;
  let dropBroken = false;
  for (const [scale, figures] of after) {
    const original = alphaBefore.get(scale) ?? null;
    const now = current.get(scale)?.alpha ?? null;
    const changed = scale === ownScale || figures.alpha !== now;
    if (!changed) continue;
    const ownOrWasAbove = scale === ownScale || (original !== null && original >= settings.alphaFloor);
    if (ownOrWasAbove && (figures.alpha === null || figures.alpha < settings.alphaFloor)) floorBroken = true;
    if (original !== null && (figures.alpha === null || original - figures.alpha > settings.maxAlphaDrop)) dropBroken = true;
  }
  if (floorBroken) violated.push('alpha-floor');
  if (dropBroken) violated.push('max-alpha-drop');
  return violated;
}

function maxOrNull(values: readonly (number | null)[]): number | null {
  let largest = -Infinity;
  for (const value of values) {
    if (value === null) return null;
    largest = Math.max(largest, value);
  }
  return values.length === 0 ? null : largest;
}

/** Rules in the order they are reported. */
const PAIR_RULE_ORDER: readonly PairRule[] = Object.freeze(['exact', 'near-dependency', 'strong-pair', 'local-dependence-mi', 'local-dependence-residual', 'local-dependence-wto']);

/** The structured reason of one recommendation (worded by src/lib/words/reasons.ts). */
function cutReason(
  evidence: EngineEvidence,
  cluster: OverlapCluster,
  keeper: number,
  actions: readonly RecommendedAction[],
  summary: RecommendationEvidence,
  settings: RecommendSettings,
): CutReason {
  const strongest = cluster.strongPairs[0] ?? null;
  const changed = (kind: ChangeAction): string[] => actions.filter((action) => action.action === kind).map((action) => action.item);
  const fired = new Set<PairRule>(cluster.links.flatMap((pair) => pair.rules ?? []));
  if (cluster.dependencies.length > 0) fired.add('near-dependency');
  if (cluster.exactDependencies.length > 0) fired.add('exact');
  const localLinks = cluster.links.filter((pair) => (pair.rules ?? []).some((rule) => rule.startsWith('local-dependence-')));
  const local = localLinks.reduce<PairEvidence | null>((best, pair) => (best === null || (pair.mi ?? -1) > (best.mi ?? -1) ? pair : best), null);
  const code: CutReason['code'] = strongest !== null ? (cluster.items.length === 2 ? 'strong-pair' : 'overlap') : local !== null ? 'local-dependence' : 'dependency';
  const shown = strongest ?? local;
  return {
    code,
    items: cluster.items.map((index) => evidence.items[index].id),
    pair: shown === null ? null : pairReport(evidence, shown),
    evidence: PAIR_RULE_ORDER.filter((rule) => fired.has(rule)),
    confidenceLevel: settings.confidenceLevel,
    conditionIndex: summary.conditionIndex,
    keep: evidence.items[keeper].id,
    keeperLocked: evidence.items[keeper].locked,
    merge: changed('merge'),
    drop: changed('drop'),
    reword: changed('reword'),
    blocked: actions
      .filter((action) => action.action === 'keep' && action.blockedBy.length > 0)
      .map((action) => ({ item: action.item, by: [...action.blockedBy] })),
    vifBefore: summary.vifBefore,
    vifAfter: summary.vifAfter,
  };
}

/** The cautions every recommendation carries. */
function standardCautions(cluster: OverlapCluster): Caution[] {
  const smallestN = Math.min(...cluster.pairs.map((pair) => pair.n));
  return [{ code: 'overlap-not-proof' }, { code: 'small-sample', smallestN }, { code: 'validated-instrument' }];
}
