import { describe, expect, it } from 'vitest';
import { assignMidRanks, midRanks } from '../../src/lib/stats/mid-ranks';

describe('midRanks', () => {
  it('gives tied values the mean of their ranks and keeps missing values missing', () => {
    const values = Object.freeze([3, 1, 4, 1, 5, NaN, 9, 2, 6, 5]);
    // R 4.2.2: rank(c(3, 1, 4, 1, 5, NA, 9, 2, 6, 5), na.last = "keep")
    const expected = [4, 1.5, 5, 1.5, 6.5, NaN, 9, 3, 8, 6.5];
    expect(Array.from(midRanks(values))).toEqual(expected);
  });

  it('ranks a permutation as 1..n and sums to n(n + 1)/2 with ties', () => {
    expect(Array.from(midRanks([30, 10, 20]))).toEqual([3, 1, 2]);
    const ranks = midRanks([2, 2, 2, 7, 7, 1]);
    expect(ranks.reduce((sum, r) => sum + r, 0)).toBe(21); // 6·7/2
    expect(Array.from(ranks)).toEqual([3, 3, 3, 5.5, 5.5, 1]);
  });

  it('handles empty and all-missing input', () => {
    expect(midRanks([]).length).toBe(0);
    expect(Array.from(midRanks([NaN, NaN]))).toEqual([NaN, NaN]);
  });
});

describe('assignMidRanks', () => {
  it('ranks only the first `count` listed positions', () => {
    const values = [5, 1, 5, 3];
    const ranks = new Float64Array(4).fill(-1);
    assignMidRanks(Int32Array.of(1, 0, 2, 3), 3, values, ranks); // positions 1, 0, 2 (sorted by value)
    expect(Array.from(ranks)).toEqual([2.5, 1, 2.5, -1]);
  });
});
