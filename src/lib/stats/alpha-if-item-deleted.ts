/**
 * Alpha if an item is deleted: Cronbach's alpha, raw and standardized, of the scale without
 * each item in turn, from the sums of the covariance matrix with that item's row and column
 * taken out (no refitting, O(k²) in all).
 *
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests"
 * (Psychometrika 16:297-334).
 */
import { checkCovarianceMatrix } from './covariance-input';
import { alphaFromVarianceSums, constantItemIndices } from './cronbach-alpha';
import type { NumericalNotice, SquareMatrix } from './types';

/** Alpha of the scale without each item, in the item order of the covariance matrix. */
export interface AlphaIfItemDeletedResult {
  /** Raw alpha without item i; null (with a notice) when fewer than two items remain or the rest has no variance. */
  readonly alpha: readonly (number | null)[];
  /** Standardized alpha without item i; null (with a notice) as above or when a remaining item is constant. */
  readonly alphaStandardized: readonly (number | null)[];
  /** Conditions met: `too-few-items`, `zero-total-variance`, `constant-item`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Raw and standardized alpha of the scale with each item left out in turn.
 * @param covariance Item covariance matrix of the scale (reverse-keyed items already recoded),
 *   symmetric with finite values and a non-negative diagonal. Not modified.
 * @throws {RangeError} when the matrix is empty, not symmetric, not finite, or has a negative
 *   variance.
 * @returns One raw and one standardized alpha per deleted item (null, with a notice, where
 *   undefined; never NaN).
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests".
 */
export function alphaIfItemDeleted(covariance: SquareMatrix): AlphaIfItemDeletedResult {
  checkCovarianceMatrix(covariance, 'alphaIfItemDeleted');
  const k = covariance.order;
  const data = covariance.data;
  const notices: NumericalNotice[] = [];
  if (k < 3) {
    notices.push({
      code: 'too-few-items',
      items: Array.from({ length: k }, (_, i) => i),
      message: `Deleting an item from a scale of ${k} leaves fewer than two items, so alpha if deleted is undefined.`,
    });
    return { alpha: new Array<null>(k).fill(null), alphaStandardized: new Array<null>(k).fill(null), notices };
  }
  const constant = constantItemIndices(covariance);
  const rowSums = new Float64Array(k);
  const correlationRowSums = new Float64Array(k);
  let total = 0;
  let trace = 0;
  let largestVariance = 0;
  let correlationTotal = 0;
  for (let i = 0; i < k; i++) {
    const variance = data[i * k + i];
    trace += variance;
    largestVariance = Math.max(largestVariance, variance);
    for (let j = 0; j < k; j++) {
      rowSums[i] += data[i * k + j];
      if (constant.length === 0) {
        correlationRowSums[i] += i === j ? 1 : data[i * k + j] / Math.sqrt(variance * data[j * k + j]);
      }
    }
    total += rowSums[i];
    correlationTotal += correlationRowSums[i];
  }
  const alpha: (number | null)[] = [];
  const alphaStandardized: (number | null)[] = [];
  const noVariance: number[] = [];
  for (let i = 0; i < k; i++) {
    const variance = data[i * k + i];
    const raw = alphaFromVarianceSums(k - 1, trace - variance, total - 2 * rowSums[i] + variance, largestVariance);
    if (raw === null) noVariance.push(i);
    alpha.push(raw);
    // Standardized: defined only when every remaining item varies.
    const othersConstant = constant.some((c) => c !== i);
    if (othersConstant) {
      alphaStandardized.push(null);
    } else if (constant.length === 1) {
      alphaStandardized.push(standardizedWithout(covariance, i));
    } else {
      alphaStandardized.push(alphaFromVarianceSums(k - 1, k - 1, correlationTotal - 2 * correlationRowSums[i] + 1, k - 1));
    }
  }
  if (noVariance.length > 0) {
    notices.push({
      code: 'zero-total-variance',
      items: noVariance,
      message: 'Without these items the sum score has no positive variance, so alpha if deleted is undefined for them.',
    });
  }
  if (constant.length > 0) {
    notices.push({
      code: 'constant-item',
      items: constant,
      message: 'Standardized alpha if deleted is undefined wherever a constant item remains in the scale.',
    });
  }
  return { alpha, alphaStandardized, notices };
}

/** Standardized alpha of the scale without item `left` (used when `left` is the only constant item). */
function standardizedWithout(covariance: SquareMatrix, left: number): number | null {
  const k = covariance.order;
  const data = covariance.data;
  let sum = 0;
  for (let i = 0; i < k; i++) {
    if (i === left) continue;
    for (let j = 0; j < k; j++) {
      if (j === left) continue;
      sum += i === j ? 1 : data[i * k + j] / Math.sqrt(data[i * k + i] * data[j * k + j]);
    }
  }
  return alphaFromVarianceSums(k - 1, k - 1, sum, k - 1);
}
