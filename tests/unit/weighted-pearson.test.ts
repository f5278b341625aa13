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

  it('declines listwise deletion when a drawn row misses an answer (the resample is computed as is then)', () => {
    const matrix = randomMatrix(100, 5, 0.1, 3);
    const { weights } = resample(100, 1);
    expect(weightedPearson(matrix, weights, [0, 1, 2, 3, 4], 'listwise')).toBeNull();
  });

  it('refuses weights that do not match the rows', () => {
    expect(() => weightedPearson(randomMatrix(10, 3, 0, 1), new Float64Array(9), [0, 1], 'pairwise')).toThrow(/9 weights for 10 rows/);
  });
});
