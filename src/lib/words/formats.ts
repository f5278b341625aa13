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
  return fixedDecimals(digits).format(value).replace('-', '\u2212');
}

/**
 * One formatter per count of decimals, made once: `toLocaleString` with options builds a new
 * `Intl.NumberFormat` on every call (tens of microseconds each), which made formatting most of
 * the cost of an audit page with its thousands of figures (docs/decisions/023-page-cost.md).
 * The text is the same: `toLocaleString(locale, options)` is defined as that formatter's `format`.
 */
const formatterByDigits = new Map<number, Intl.NumberFormat>();

function fixedDecimals(digits: number): Intl.NumberFormat {
  let formatter = formatterByDigits.get(digits);
  if (!formatter) {
    formatter = new Intl.NumberFormat('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });
    formatterByDigits.set(digits, formatter);
  }
  return formatter;
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

/** Seconds with at most one decimal (made once, as for {@link formatNumber}). */
const upToOneDecimal = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });

/**
 * A duration in words.
 * @param milliseconds the duration.
 * @returns e.g. `0.9 s`, `2 min 5 s`.
 */
export function formatDuration(milliseconds: number | null | undefined): string {
  if (milliseconds === null || milliseconds === undefined || !Number.isFinite(milliseconds)) return '—';
  if (milliseconds < 60_000) return `${upToOneDecimal.format(milliseconds / 1000)} s`;
  const minutes = Math.floor(milliseconds / 60_000);
  return `${minutes} min ${Math.round((milliseconds - minutes * 60_000) / 1000)} s`;
}

/** Sizes are written where the limits live (ingest), so the readers can use it too. */
export { formatMebibytes } from '../ingest/read-limits';
