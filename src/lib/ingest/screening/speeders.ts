/** Completion times against the median completion time. */
export interface SpeedCheck {
  /** Median of the readable completion times (seconds), or null when there are none. */
  readonly median: number | null;
  /** Completion time below which a respondent is a speeder: `share × median` (seconds), or null. */
  readonly threshold: number | null;
  /** Per respondent: completion time as a share of the median, or null when unreadable. */
  readonly ratio: (number | null)[];
  /** 0-based rows of the speeders. */
  readonly speeders: number[];
}

/**
 * Median of finite values (mean of the two middle values for an even count).
 * @param values numbers, NaN ignored.
 * @returns the median, or null when no value is finite.
 * References: Hyndman & Fan 1996, "Sample quantiles in statistical packages", The American Statistician 50:361-365 (the median as the mean of the two middle order statistics for even n).
 */
export function medianOf(values: ArrayLike<number>): number | null {
  const finite = Array.from(values).filter((value) => Number.isFinite(value)).sort((a, b) => a - b);
  if (finite.length === 0) return null;
  const middle = finite.length >> 1;
  return finite.length % 2 === 1 ? finite[middle] : (finite[middle - 1] + finite[middle]) / 2;
}

/**
 * Flags speeders: respondents whose completion time is below a share of the median
 * completion time (common practice: 1/3 to 1/2 of the median, by house rule).
 * @param durations completion times in seconds, NaN when unreadable (never flagged).
 * @param share the share of the median below which a respondent is flagged, in (0, 1].
 * @throws {RangeError} when the share is not in (0, 1].
 * @returns the median, the threshold, each respondent's ratio to the median, and the speeders.
 * References: none published for the cut-off: common practice, 1/3 to 1/2 of the median by house rule
 *   (Paredown methods.md §6).
 */
export function speedCheck(durations: ArrayLike<number>, share: number): SpeedCheck {
  if (!(share > 0 && share <= 1)) throw new RangeError(`speedCheck: share must be in (0, 1], got ${share}`);
  const median = medianOf(durations);
  const ratio = Array.from(durations, (value) => (median !== null && median > 0 && Number.isFinite(value) ? value / median : null));
  if (median === null || median <= 0) return { median, threshold: null, ratio, speeders: [] };
  const threshold = share * median;
  const speeders: number[] = [];
  for (let i = 0; i < durations.length; i++) if (Number.isFinite(durations[i]) && durations[i] < threshold) speeders.push(i);
  return { median, threshold, ratio, speeders };
}
