/**
 * Item-rest correlation (the corrected item-total correlation): each item against the sum of
 * the other items of its scale, from the blocks of the covariance matrix,
 * r_i,rest = (Σ_j C_ij − C_ii) / sqrt(C_ii · (Σ_jl C_jl − 2 Σ_j C_ij + C_ii)).
 *
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests"
 * (Psychometrika 16:297-334); Nunnally & Bernstein 1994, Psychometric Theory, 3rd ed., ch. 8
 * (part-whole correction).
 */
import { checkCovarianceMatrix } from './covariance-input';
import { constantItemIndices } from './cronbach-alpha';
import { ZERO_VARIANCE_RELATIVE_TOLERANCE } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Item-rest correlations of one scale, in the item order of the covariance matrix. */
export interface ItemRestCorrelationResult {
  /** One value per item; null with a notice when the item or the rest of the scale is constant. */
  readonly correlations: readonly (number | null)[];
  /** Conditions met: `too-few-items`, `constant-item`, `constant-rest`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Correlation of each item with the sum of the other items of its scale.
 * @param covariance Item covariance matrix of the scale (reverse-keyed items already recoded),
 *   symmetric with finite values and a non-negative diagonal. Not modified.
 * @throws {RangeError} when the matrix is empty, not symmetric, not finite, or has a negative
 *   variance.
 * @returns One correlation per item (null, with a notice, where it is undefined; never NaN).
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests".
 */
export function itemRestCorrelations(covariance: SquareMatrix): ItemRestCorrelationResult {
  checkCovarianceMatrix(covariance, 'itemRestCorrelations');
  const k = covariance.order;
  const data = covariance.data;
  if (k < 2) {
    return {
      correlations: [null],
      notices: [{ code: 'too-few-items', items: [0], message: 'An item-rest correlation needs at least two items.' }],
    };
  }
  const rowSums = new Float64Array(k);
  let total = 0;
  let trace = 0;
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) rowSums[i] += data[i * k + j];
    total += rowSums[i];
    trace += data[i * k + i];
  }
  const constant = new Set(constantItemIndices(covariance));
  const constantRest: number[] = [];
  const correlations: (number | null)[] = [];
  for (let i = 0; i < k; i++) {
    const variance = data[i * k + i];
    const restVariance = total - 2 * rowSums[i] + variance;
    const restTrace = trace - variance;
    if (constant.has(i)) {
      correlations.push(null);
    } else if (!(restVariance > ZERO_VARIANCE_RELATIVE_TOLERANCE * restTrace) || !(restTrace > 0)) {
      correlations.push(null);
      constantRest.push(i);
    } else {
      correlations.push((rowSums[i] - variance) / Math.sqrt(variance * restVariance));
    }
  }
  const notices: NumericalNotice[] = [];
  if (constant.size > 0) {
    notices.push({ code: 'constant-item', items: [...constant], message: 'A constant item has no item-rest correlation.' });
  }
  if (constantRest.length > 0) {
    notices.push({
      code: 'constant-rest',
      items: constantRest,
      message: 'Without these items the rest of the scale has no positive variance, so their item-rest correlation is undefined.',
    });
  }
  return { correlations, notices };
}
