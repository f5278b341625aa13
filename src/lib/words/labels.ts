/**
 * Labels a reader sees for the audit's states and choices: status and stage words, methods,
 * missing-data policies, constraints and actions, and the one-line summary of an audit's
 * settings. Pure; shared by the islands, the pages and (later) the workspace and the memo.
 * The labels of the settings themselves live in their descriptors (src/lib/audit/settings-table.ts).
 */
import { formatNumber, formatShare } from './formats';

/** What each audit status is called on screen. */
export const statusWords: Record<string, string> = { queued: 'Waiting', running: 'Running', done: 'Done', failed: 'Failed', cancelled: 'Cancelled' };

/** The button that cancels a queued or running audit, its words while the request is on its way, and the line of a cancelled audit with no stored reason. */
export const cancelAuditWords = { button: 'Cancel audit', pending: 'Cancelling…', cancelled: 'The audit was cancelled.' } as const;

/**
 * The reason stored on an audit someone cancelled.
 * @param name who cancelled it.
 * @returns e.g. "Cancelled by Dana Designer before it finished; retry it to run it again."
 */
export function auditCancelledReason(name: string): string {
  return `Cancelled by ${name.trim() || 'a team member'} before it finished; retry it to run it again.`;
}

/**
 * The reason stored on an audit stopped at the server's time limit per audit (AUDIT_MAX_SECONDS).
 * @param maxRunMs the limit in milliseconds.
 * @returns one sentence saying what happened and what to do.
 */
export function auditTimeLimitReason(maxRunMs: number): string {
  const seconds = Math.round(maxRunMs / 1000);
  return `The audit ran longer than this server's limit of ${seconds.toLocaleString('en-GB')} second${seconds === 1 ? '' : 's'} per audit and was stopped; run it again with fewer bootstrap resamples (or ask whoever runs Paredown to raise AUDIT_MAX_SECONDS).`;
}

/** What each stage of a running audit is called on screen. */
export const stageWords: Record<string, string> = {
  loading: 'Reading the stored wave',
  evidence: 'Correlations, VIF and condition indices',
  structure: "KMO, Bartlett's test and parallel analysis",
  engine: 'Overlap clusters, cut list and bootstrap stability',
  outcome: 'Outcome model',
  saving: 'Saving the result',
};

/** Correlation methods as shown. */
export const methodWords: Record<string, string> = { pearson: 'Pearson', spearman: 'Spearman', polychoric: 'Polychoric' };

/** Why each correlation method suits the items, in one sentence (the memo's settings section). */
export const methodRationale: Record<string, string> = {
  pearson: 'Pearson correlations treat the answers as interval scores; with five or more ordered categories and no strong skew they agree closely with the alternatives and keep every statistic comparable with a later driver model.',
  spearman: 'Spearman correlations use only the order of the answers (mid-ranks), which suits skewed rating items whose categories need not be equally spaced.',
  polychoric: 'Polychoric correlations estimate how the continuous attitudes behind two ordinal items correlate, which suits items with few categories or skewed answers; they assume a normal trait behind each item.',
};

/** Missing-data policies as shown. */
export const missingWords: Record<string, string> = { pairwise: 'pairwise deletion', listwise: 'listwise deletion' };

/** Constraints that can block a cut, as shown in a list (the reason's clauses are in reasons.ts). */
export const constraintWords: Record<string, string> = {
  locked: 'the item is locked',
  'min-items': 'its scale would fall below the minimum number of items',
  'alpha-floor': "its scale's alpha would fall below the floor",
  'max-alpha-drop': "its scale's alpha would drop by more than allowed",
  'cut-cap': 'the cap on the share of items cut is reached',
  facet: 'it is the last item of its content facet, which would go unasked',
};

/** Actions as shown. */
export const actionWords: Record<string, string> = { drop: 'Drop', merge: 'Merge', reword: 'Reword', keep: 'Keep', undecided: 'Undecided' };

