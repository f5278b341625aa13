/**
 * The item table's rows, read from the audit JSON: every per-item statistic (audit-json.md,
 * `items`), the keeper score of items in an overlap cluster, and each item's strongest partner
 * with the wording similarity the audit measured for it. Pure; keys the schema only adds are
 * read defensively.
 */
import type { AuditJson } from '../../lib/audit/audit-json';

/** One row of the item table. */
export interface ItemRow {
  id: string;
  scale: string | null;
  text: string | null;
  locked: boolean;
  inMatrix: boolean;
  n: number;
  mean: number | null;
  sd: number | null;
  missingRate: number;
  floor: number | null;
  ceiling: number | null;
  vif: number | null;
  tolerance: number | null;
  msa: number | null;
  itemRest: number | null;
  alphaIfDeleted: number | null;
  keeperScore: number | null;
  partner: string | null;
  partnerR: number | null;
  /** Wording similarity with the strongest partner, or with the pair partner the audit compared, when measured. */
  wording: number | null;
  /** Proposed action (drop, merge, reword) or keep when in a recommendation, else null. */
  proposal: string | null;
}

function numberOrNull(value: unknown): number | null {
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

/**
 * The rows of the item table.
 * @param audit the audit JSON.
 * @returns one row per item, in questionnaire order.
 */
export function itemRows(audit: AuditJson): ItemRow[] {
  const keeper = new Map<string, number>();
  const proposal = new Map<string, string>();
  const wording = new Map<string, Map<string, number>>();
  const noteWording = (a: string, b: string, value: number | null) => {
    if (value === null) return;
    for (const [x, y] of [[a, b], [b, a]]) {
      if (!wording.has(x)) wording.set(x, new Map());
      wording.get(x)!.set(y, value);
    }
  };
  for (const recommendation of audit.recommendations) {
    const scores = Array.isArray(recommendation.evidence.keeperScores) ? (recommendation.evidence.keeperScores as Record<string, unknown>[]) : [];
    for (const score of scores) if (typeof score.item === 'string' && numberOrNull(score.score) !== null) keeper.set(score.item, score.score as number);
    proposal.set(recommendation.keep, 'keep');
    for (const action of recommendation.actions) {
      proposal.set(action.item, action.into ? `${action.action} into ${action.into}` : action.action);
      noteWording(action.item, recommendation.keep, numberOrNull(action.wordingWithKeeper));
    }
  }
  const pairLists: unknown[] = [audit.pairs, ...(Array.isArray(audit.clusters) ? (audit.clusters as Record<string, unknown>[]).map((c) => c.strongPairs) : [])];
  for (const list of pairLists) {
    if (!Array.isArray(list)) continue;
    for (const pair of list as Record<string, unknown>[]) {
      const names = Array.isArray(pair.items) ? pair.items : [];
      if (typeof names[0] === 'string' && typeof names[1] === 'string') noteWording(names[0], names[1], numberOrNull(pair.wording));
    }
  }
  return audit.items.map((item) => {
    const partner = item.topPartner?.id ?? null;
    const known = wording.get(item.id);
    const partnerWording = partner !== null ? known?.get(partner) ?? null : null;
    return {
      id: item.id,
      scale: item.scale,
      text: typeof item.text === 'string' ? item.text : null,
      locked: item.locked === true,
      inMatrix: item.inMatrix !== false,
      n: item.n,
      mean: numberOrNull(item.mean),
      sd: numberOrNull(item.sd),
      missingRate: item.missingRate,
      floor: numberOrNull(item.floor),
      ceiling: numberOrNull(item.ceiling),
      vif: numberOrNull(item.vif),
      tolerance: numberOrNull(item.tolerance),
      msa: numberOrNull(item.msa),
      itemRest: numberOrNull(item.itemRest),
      alphaIfDeleted: numberOrNull(item.alphaIfDeleted),
      keeperScore: keeper.get(item.id) ?? null,
      partner,
      partnerR: numberOrNull(item.topPartner?.r),
      wording: partnerWording ?? (known && known.size > 0 ? Math.max(...known.values()) : null),
      proposal: proposal.get(item.id) ?? null,
    };
  });
}
