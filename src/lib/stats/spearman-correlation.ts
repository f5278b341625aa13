/**
 * Spearman's rank correlation: Pearson's correlation of the mid-ranks. Under missing data the
 * ranks are taken over the pair-complete rows only (re-ranked for every pair), as R's
 * `cor(x, y, method = "spearman", use = "pairwise.complete.obs")` does.
 *
 * References: Spearman 1904, "The proof and measurement of association between two things"
 * (American Journal of Psychology 15:72-101); Kendall 1948, "Rank Correlation Methods" (ties).
 */
import { midRanks } from './mid-ranks';
import { checkPairedVectors, pearsonOfPairComplete, type PairCorrelation } from './pearson-correlation';

/**
 * Spearman's rho over the rows where both vectors are observed: those rows are ranked (ties
 * get mid-ranks) and Pearson's r of the two rank vectors is returned.
 * @param x First vector, NaN for missing.
 * @param y Second vector, NaN for missing, same length as x.
 * @throws {RangeError} when the lengths differ or a value is ±Infinity.
 * @returns rho (or null with the reason when undefined) and the number of pair-complete rows.
 * References: Spearman 1904, "The proof and measurement of association between two things".
 */
export function spearmanCorrelation(x: ArrayLike<number>, y: ArrayLike<number>): PairCorrelation {
  checkPairedVectors(x, y, 'spearmanCorrelation');
  const keptX: number[] = [];
  const keptY: number[] = [];
  for (let i = 0; i < x.length; i++) {
    if (Number.isNaN(x[i]) || Number.isNaN(y[i])) continue;
    keptX.push(x[i]);
    keptY.push(y[i]);
  }
  return pearsonOfPairComplete(midRanks(keptX), midRanks(keptY));
}
