/**
 * Number formats a reader sees (en-GB, minus sign U+2212, a dash for a value that does not
 * exist). Pure; shared by the islands and the pages.
 */

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

/** Sizes are written where the limits live (ingest), so the readers can use it too. */
export { formatMebibytes } from '../ingest/read-limits';
