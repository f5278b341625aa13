/**
 * The greedy cover of undefined correlation pairs (Chvátal 1979). The outside check is exhaustive
 * enumeration: on small designs the greedy cover is compared with the true minimum cover.
 */
import { describe, expect, it } from 'vitest';
import { undefinedPairCover } from '../../src/lib/stats';

/** Size of the smallest set of items touching every pair, by trying every subset. */
function minimumCover(order: number, pairs: readonly (readonly [number, number])[]): number {
  let best = order;
  for (let mask = 0; mask < 1 << order; mask++) {
    if (pairs.every(([j, k]) => ((mask >> j) & 1) === 1 || ((mask >> k) & 1) === 1)) {
      let size = 0;
      for (let j = 0; j < order; j++) size += (mask >> j) & 1;
      best = Math.min(best, size);
    }
  }
  return best;
}

describe('undefinedPairCover', () => {
  it('leaves nothing out when every pair is defined', () => {
    expect(undefinedPairCover(5, [])).toEqual({ leftOut: [], partners: [] });
  });

  it('planned missingness (three-form design): the block answered by fewest leaves, not the shared block', () => {
    // Items 0-3 asked of everyone, 4-5 only of form A, 6-7 only of form B: pairs (4|5) × (6|7) undefined.
    const pairs: [number, number][] = [[4, 6], [4, 7], [5, 6], [5, 7]];
    const cover = undefinedPairCover(8, pairs, [300, 300, 300, 300, 150, 150, 100, 100]);
    // Enumeration: the minimum cover has 2 items; ties broken toward the items with fewer answers.
    expect(cover.leftOut.length).toBe(minimumCover(8, pairs));
    expect([...cover.leftOut].sort()).toEqual([6, 7]);
    expect(cover.partners[0]).toEqual([4, 5]);
  });

  it('one item with no partner at all leaves alone (a star)', () => {
    const pairs: [number, number][] = [[2, 0], [2, 1], [2, 3], [2, 4]];
    expect(undefinedPairCover(5, pairs)).toEqual({ leftOut: [2], partners: [[0, 1, 3, 4]] });
  });

  it('matches the minimum cover on seeded random sparse designs of up to 10 items', () => {
    let seed = 12345;
    const next = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    let equal = 0;
    for (let trial = 0; trial < 200; trial++) {
      const order = 4 + Math.floor(next() * 7);
      const pairs: [number, number][] = [];
      for (let j = 0; j < order; j++) for (let k = j + 1; k < order; k++) if (next() < 0.15) pairs.push([j, k]);
      const cover = undefinedPairCover(order, pairs);
      const gone = new Set(cover.leftOut);
      expect(pairs.every(([j, k]) => gone.has(j) || gone.has(k))).toBe(true);
      const minimum = minimumCover(order, pairs);
      expect(cover.leftOut.length).toBeGreaterThanOrEqual(minimum);
      // Chvátal 1979: greedy ≤ H(d) × minimum, d the largest degree (≤ 9 here, H(9) < 2.83).
      expect(cover.leftOut.length).toBeLessThanOrEqual(Math.ceil(2.83 * minimum));
      if (cover.leftOut.length === minimum) equal++;
    }
    expect(equal).toBeGreaterThan(150);
  });

  it('refuses pairs outside the matrix', () => {
    expect(() => undefinedPairCover(3, [[0, 3]])).toThrow(RangeError);
    expect(() => undefinedPairCover(3, [[1, 1]])).toThrow(RangeError);
    expect(() => undefinedPairCover(3, [], [1, 2])).toThrow(RangeError);
  });
});
