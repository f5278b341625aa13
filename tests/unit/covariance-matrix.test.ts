import { describe, expect, it } from 'vitest';
import { covarianceMatrix } from '../../src/lib/stats/covariance-matrix';
import { itemMatrixFromColumns, selectRespondents } from '../../src/lib/stats/types';
import { centeredCrossProducts } from '../../src/lib/stats/cross-products';
import { completeRows } from '../../src/lib/stats/complete-rows';
import { correlationDatasets, datasetMatrix, hasNaN } from './correlation-fixtures';

/** Largest relative difference, scaled by max(1, |expected|). */
function largestRelativeDifference(flat: Float64Array, rows: (number | null)[][]): number {
  let largest = 0;
  rows.forEach((row, i) =>
    row.forEach((value, j) => {
      largest = Math.max(largest, Math.abs(flat[i * rows.length + j] - (value as number)) / Math.max(1, Math.abs(value as number)));
    }),
  );
  return largest;
}

describe('covarianceMatrix', () => {
  it('matches R cov(use = "pairwise.complete.obs") and cov(use = "complete.obs") to 1e-9 on every data set', () => {
    for (const dataset of correlationDatasets()) {
      const matrix = datasetMatrix(dataset);
      const copy = Float64Array.from(matrix.data);
      const pairwise = covarianceMatrix(matrix, { missing: 'pairwise' });
      const listwise = covarianceMatrix(matrix, { missing: 'listwise' });
      expect(matrix.data).toEqual(copy);
      // R 4.2.2: cov(x, use = "pairwise.complete.obs")
      expect(largestRelativeDifference(pairwise.matrix.data, dataset.covariancePairwise), dataset.name).toBeLessThan(1e-9);
      // R 4.2.2: cov(x, use = "complete.obs")
      expect(largestRelativeDifference(listwise.matrix.data, dataset.covarianceListwise), dataset.name).toBeLessThan(1e-9);
      // R 4.2.2: crossprod(!is.na(x))
      expect(Array.from(pairwise.n.data)).toEqual(dataset.pairCounts.flat());
      expect(listwise.n.data.every((n) => n === dataset.completeRows)).toBe(true);
      expect(listwise.rowsUsed).toBe(dataset.completeRows);
      expect(pairwise.notices).toEqual([]);
    }
  });

  it('reports cells with fewer than 2 common respondents as 0, never NaN', () => {
    const matrix = itemMatrixFromColumns([
      [1, 2, 3, 4, NaN],
      [NaN, NaN, NaN, 5, 6],
      [NaN, NaN, NaN, NaN, NaN],
    ]);
    const result = covarianceMatrix(matrix, { missing: 'pairwise' });
    expect(hasNaN(result.matrix.data)).toBe(false);
    expect(result.matrix.data[0]).toBeCloseTo(5 / 3, 15); // var(1:4)
    expect(result.undefinedPairs).toEqual([[0, 1], [0, 2], [1, 2], [2, 2]]);
    expect(result.notices[0].code).toBe('covariance-undefined');
    expect(result.rowsUsed).toBe(5);
    const listwise = covarianceMatrix(matrix, { missing: 'listwise' });
    expect(listwise.rowsUsed).toBe(0);
    expect(hasNaN(listwise.matrix.data)).toBe(false);
    expect(listwise.undefinedPairs.length).toBe(6);
  });

  it('checks its inputs', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3]]);
    expect(() => covarianceMatrix(matrix, { missing: 'all' as never })).toThrow(/covarianceMatrix: missing must be pairwise or listwise/);
    expect(() => covarianceMatrix(itemMatrixFromColumns([[1, -Infinity]]), { missing: 'pairwise' })).toThrow(/infinite value/);
  });
});

describe('covarianceMatrix with cross-products from the caller', () => {
  it('gives bit for bit the same result as its own pass under listwise deletion and on complete data', () => {
    // Identity: the cross-products handed in are those the function would compute itself.
    for (const dataset of correlationDatasets()) {
      const matrix = datasetMatrix(dataset);
      const complete = completeRows(matrix);
      if (complete.length < 2) continue;
      const rows = selectRespondents(matrix, complete);
      const crossProducts = centeredCrossProducts(rows);
      const own = covarianceMatrix(matrix, { missing: 'listwise' });
      const given = covarianceMatrix(matrix, { missing: 'listwise', crossProducts });
      expect(Array.from(given.matrix.data)).toEqual(Array.from(own.matrix.data));
      expect(Array.from(given.n.data)).toEqual(Array.from(own.n.data));
      expect(given.rowsUsed).toBe(own.rowsUsed);
      const pairwise = covarianceMatrix(rows, { missing: 'pairwise', crossProducts });
      expect(Array.from(pairwise.matrix.data)).toEqual(Array.from(covarianceMatrix(rows, { missing: 'pairwise' }).matrix.data));
      expect(pairwise.rowsUsed).toBe(rows.rows);
    }
  });

  it('refuses cross-products for pairwise deletion with missing answers or of other rows', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3, 4, 5], [2, 1, 4, 3, 5], [5, 3, NaN, 1, 2]]);
    const crossProducts = centeredCrossProducts(selectRespondents(matrix, completeRows(matrix)));
    expect(() => covarianceMatrix(matrix, { missing: 'pairwise', crossProducts })).toThrow(/pairwise deletion with missing/);
    expect(() => covarianceMatrix(matrix, { missing: 'listwise', crossProducts: centeredCrossProducts(selectRespondents(matrix, [0, 1])) })).toThrow(/cover 2 rows/);
  });

  it('uses the cross-products it is given rather than passing over the data again', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3, 4, 5], [2, 1, 4, 3, 5]]);
    const own = centeredCrossProducts(matrix);
    const doubled = { ...own, centered: { order: 2, data: own.centered.data.map((value) => 2 * value) } };
    // Hand-worked: Σ(x − 3)² = 10 over n − 1 = 4 gives 2.5; doubled sums give 5.
    expect(covarianceMatrix(matrix, { missing: 'listwise' }).matrix.data[0]).toBe(2.5);
    expect(covarianceMatrix(matrix, { missing: 'listwise', crossProducts: doubled }).matrix.data[0]).toBe(5);
  });
});
