import { describe, expect, it } from 'vitest';
import { principalSubmatrix } from '../../src/lib/engine/principal-submatrix';
import { squareMatrixFromRows, squareMatrixToRows } from '../../src/lib/stats/types';

describe('principalSubmatrix', () => {
  const matrix = squareMatrixFromRows([
    [1, 2, 3],
    [4, 5, 6],
    [7, 8, 9],
  ]);

  it('keeps the listed rows and columns in the order given, without touching the input', () => {
    const before = Float64Array.from(matrix.data);
    expect(squareMatrixToRows(principalSubmatrix(matrix, [2, 0]))).toEqual([[9, 7], [3, 1]]); // definition: A[idx, idx]
    expect(squareMatrixToRows(principalSubmatrix(matrix, []))).toEqual([]);
    expect(matrix.data).toEqual(before);
  });

  it('refuses an index out of range or repeated', () => {
    expect(() => principalSubmatrix(matrix, [3])).toThrow(/principalSubmatrix: index 3 is outside 0..2/);
    expect(() => principalSubmatrix(matrix, [1, 1])).toThrow(/index 1 is listed twice/);
    expect(() => principalSubmatrix(matrix, [0.5])).toThrow(/index 0.5 is outside/);
  });
});
