import { describe, expect, it } from 'vitest';
import { repairCorrelationMatrix } from '../../src/lib/stats/nearest-correlation';
import { symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import { squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
import { varianceInflation } from '../../src/lib/stats/variance-inflation';
import { allFinite, dataset, overlapFixture, referenceCorrelation } from './overlap-fixtures';

function expectCorrelationMatrix(matrix: SquareMatrix, floor: number): void {
  const n = matrix.order;
  for (let i = 0; i < n; i++) {
    expect(matrix.data[i * n + i]).toBe(1);
    for (let j = 0; j < n; j++) expect(matrix.data[i * n + j]).toBe(matrix.data[j * n + i]);
  }
  expect(symmetricEigenvalues(matrix)[n - 1]).toBeGreaterThanOrEqual(floor * 0.5);
}

describe('repairCorrelationMatrix', () => {
  it('finds Higham’s nearest correlation matrix as Matrix::nearPD does, to 1e-6', () => {
    // R 4.2.2, Matrix 1.5.3: Matrix::nearPD(A, corr = TRUE, do2eigen = FALSE, conv.tol = 1e-13)
    for (const reference of overlapFixture.nearestCorrelation) {
      const input = squareMatrixFromRows(reference.input);
      const result = repairCorrelationMatrix(input, { method: 'higham', eigenvalueFloor: 0 });
      expect(result.repaired, reference.name).toBe(true);
      expect(result.converged).toBe(true);
      expect(result.smallestEigenvalueBefore).toBeCloseTo(reference.inputEigenvalues.at(-1)!, 12);
      const n = input.order;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) expect(Math.abs(result.matrix.data[i * n + j] - reference.nearest[i][j]), `${reference.name} (${i}, ${j})`).toBeLessThan(1e-6);
      }
    }
  });

  it('reproduces Higham’s (2002) published 3 × 3 example to four decimals', () => {
    // Higham 2002, IMA J. Numer. Anal. 22, §4: A = [1 1 0; 1 1 1; 0 1 1] → off-diagonal 0.7607, 0.1573
    const result = repairCorrelationMatrix(squareMatrixFromRows([[1, 1, 0], [1, 1, 1], [0, 1, 1]]));
    expect(result.matrix.data[1]).toBeCloseTo(0.7607, 4);
    expect(result.matrix.data[2]).toBeCloseTo(0.1573, 4);
    expect(result.matrix.data[5]).toBeCloseTo(0.7607, 4);
  });

  it('leaves an invertible, repaired matrix with a unit diagonal and reports the change', () => {
    for (const method of ['higham', 'clip'] as const) {
      const input = squareMatrixFromRows(overlapFixture.nearestCorrelation[2].input);
      const before = Float64Array.from(input.data);
      const result = repairCorrelationMatrix(input, { method });
      expect(Array.from(input.data)).toEqual(Array.from(before));
      expect(result.method).toBe(method);
      expectCorrelationMatrix(result.matrix, 1e-8);
      let sum = 0;
      let largest = 0;
      for (let index = 0; index < before.length; index++) {
        const change = Math.abs(result.matrix.data[index] - before[index]);
        sum += change * change;
        largest = Math.max(largest, change);
      }
      expect(result.frobeniusChange).toBeCloseTo(Math.sqrt(sum), 14);
      expect(result.largestChange).toBe(largest);
      expect(result.largestChange).toBeGreaterThan(0.01);
      expect(result.notices[0]).toMatchObject({ code: 'matrix-repaired', items: [0, 1, 2, 3, 4] });
      // The repaired matrix has VIFs (no exact dependency, not indefinite).
      expect(varianceInflation(result.matrix).items.every((item) => item.vif !== null)).toBe(true);
    }
  });

  it('moves the matrix less with Higham’s method than with clipping (it is the nearest)', () => {
    const input = squareMatrixFromRows(overlapFixture.nearestCorrelation[2].input);
    const higham = repairCorrelationMatrix(input, { method: 'higham' });
    const clip = repairCorrelationMatrix(input, { method: 'clip' });
    expect(higham.frobeniusChange).toBeLessThan(clip.frobeniusChange);
  });

  it('does not touch a positive semi-definite matrix, a singular one included', () => {
    const R = referenceCorrelation(dataset('mtcars'));
    const result = repairCorrelationMatrix(R);
    expect(result.repaired).toBe(false);
    expect(result.method).toBeNull();
    expect(Array.from(result.matrix.data)).toEqual(Array.from(R.data));
    expect(result.matrix.data).not.toBe(R.data);
    // An exact duplicate is an exact dependency (reported by VIF), not an indefinite matrix.
    const singular = repairCorrelationMatrix(squareMatrixFromRows([[1, 1, 0.3], [1, 1, 0.3], [0.3, 0.3, 1]]));
    expect(singular.repaired).toBe(false);
    expect(allFinite(singular)).toBe(true);
  });

  it('reports a sweep limit that was hit, still returning a valid correlation matrix', () => {
    const result = repairCorrelationMatrix(squareMatrixFromRows(overlapFixture.nearestCorrelation[2].input), { maxIterations: 2 });
    expect(result.converged).toBe(false);
    expect(result.iterations).toBe(2);
    expect(result.notices.map((notice) => notice.code)).toEqual(['matrix-repaired', 'repair-not-converged']);
    expectCorrelationMatrix(result.matrix, 1e-8);
  });

  it('refuses bad options', () => {
    const input = squareMatrixFromRows([[1, 0.5], [0.5, 1]]);
    expect(() => repairCorrelationMatrix(input, { eigenvalueFloor: 1 })).toThrow(/eigenvalueFloor/);
    expect(() => repairCorrelationMatrix(input, { maxIterations: 0 })).toThrow(/maxIterations/);
    expect(() => repairCorrelationMatrix(input, { tolerance: 0 })).toThrow(/tolerance/);
  });
});
