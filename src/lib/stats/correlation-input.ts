/**
 * Input check shared by the functions that take an item correlation matrix (VIF, condition
 * number, KMO, repair). Not a statistic: a precondition, kept in one place so every caller
 * words it the same way.
 */
import { checkSymmetricMatrix } from './symmetric-input';
import { UNIT_DIAGONAL_TOLERANCE } from './tolerances';
import type { SquareMatrix } from './types';

/**
 * Checks that a matrix is a correlation matrix in shape: square, finite, symmetric, with a unit
 * diagonal and every element within [−1, 1] (up to the named tolerances). It does NOT require
 * positive semi-definiteness: that is a numerical condition the callers report.
 * @param matrix The matrix to check.
 * @param caller Name of the calling function, for the error message.
 * @throws {RangeError} when the matrix is empty or not square.
 * @throws {RangeError} naming the first element that is not finite, breaks symmetry beyond
 *   SYMMETRY_TOLERANCE, leaves the diagonal by more than UNIT_DIAGONAL_TOLERANCE or lies
 *   outside [−1, 1].
 * @returns Nothing; it returns only when every check passes.
 * References: Pearson 1896, "Mathematical contributions to the theory of evolution. III.
 * Regression, heredity and panmixia" (properties of the correlation coefficient).
 */
export function checkCorrelationMatrix(matrix: SquareMatrix, caller: string): void {
  checkSymmetricMatrix(matrix, caller, 'correlation matrix', {
    diagonal: (value, i) => {
      if (!(Math.abs(value - 1) <= UNIT_DIAGONAL_TOLERANCE)) {
        throw new RangeError(`${caller}: diagonal element ${i} is ${value}, a correlation matrix has 1 there`);
      }
    },
    offDiagonal: (value, i, j) => {
      if (Math.abs(value) > 1 + UNIT_DIAGONAL_TOLERANCE) throw new RangeError(`${caller}: element (${i}, ${j}) is ${value}, outside [-1, 1]`);
    },
  });
}
