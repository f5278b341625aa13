/**
 * Principal submatrices: the rows and columns of a square matrix that belong to a subset of its
 * items. The engine uses them to read the correlations, covariances and pair counts of a scale or
 * of the items left after a cut without another pass over the data.
 */
import type { SquareMatrix } from '../stats/types';

/**
 * The principal submatrix of the listed rows/columns, in the order given.
 * @param matrix A square matrix (row-major, both triangles). Not modified.
 * @param indices 0-based positions to keep, each in [0, order), no repeats.
 * @throws {RangeError} when an index is out of range, not an integer, or repeated.
 * @returns A new square matrix of order `indices.length`.
 * References: Horn & Johnson 2013, "Matrix Analysis", 2nd ed., §0.7.1 (principal submatrices).
 */
export function principalSubmatrix(matrix: SquareMatrix, indices: readonly number[]): SquareMatrix {
  const seen = new Set<number>();
  for (const index of indices) {
    if (!Number.isInteger(index) || index < 0 || index >= matrix.order) {
      throw new RangeError(`principalSubmatrix: index ${index} is outside 0..${matrix.order - 1}`);
    }
    if (seen.has(index)) throw new RangeError(`principalSubmatrix: index ${index} is listed twice`);
    seen.add(index);
  }
  const order = indices.length;
  const data = new Float64Array(order * order);
  for (let i = 0; i < order; i++) {
    const source = indices[i] * matrix.order;
    for (let j = 0; j < order; j++) data[i * order + j] = matrix.data[source + indices[j]];
  }
  return { order, data };
}
