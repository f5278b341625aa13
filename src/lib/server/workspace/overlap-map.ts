/**
 * The overlap map's slice of a done audit (contract: src/lib/api/overlap-map.ts): read from the
 * stored audit JSON, with the cluster ordering computed here (average-linkage tree on 1 − |r|).
 * A done audit never changes, so the last few slices are kept in memory.
 */
import type { AuditJson } from '../../audit/audit-json';
import { MAP_DECIMALS, type OverlapMap, type OverlapMapPair } from '../../api/overlap-map';
import { clusterTreeOfCorrelations } from '../../memo/overlap-order';

const CACHE_SIZE = 8;
const cache = new Map<string, OverlapMap>();

function numberOrNull(value: unknown): number | null {
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

function round(value: number): number {
  const factor = 10 ** MAP_DECIMALS;
  return Math.round(value * factor) / factor;
}

/**
 * The map slice of an audit, from cache when it was built before.
 * @param auditId the audit's id (the cache key).
 * @param resultText the stored audit JSON of a done audit.
 * @returns the slice.
 */
export function overlapMapOf(auditId: string, resultText: string): OverlapMap {
  const cached = cache.get(auditId);
  if (cached) return cached;
  const map = buildOverlapMap(auditId, JSON.parse(resultText) as AuditJson);
  cache.set(auditId, map);
  if (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  return map;
}

/**
 * Builds the map slice of an audit JSON.
 * @param auditId the audit's id.
 * @param audit the audit JSON.
 * @returns the slice.
 */
export function buildOverlapMap(auditId: string, audit: AuditJson): OverlapMap {
  const ids = audit.correlation.items;
  const m = ids.length;
  const index = new Map(ids.map((id, i) => [id, i]));
  const positions = new Map(audit.items.map((item, position) => [item.id, { item, position }]));
  const items = ids.map((id) => {
    const found = positions.get(id);
    return {
      id,
      text: typeof found?.item.text === 'string' && found.item.text.trim() !== '' ? found.item.text : null,
      scale: found?.item.scale ?? null,
      position: found?.position ?? Number.MAX_SAFE_INTEGER,
      locked: found?.item.locked === true,
    };
  });

  // Packed upper triangle, rounded; the pair counts packed alike (or one number when all agree).
  const upper: (number | null)[] = [];
  const counts: number[] = [];
  for (let i = 0; i < m; i++) {
    for (let j = i + 1; j < m; j++) {
      const r = numberOrNull(audit.correlation.matrix[i]?.[j]);
      upper.push(r === null ? null : round(r));
      counts.push(numberOrNull(audit.correlation.n?.[i]?.[j]) ?? 0);
    }
  }
  const pairN = counts.length > 0 && counts.every((n) => n === counts[0]) ? counts[0] : counts;

  const tree = clusterTreeOfCorrelations(audit.correlation.matrix);
  const questionnaire = items.map((_, i) => i).sort((a, b) => items[a].position - items[b].position);
  const scaleIds = audit.scales.map((scale) => scale.id);
  for (const item of items) if (item.scale !== null && !scaleIds.includes(item.scale)) scaleIds.push(item.scale);
  const scaleRank = (i: number) => (items[i].scale === null ? scaleIds.length : scaleIds.indexOf(items[i].scale as string));
  const byScale = [...questionnaire].sort((a, b) => scaleRank(a) - scaleRank(b) || items[a].position - items[b].position);
  const scales = scaleIds.map((id) => ({ id, items: byScale.filter((i) => items[i].scale === id) })).filter((scale) => scale.items.length > 0);

  const recommendations = audit.recommendations.map((recommendation, i) => ({
    index: i,
    cluster: recommendation.cluster,
    keep: recommendation.keep,
    actions: recommendation.actions.map((action) => ({ item: action.item, action: action.action, into: action.into ?? null })),
    reason: recommendation.reason,
    stability: numberOrNull(recommendation.stability),
    unstable: recommendation.unstable === true,
  }));
  const sameSet = (a: readonly string[], b: readonly string[]) => a.length === b.length && a.every((id) => b.includes(id));
  const engineClusters = Array.isArray(audit.clusters) ? (audit.clusters as { items?: unknown; maxR?: unknown }[]) : audit.recommendations.map((r) => ({ items: r.cluster, maxR: r.evidence.maxR }));
  const clusters = engineClusters
    .map((cluster) => {
      const members = Array.isArray(cluster.items) ? cluster.items.filter((id): id is string => typeof id === 'string') : [];
      const recommendation = audit.recommendations.findIndex((r) => sameSet(r.cluster, members));
      return { items: members.map((id) => index.get(id)).filter((i): i is number => i !== undefined), maxR: numberOrNull(cluster.maxR), recommendation: recommendation >= 0 ? recommendation : null };
    })
    .filter((cluster) => cluster.items.length > 1);

  const { pairs, localDependence } = pairEvidence(audit, index);
  return {
    auditId,
    method: audit.correlation.method,
    missing: audit.correlation.missing,
    respondentsUsed: audit.input.respondentsUsed,
    items,
    scales,
    upper,
    pairN,
    orders: { cluster: [...tree.order], scale: byScale, questionnaire },
    clusterHeights: tree.height.map(round),
    clusters,
    pairs,
    localDependence,
    recommendations,
    strongPairThreshold: numberOrNull(audit.settings.strongPairThreshold),
    confidenceLevel: numberOrNull(audit.settings.confidenceLevel) ?? 0.95,
  };
}

/**
 * The pair evidence: the audit's top-level `pairs` when the engine wrote them (local dependence
 * included), else the strong pairs of its clusters and recommendations.
 */
function pairEvidence(audit: AuditJson, index: Map<string, number>): { pairs: OverlapMapPair[]; localDependence: boolean } {
  const top = Array.isArray(audit.pairs) ? (audit.pairs as Record<string, unknown>[]) : null;
  const sources: Record<string, unknown>[] = top ? [...top] : [];
  if (!top) {
    const lists = [
      ...(Array.isArray(audit.clusters) ? (audit.clusters as Record<string, unknown>[]).map((c) => c.strongPairs) : []),
      ...audit.recommendations.map((r) => r.evidence.pairs ?? r.evidence.strongPairs),
    ];
    for (const list of lists) if (Array.isArray(list)) sources.push(...(list as Record<string, unknown>[]));
  }
  const seen = new Map<string, OverlapMapPair>();
  for (const source of sources) {
    const names = Array.isArray(source.items) ? source.items : [];
    const a = index.get(names[0] as string);
    const b = index.get(names[1] as string);
    const r = numberOrNull(source.r);
    if (a === undefined || b === undefined || r === null) continue;
    const key = a < b ? `${a}:${b}` : `${b}:${a}`;
    const previous = seen.get(key);
    const pair: OverlapMapPair = {
      a: Math.min(a, b),
      b: Math.max(a, b),
      r,
      lower: numberOrNull(source.lower),
      upper: numberOrNull(source.upper),
      n: numberOrNull(source.n),
      residual: numberOrNull(source.residual),
      residualCritical: numberOrNull(source.residualCritical),
      mi: numberOrNull(source.mi),
      miCritical: numberOrNull(source.miCritical),
      sepc: numberOrNull(source.sepc),
      wto: numberOrNull(source.wto),
      partial: numberOrNull(source.partial),
      wording: numberOrNull(source.wording),
      rules: Array.isArray(source.rules) ? source.rules.filter((rule): rule is string => typeof rule === 'string') : [],
    };
    // Keep whichever copy says more.
    if (!previous || Object.values(pair).filter((v) => v !== null).length > Object.values(previous).filter((v) => v !== null).length) seen.set(key, pair);
  }
  const pairs = [...seen.values()];
  return { pairs, localDependence: pairs.some((pair) => pair.residual !== null || pair.wto !== null || pair.partial !== null) };
}
