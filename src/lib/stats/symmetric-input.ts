/**
 * Input check shared by every function that takes a symmetric matrix: the shape, finiteness
 * and symmetry part that correlation-input.ts, covariance-input.ts and symmetric-eigen.ts have
 * in common. Not a statistic: a precondition, kept in one place so that "symmetric" means the
 * same tolerance everywhere and every caller words it the same way.
 */
import { SYMMETRY_TOLERANCE } from './tolerances';
import type { SquareMatrix } from './types';

/**
 * Checks that a matrix is square, finite and symmetric within SYMMETRY_TOLERANCE (relative to
 * the larger of the two elements, or 1). Row by row: the diagonal element first, then the
 * elements right of it against their mirror images below the diagonal.
 * @param matrix The matrix to check; not modified.
 * @param caller Name of the calling function, for the error message.
 * @param noun What the caller calls the matrix in the order message (e.g. `correlation matrix`).
 * @param checks Extra element checks, run in the same row-by-row order: `diagonal` replaces
 *   the default finiteness check of diagonal element i (it must reject non-finite values
 *   itself); `offDiagonal` runs on element (i, j), j > i, after it passed the finiteness and
 *   symmetry checks.
 * @throws {RangeError} when the order is not a positive integer or the data length is not the
 *   order squared.
 * @throws {RangeError} naming the first element that is not finite or breaks symmetry (and
 *   whatever the extra checks throw).
 * @returns Nothing; it returns only when every check passes.
 * References: none (input validation; Golub & Van Loan 2013, "Matrix Computations", 4th ed.,
 * §8.1 on the symmetric eigenproblem assumes exact symmetry, checked here to a tolerance).
 */
export function checkSymmetricMatrix(
  matrix: SquareMatrix,
  caller: string,
  noun: string,
  checks: {
    readonly diagonal?: (value: number, i: number) => void;
    readonly offDiagonal?: (value: number, i: number, j: number) => void;
  } = {},
): void {
  const { order, data } = matrix;
  if (!Number.isInteger(order) || order < 1) throw new RangeError(`${caller}: the ${noun} must have order >= 1, got ${order}`);
  if (data.length !== order * order) throw new RangeError(`${caller}: expected ${order * order} values for order ${order}, got ${data.length}`);
  for (let i = 0; i < order; i++) {
    const diagonal = data[i * order + i];
    if (checks.diagonal !== undefined) checks.diagonal(diagonal, i);
    else if (!Number.isFinite(diagonal)) throw new RangeError(`${caller}: element (${i}, ${i}) is not finite`);
    for (let j = i + 1; j < order; j++) {
      const a = data[i * order + j];
      const b = data[j * order + i];
      if (!Number.isFinite(a) || !Number.isFinite(b)) throw new RangeError(`${caller}: element (${i}, ${j}) is not finite`);
      if (Math.abs(a - b) > SYMMETRY_TOLERANCE * Math.max(Math.abs(a), Math.abs(b), 1)) {
        throw new RangeError(`${caller}: the matrix is not symmetric at (${i}, ${j}): ${a} against ${b}`);
      }
      checks.offDiagonal?.(a, i, j);
    }
  }
}
