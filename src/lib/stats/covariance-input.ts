/**
 * Input check shared by the functions that take an item covariance matrix (alpha, item-rest
 * correlation, alpha if deleted). Not a statistic: a precondition, kept in one place so every
 * caller words it the same way. Correlation matrices are checked by correlation-input.ts.
 */
import { SYMMETRY_TOLERANCE } from './tolerances';
import type { SquareMatrix } from './types';

/**
 * Checks that a matrix is a covariance matrix in shape: square, finite, symmetric, with a
 * non-negative diagonal. It does NOT require positive semi-definiteness (a pairwise covariance
 * matrix may be indefinite): callers report what follows from that as a result.
 * @param matrix The matrix to check; not modified.
 * @param caller Name of the calling function, for the error message.
 * @throws {RangeError} when the matrix is empty or its data length does not match its order.
 * @throws {RangeError} naming the first element that is not finite, breaks symmetry beyond
 *   SYMMETRY_TOLERANCE, or is a negative variance on the diagonal.
 * @returns Nothing; it returns only when every check passes.
 * References: none (input validation; a covariance matrix is symmetric with variances ≥ 0).
 */
export function checkCovarianceMatrix(matrix: SquareMatrix, caller: string): void {
  const { order, data } = matrix;
  if (!Number.isInteger(order) || order < 1) throw new RangeError(`${caller}: the covariance matrix must have order >= 1, got ${order}`);
  if (data.length !== order * order) throw new RangeError(`${caller}: expected ${order * order} values for order ${order}, got ${data.length}`);
  for (let i = 0; i < order; i++) {
    const variance = data[i * order + i];
    if (!Number.isFinite(variance)) throw new RangeError(`${caller}: element (${i}, ${i}) is not finite`);
    if (variance < 0) throw new RangeError(`${caller}: the variance on the diagonal at (${i}, ${i}) is negative: ${variance}`);
    for (let j = i + 1; j < order; j++) {
      const a = data[i * order + j];
      const b = data[j * order + i];
      if (!Number.isFinite(a) || !Number.isFinite(b)) throw new RangeError(`${caller}: element (${i}, ${j}) is not finite`);
      if (Math.abs(a - b) > SYMMETRY_TOLERANCE * Math.max(Math.abs(a), Math.abs(b), 1)) {
        throw new RangeError(`${caller}: the matrix is not symmetric at (${i}, ${j}): ${a} against ${b}`);
      }
    }
  }
}
