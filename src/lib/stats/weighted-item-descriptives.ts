/**
 * Per-item descriptives of a bootstrap resample without building it: a resample that draws
 * respondent i w_i times has the descriptives of the original rows with weights, so one pass over
 * the distinct rows drawn (about 63% of n) gives what `itemDescriptives` gives on the resampled
 * matrix. With integer weights the counts are exact integers, so the answers, missing answers,
 * missing rate, smallest and largest answers, floor and ceiling shares and answers out of range
 * are those of `itemDescriptives` bit for bit; the mean and standard deviation come from sums
 * shifted by the item's first answer (one pass instead of two), equal up to rounding
 * (tests/unit/weighted-item-descriptives.test.ts). The bootstrap's decisions read only the exact
 * figures (the answers, missing rate, floor and ceiling shares, and whether an item varies).
 *
 * References: Efron & Tibshirani 1993, "An Introduction to the Bootstrap", ch. 6 (the resample as
 * weights on the observed rows); Terwee et al. 2007 (floor and ceiling); Chan, Golub & LeVeque
 * 1983 (shifted sums).
 */
import { checkItemMatrix, refuseInfiniteAnswer } from './item-matrix-input';
import { checkItemRanges, itemDescriptiveOf, type ItemDescriptive, type ItemDescriptivesOptions } from './item-descriptives';
import { distinctDraws, type ItemMatrix } from './types';

/**
 * Per-item descriptives of the resample that draws row i of `matrix` `weights[i]` times.
 * @param matrix The original respondents × items (column-major, NaN for missing); not modified.
 * @param weights How often each respondent is drawn (non-negative integers), one per row.
 * @param options `ranges`: a valid range per item, or null for an item without one (as
 *   `itemDescriptives`).
 * @throws {RangeError} when the shape is inconsistent, the weights do not match the rows or are
 *   not non-negative integers, a drawn answer is ±Infinity (named by its row in `matrix`),
 *   `ranges` does not have one entry per item, or a range is not finite with min < max.
 * @returns One entry per item, in item order, as `itemDescriptives` returns it for the resample
 *   (mean and standard deviation up to rounding, the rest exactly). Never NaN.
 * References: Efron & Tibshirani 1993, ch. 6; Terwee et al. 2007, "Quality criteria were proposed
 * for measurement properties of health status questionnaires".
 */
export function weightedItemDescriptives(matrix: ItemMatrix, weights: Float64Array, options: ItemDescriptivesOptions = {}): ItemDescriptive[] {
  const caller = 'weightedItemDescriptives';
  checkItemMatrix(matrix, caller, false);
  const { rows, columns, data } = matrix;
  if (!(weights instanceof Float64Array) || weights.length !== rows) throw new RangeError(`${caller}: ${weights?.length} weights for ${rows} rows`);
  const ranges = options.ranges;
  checkItemRanges(ranges, columns, caller);
  for (let i = 0; i < rows; i++) {
    const weight = weights[i];
    if (!(Number.isInteger(weight) && weight >= 0)) throw new RangeError(`${caller}: the weight of row ${i} must be a non-negative integer, got ${weight}`);
  }
  const { drawn, w, total } = distinctDraws(weights);
  const distinct = drawn.length;
  const result: ItemDescriptive[] = [];
  for (let j = 0; j < columns; j++) {
    const offset = j * rows;
    const range = ranges?.[j] ?? null;
    // Without a range nothing is out of it: the bounds that no answer passes.
    const low = range === null ? -Infinity : range.min;
    const high = range === null ? Infinity : range.max;
    // Sums of the answers less the first one (shifted sums: the variance without cancellation
    // when the answers lie far from 0).
    let shift = NaN;
    for (let t = 0; t < distinct && shift !== shift; t++) shift = data[offset + drawn[t]];
    let n = 0;
    let sum = 0;
    let sumOfSquares = 0;
    let minimum = Infinity;
    let maximum = -Infinity;
    let atMinimum = 0;
    let atMaximum = 0;
    let atLow = 0;
    let atHigh = 0;
    let outOfRange = 0;
    for (let t = 0; t < distinct; t++) {
      const value = data[offset + drawn[t]];
      if (value !== value) continue;
      const weight = w[t];
      const deviation = value - shift;
      n += weight;
      sum += weight * deviation;
      sumOfSquares += weight * deviation * deviation;
      if (value < minimum) {
        minimum = value;
        atMinimum = 0;
      }
      if (value > maximum) {
        maximum = value;
        atMaximum = 0;
      }
      // Weighted counts are sums of integers, exact in any order: the shares below are the
      // unweighted ones of the resample, bit for bit. (Multiplied rather than branched on: on
      // rating answers a branch per category mispredicts.)
      atMinimum += weight * (((value === minimum) as unknown as number) | 0);
      atMaximum += weight * (((value === maximum) as unknown as number) | 0);
      atLow += weight * (((value === low) as unknown as number) | 0);
      atHigh += weight * (((value === high) as unknown as number) | 0);
      outOfRange += weight * ((((value < low) as unknown as number) | ((value > high) as unknown as number)) | 0);
    }
    // An infinite answer makes the sums infinite or NaN: only then is the item searched for it.
    if (sumOfSquares - sumOfSquares !== 0) refuseInfiniteAnswer(data.subarray(offset, offset + rows), j, caller, drawn);
    const missing = total - n;
    const missingRate = total === 0 ? 0 : missing / total;
    const squares = n === 0 ? 0 : Math.max(0, sumOfSquares - (sum * sum) / n);
    result.push(
      itemDescriptiveOf({
        n, missing, missingRate, range, mean: n === 0 ? 0 : shift + sum / n, squares, minimum, maximum,
        atFloor: range === null ? atMinimum : atLow, atCeiling: range === null ? atMaximum : atHigh, outOfRange,
      }),
    );
  }
  return result;
}
