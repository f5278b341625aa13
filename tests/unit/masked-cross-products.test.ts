import { describe, expect, it } from 'vitest';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { covarianceMatrix } from '../../src/lib/stats/covariance-matrix';
import { maskedCrossProducts, pairCentredSums } from '../../src/lib/stats/masked-cross-products';
import { pearsonOfPairComplete } from '../../src/lib/stats/pearson-correlation';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import type { ItemMatrix } from '../../src/lib/stats/types';

/**
 * Seeded rating-like data with scattered missing answers: items load on one factor, are rounded
 * to 1-7 (or left continuous), and each value is missing with probability `missingShare`. A few
 * special columns: constant over many rows, almost never answered, and one with a large offset.
 */
function scatteredData(rows: number, items: number, seed: number, missingShare: number, options: { rounded: boolean; offset?: number }): ItemMatrix {
  const random = createSeededRandom(seed);
  const factor = Float64Array.from({ length: rows }, () => random.nextNormal());
  const data = new Float64Array(rows * items);
  for (let j = 0; j < items; j++) {
    const loading = 0.3 + 0.6 * random.next();
    for (let i = 0; i < rows; i++) {
      let value = loading * factor[i] + Math.sqrt(1 - loading * loading) * random.nextNormal();
      if (options.rounded) value = Math.min(7, Math.max(1, Math.round(4 + 1.5 * value)));
      if (j === 1 && i % 3 !== 0) value = options.rounded ? 4 : 0.25; // constant over two thirds of the rows
      if (j === 2 && options.offset !== undefined) value += options.offset;
      // The last item: answered by 2 rows at most (too few); item 0 unanswered where item 1 varies,
      // so item 1 is constant over the pair (0, 1).
      const missing = random.next() < missingShare || (j === items - 1 && i > 1) || (j === 0 && i % 3 === 0);
      data[j * rows + i] = missing ? Number.NaN : value;
    }
  }
  return { rows, columns: items, data };
}

/** The two-pass pairwise covariance of two columns (the loop covarianceMatrix used before). */
function loopCovariance(x: Float64Array, y: Float64Array): { n: number; value: number } {
  let n = 0;
  let sumX = 0;
  let sumY = 0;
  for (let i = 0; i < x.length; i++) {
    if (Number.isNaN(x[i]) || Number.isNaN(y[i])) continue;
    n++;
    sumX += x[i];
    sumY += y[i];
  }
  let sum = 0;
  for (let i = 0; i < x.length; i++) if (!Number.isNaN(x[i]) && !Number.isNaN(y[i])) sum += (x[i] - sumX / n) * (y[i] - sumY / n);
  return { n, value: n < 2 ? 0 : sum / (n - 1) };
}

// Shapes: items not a multiple of the 4-item register tile, rows not a multiple of the 512-row
// tile, a single partial tile, and a shape with exactly one full tile.
const SHAPES = [
  { rows: 40, items: 3, missingShare: 0.1, rounded: true },
  { rows: 512, items: 8, missingShare: 0.03, rounded: false },
  { rows: 1_037, items: 13, missingShare: 0.03, rounded: true },
  { rows: 2_600, items: 31, missingShare: 0.2, rounded: false, offset: 1e4 },
  { rows: 700, items: 42, missingShare: 0.03, rounded: true, offset: 250 },
] as const;