/**
 * A recommendation in one line: what to keep, then what to do with each other item, e.g.
 * "Keep dig_4 · drop dig_1 · merge dig_7 into dig_4".
 * @param keep the item kept.
 * @param actions every item's action (`keep` actions are left out).
 * @returns the line.
 */
export function proposedCutLine(keep: string, actions: readonly { item: string; action: string; into: string | null }[]): string {
  const changed = actions.filter((action) => action.action !== 'keep');
  return [`Keep ${keep}`, ...changed.map((action) => (action.action === 'merge' ? `merge ${action.item} into ${action.into ?? keep}` : `${actionWords[action.action]?.toLowerCase() ?? action.action} ${action.item}`))].join(' · ');
}

const EARLY_CUT_LIST_HEADING = 'Proposed cuts so far';

/** The early cut list shown while an audit's bootstrap runs (EarlyCutList.tsx, and the command line). */
export const earlyCutListWords = {
  heading: EARLY_CUT_LIST_HEADING,
  reasonsLink: 'Their reasons, on the audit’s page',
  /** The command line's heading above the lines, on standard error. */
  commandLineHeading: (resamples: number) => `${EARLY_CUT_LIST_HEADING} (stability still being checked on ${resamples} resamples):`,
  note: (resamples: number) =>
    `Made before the bootstrap: how often ${formatNumber(resamples, 0)} resamples repeat each line is still being checked, and a line that flips is marked unstable in the finished audit. Read these, but decide once the audit is done.`,
};

/** The settings line of an audit, e.g. "Pearson, pairwise deletion · 200 resamples (seed 1)". */
export function settingsLine(settings: { method: string; missing: string; bootstrap: number; seed: number; outcome?: string | null }): string {
  const parts = [`${methodWords[settings.method] ?? settings.method}, ${missingWords[settings.missing] ?? settings.missing}`];
  parts.push(settings.bootstrap > 0 ? `${settings.bootstrap} bootstrap resamples (seed ${settings.seed})` : 'no bootstrap');
  if (settings.outcome) parts.push(`outcome ${settings.outcome}`);
  return parts.join(' · ');
}

/**
 * The locks and constraints an audit ran under, in one line, e.g.
 * "Locked: coll_1, dig_4 · at least 3 items per scale · alpha at least 0.70 · at most 25% cut".
 * @param settings the audit's resolved settings (older audits may lack some keys).
 * @returns the line.
 */
export function constraintsLine(settings: { locked?: readonly string[]; minItemsPerScale?: number; alphaFloor?: number; maxAlphaDrop?: number; maxCutShare?: number }): string {
  const locked = settings.locked ?? [];
  const parts = [locked.length === 0 ? 'No locked items' : `Locked: ${locked.length > 4 ? `${locked.slice(0, 4).join(', ')} and ${locked.length - 4} more` : locked.join(', ')}`];
  if (typeof settings.minItemsPerScale === 'number') parts.push(`at least ${settings.minItemsPerScale} items per scale`);
  if (typeof settings.alphaFloor === 'number') parts.push(`alpha at least ${formatNumber(settings.alphaFloor, 2)}`);
  if (typeof settings.maxAlphaDrop === 'number') parts.push(`alpha drop at most ${formatNumber(settings.maxAlphaDrop, 2)}`);
  if (typeof settings.maxCutShare === 'number') parts.push(`at most ${formatShare(settings.maxCutShare)} cut`);
  return parts.join(' · ');
}

/**
 * Which reliability figure follows the chosen correlation method and which stays on the raw
 * scores, said wherever alpha and omega stand side by side (issue 14).
 * @param method the audit's correlation method, or null where the page does not know it.
 * @returns one sentence.
 */
export function reliabilityBasisNote(method: string | null): string {
  const matrix = method ? `the ${methodWords[method] ?? method} correlation matrix` : "the audit's correlation matrix";
  return `Alpha stays on the raw scores (item covariances) whatever the method; omega total follows the chosen method: model-implied, from one-factor minres loadings on ${matrix} (not psych::omega's observed-variance version).`;
}
