/**
 * Cronbach's coefficient alpha of a scale, raw (from the item covariances) and standardized
 * (from the correlations the covariances imply).
 *
 * raw alpha = k/(k − 1) · (1 − Σ var_i / var_total), var_total = Σ_ij C_ij;
 * standardized alpha = k r̄ / (1 + (k − 1) r̄), r̄ the mean off-diagonal correlation.
 *
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests"
 * (Psychometrika 16:297-334); Guttman 1945, "A basis for analyzing test-retest reliability"
 * (Psychometrika 10:255-282, lambda-3).
 */
import { checkCovarianceMatrix } from './covariance-input';
import { ZERO_VARIANCE_RELATIVE_TOLERANCE } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Alpha of one scale. `null` values come with a notice saying why; alpha itself may be negative. */
export interface CronbachAlphaResult {
  /** Number of items k. */
  readonly items: number;
  /** Raw alpha from the covariances; null for one item or a total variance that is not positive. */
  readonly alpha: number | null;
  /** Standardized alpha; null for one item, a constant item, or a non-positive sum of correlations. */
  readonly alphaStandardized: number | null;
  /** Mean off-diagonal correlation r̄ implied by the covariances; null with alphaStandardized. */
  readonly averageCorrelation: number | null;
  /** Variance of the sum score, Σ_ij C_ij. */
  readonly totalVariance: number;
  /** Conditions met: `too-few-items`, `zero-total-variance`, `constant-item`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Alpha from its three ingredients: k/(k − 1) · (1 − sumOfItemVariances / totalVariance).
 * @param itemCount k, the number of items (at least 2 for a value).
 * @param sumOfItemVariances Σ var_i (for standardized alpha: k).
 * @param totalVariance Variance of the sum score Σ_ij C_ij (for standardized alpha: Σ_ij r_ij).
 * @param scale Largest variance involved, the yardstick for "zero" total variance.
 * @throws {RangeError} when an argument is not finite or k is not a positive integer.
 * @returns Alpha, or null when k < 2 or the total variance is not positive (relative to `scale`).
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests".
 */
export function alphaFromVarianceSums(
  itemCount: number,
  sumOfItemVariances: number,
  totalVariance: number,
  scale: number,
): number | null {
  if (!Number.isInteger(itemCount) || itemCount < 1) {
    throw new RangeError(`alphaFromVarianceSums: itemCount must be a positive integer, got ${itemCount}`);
  }
  if (![sumOfItemVariances, totalVariance, scale].every(Number.isFinite)) {
    throw new RangeError('alphaFromVarianceSums: variances must be finite numbers');
  }
  if (itemCount < 2) return null;
  if (!(totalVariance > ZERO_VARIANCE_RELATIVE_TOLERANCE * Math.abs(scale))) return null;
  return (itemCount / (itemCount - 1)) * (1 - sumOfItemVariances / totalVariance);
}

/**
 * Indices of items whose variance is zero relative to the largest variance of the matrix
 * (at or below ZERO_VARIANCE_RELATIVE_TOLERANCE times it). The matrix is assumed checked.
 * @param covariance Item covariance matrix; not modified.
 * @returns 0-based indices of the constant items (empty when none; every item when all
 *   variances are zero).
 * References: none (a numerical condition, not a published method).
 */
export function constantItemIndices(covariance: SquareMatrix): number[] {
  const k = covariance.order;
  let largest = 0;
  for (let i = 0; i < k; i++) largest = Math.max(largest, covariance.data[i * k + i]);
  const constant: number[] = [];
  for (let i = 0; i < k; i++) {
    if (!(covariance.data[i * k + i] > ZERO_VARIANCE_RELATIVE_TOLERANCE * largest)) constant.push(i);
  }
  return constant;
}

/**
 * Cronbach's alpha, raw and standardized, of the items of one scale.
 * @param covariance Item covariance matrix of the scale (reverse-keyed items already recoded),
 *   symmetric with finite values and a non-negative diagonal; pairwise or listwise. Not modified.
 * @throws {RangeError} when the matrix is empty, not symmetric, not finite, or has a negative
 *   variance.
 * @returns Raw and standardized alpha, r̄ and the total variance, with notices for every value
 *   that could not be computed (never NaN).
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests",
 * Psychometrika 16:297-334.
 */
export function cronbachAlpha(covariance: SquareMatrix): CronbachAlphaResult {
  checkCovarianceMatrix(covariance, 'cronbachAlpha');
  const k = covariance.order;
  const data = covariance.data;
  const notices: NumericalNotice[] = [];
  let sumOfItemVariances = 0;
  let totalVariance = 0;
  let largestVariance = 0;
  for (let i = 0; i < k; i++) {
    sumOfItemVariances += data[i * k + i];
    largestVariance = Math.max(largestVariance, data[i * k + i]);
    for (let j = 0; j < k; j++) totalVariance += data[i * k + j];
  }
  if (k < 2) {
    notices.push({ code: 'too-few-items', items: [0], message: 'Alpha needs at least two items; this scale has one.' });
    return { items: k, alpha: null, alphaStandardized: null, averageCorrelation: null, totalVariance, notices };
  }
  const alpha = alphaFromVarianceSums(k, sumOfItemVariances, totalVariance, largestVariance);
  if (alpha === null) {
    notices.push({
      code: 'zero-total-variance',
      items: range(k),
      message: `The sum score of the scale has no positive variance (${totalVariance}), so alpha is undefined.`,
    });
  }
  const constant = constantItemIndices(covariance);
  if (constant.length > 0) {
    notices.push({
      code: 'constant-item',
      items: constant,
      message: 'Constant items have no correlations, so standardized alpha is undefined.',
    });
    return { items: k, alpha, alphaStandardized: null, averageCorrelation: null, totalVariance, notices };
  }
  let sumOfCorrelations = 0;
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      sumOfCorrelations += i === j ? 1 : data[i * k + j] / Math.sqrt(data[i * k + i] * data[j * k + j]);
    }
  }
  const alphaStandardized = alphaFromVarianceSums(k, k, sumOfCorrelations, k);
  if (alphaStandardized === null) {
    notices.push({
      code: 'zero-total-variance',
      items: range(k),
      message: `The implied correlations sum to ${sumOfCorrelations}, not a positive total, so standardized alpha is undefined.`,
    });
    return { items: k, alpha, alphaStandardized: null, averageCorrelation: null, totalVariance, notices };
  }
  const averageCorrelation = (sumOfCorrelations - k) / (k * (k - 1));
  return { items: k, alpha, alphaStandardized, averageCorrelation, totalVariance, notices };
}

function range(count: number): number[] {
  return Array.from({ length: count }, (_, i) => i);
}
