/**
 * How pages and islands write dates (British English, month abbreviated), so the same moment
 * reads the same everywhere. Each takes an ISO string (as the API sends it), a timestamp or a Date.
 */

const day = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric' });
const dayAndTime = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });
const recentTime = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' });

/**
 * The day, e.g. "3 Mar 2027".
 * @param value ISO string, timestamp or Date.
 * @returns the day as text.
 */
export function formatDay(value: string | number | Date): string {
  return day.format(new Date(value));
}

/**
 * The day and time, e.g. "3 Mar 2027, 14:05".
 * @param value ISO string, timestamp or Date.
 * @returns the day and time as text.
 */
export function formatDayAndTime(value: string | number | Date): string {
  return dayAndTime.format(new Date(value));
}

/**
 * A recent moment without the year, e.g. "3 Mar, 14:05" (lists of audits and mail).
 * @param value ISO string, timestamp or Date.
 * @returns the day and time as text.
 */
export function formatRecentTime(value: string | number | Date): string {
  return recentTime.format(new Date(value));
}
