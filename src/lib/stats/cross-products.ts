/**
 * Centred cross-products of complete data, and the Pearson correlation matrix that follows
 * from them. This is the fast path for complete (or listwise-deleted) data: one pass for the
 * means, one blocked pass for every pair of items at once.
 *
 * References: Pearson 1896, "Mathematical contributions to the theory of evolution. III.
 * Regression, heredity and panmixia" (product-moment correlation); Chan, Golub & LeVeque 1983,
 * "Algorithms for computing the sample variance: analysis and recommendations" (two-pass,
 * centred sums for accuracy).
 */
import { accumulateCenteredProducts } from './centered-products-kernel';
import { CONSTANT_ITEM_RELATIVE_SD } from './tolerances';
import type { ItemMatrix, SquareMatrix } from './types';

/** Respondents per cache tile of the blocked kernel (performance only, not a tolerance). */
export const CROSS_PRODUCT_BLOCK_ROWS = 512;

/**
 * Sums of centred products over respondents: `centered[j][k] = Σ_i (x_ij − mean_j)(x_ik − mean_k)`.
 * Divide by `rows − 1` for the sample covariance matrix.
 */
export interface CenteredCrossProducts {
  /** Respondents summed over. */
  readonly rows: number;
  /** Mean of each item. */
  readonly means: Float64Array;
  /** Full symmetric matrix of centred cross-products (both triangles filled). */
  readonly centered: SquareMatrix;
}

/**
 * Means of every item (first pass of the two-pass method), checking that each value is finite.
 * Shared with the worker-thread version, which checks its input on the calling thread.
 * @param matrix Respondents × items, column-major.
 * @param caller Name of the calling function, for the error message.
 * @throws {RangeError} naming the first item (0-based column), and the respondent, that holds a
 *   missing or non-finite value (or whose sum overflows).
 * @returns The mean of each item.
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance:
 * analysis and recommendations" (two-pass method).
 */
export function checkedItemMeans(matrix: ItemMatrix, caller: string): Float64Array {
  const { rows, columns, data } = matrix;
  const means = new Float64Array(columns);
  for (let j = 0; j < columns; j++) {
    const offset = j * rows;
    let sum = 0;
    for (let i = 0; i < rows; i++) sum += data[offset + i];
    if (!Number.isFinite(sum)) {
      let row = 0;
      while (row < rows && Number.isFinite(data[offset + row])) row++;
      // A finite column can still overflow its sum; report that case too.
      const where = row < rows ? `a missing or non-finite value at respondent ${row}` : 'values whose sum overflows';
      throw new RangeError(`${caller}: item ${j} has ${where}; complete, finite data is required`);
    }
    means[j] = sum / rows;
  }
  return means;
}

/**
 * Checks an ItemMatrix's shape before a cross-product pass.
 * @param matrix The matrix to check.
 * @param caller Name of the calling function, for the error message.
 * @throws {RangeError} when there are no respondents or no items, or the data length is wrong.
 * @returns Nothing; it returns only when the shape is right.
 * References: none (an input check, not a statistic).
 */
export function checkItemMatrixShape(matrix: ItemMatrix, caller: string): void {
  const { rows, columns, data } = matrix;
  if (!Number.isInteger(rows) || rows < 1) throw new RangeError(`${caller}: at least one respondent is required, got ${rows}`);
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError(`${caller}: at least one item is required, got ${columns}`);
  if (data.length !== rows * columns) {
    throw new RangeError(`${caller}: data holds ${data.length} values, expected rows × columns = ${rows * columns}`);
  }
}

/**
 * Copies the upper triangle of a row-major square array into its lower triangle, in place.
 * @param values `order × order` values, row-major; the upper triangle (j <= k) is the source.
 * @param order The order of the square array.
 * @returns Nothing; `values` is completed in place.
 * References: none (storage of a symmetric matrix).
 */
export function mirrorUpperTriangle(values: Float64Array, order: number): void {
  for (let j = 0; j < order; j++) {
    for (let k = j + 1; k < order; k++) values[k * order + j] = values[j * order + k];
  }
}

/**
 * Centred cross-products of complete data, single-threaded (see
 * `centeredCrossProductsParallel` for the worker-thread version of the same sums).
 * @param matrix Respondents × items, column-major, every value finite.
 * @throws {RangeError} when the matrix has no respondents or no items, or its data length is wrong.
 * @throws {RangeError} naming the first item that holds a missing (NaN) or non-finite value.
 * @returns The number of respondents, the item means and the full symmetric matrix of centred
 *   cross-products.
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance:
 * analysis and recommendations".
 */
