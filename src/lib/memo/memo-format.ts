/**
 * How the memo writes numbers and dates: fixed decimals, a dash for a value that does not exist,
 * "infinite" where a statistic is infinite by construction (exact dependencies).
 */

/** The sign a reader sees for a value that does not exist. */
export const NO_VALUE = '–';

/**
 * A number with a fixed count of decimals, or a dash.
 * @param value the number, or null/undefined.
 * @param decimals decimals to show.
 * @returns the text.
 */
export function fixed(value: number | null | undefined, decimals = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  const text = value.toFixed(decimals);
  // -0.00 reads as a sign error.
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/**
 * A correlation-like value without its leading zero (".82", "-.31"), as the trade writes them.
 * @param value the value in [-1, 1], or null.
 * @param decimals decimals to show.
 * @returns the text.
 */
export function coefficient(value: number | null | undefined, decimals = 2): string {
  const text = fixed(value, decimals);
  return text.replace(/^(-?)0\./, '$1.');
}

/**
 * A share as a percentage.
 * @param share the share in [0, 1], or null.
 * @param decimals decimals of the percentage.
 * @returns the text, e.g. "4.7%".
 */
export function percent(share: number | null | undefined, decimals = 1): string {
  if (share === null || share === undefined || !Number.isFinite(share)) return NO_VALUE;
  return `${(share * 100).toFixed(decimals)}%`;
}

/**
 * A VIF or condition number: null means infinite when the caller says so.
 * @param value the value, or null.
 * @param nullMeansInfinite whether a null stands for an infinite value (exact dependency).
 * @returns the text.
 */
export function inflation(value: number | null | undefined, nullMeansInfinite: boolean): string {
  if (value === null || value === undefined) return nullMeansInfinite ? 'infinite' : NO_VALUE;
  if (!Number.isFinite(value)) return 'infinite';
  return value >= 1000 ? Math.round(value).toLocaleString('en-GB') : value.toFixed(2);
}

/**
 * A whole count with thousands separators.
 * @param value the count.
 * @returns the text.
 */
export function count(value: number): string {
  return Math.round(value).toLocaleString('en-GB');
}

/**
 * A date and time in plain words, in UTC so every reader sees the same.
 * @param iso an ISO time, or null.
 * @returns e.g. "2 December 2026, 14:05 UTC", or a dash.
 */
export function dateTime(iso: string | null | undefined): string {
  if (!iso) return NO_VALUE;
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return NO_VALUE;
  const day = date.toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
  const time = date.toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit', timeZone: 'UTC' });
  return `${day}, ${time} UTC`;
}

/**
 * A file-name-safe stem: letters, digits and dashes only.
 * @param parts the words to join.
 * @returns the stem, never empty.
 */
export function fileStem(...parts: string[]): string {
  const stem = parts
    .join('-')
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toLowerCase()
    .slice(0, 80);
  return stem || 'memo';
}
