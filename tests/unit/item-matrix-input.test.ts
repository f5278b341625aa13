import { describe, expect, it } from 'vitest';
import { checkItemMatrix } from '../../src/lib/stats/item-matrix-input';

const matrix = (columns: number[][]) => ({ rows: columns[0].length, columns: columns.length, data: Float64Array.from(columns.flat()) });

describe('checkItemMatrix', () => {
  it('accepts missing answers (NaN) and sums that overflow without any infinite answer', () => {
    expect(() => checkItemMatrix(matrix([[1, Number.NaN, 3], [Number.NaN, Number.NaN, Number.NaN]]), 'f')).not.toThrow();
    expect(() => checkItemMatrix(matrix([[1e308, 1e308, -1e308]]), 'f')).not.toThrow();
  });

  it('names the first infinite value in column order, with or without missing answers beside it', () => {
    expect(() => checkItemMatrix(matrix([[1, 2, 3], [4, Number.NaN, Number.NEGATIVE_INFINITY], [Number.POSITIVE_INFINITY, 1, 1]]), 'f')).toThrow(
      'f: item 1 has an infinite value at respondent 2; use NaN for a missing answer',
    );
    expect(() => checkItemMatrix(matrix([[1, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]]), 'g')).toThrow('g: item 0 has an infinite value at respondent 1');
  });

  it('leaves infinite values to the caller when asked, and refuses a wrong shape', () => {
    expect(() => checkItemMatrix(matrix([[1, Number.POSITIVE_INFINITY]]), 'f', false)).not.toThrow();
    expect(() => checkItemMatrix({ rows: 2, columns: 2, data: new Float64Array(3) }, 'f')).toThrow(/rows × columns = 4/);
    expect(() => checkItemMatrix({ rows: 2, columns: 0, data: new Float64Array(0) }, 'f')).toThrow(/at least one item/);
    expect(() => checkItemMatrix({ rows: -1, columns: 1, data: new Float64Array(0) }, 'f')).toThrow(/non-negative integer/);
  });
});
