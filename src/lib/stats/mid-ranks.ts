/**
 * Mid-ranks: ranks 1..n of the observed values, with tied values sharing the mean of the ranks
 * they occupy (so a tie of the 2nd and 3rd smallest both get 2.5). Missing values (NaN) keep
 * NaN and take no rank, as R's `rank(x, na.last = "keep")` does.
 *
 * References: Kendall 1948, "Rank Correlation Methods" (mid-ranks for ties); Spearman 1904,
 * "The proof and measurement of association between two things".
 */

/**
 * Mid-ranks of the observed values of a vector.
 * @param values Values, NaN for missing; ±Infinity rank as the extremes.
 * @returns A new array of the same length: the mid-rank of each observed value (1 = smallest),
 *   NaN where the value is missing. The input is not modified.
 * References: Kendall 1948, "Rank Correlation Methods".
 */
export function midRanks(values: ArrayLike<number>): Float64Array {
  const length = values.length;
  const ranks = new Float64Array(length).fill(NaN);
  const order: number[] = [];
  for (let i = 0; i < length; i++) if (!Number.isNaN(values[i])) order.push(i);
  order.sort((a, b) => values[a] - values[b] || a - b);
  assignMidRanks(order, order.length, values, ranks);
  return ranks;
}

/**
 * Writes mid-ranks into `ranks` for the positions listed in `sortedPositions` (already in
 * ascending order of their values): tied runs share the mean of their ranks.
 * @param sortedPositions Positions of the values to rank, sorted by value.
 * @param count How many of `sortedPositions` to use (the first `count`).
 * @param values The values.
 * @param ranks Output; only the listed positions are written.
 * References: Kendall 1948, "Rank Correlation Methods".
 */
export function assignMidRanks(sortedPositions: ArrayLike<number>, count: number, values: ArrayLike<number>, ranks: Float64Array): void {
  let start = 0;
  while (start < count) {
    const value = values[sortedPositions[start]];
    let end = start + 1;
    while (end < count && values[sortedPositions[end]] === value) end++;
    // Ranks start + 1 .. end share their mean.
    const shared = (start + 1 + end) / 2;
    for (let t = start; t < end; t++) ranks[sortedPositions[t]] = shared;
    start = end;
  }
}
