/**
 * The item covariance matrix (sample covariances, denominator n − 1) under an explicit
 * missing-data policy, with the number of respondents behind every cell. Cronbach's alpha and
 * its relatives are computed from it.
 *
 * - Listwise: respondents who answered every item; every cell has the same n.
 * - Pairwise: each cell from the respondents who answered both items, with their own means
 *   (pair-complete), as R's `cov(x, use = "pairwise.complete.obs")` does; the diagonal is each
 *   item's variance over all of its own answers.
 *
 * A cell with fewer than MIN_ROWS_FOR_COVARIANCE respondents has no covariance: it is entered
 * as 0 (never NaN), listed in `undefinedPairs` (a diagonal cell appears as the pair [j, j]) and
 * reported by a `covariance-undefined` notice.
 *
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance:
 * analysis and recommendations" (two-pass centred sums); Cronbach 1951, "Coefficient alpha and
 * the internal structure of tests" (the use made of it).
 */
import { checkItemMatrix } from './item-matrix-input';
import { completeRows, rowsWithAnyAnswer } from './complete-rows';
import { centeredCrossProducts, type CenteredCrossProducts } from './cross-products';
import { maskedCrossProducts, pairCentredSums } from './masked-cross-products';
import { MIN_ROWS_FOR_COVARIANCE } from './tolerances';
import { selectRespondents, type ItemMatrix, type MissingPolicy, type NumericalNotice, type SquareMatrix } from './types';

/** Options of `covarianceMatrix`. */
export interface CovarianceMatrixOptions {
  readonly missing: MissingPolicy;
  /**
   * Complete data or listwise deletion only: the centred cross-products of the same matrix's
   * complete rows, already computed by the caller (e.g. for the Pearson matrix), used instead of
   * another pass over the data. The result is bit for bit the same. Its `rows` must equal the
   * number of complete rows and its order the number of items.
   */
  readonly crossProducts?: CenteredCrossProducts;
}

/** A covariance matrix with the respondents behind each cell. */
export interface CovarianceMatrixResult {
  readonly missing: MissingPolicy;
  /** Full symmetric matrix, row-major; 0 where undefined. Never NaN. */
  readonly matrix: SquareMatrix;
  /** Respondents behind each cell (pair-complete counts, or complete rows under listwise). */
  readonly n: SquareMatrix;
  /** Listwise: complete rows. Pairwise: rows with at least one item answered. */
  readonly rowsUsed: number;
  /** Cells without a covariance, [j, k] with j <= k. */
  readonly undefinedPairs: readonly (readonly [number, number])[];
  readonly notices: readonly NumericalNotice[];
}

/**
 * Sample covariance matrix of the items (denominator n − 1) under pairwise or listwise
 * deletion.
 * @param matrix Respondents × items, column-major, NaN for missing.
 * @param options `missing`: pairwise or listwise.
 * @throws {RangeError} when the shape is inconsistent, a value is ±Infinity, or the policy is unknown.
 * @throws {RangeError} when `options.crossProducts` is given for pairwise deletion with missing
 *   answers, or does not match the complete rows and items.
 * @returns The covariance matrix, the n of every cell, the rows used, undefined cells and notices.
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance:
 * analysis and recommendations".
 */
export function covarianceMatrix(matrix: ItemMatrix, options: CovarianceMatrixOptions): CovarianceMatrixResult {
  const caller = 'covarianceMatrix';
  checkItemMatrix(matrix, caller);
  const { rows, columns, data } = matrix;
  const missing = options?.missing;
  if (missing !== 'pairwise' && missing !== 'listwise') throw new RangeError(`${caller}: missing must be pairwise or listwise, got ${String(missing)}`);

  const order = columns;
  const values = new Float64Array(order * order);
  const counts = new Float64Array(order * order);
  const undefinedPairs: [number, number][] = [];
  const complete = completeRows(matrix);
  const hasMissing = complete.length < rows;
  const given = options.crossProducts;
  if (given !== undefined) {
    if (missing === 'pairwise' && hasMissing) throw new RangeError(`${caller}: crossProducts cannot serve pairwise deletion with missing answers`);
    if (given.rows !== complete.length || given.centered.order !== order || given.means.length !== order) {
      throw new RangeError(`${caller}: the crossProducts cover ${given.rows} rows and ${given.centered.order} items, the complete data ${complete.length} rows and ${order} items`);
    }
  }
  let rowsUsed: number;
  if (missing === 'listwise' || !hasMissing) {
    const usedRows = complete.length;
    // Without a missing answer every row answered an item: no pass needed to count them.
    rowsUsed = missing === 'listwise' || !hasMissing ? complete.length : rowsWithAnyAnswer(matrix);
    counts.fill(usedRows);
    if (usedRows < MIN_ROWS_FOR_COVARIANCE) {
      for (let j = 0; j < order; j++) for (let k = j; k < order; k++) undefinedPairs.push([j, k]);
    } else {
      const products = given ?? centeredCrossProducts(hasMissing ? selectRespondents(matrix, complete) : matrix);
      for (let t = 0; t < order * order; t++) values[t] = products.centered.data[t] / (usedRows - 1);
    }
  } else {
    rowsUsed = rowsWithAnyAnswer(matrix);
    // Every pair at once from the masked cross-products; the two-pass pair loop only for a pair
    // they cannot give to full accuracy (heavy cancellation, or an item constant over the pair).
    const masked = maskedCrossProducts(matrix);
    for (let j = 0; j < order; j++) {
      for (let k = j; k < order; k++) {
        const sums = pairCentredSums(masked, j, k);
        const n = sums.n;
        counts[j * order + k] = n;
        counts[k * order + j] = n;
        if (n < MIN_ROWS_FOR_COVARIANCE) {
          undefinedPairs.push([j, k]);
          continue;
        }
        const covariance = sums.accurate ? sums.products / (n - 1) : pairCovariance(data, rows, j, k);
        values[j * order + k] = covariance;
        values[k * order + j] = covariance;
      }
    }
  }
  const notices: NumericalNotice[] = [];
  if (undefinedPairs.length > 0) {
    const items = Array.from(new Set(undefinedPairs.flat())).sort((a, b) => a - b);
    notices.push({
      code: 'covariance-undefined',
      items,
      message: `${undefinedPairs.length} cell(s) of the covariance matrix rest on fewer than ${MIN_ROWS_FOR_COVARIANCE} respondents and are entered as 0.`,
    });
  }
  return { missing, matrix: { order, data: values }, n: { order, data: counts }, rowsUsed, undefinedPairs, notices };
}

/** The two-pass covariance of items j and k over the rows where both are answered (at least 2). */
function pairCovariance(data: Float64Array, rows: number, j: number, k: number): number {
  const x = data.subarray(j * rows, (j + 1) * rows);
  const y = data.subarray(k * rows, (k + 1) * rows);
  let n = 0;
  let sumX = 0;
  let sumY = 0;
  for (let i = 0; i < rows; i++) {
    const a = x[i];
    const b = y[i];
    if (a !== a || b !== b) continue;
    n++;
    sumX += a;
    sumY += b;
  }
  const meanX = sumX / n;
  const meanY = sumY / n;
  let sumProducts = 0;
  for (let i = 0; i < rows; i++) {
    const a = x[i];
    const b = y[i];
    if (a !== a || b !== b) continue;
    sumProducts += (a - meanX) * (b - meanY);
  }
  return sumProducts / (n - 1);
}
