/**
 * Pairwise-complete sums of every pair of items at once, for data with missing answers, through
 * the blocked cross-product kernel of complete data (centered-products-kernel.ts). With x̃ the
 * data shifted by each item's mean over its own answers and set to 0 where missing, and m the 0/1
 * answered mask, four products give, for items j and k over the respondents who answered both:
 *
 * - counts   N_jk = Σ m_j·m_k        (MᵀM, symmetric)
 * - sums     S_jk = Σ x̃_j·m_k        (X̃ᵀM: item j's sum where k is answered)
 * - squares  Q_jk = Σ x̃_j²·m_k       (X̃²ᵀM)
 * - products P_jk = Σ x̃_j·x̃_k        (X̃ᵀX̃, symmetric: the zeros drop the unanswered)
 *
 * and the pair-complete centred sums follow: C_jk = P_jk − S_jk·S_kj / N_jk,
 * V_j|k = Q_jk − S_jk² / N_jk. Shifting by the item's own mean first keeps the subtraction mild
 * (a pair's mean differs from the item's by little), so the result matches the two-pass pair
 * loop to rounding (Chan, Golub & LeVeque 1983 on shifted sums); `pairCentredSums` says when a
 * pair is not accurate enough and must be recomputed by the loop.
 *
 * Cost. P is the complete-data kernel on the zero-filled, shifted data (blocked, register-tiled).
 * The three mask products are taken by their complement, since m = 1 − (missing): with T_j = Σ x̃_j
 * over every row, S_jk = T_j − Σ_{rows where k is missing} x̃_j, likewise Q, and
 * N_jk = rows − missing_j − missing_k + both missing. Each respondent adds work only for the items
 * they left out (items × their missing answers), so the four products cost little more than the
 * one of complete data whenever answers are mostly present, and never more than a dense product.
 *
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance: analysis
 * and recommendations" (The American Statistician 37:242-247; shifted data); Golub & Van Loan
 * 2013, "Matrix Computations", 4th ed., §1.5 (blocking for the memory hierarchy).
 */
import { accumulateCenteredProducts } from './centered-products-kernel';
import { CROSS_PRODUCT_BLOCK_ROWS, mirrorUpperTriangle } from './cross-products';
import { MASKED_PRODUCTS_CANCELLATION_LIMIT } from './tolerances';
import { keptPerMatrix, type ItemMatrix } from './types';

/** The four pairwise-complete products of `maskedCrossProducts`, each row-major `order × order`. */
export interface MaskedCrossProducts {
  readonly order: number;
  /** Each item's mean over its own answers (0 for an item without any), subtracted first. */
  readonly shifts: Float64Array;
  /** N_jk: respondents who answered both j and k (the diagonal: who answered j). Symmetric. */
  readonly counts: Float64Array;
  /** S_jk: Σ of item j's shifted values over the respondents who answered both. Not symmetric. */
  readonly sums: Float64Array;
  /** Q_jk: Σ of item j's squared shifted values over the respondents who answered both. Not symmetric. */
  readonly squares: Float64Array;
  /** P_jk: Σ of the products of j's and k's shifted values over the respondents who answered both. Symmetric. */
  readonly products: Float64Array;
}

/**
 * The pairwise-complete counts, sums, sums of squares and cross-products of every pair of items.
 * Found once per matrix (by its data array and shape) and kept while the matrix lives: the
 * pairwise correlation and covariance matrices of one wave read the same products.
 * @param matrix Respondents × items, column-major, NaN for missing, finite otherwise (checked by
 *   the caller: correlationMatrix and covarianceMatrix refuse infinite values first); not to be
 *   modified after the call (the kept products would no longer be its own).
 * @throws {RangeError} when the data length is not rows × columns or there are no items.
 * @returns The four products (see the module notes), full matrices; read-only (shared).
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance".
 */
export function maskedCrossProducts(matrix: ItemMatrix): MaskedCrossProducts {
  const { rows, columns: order, data } = matrix;
  if (!Number.isInteger(order) || order < 1) throw new RangeError(`maskedCrossProducts: at least one item is required, got ${order}`);
  if (!Number.isInteger(rows) || rows < 0 || data.length !== rows * order) {
    throw new RangeError(`maskedCrossProducts: data holds ${data.length} values, expected rows × columns = ${rows * order}`);
  }
  return maskedOfMatrix(matrix);
}