export function centeredCrossProducts(matrix: ItemMatrix): CenteredCrossProducts {
  checkItemMatrixShape(matrix, 'centeredCrossProducts');
  const means = checkedItemMeans(matrix, 'centeredCrossProducts');
  const { rows, columns } = matrix;
  const sums = new Float64Array(columns * columns);
  accumulateCenteredProducts(matrix.data, rows, columns, means, 0, rows, sums, CROSS_PRODUCT_BLOCK_ROWS);
  mirrorUpperTriangle(sums, columns);
  return { rows, means, centered: { order: columns, data: sums } };
}

/**
 * The centred cross-products of some of the items, taken from those of every item: the rows and
 * columns of `positions` (a principal submatrix) and their means. Each sum depends on its own two
 * items only (the kernel sums every pair over the rows in the same order whatever the other
 * columns), so the result is bit for bit what `centeredCrossProducts` gives on the selected items.
 * @param crossProducts Cross-products of every item (from `centeredCrossProducts`).
 * @param positions 0-based item indices to keep, in the order wanted, without repeats.
 * @throws {RangeError} when a position is not an item of `crossProducts` or appears twice.
 * @returns The cross-products of the selected items over the same rows.
 * References: none (a principal submatrix of a symmetric matrix).
 */
export function crossProductsOfItems(crossProducts: CenteredCrossProducts, positions: readonly number[]): CenteredCrossProducts {
  const { order, data } = crossProducts.centered;
  const seen = new Uint8Array(order);
  for (const position of positions) {
    if (!Number.isInteger(position) || position < 0 || position >= order) {
      throw new RangeError(`crossProductsOfItems: position ${position} is not an item of cross-products of order ${order}`);
    }
    if (seen[position] === 1) throw new RangeError(`crossProductsOfItems: position ${position} is given twice`);
    seen[position] = 1;
  }
  const size = positions.length;
  const centered = new Float64Array(size * size);
  const means = new Float64Array(size);
  for (let a = 0; a < size; a++) {
    means[a] = crossProducts.means[positions[a]];
    const row = positions[a] * order;
    for (let b = 0; b < size; b++) centered[a * size + b] = data[row + positions[b]];
  }
  return { rows: crossProducts.rows, means, centered: { order: size, data: centered } };
}

/**
 * Pearson correlation matrix from centred cross-products:
 * `r_jk = C_jk / sqrt(C_jj · C_kk)`, with exactly 1 on the diagonal and every value clamped
 * to [−1, 1] against rounding.
 * @param crossProducts The result of `centeredCrossProducts` (or its parallel twin).
 * @throws {RangeError} when the cross-product matrix is not square or holds a non-finite value.
 * @throws {RangeError} naming every constant item (centred sum of squares zero, or a standard
 *   deviation at or below CONSTANT_ITEM_RELATIVE_SD of its mean, which is rounding): its
 *   correlation does not exist, and the caller must exclude it (and say so) before correlating.
 * @returns The full symmetric correlation matrix, row-major.
 * References: Pearson 1896, "Mathematical contributions to the theory of evolution. III.
 * Regression, heredity and panmixia".
 */
export function pearsonFromCrossProducts(crossProducts: CenteredCrossProducts): SquareMatrix {
  const { order, data } = crossProducts.centered;
  if (!Number.isInteger(order) || order < 1 || data.length !== order * order) {
    throw new RangeError(`pearsonFromCrossProducts: the cross-product matrix must be square with order >= 1, got order ${order} and ${data.length} values`);
  }
  const constant: number[] = [];
  for (let j = 0; j < order; j++) {
    const sumOfSquares = data[j * order + j];
    if (!Number.isFinite(sumOfSquares)) throw new RangeError(`pearsonFromCrossProducts: item ${j} has a non-finite sum of squares`);
    const standardDeviation = Math.sqrt(Math.max(0, sumOfSquares) / crossProducts.rows);
    const mean = crossProducts.means[j] ?? 0;
    if (standardDeviation === 0 || standardDeviation <= CONSTANT_ITEM_RELATIVE_SD * Math.abs(mean)) constant.push(j);
  }
  if (constant.length > 0) {
    throw new RangeError(
      `pearsonFromCrossProducts: item(s) ${constant.join(', ')} are constant (zero variance) and have no correlation; exclude them first`,
    );
  }
  const correlation = new Float64Array(order * order);
  for (let j = 0; j < order; j++) {
    correlation[j * order + j] = 1;
    for (let k = j + 1; k < order; k++) {
      // One square root of the product (not two reciprocals) keeps a duplicate column at exactly 1.
      const value = data[j * order + k] / Math.sqrt(data[j * order + j] * data[k * order + k]);
      if (!Number.isFinite(value)) throw new RangeError(`pearsonFromCrossProducts: cross-product (${j}, ${k}) is not finite`);
      const r = Math.max(-1, Math.min(1, value));
      correlation[j * order + k] = r;
      correlation[k * order + j] = r;
    }
  }
  return { order, data: correlation };
}