describe('pairwise-missing statistics from masked cross-products', () => {
  it.each(SHAPES.map((shape) => [`${shape.rows} × ${shape.items}`, shape] as const))(
    'Pearson equals the two-pass pair loop to 1e-12, with the same counts and undefined pairs (%s)',
    (_, shape) => {
      const matrix = scatteredData(shape.rows, shape.items, shape.rows + shape.items, shape.missingShare, shape);
      const result = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise', repair: 'none' });
      const p = shape.items;
      const expectedUndefined: [number, number][] = [];
      let largest = 0;
      for (let j = 0; j < p; j++) {
        for (let k = j + 1; k < p; k++) {
          // pearsonOfPairComplete: the pair loop, itself checked against R's cor(use = "pairwise") in pearson-correlation.test.ts
          const loop = pearsonOfPairComplete(matrix.data.subarray(j * shape.rows, (j + 1) * shape.rows), matrix.data.subarray(k * shape.rows, (k + 1) * shape.rows));
          expect(result.n.data[j * p + k], `n (${j}, ${k})`).toBe(loop.n);
          if (loop.r === null) {
            expectedUndefined.push([j, k]);
            expect(result.matrix.data[j * p + k]).toBe(0);
          } else {
            largest = Math.max(largest, Math.abs(result.matrix.data[j * p + k] - loop.r), Math.abs(result.matrix.data[k * p + j] - loop.r));
          }
        }
      }
      expect(largest).toBeLessThanOrEqual(1e-12);
      expect(result.undefinedPairs).toEqual(expectedUndefined);
      expect(expectedUndefined).toContainEqual([0, 1]); // item 1 constant over the pair
      expect(expectedUndefined).toContainEqual([0, p - 1]); // the last item has too few answers
    },
  );

  it.each(SHAPES.map((shape) => [`${shape.rows} × ${shape.items}`, shape] as const))(
    'the covariance equals the two-pass pair loop to 1e-12 relative to the variances (%s)',
    (_, shape) => {
      const matrix = scatteredData(shape.rows, shape.items, 7 * shape.rows + shape.items, shape.missingShare, shape);
      const result = covarianceMatrix(matrix, { missing: 'pairwise' });
      const p = shape.items;
      const column = (j: number) => matrix.data.subarray(j * shape.rows, (j + 1) * shape.rows);
      for (let j = 0; j < p; j++) {
        for (let k = j; k < p; k++) {
          const loop = loopCovariance(column(j), column(k));
          expect(result.n.data[j * p + k]).toBe(loop.n);
          const scale = Math.max(1, Math.sqrt(Math.abs(loopCovariance(column(j), column(j)).value * loopCovariance(column(k), column(k)).value)));
          expect(Math.abs(result.matrix.data[j * p + k] - loop.value), `(${j}, ${k})`).toBeLessThanOrEqual(1e-12 * scale);
          expect(result.matrix.data[k * p + j]).toBe(result.matrix.data[j * p + k]);
        }
      }
    },
  );

  it('keeps an exact copy of an item at exactly 1, as the pair loop does', () => {
    const base = scatteredData(900, 6, 3, 0.05, { rounded: true });
    const rows = base.rows;
    const data = new Float64Array(rows * 7);
    data.set(base.data);
    data.set(base.data.subarray(2 * rows, 3 * rows), 6 * rows); // item 6 copies item 2, missing answers included
    const result = correlationMatrix({ rows, columns: 7, data }, { method: 'pearson', missing: 'pairwise', repair: 'none' });
    expect(result.matrix.data[2 * 7 + 6]).toBe(1);
    expect(result.matrix.data[6 * 7 + 2]).toBe(1);
  });

  it('gives the sums of a hand-worked example and flags a pair it cannot give accurately', () => {
    // x = 1, 2, NaN, 4; y = 2, NaN, 5, 9; z = 3, 3, 3, NaN. Item means over own answers: 7/3, 16/3, 3.
    // Pair (x, y): rows 0 and 3, x = 1, 4 (mean 2.5), y = 2, 9 (mean 5.5): Σ(x−2.5)² = 4.5,
    // Σ(y−5.5)² = 24.5, Σ(x−2.5)(y−5.5) = 10.5 (by hand).
    const nan = Number.NaN;
    const masked = maskedCrossProducts({ rows: 4, columns: 3, data: Float64Array.from([1, 2, nan, 4, 2, nan, 5, 9, 3, 3, 3, nan]) });
    expect(Array.from(masked.counts)).toEqual([3, 2, 2, 2, 3, 2, 2, 2, 3]);
    const xy = pairCentredSums(masked, 0, 1);
    expect(xy.n).toBe(2);
    expect(xy.squaresJ).toBeCloseTo(4.5, 12);
    expect(xy.squaresK).toBeCloseTo(24.5, 12);
    expect(xy.products).toBeCloseTo(10.5, 12);
    expect(xy.accurate).toBe(true);
    // z is constant: its centred sum of squares is zero, so the pair is left to the pair loop.
    expect(pairCentredSums(masked, 0, 2).accurate).toBe(false);
    expect(() => pairCentredSums(masked, 0, 3)).toThrow(/must lie in 0..2/);
  });
});
