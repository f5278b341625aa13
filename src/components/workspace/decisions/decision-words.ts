/**
 * Small pure helpers of the decisions workspace: how a decision, a stability and a what-if
 * figure read, and which constraints the current what-if breaks.
 */
import type { CutListConstraints, CutListItem, DecisionKind, WhatIfResponse } from '../../../lib/api/cut-list';
import { formatNumber, formatShare } from '../../../lib/words';

/** A decision in words, e.g. "Merge into coll_2". */
export function decisionPhrase(decision: DecisionKind, into: string | null): string {
  switch (decision) {
    case 'keep':
      return 'Keep';
    case 'drop':
      return 'Drop';
    case 'merge':
      return into ? `Merge into ${into}` : 'Merge';
    case 'reword':
      return 'Reword';
    default:
      return 'Undecided';
  }
}

/** A stability in words: "stable, 93% of resamples", "unstable, 48%", or unknown. */
export function stabilityPhrase(stability: number | null, unstable: boolean): string {
  if (stability === null) return 'stability unknown';
  return `${unstable ? 'unstable' : 'stable'}, ${formatShare(stability)} of resamples`;
}

/** A "before → after" pair of figures. */
export function beforeAfter(before: number | null, after: number | null, digits: number, infiniteBefore = false, infiniteAfter = false): string {
  return `${before === null && infiniteBefore ? '∞' : formatNumber(before, digits)} → ${after === null && infiniteAfter ? '∞' : formatNumber(after, digits)}`;
}

/** Minutes saved in words. */
export function minutesWords(minutes: number): string {
  return minutes < 1 ? `${Math.round(minutes * 60)} s` : `${formatNumber(minutes, 1)} min`;
}

/** One constraint the current decisions break, in a sentence. */
export interface Breach {
  scale: string;
  message: string;
}

/**
 * The study's constraints the what-if breaks (a scale below its minimum items or its alpha floor).
 * @param whatIf the current what-if.
 * @param constraints the study's constraints.
 * @returns one sentence per breach.
 */
export function constraintBreaches(whatIf: WhatIfResponse | null, constraints: CutListConstraints): Breach[] {
  if (!whatIf) return [];
  const breaches: Breach[] = [];
  for (const scale of whatIf.scales) {
    if (constraints.minItemsPerScale !== null && scale.items < constraints.minItemsPerScale && scale.items < scale.itemsBefore) {
      breaches.push({ scale: scale.id, message: `${scale.id} would keep ${scale.items} ${scale.items === 1 ? 'item' : 'items'}, fewer than the study’s minimum of ${constraints.minItemsPerScale}.` });
    }
    if (constraints.alphaFloor !== null && scale.alpha !== null && scale.alpha < constraints.alphaFloor && scale.items < scale.itemsBefore) {
      breaches.push({ scale: scale.id, message: `${scale.id}’s alpha would fall to ${formatNumber(scale.alpha, 2)}, below the study’s floor of ${formatNumber(constraints.alphaFloor, 2)}.` });
    }
  }
  // A cut that empties a content facet (the codebook's facet column) is a constraint too.
  for (const warning of whatIf.warnings) if (warning.code === 'facet-emptied') breaches.push({ scale: warning.items.join(', '), message: warning.message });
  return breaches;
}

/** The items another item could merge into: in the study, not itself, not removed. */
export function mergeTargets(items: readonly CutListItem[], itemId: string): CutListItem[] {
  return items.filter((item) => item.inAudit && item.id !== itemId && item.decision !== 'drop' && item.decision !== 'merge');
}
