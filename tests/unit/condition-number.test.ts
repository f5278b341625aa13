import { describe, expect, it } from 'vitest';
import { conditionNumber } from '../../src/lib/stats/condition-number';
import { symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import {
  allFinite,
  completeItemMatrix,
  dataset,
  indefiniteCorrelation,
  overlapFixture,
  pearsonOf,
  permuteSquare,
  referenceCorrelation,
  relativeError,
  reverseItem,
} from './overlap-fixtures';

describe('conditionNumber', () => {
  it('equals sqrt(max/min eigenvalue) from R to 1e-10 on every dataset', () => {
    // R 4.2.2: ev <- eigen(cor(X), symmetric = TRUE)$values; sqrt(max(ev) / min(ev))
    for (const entry of overlapFixture.datasets) {
      const result = conditionNumber(referenceCorrelation(entry));
      expect(relativeError(result.value!, entry.conditionNumber.value), entry.name).toBeLessThan(1e-10);
      expect(relativeError(result.largestEigenvalue, entry.eigen.values[0])).toBeLessThan(1e-12);
      expect(result.notices).toEqual([]);
    }
  });

  it('has the closed form sqrt((1 + |r|)/(1 − |r|)) for two items', () => {
    // Eigenvalues of [[1, r], [r, 1]] are 1 ± r
    expect(conditionNumber(squareMatrixFromRows([[1, -0.8], [-0.8, 1]])).value).toBeCloseTo(3, 13);
    expect(conditionNumber(squareMatrixFromRows([[1]])).value).toBe(1);
  });

  it('does not change when items are reordered or an item is reverse-keyed', () => {
    const entry = dataset('attitude');
    const matrix = completeItemMatrix(entry);
    const reversed = pearsonOf(reverseItem(matrix, 2, 40, 90));
    // R 4.2.2: sqrt(max/min eigen(cor(attitude[, -1]))$values)
    expect(relativeError(conditionNumber(reversed).value!, entry.conditionNumber.value)).toBeLessThan(1e-10);
    const permuted = permuteSquare(referenceCorrelation(entry), [5, 0, 3, 1, 4, 2]);
    expect(relativeError(conditionNumber(permuted).value!, entry.conditionNumber.value)).toBeLessThan(1e-10);
  });

  it('reuses given eigenvalues', () => {
    const R = referenceCorrelation(dataset('swiss'));
    expect(conditionNumber(R, { eigenvalues: symmetricEigenvalues(R) })).toEqual(conditionNumber(R));
    expect(() => conditionNumber(R, { eigenvalues: [2, 1] })).toThrow(/2 eigenvalues given for a matrix of order 5/);
  });

  it('reports a singular matrix as null with an exact-dependency notice', () => {
    const duplicate = squareMatrixFromRows([[1, 1, 0.3], [1, 1, 0.3], [0.3, 0.3, 1]]);
    const result = conditionNumber(duplicate);
    expect(result.value).toBeNull();
    expect(result.notices[0].code).toBe('exact-dependency');
    expect(allFinite(result)).toBe(true);
  });

  it('reports an indefinite matrix as null with an indefinite-matrix notice', () => {
    const result = conditionNumber(indefiniteCorrelation());
    expect(result.value).toBeNull();
    expect(result.smallestEigenvalue).toBeLessThan(0);
    expect(result.notices[0].code).toBe('indefinite-matrix');
  });
});
