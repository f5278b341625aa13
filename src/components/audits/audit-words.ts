/**
 * Words and number formats the audit islands and the audit page share (pure; safe in islands).
 */

/** What each audit status is called on screen. */
export const statusWords: Record<string, string> = { queued: 'Waiting', running: 'Running', done: 'Done', failed: 'Failed' };

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

/** Missing-data policies as shown. */
export const missingWords: Record<string, string> = { pairwise: 'pairwise deletion', listwise: 'listwise deletion' };

/** Constraints that can block a cut, as shown. */
export const constraintWords: Record<string, string> = {
  locked: 'the item is locked',
  'min-items': 'its scale would fall below the minimum number of items',
  'alpha-floor': "its scale's alpha would fall below the floor",
  'max-alpha-drop': "its scale's alpha would drop by more than allowed",
  'cut-cap': 'the cap on the share of items cut is reached',
};

/** Actions as shown. */
export const actionWords: Record<string, string> = { drop: 'Drop', merge: 'Merge', reword: 'Reword', keep: 'Keep' };

/**
 * A number with a fixed count of decimals, or a dash for a value that does not exist.
 * @param value the number or null.
 * @param digits decimals (2 by default).
 * @returns the text (en-GB, minus sign as U+2212).
 */
export function formatNumber(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return value.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits }).replace('-', '\u2212');
}

/**
 * A share as a whole percentage.
 * @param value 0 to 1, or null.
 * @returns e.g. `94%`, or a dash.
 */
export function formatShare(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return `${Math.round(value * 100)}%`;
}

/**
 * A duration in words.
 * @param milliseconds the duration.
 * @returns e.g. `0.9 s`, `2 min 5 s`.
 */
export function formatDuration(milliseconds: number | null | undefined): string {
  if (milliseconds === null || milliseconds === undefined || !Number.isFinite(milliseconds)) return '—';
  if (milliseconds < 60_000) return `${(milliseconds / 1000).toLocaleString('en-GB', { maximumFractionDigits: 1 })} s`;
  const minutes = Math.floor(milliseconds / 60_000);
  return `${minutes} min ${Math.round((milliseconds - minutes * 60_000) / 1000)} s`;
}

/** The settings line of an audit, e.g. "Pearson, pairwise deletion · 200 resamples (seed 1)". */
export function settingsLine(settings: { method: string; missing: string; bootstrap: number; seed: number; outcome?: string | null }): string {
  const parts = [`${methodWords[settings.method] ?? settings.method}, ${missingWords[settings.missing] ?? settings.missing}`];
  parts.push(settings.bootstrap > 0 ? `${settings.bootstrap} bootstrap resamples (seed ${settings.seed})` : 'no bootstrap');
  if (settings.outcome) parts.push(`outcome ${settings.outcome}`);
  return parts.join(' · ');
}
