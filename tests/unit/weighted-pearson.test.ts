/**
 * weightedPearson (the bootstrap's one-pass Pearson and covariance over weighted original rows)
 * against correlationMatrix and covarianceMatrix computed on the resampled matrix itself: equal to
 * 1e-12, with the same pair n, undefined pairs and repair flags. The reference functions are the
 * core's, themselves checked against R's cor(use = "pairwise.complete.obs") and cov() in
 * correlation-matrix.test.ts and covariance-matrix.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { covarianceMatrix } from '../../src/lib/stats/covariance-matrix';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { selectItems, selectRespondents, type ItemMatrix } from '../../src/lib/stats/types';
import { weightedPearson } from '../../src/lib/stats/weighted-pearson';
import { weightedPearsonReference } from './weighted-pearson-reference';

function randomMatrix(rows: number, columns: number, missingShare: number, seed: number): ItemMatrix {
  const random = createSeededRandom(seed);
  const data = new Float64Array(rows * columns);
  for (let i = 0; i < rows; i++) {
    const common = random.nextNormal();
    for (let j = 0; j < columns; j++) {
      const value = Math.min(5, Math.max(1, Math.round(3 + common * 0.8 + random.nextNormal())));
      data[j * rows + i] = random.next() < missingShare ? Number.NaN : j === columns - 1 ? value * 10.25 + 1000 : value;
    }
  }
  return { rows, columns, data };
}

function resample(rows: number, seed: number): { drawn: Int32Array; weights: Float64Array } {
  const random = createSeededRandom(seed);
  const drawn = new Int32Array(rows);
  const weights = new Float64Array(rows);
  for (let i = 0; i < rows; i++) {
    drawn[i] = random.nextInt(rows);
    weights[drawn[i]]++;
  }
  return { drawn, weights };
}

function expectClose(actual: Float64Array, expected: Float64Array, tolerance: number): void {
  expect(actual.length).toBe(expected.length);
  let worst = 0;
  for (let t = 0; t < actual.length; t++) worst = Math.max(worst, Math.abs(actual[t] - expected[t]));
  expect(worst).toBeLessThan(tolerance);
}

describe('weightedPearson', () => {
  // Integer answers take the exact one-pass sums; a non-integer item (the last) the two-pass path.
  it.each([
    ['integer answers, pairwise with 8% missing', 300, 12, 0.08, 'pairwise', true],
    ['integer answers, complete data', 250, 9, 0, 'pairwise', true],
    ['integer answers, listwise, complete data', 120, 7, 0, 'listwise', true],
    ['integer answers, few rows and 40% missing', 12, 6, 0.4, 'pairwise', true],
    ['a non-integer item, pairwise with 8% missing', 300, 12, 0.08, 'pairwise', false],
    ['a non-integer item, complete data', 250, 9, 0, 'pairwise', false],
    ['a non-integer item, few rows and 40% missing', 12, 6, 0.4, 'pairwise', false],
  ] as const)('equals the core on the resampled matrix: %s', (_, rows, columns, missingShare, missing, integerOnly) => {
    const matrix = randomMatrix(rows, columns, missingShare, rows + columns);
    const { drawn, weights } = resample(rows, 7);
    const columnsUsed = Array.from({ length: columns }, (__, j) => j).filter((j) => j !== 2 && (!integerOnly || j !== columns - 1));
    const sample = selectItems(selectRespondents(matrix, drawn), columnsUsed);
    const expectedR = correlationMatrix(sample, {
      method: 'pearson',
      missing,
    });
    const expectedCov = covarianceMatrix(sample, { missing });
    const result = weightedPearson(matrix, weights, columnsUsed, missing);
    expect(result).not.toBeNull();
    const { correlation, covariance } = result!;
    expectClose(correlation.matrix.data, expectedR.matrix.data, 1e-12);
    expect(Array.from(correlation.n.data)).toEqual(Array.from(expectedR.n.data));
    expect(correlation.undefinedPairs).toEqual(expectedR.undefinedPairs);
    expect([correlation.rowsUsed, correlation.indefinite, correlation.repaired]).toEqual([expectedR.rowsUsed, expectedR.indefinite, expectedR.repaired]);
    expectClose(covariance.matrix.data, expectedCov.matrix.data, 1e-10);
    expect(Array.from(covariance.n.data)).toEqual(Array.from(expectedCov.n.data));
    expect(covariance.undefinedPairs).toEqual(expectedCov.undefinedPairs);
    expect(covariance.rowsUsed).toBe(expectedCov.rowsUsed);
  });

  // The integer path groups its exact sums differently (totals less the partner's missing rows,
  // Σwxy four partners at a time); exact integer sums make any grouping give the same bits as the
  // plain pair loop written out here.
  it('gives integer answers bit for bit the exact one-pass pair sums', () => {
    const rows = 400;
    const columns = 11; // two blocks of four partners and a remainder
    const matrix = randomMatrix(rows, columns, 0.15, 99);
    const { weights } = resample(rows, 5);
    const used = Array.from({ length: columns - 1 }, (__, j) => j);
    const result = weightedPearson(matrix, weights, used, 'pairwise')!;
    const order = used.length;
    for (let a = 0; a < order; a++) {
      for (let b = a + 1; b < order; b++) {
        let n = 0;
        let sx = 0;
        let sy = 0;
        let sxx = 0;
        let syy = 0;
        let sxy = 0;
        for (let i = 0; i < rows; i++) {
          const x = matrix.data[a * rows + i];
          const y = matrix.data[b * rows + i];
          if (x !== x || y !== y || weights[i] === 0) continue;
          n += weights[i];
          sx += weights[i] * x;
          sy += weights[i] * y;
          sxx += weights[i] * x * x;
          syy += weights[i] * y * y;
          sxy += weights[i] * x * y;
        }
        const centredXY = n * sxy - sx * sy;
        expect(result.correlation.matrix.data[a * order + b]).toBe(centredXY / Math.sqrt((n * sxx - sx * sx) * (n * syy - sy * sy)));
        expect(result.covariance.matrix.data[a * order + b]).toBe(centredXY / (n * (n - 1)));
        expect(result.correlation.n.data[a * order + b]).toBe(n);
      }
    }
  });

  // The masked products through the blocked kernel (three items of w∘X₀ by four doubles of X₀,
  // up to three items packed to a double, rows 256 at a time, the missing rows' complement row by
  // row) against the earlier pair loop, bit for bit: odd orders (tile remainders), more distinct
  // rows than one row tile, every packing (3 lanes: n·max² < 2^17; 2: < 2^26; 1: larger, or a
  // negative answer) and several missing patterns.
  function integerMatrix(rows: number, columns: number, seed: number, pattern: 'none' | 'scattered' | 'blocks' | 'item-gone', spread: { low: number; high: number }): ItemMatrix {
    const random = createSeededRandom(seed);
    const data = new Float64Array(rows * columns);
    const span = spread.high - spread.low;
    for (let i = 0; i < rows; i++) {
      const common = random.nextNormal();
      for (let j = 0; j < columns; j++) {
        const centred = 0.5 + (common * 0.6 + random.nextNormal() * 0.8) / 4;
        let value = Math.round(spread.low + span * Math.min(1, Math.max(0, centred)));
        if (pattern === 'scattered' && random.next() < 0.07) value = Number.NaN;
        if (pattern === 'blocks' && i % 17 < 3 && j % 5 < 2) value = Number.NaN;
        if (pattern === 'item-gone' && j === 1 && i % 3 !== 0) value = Number.NaN;
        data[j * rows + i] = value;
      }
    }
    return { rows, columns, data };
  }

  function expectSameBits(actual: Float64Array, expected: Float64Array): void {
    expect(actual.length).toBe(expected.length);
    let differing = 0;
    for (let t = 0; t < actual.length; t++) if (!Object.is(actual[t], expected[t])) differing++;
    expect(differing).toBe(0);
  }

  it.each([
    ['1 item, scattered missing, 3 lanes', 40, 1, 'scattered', 1, 5],
    ['2 items, complete, 3 lanes', 31, 2, 'none', 1, 5],
    ['5 items, scattered missing, 3 lanes', 157, 5, 'scattered', 1, 5],
    ['7 items, blocks missing, 700 rows (row tiles), 3 lanes', 700, 7, 'blocks', 1, 7],
    ['13 items, one item mostly missing, 3 lanes', 333, 13, 'item-gone', 0, 4],
    ['26 items, scattered missing, 2 lanes', 611, 26, 'scattered', 1, 30],
    ['11 items, complete, 2 lanes', 900, 11, 'none', 0, 100],
    ['10 items, scattered missing, 1 lane (large answers)', 301, 10, 'scattered', 0, 5000],
    ['9 items, blocks missing, 1 lane (negative answers)', 263, 9, 'blocks', -3, 3],
  ] as const)('equals the earlier pair loop bit for bit: %s', (_, rows, columns, pattern, low, high) => {
    const matrix = integerMatrix(rows, columns, rows * 31 + columns, pattern, { low, high });
    for (const seed of [3, 8]) {
      const { weights } = resample(rows, seed);
      const used = Array.from({ length: columns }, (__, j) => j);
      const expected = weightedPearsonReference(matrix, weights, used, 'pairwise')!;
      const actual = weightedPearson(matrix, weights, used, 'pairwise')!;
      expectSameBits(actual.correlation.matrix.data, expected.correlation.matrix.data);
      expectSameBits(actual.correlation.n.data, expected.correlation.n.data);
      expectSameBits(actual.covariance.matrix.data, expected.covariance.matrix.data);
      expectSameBits(actual.covariance.n.data, expected.covariance.n.data);
      expect(actual.correlation.undefinedPairs).toEqual(expected.correlation.undefinedPairs);
      expect(actual.covariance.undefinedPairs).toEqual(expected.covariance.undefinedPairs);
      expect([actual.correlation.rowsUsed, actual.correlation.indefinite, actual.correlation.repaired]).toEqual([
        expected.correlation.rowsUsed,
        expected.correlation.indefinite,
        expected.correlation.repaired,
      ]);
    }
  });

  it('gives the same bits when calls on two matrices and different item lists alternate (the thread scratch and the per-matrix rows are reused)', () => {
    const first = integerMatrix(257, 9, 5, 'scattered', { low: 1, high: 5 });
    const second = integerMatrix(180, 6, 6, 'blocks', { low: 0, high: 40 });
    const lists: [ItemMatrix, number[]][] = [
      [first, [0, 1, 2, 3, 4, 5, 6, 7, 8]],
      [second, [5, 0, 3]],
      [first, [8, 2, 2, 6]],
      [second, [0, 1, 2, 3, 4, 5]],
      [first, [4]],
    ];
    for (const seed of [11, 12]) {
      for (const [matrix, used] of lists) {
        const { weights } = resample(matrix.rows, seed);
        const expected = weightedPearsonReference(matrix, weights, used, 'pairwise')!;
        const actual = weightedPearson(matrix, weights, used, 'pairwise')!;
        expectSameBits(actual.correlation.matrix.data, expected.correlation.matrix.data);
        expectSameBits(actual.covariance.matrix.data, expected.covariance.matrix.data);
        expectSameBits(actual.covariance.n.data, expected.covariance.n.data);
      }
    }
  });

  it('declines listwise deletion when a drawn row misses an answer (the resample is computed as is then)', () => {
    const matrix = randomMatrix(100, 5, 0.1, 3);
    const { weights } = resample(100, 1);
    expect(weightedPearson(matrix, weights, [0, 1, 2, 3, 4], 'listwise')).toBeNull();
  });

  it('refuses weights that do not match the rows', () => {
    expect(() => weightedPearson(randomMatrix(10, 3, 0, 1), new Float64Array(9), [0, 1], 'pairwise')).toThrow(/9 weights for 10 rows/);
  });
});