/** The work of `maskedCrossProducts` for a checked matrix, once per matrix (an audit's pairwise correlations and covariances share one pass). */
const maskedOfMatrix = keptPerMatrix(({ rows, columns: order, data }): MaskedCrossProducts => {
  // Shifts, and the shifted data with every missing value set to the shift (so x − shift = 0 there).
  const shifts = new Float64Array(order);
  const filled = new Float64Array(rows * order);
  const missingCount = new Int32Array(order);
  let missingTotal = 0;
  for (let j = 0; j < order; j++) {
    let sum = 0;
    let answered = 0;
    for (let i = 0, at = j * rows; i < rows; i++, at++) {
      const value = data[at];
      if (value === value) {
        sum += value;
        answered++;
      }
    }
    const shift = answered > 0 ? sum / answered : 0;
    shifts[j] = shift;
    missingCount[j] = rows - answered;
    missingTotal += rows - answered;
    for (let i = 0, at = j * rows; i < rows; i++, at++) {
      const value = data[at];
      filled[at] = value === value ? value : shift;
    }
  }
  const products = new Float64Array(order * order);
  accumulateCenteredProducts(filled, rows, order, shifts, 0, rows, products, CROSS_PRODUCT_BLOCK_ROWS);
  mirrorUpperTriangle(products, order);

  // Each respondent's missing items (compressed rows), from the column-major data.
  const missingStart = new Int32Array(rows + 1);
  for (let j = 0; j < order; j++) {
    if (missingCount[j] === 0) continue;
    for (let i = 0, at = j * rows; i < rows; i++, at++) if (data[at] !== data[at]) missingStart[i + 1]++;
  }
  for (let i = 0; i < rows; i++) missingStart[i + 1] += missingStart[i];
  const missingItems = new Int32Array(missingTotal);
  const cursor = missingStart.slice(0, rows);
  for (let j = 0; j < order; j++) {
    if (missingCount[j] === 0) continue;
    for (let i = 0, at = j * rows; i < rows; i++, at++) if (data[at] !== data[at]) missingItems[cursor[i]++] = j;
  }

  // Totals over every row (the shifted values are 0 where missing), then the complements.
  const totals = new Float64Array(order);
  const totalSquares = new Float64Array(order);
  for (let j = 0; j < order; j++) {
    let sum = 0;
    let squares = 0;
    for (let i = 0, at = j * rows; i < rows; i++, at++) {
      const shifted = filled[at] - shifts[j];
      sum += shifted;
      squares += shifted * shifted;
    }
    totals[j] = sum;
    totalSquares[j] = squares;
  }
  // lostSums[k * order + j] = Σ over rows where k is missing of x̃_j; lostSquares likewise; bothMissing[j * order + k].
  const lostSums = new Float64Array(order * order);
  const lostSquares = new Float64Array(order * order);
  const bothMissing = new Float64Array(order * order);
  const row = new Float64Array(order);
  for (let i = 0; i < rows; i++) {
    const from = missingStart[i];
    const to = missingStart[i + 1];
    if (from === to) continue;
    for (let j = 0; j < order; j++) row[j] = filled[j * rows + i] - shifts[j];
    for (let a = from; a < to; a++) {
      const k = missingItems[a];
      const base = k * order;
      for (let j = 0; j < order; j++) {
        const value = row[j];
        lostSums[base + j] += value;
        lostSquares[base + j] += value * value;
      }
      for (let b = from; b < to; b++) bothMissing[base + missingItems[b]]++;
    }
  }
  const counts = new Float64Array(order * order);
  const sums = new Float64Array(order * order);
  const squares = new Float64Array(order * order);
  for (let j = 0; j < order; j++) {
    for (let k = 0; k < order; k++) {
      counts[j * order + k] = rows - missingCount[j] - missingCount[k] + bothMissing[j * order + k];
      sums[j * order + k] = totals[j] - lostSums[k * order + j];
      squares[j * order + k] = totalSquares[j] - lostSquares[k * order + j];
    }
  }
  return { order, shifts, counts, sums, squares, products };
});

/** The pair-complete centred sums of items j and k (see `pairCentredSums`). */
export interface PairCentredSums {
  /** Respondents who answered both. */
  readonly n: number;
  /** Σ (x_j − mean_j)² over them, the mean taken over them too. */
  readonly squaresJ: number;
  /** Σ (x_k − mean_k)² over them. */
  readonly squaresK: number;
  /** Σ (x_j − mean_j)(x_k − mean_k) over them. */
  readonly products: number;
  /**
   * False when either sum of squares fell below MASKED_PRODUCTS_CANCELLATION_LIMIT of its shifted
   * sum (an item constant over the pair, or a cancellation that would cost accuracy): the caller
   * must then compute the pair by the two-pass loop. Always true when n is 0.
   */
  readonly accurate: boolean;
}

/**
 * The pair-complete centred sums of items j and k from the masked products (j may equal k: the
 * item's own variance sums).
 * @param masked The result of `maskedCrossProducts`.
 * @param j First item (0-based).
 * @param k Second item (0-based).
 * @throws {RangeError} when an index is outside 0..order − 1.
 * @returns n, the two centred sums of squares, the centred cross-product, and whether they are accurate.
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance".
 */
export function pairCentredSums(masked: MaskedCrossProducts, j: number, k: number): PairCentredSums {
  const { order } = masked;
  if (!(Number.isInteger(j) && Number.isInteger(k) && j >= 0 && k >= 0 && j < order && k < order)) {
    throw new RangeError(`pairCentredSums: items ${j} and ${k} must lie in 0..${order - 1}`);
  }
  const jk = j * order + k;
  const kj = k * order + j;
  const n = masked.counts[jk];
  if (n === 0) return { n, squaresJ: 0, squaresK: 0, products: 0, accurate: true };
  const sumJ = masked.sums[jk];
  const sumK = masked.sums[kj];
  const shiftedJ = masked.squares[jk];
  const shiftedK = masked.squares[kj];
  const squaresJ = shiftedJ - (sumJ * sumJ) / n;
  const squaresK = shiftedK - (sumK * sumK) / n;
  const accurate = squaresJ > MASKED_PRODUCTS_CANCELLATION_LIMIT * shiftedJ && squaresK > MASKED_PRODUCTS_CANCELLATION_LIMIT * shiftedK;
  return { n, squaresJ, squaresK, products: masked.products[jk] - (sumJ * sumK) / n, accurate };
}
