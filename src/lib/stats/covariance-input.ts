/**
 * Input check shared by the functions that take an item covariance matrix (alpha, item-rest
 * correlation, alpha if deleted). Not a statistic: a precondition, kept in one place so every
 * caller words it the same way. Correlation matrices are checked by correlation-input.ts.
 */
import { checkSymmetricMatrix } from './symmetric-input';
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
  checkSymmetricMatrix(matrix, caller, 'covariance matrix', {
    diagonal: (variance, i) => {
      if (!Number.isFinite(variance)) throw new RangeError(`${caller}: element (${i}, ${i}) is not finite`);
      if (variance < 0) throw new RangeError(`${caller}: the variance on the diagonal at (${i}, ${i}) is negative: ${variance}`);
    },
  });
}
