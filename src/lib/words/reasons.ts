/**
 * The one sentence a reader sees for each recommendation (audit-json `reason`), made from the
 * engine's structured reason (`CutReason`, src/lib/engine/recommend-cuts.ts). Pure: the audit
 * JSON, the pages, the workspace and the memo word a reason the same way.
 */
import type { ConstraintName, CutReason, PairReport } from '../engine/recommend-cuts';
import type { PairRule } from '../engine/types';

/** Each rule of the engine as the evidence a sentence names ("shown by ..."). */
export const evidenceWords: Readonly<Record<PairRule, string>> = Object.freeze({
  exact: 'an exact linear dependency',
  'near-dependency': 'a near-dependency among the items (condition index)',
  'strong-pair': 'a strong correlation',
  'local-dependence-mi': "a modification index above its scale's critical value",
  'local-dependence-residual': "a residual correlation above its scale's critical value",
  'local-dependence-wto': 'a large topological overlap in the partial-correlation network',
});

/** "modification index 42.5 (critical 16.0), expected residual correlation 0.86, wTO 0.37". */
function describeLocal(pair: PairReport): string {
  const parts: string[] = [];
  if (pair.mi !== undefined && pair.mi !== null) parts.push(`modification index ${pair.mi.toFixed(1)}${pair.miCritical !== undefined && pair.miCritical !== null ? ` (critical ${pair.miCritical.toFixed(1)})` : ''}`);
  if (pair.sepc !== undefined && pair.sepc !== null) parts.push(`expected residual correlation ${pair.sepc.toFixed(2)}`);
  if (pair.wto !== undefined && pair.wto !== null) parts.push(`wTO ${pair.wto.toFixed(2)}`);
  return parts.join(', ');
}

/** Why a blocked item stays, as a clause after "X stays because ...". */
export const constraintClauses: Readonly<Record<ConstraintName, string>> = Object.freeze({
  locked: 'it is locked',
  'min-items': 'its scale would fall below the minimum number of items',
  'alpha-floor': "a scale's alpha would fall below the floor",
  'max-alpha-drop': "a scale's alpha would drop by more than the allowed amount",
  'cut-cap': 'the cap on the share of items cut is reached',
  facet: 'it is the last item of its content facet',
});

/**
 * "A", "A and B", "A, B and C".
 * @param names the names, in order.
 * @returns the list in words.
 */
export function listOf(names: readonly string[]): string {
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

/** "r = 0.93, 95% interval 0.91 to 0.95, n = 211". */
function describePair(pair: PairReport, confidenceLevel: number): string {
  const percent = Math.round(confidenceLevel * 100);
  return (
    `r = ${pair.r.toFixed(2)}` +
    (pair.lower !== null && pair.upper !== null
      ? `, ${percent}% interval ${pair.lower.toFixed(2)} to ${pair.upper.toFixed(2)}${pair.interval === 'estimator-se' ? " from the polychoric estimate's own standard error" : ''}`
      : '') +
    `, n = ${pair.n}`
  );
}

/**
 * The sentence of one recommendation: the overlap, then the decision (keeper, merges, drops,
 * rewordings, the VIF it lowers), then what stays and why.
 * @param reason the engine's structured reason.
 * @returns one sentence ending in a full stop.
 */
export function reasonSentence(reason: CutReason): string {
  const pair = reason.pair;
  let overlap: string;
  if (pair !== null && reason.code === 'strong-pair') {
    overlap = `${pair.items[0]} and ${pair.items[1]} correlate strongly (${describePair(pair, reason.confidenceLevel)})`;
  } else if (pair !== null && reason.code === 'local-dependence') {
    const local = describeLocal(pair);
    const figures = `${local}${local.length > 0 ? ', ' : ''}${describePair(pair, reason.confidenceLevel)}`;
    overlap =
      reason.items.length === 2
        ? `${pair.items[0]} and ${pair.items[1]} share variance beyond their scale's common factor (${figures})`
        : `${listOf(reason.items)} share variance beyond their scale's common factor (strongest pair ${pair.items[0]}-${pair.items[1]}, ${figures})`;
  } else if (pair !== null) {
    overlap = `${listOf(reason.items)} overlap (strongest pair ${pair.items[0]}-${pair.items[1]}, ${describePair(pair, reason.confidenceLevel)})`;
  } else {
    const index = reason.conditionIndex === null ? 'an exact dependency' : `condition index ${reason.conditionIndex.toFixed(0)}`;
    overlap = `${listOf(reason.items)} are nearly linearly dependent (${index})`;
  }

  if (reason.evidence !== undefined && reason.evidence.length > 0) overlap += `, shown by ${listOf(reason.evidence.map((rule) => evidenceWords[rule]))}`;

  const verbs: string[] = [];
  if (reason.merge.length > 0) verbs.push(`merge ${listOf(reason.merge)} into it`);
  if (reason.drop.length > 0) verbs.push(`drop ${listOf(reason.drop)}`);
  if (reason.reword.length > 0) verbs.push(`reword ${listOf(reason.reword)} so that it asks something ${reason.keep} does not`);

  const blockers = reason.blocked.map((entry) => `${entry.item} stays because ${entry.by.map((constraint) => constraintClauses[constraint]).join(' and ')}`);
  if (verbs.length === 0) {
    return `${overlap}; no change is proposed${blockers.length > 0 ? `: ${blockers.join('; ')}` : ''}.`;
  }
  let decision = `keep ${reason.keep}${reason.keeperLocked ? ' (locked)' : ' (best keeper score)'} and ${listOf(verbs)}`;
  if (reason.vifBefore !== null && reason.vifAfter !== null && reason.vifAfter < reason.vifBefore) {
    decision += `, which lowers the cluster's highest VIF from ${reason.vifBefore.toFixed(1)} to ${reason.vifAfter.toFixed(1)}`;
  }
  return `${overlap}; ${decision}${blockers.length > 0 ? `; ${blockers.join('; ')}` : ''}.`;
}
