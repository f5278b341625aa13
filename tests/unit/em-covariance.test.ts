import { describe, expect, it } from 'vitest';
import { belsleyCollinearity, belsleyCollinearityFromMoments } from '../../src/lib/stats/belsley-collinearity';
import { centeredCrossProducts } from '../../src/lib/stats/cross-products';
import { emCovariance, EmEstimateRefusal } from '../../src/lib/stats/em-covariance';
import { itemMatrixFromRows } from '../../src/lib/stats/types';
import { emFixture, largestDifference } from './local-dependence-fixtures';

function matrixOf(rows: (number | null)[][]) {
  return itemMatrixFromRows(rows.map((row) => row.map((value) => (value === null ? Number.NaN : value))));
}

describe('emCovariance', () => {
  it.each(emFixture.cases.map((c) => [c.name, c] as const))('matches an EM written in base R, and lavaan\'s saturated ML fit, on %s', (_name, reference) => {
    const matrix = matrixOf(reference.data);
    const before = Float64Array.from(matrix.data);
    const result = emCovariance(matrix);
    expect(result.converged).toBe(true);
    expect(result.rows).toBe(reference.em.rows);
    expect(result.completeRows).toBe(reference.completeRows);
    // R 4.2.2: emNormal(x, tol = 1e-13)$means and $covariance in scripts/reference/em-covariance.R
    reference.em.means.forEach((mean, j) => expect(Math.abs(result.means[j] - mean)).toBeLessThan(1e-9));
    expect(largestDifference(result.covariance, reference.em.covariance)).toBeLessThan(1e-9);
    // R 4.2.2 lavaan 0.6.14: lavInspect(lavCor(x, missing = 'ml', output = 'fit'), 'implied'), an optimiser's answer (agrees to < 5e-6)
    reference.lavaan.means.forEach((mean, j) => expect(Math.abs(result.means[j] - mean)).toBeLessThan(2e-5));
    expect(largestDifference(result.covariance, reference.lavaan.covariance)).toBeLessThan(2e-5);
    expect(matrix.data).toEqual(before);
  });

  it('gives the complete-data ML moments when nothing is missing (one iteration settles)', () => {
    const reference = emFixture.cases[1];
    const rows = reference.data.filter((row) => row.every((value) => value !== null)) as number[][];
    const matrix = itemMatrixFromRows(rows);
    const result = emCovariance(matrix);
    const { means, centered } = centeredCrossProducts(matrix);
    // Identity: with complete data the ML covariance is the centred cross-product over n.
    means.forEach((mean, j) => expect(result.means[j]).toBeCloseTo(mean, 12));
    centered.data.forEach((value, index) => expect(result.covariance.data[index]).toBeCloseTo(value / rows.length, 12));
    expect(result.iterations).toBeLessThanOrEqual(2);
  });

  it('leaves out respondents who answered nothing, and rejects constant items and exact copies', () => {
    const withEmpty = itemMatrixFromRows([
      [1, 2, 3],
      [2, 3, 1],
      [Number.NaN, Number.NaN, Number.NaN],
      [3, 1, 2],
      [4, Number.NaN, 5],
      [2, 3, 3],
    ]);
    const result = emCovariance(withEmpty);
    expect(result.rows).toBe(5);
    expect(result.rowsWithoutAnswers).toBe(1);
    expect(() => emCovariance(itemMatrixFromRows([[1, 2], [1, 3], [1, 4]]))).toThrow(/item\(s\) 0 have fewer than two answers or no variation/);
    const copies = itemMatrixFromRows([
      [1, 1, 2],
      [2, 2, 1],
      [3, 3, 5],
      [4, 4, Number.NaN],
      [2, 2, 3],
    ]);
    expect(() => emCovariance(copies)).toThrow(/singular/);
    // The reason, for callers that say why they fell back to complete rows (compute-evidence.ts).
    const reasonOf = (matrix: Parameters<typeof emCovariance>[0]): string | null => {
      try {
        emCovariance(matrix);
        return null;
      } catch (error) {
        return error instanceof EmEstimateRefusal ? error.reason : 'another error';
      }
    };
    expect(reasonOf(copies)).toBe('singular');
    expect(reasonOf(itemMatrixFromRows([[1, 2], [1, 3], [1, 4]]))).toBe('items-without-variance');
  });
});

describe('belsleyCollinearityFromMoments', () => {
  it.each(emFixture.cases.map((c) => [c.name, c] as const))('matches BKW of the EM moments computed in R on %s', (_name, reference) => {
    const em = emCovariance(matrixOf(reference.data));
    const result = belsleyCollinearityFromMoments(em.means, em.covariance, em.rows);
    expect(result.rowsUsed).toBe(reference.em.rows);
    // R 4.2.2: bkwFromMoments(em$means, em$covariance, em$rows) in scripts/reference/em-covariance.R (eigen of the scaled X'X)
    reference.bkw.singularValues.forEach((d, k) => expect(Math.abs(result.singularValues[k] - d)).toBeLessThan(1e-8));
    reference.bkw.conditionIndices.forEach((eta, k) => expect(Math.abs((result.conditionIndices[k] as number) - eta) / eta).toBeLessThan(1e-7));
    reference.bkw.proportions.forEach((row, k) => row.forEach((value, j) => expect(Math.abs(result.varianceProportions[k][j] - value)).toBeLessThan(1e-6)));
  });

  it('equals the complete-row diagnostics when the moments come from complete data', () => {
    const reference = emFixture.cases[0];
    const rows = reference.data.filter((row) => row.every((value) => value !== null)) as number[][];
    const matrix = itemMatrixFromRows(rows);
    const { means, centered } = centeredCrossProducts(matrix);
    const covariance = { order: centered.order, data: centered.data.map((value) => value / rows.length) };
    const fromMoments = belsleyCollinearityFromMoments(means, covariance, rows.length);
    const fromRows = belsleyCollinearity(matrix, { path: 'qr' });
    // Identity: X'X/n = Σ + μμᵀ, so both routes see the same scaled Gram matrix.
    fromRows.singularValues.forEach((d, k) => expect(Math.abs(fromMoments.singularValues[k] - d)).toBeLessThan(1e-9));
    fromRows.varianceProportions.forEach((row, k) => row.forEach((value, j) => expect(Math.abs(fromMoments.varianceProportions[k][j] - value)).toBeLessThan(1e-6)));
  });

  it('rejects mismatched input', () => {
    expect(() => belsleyCollinearityFromMoments([1, 2], { order: 1, data: Float64Array.of(1) }, 10)).toThrow(/order/);
    expect(() => belsleyCollinearityFromMoments([1], { order: 1, data: Float64Array.of(1) }, 0)).toThrow(/rows/);
  });
});
