import { describe, expect, it } from 'vitest';
import { answeredSumIsFinite, checkItemMatrix, columnSumIsFinite } from '../../src/lib/stats/item-matrix-input';

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

describe('columnSumIsFinite', () => {
  it('finds a missing or infinite value wherever it sits among the four running sums and the tail', () => {
    const rows = 11;
    const clean = Float64Array.from({ length: 2 * rows }, (_, i) => (i % 5) + 1);
    expect(columnSumIsFinite(clean, 0, rows)).toBe(true);
    expect(columnSumIsFinite(clean, rows, rows)).toBe(true);
    for (let at = 0; at < rows; at++) {
      for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
        const data = Float64Array.from(clean);
        data[rows + at] = bad;
        expect(columnSumIsFinite(data, rows, rows), `value ${bad} at ${at}`).toBe(false);
        // Only the column asked about is read.
        expect(columnSumIsFinite(data, 0, rows)).toBe(true);
      }
    }
    expect(columnSumIsFinite(new Float64Array(0), 0, 0)).toBe(true);
  });
});

describe('answeredSumIsFinite', () => {
  it('passes missing answers and finds an infinite one wherever it sits', () => {
    const rows = 11;
    const withGaps = Float64Array.from({ length: rows }, (_, i) => (i % 3 === 0 ? Number.NaN : i));
    expect(answeredSumIsFinite(withGaps, 0, rows)).toBe(true);
    for (let at = 0; at < rows; at++) {
      for (const bad of [Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
        const data = Float64Array.from(withGaps);
        data[at] = bad;
        expect(answeredSumIsFinite(data, 0, rows), `value ${bad} at ${at}`).toBe(false);
      }
    }
    expect(answeredSumIsFinite(Float64Array.of(Number.NaN, Number.NaN), 0, 2)).toBe(true);
  });
});
