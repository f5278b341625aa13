/**
 * The audit JSON (audit-json.md) read into what the audit page shows: headline figures,
 * recommendations with their evidence, the after-cut what-if. Pure; keys the schema only adds
 * (cautions, blockedBy, the pair intervals) are read defensively, so an older stored result
 * still renders.
 */
import type { AuditJson } from '../../lib/audit/audit-json';

/** A number, or null when the value is absent or not finite. */
function numberOrNull(value: unknown): number | null {
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

function stringList(value: unknown): string[] {
  return Array.isArray(value) ? value.filter((entry): entry is string => typeof entry === 'string') : [];
}

/** The figures at the top of the audit page. */
export interface HeadlineFigures {
  items: number;
  itemsInMatrix: number;
  rows: number;
  respondentsUsed: number;
  respondentsExcluded: number;
  /** Largest finite VIF and its item. */
  maxVif: { value: number; item: string } | null;
  /** Items in the matrix whose VIF is infinite (exact dependency). */
  infiniteVif: string[];
  conditionNumber: number | null;
  /** True when the matrix is singular (an exact dependency), so the condition number is infinite. */
  singular: boolean;
  kmo: number | null;
  kmoLabel: string | null;
  factorsSuggested: number | null;
}

/**
 * Headline figures of an audit.
 * @param audit the audit JSON.
 * @returns the figures.
 */
export function headlineFigures(audit: AuditJson): HeadlineFigures {
  let maxVif: HeadlineFigures['maxVif'] = null;
  const infiniteVif: string[] = [];
  for (const item of audit.items) {
    if (item.inMatrix === false) continue;
    if (item.vif === null) {
      if (audit.warnings.some((warning) => warning.code === 'exact-dependency' && warning.items.includes(item.id))) infiniteVif.push(item.id);
    } else if (!maxVif || item.vif > maxVif.value) {
      maxVif = { value: item.vif, item: item.id };
    }
  }
  return {
    items: audit.input.items,
    itemsInMatrix: numberOrNull(audit.input.itemsInMatrix) ?? audit.correlation.items.length,
    rows: audit.input.rows,
    respondentsUsed: audit.input.respondentsUsed,
    respondentsExcluded: audit.input.respondentsExcluded,
    maxVif,
    infiniteVif,
    conditionNumber: audit.conditionNumber,
    singular: audit.conditionNumber === null && audit.eigenvalues.length > 0 && audit.warnings.some((warning) => warning.code === 'exact-dependency'),
    kmo: audit.kmo,
    kmoLabel: typeof audit.kmoLabel === 'string' ? audit.kmoLabel : null,
    factorsSuggested: audit.parallelAnalysis?.suggested ?? null,
  };
}

/** One item of a cluster, with its wording. */
export interface ClusterItem {
  id: string;
  scale: string | null;
  text: string | null;
  locked: boolean;
}

/** One changed (or blocked) item of a recommendation. */
export interface ActionView {
  item: string;
  action: string;
  into: string | null;
  /** What the engine would have done when a constraint blocked it. */
  proposed: string | null;
  blockedBy: string[];
  rWithKeeper: number | null;
}

/** One recommendation as the page shows it. */
export interface RecommendationView {
  cluster: ClusterItem[];
  keep: string;
  actions: ActionView[];
  reason: string;
  maxR: number | null;
  /** The strongest pair's interval. */
  strongest: { items: string[]; r: number; lower: number | null; upper: number | null; n: number | null } | null;
  conditionIndex: number | null;
  /** The cluster holds an exact dependency (a copied column): its condition index and VIF are infinite. */
  exactDependency: boolean;
  vifBefore: number | null;
  vifAfter: number | null;
  stability: number | null;
  unstable: boolean;
  overlapStability: number | null;
  cautions: string[];
}

/**
 * The recommendations of an audit, in the engine's order.
 * @param audit the audit JSON.
 * @returns one view per recommendation.
 */
export function recommendationViews(audit: AuditJson): RecommendationView[] {
  const items = new Map(audit.items.map((item) => [item.id, item]));
  return audit.recommendations.map((recommendation) => {
    const evidence = recommendation.evidence;
    const pairs = Array.isArray(evidence.strongPairs) ? (evidence.strongPairs as Record<string, unknown>[]) : [];
    const strongestPair = pairs.reduce<Record<string, unknown> | null>(
      (best, pair) => (best === null || Math.abs(numberOrNull(pair.r) ?? 0) > Math.abs(numberOrNull(best.r) ?? 0) ? pair : best),
      null,
    );
    return {
      cluster: recommendation.cluster.map((id) => {
        const item = items.get(id);
        return { id, scale: item?.scale ?? null, text: typeof item?.text === 'string' ? item.text : null, locked: item?.locked === true };
      }),
      keep: recommendation.keep,
      actions: recommendation.actions.map((action) => ({
        item: action.item,
        action: action.action,
        into: action.into,
        proposed: typeof action.proposed === 'string' ? action.proposed : null,
        blockedBy: stringList(action.blockedBy),
        rWithKeeper: numberOrNull(action.rWithKeeper),
      })),
      reason: recommendation.reason,
      maxR: numberOrNull(evidence.maxR),
      strongest:
        strongestPair && numberOrNull(strongestPair.r) !== null
          ? { items: stringList(strongestPair.items), r: strongestPair.r as number, lower: numberOrNull(strongestPair.lower), upper: numberOrNull(strongestPair.upper), n: numberOrNull(strongestPair.n) }
          : null,
      conditionIndex: numberOrNull(evidence.conditionIndex),
      exactDependency: Array.isArray(evidence.exactDependencies) && evidence.exactDependencies.length > 0,
      vifBefore: numberOrNull(evidence.vifBefore),
      vifAfter: numberOrNull(evidence.vifAfter),
      stability: numberOrNull(recommendation.stability),
      unstable: recommendation.unstable === true,
      overlapStability: numberOrNull(recommendation.overlapStability),
      cautions: stringList(recommendation.cautions),
    };
  });
}

/**
 * Cautions that every recommendation carries, said once for the page, and each recommendation's
 * own (its sample size, its instability).
 * @param recommendations the views.
 * @returns the shared cautions, and the views with only their own cautions.
 */
export function splitCautions(recommendations: RecommendationView[]): { shared: string[]; own: RecommendationView[] } {
  if (recommendations.length < 2) return { shared: [], own: recommendations };
  const shared = recommendations[0].cautions.filter((caution) => recommendations.every((r) => r.cautions.includes(caution)));
  return { shared, own: recommendations.map((r) => ({ ...r, cautions: r.cautions.filter((caution) => !shared.includes(caution)) })) };
}

/** One scale before and after the proposed cut. */
export interface ScaleAfterCut {
  id: string;
  itemsBefore: number | null;
  items: number;
  alphaBefore: number | null;
  alpha: number | null;
  omegaBefore: number | null;
  omega: number | null;
  spearmanBrown: number | null;
}

/** The what-if of the proposed cut. */
export interface AfterCutView {
  removed: string[];
  itemsRemoved: number;
  minutesSaved: number;
  secondsPerItem: number | null;
  maxVifBefore: number | null;
  maxVif: number | null;
  conditionNumberBefore: number | null;
  conditionNumber: number | null;
  scales: ScaleAfterCut[];
}

/**
 * The after-cut what-if of an audit.
 * @param audit the audit JSON.
 * @returns the view, or null when the audit has none.
 */
export function afterCutView(audit: AuditJson): AfterCutView | null {
  const after = audit.afterCut;
  if (!after) return null;
  return {
    removed: stringList(after.removed),
    itemsRemoved: after.itemsRemoved,
    minutesSaved: after.minutesSaved,
    secondsPerItem: numberOrNull(after.secondsPerItem),
    maxVifBefore: numberOrNull(after.maxVifBefore),
    maxVif: after.maxVif,
    conditionNumberBefore: numberOrNull(after.conditionNumberBefore),
    conditionNumber: after.conditionNumber,
    scales: after.scales.map((scale) => ({
      id: scale.id,
      itemsBefore: numberOrNull(scale.itemsBefore),
      items: scale.items,
      alphaBefore: numberOrNull(scale.alphaBefore),
      alpha: scale.alpha,
      omegaBefore: numberOrNull(scale.omegaBefore),
      omega: scale.omegaTotal,
      spearmanBrown: numberOrNull(scale.spearmanBrown),
    })),
  };
}
