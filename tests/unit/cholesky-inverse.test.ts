/**
 * choleskyInverse against the closed form of a 2 × 2 correlation matrix and against the spectral
 * inverse (eigen path) on generated correlation matrices of odd orders; varianceInflationFromInverse
 * against varianceInflation; inflationWithInverse (bootstrap resamples) against
 * inflationAndSpectrum with the earlier eigen-path inverse.
 */
import { describe, expect, it } from 'vitest';
import { inflationAndSpectrum, inflationWithInverse } from '../../src/lib/engine/inflation-evidence';
import type { EngineItem } from '../../src/lib/engine/types';
import { choleskyInverse } from '../../src/lib/stats/cholesky-inverse';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { spectralInverse } from '../../src/lib/stats/spectral-inverse';
import { symmetricEigen, symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import type { SquareMatrix } from '../../src/lib/stats/types';
import { varianceInflation, varianceInflationFromInverse } from '../../src/lib/stats/variance-inflation';

function generatedCorrelation(rows: number, columns: number, seed: number, twin = false): SquareMatrix {
  const random = createSeededRandom(seed);
  const data = new Float64Array(rows * columns);
  for (let i = 0; i < rows; i++) {
    const common = random.nextNormal();
    for (let j = 0; j < columns; j++) {
      data[j * rows + i] = twin && j === columns - 1 ? data[i] + 0.05 * random.nextNormal() : common * 0.7 + random.nextNormal();
    }
  }
  return correlationMatrix({ rows, columns, data }, { method: 'pearson', missing: 'pairwise' }).matrix;
}

function engineItem(id: string): EngineItem {
  return { id, scale: null, text: null, locked: false, min: null, max: null };
}

function largestRelativeDifference(actual: Float64Array, expected: Float64Array): number {
  let worst = 0;
  for (let t = 0; t < actual.length; t++) worst = Math.max(worst, Math.abs(actual[t] - expected[t]) / Math.max(1, Math.abs(expected[t])));
  return worst;
}

describe('choleskyInverse', () => {
  it('gives the closed form of a 2 × 2 correlation matrix, 1 / (1 − r²) · [[1, −r], [−r, 1]]', () => {
    const r = 0.6;
    const inverse = choleskyInverse({ order: 2, data: Float64Array.from([1, r, r, 1]) })!;
    const scale = 1 / (1 - r * r);
    [scale, -r * scale, -r * scale, scale].forEach((expected, t) => expect(inverse.data[t]).toBeCloseTo(expected, 14));
  });

  it.each([
    [1, 50, 1],
    [3, 80, 2],
    [7, 200, 3],
    [13, 300, 4],
    [40, 500, 5],
    [101, 1000, 6],
  ])('equals the spectral inverse to 1e-10 relative at order %i', (order, rows, seed) => {
    const correlation = generatedCorrelation(rows, order, seed);
    const expected = spectralInverse(symmetricEigen(correlation))!;
    const actual = choleskyInverse(correlation)!;
    expect(actual.order).toBe(order);
    expect(largestRelativeDifference(actual.data, expected.data)).toBeLessThan(1e-10);
    // Symmetric exactly, and R·R⁻¹ = I.
    for (let i = 0; i < order; i++) {
      for (let j = 0; j < order; j++) {
        expect(actual.data[i * order + j]).toBe(actual.data[j * order + i]);
        let product = 0;
        for (let k = 0; k < order; k++) product += correlation.data[i * order + k] * actual.data[k * order + j];
        expect(Math.abs(product - (i === j ? 1 : 0))).toBeLessThan(1e-10);
      }
    }
  });

  it('returns null for a matrix that is not positive definite', () => {
    expect(choleskyInverse({ order: 2, data: Float64Array.from([1, 1, 1, 1]) })).toBeNull();
    expect(choleskyInverse({ order: 3, data: Float64Array.from([1, 0.9, -0.9, 0.9, 1, 0.9, -0.9, 0.9, 1]) })).toBeNull();
  });
});

describe('varianceInflationFromInverse and inflationWithInverse', () => {
  it.each([
    ['12 items', 12, 400, 11, false],
    ['33 items with a near twin', 33, 600, 12, true],
  ])('equal the eigen path to 1e-10 relative: %s', (_, order, rows, seed, twin) => {
    const correlation = generatedCorrelation(rows, order, seed, twin);
    const expected = varianceInflation(correlation);
    const actual = varianceInflationFromInverse(correlation, choleskyInverse(correlation)!);
    expect(actual.exactDependencies).toEqual([]);
    expect(actual.notices).toEqual([]);
    actual.items.forEach((item, j) => {
      expect(Math.abs((item.vif as number) - (expected.items[j].vif as number)) / (expected.items[j].vif as number)).toBeLessThan(1e-10);
      expect(item.topPartner).toEqual(expected.items[j].topPartner);
    });

    const items: EngineItem[] = Array.from({ length: order + 1 }, (__, j) => engineItem(`q${j}`));
    const usable = Array.from({ length: order }, (__, k) => k + 1);
    const before = inflationAndSpectrum(correlation, items, usable);
    const after = inflationWithInverse(correlation, items, usable);
    expect(after.eigenvalues).toEqual(before.eigenvalues);
    expect(after.conditionNumber).toBe(before.conditionNumber);
    expect(after.exactDependencies).toEqual(before.exactDependencies);
    expect(after.topPartner).toEqual(before.topPartner);
    expect(after.warnings).toEqual(before.warnings);
    after.vif.forEach((vif, j) => (j === 0 ? expect(vif).toBeNull() : expect(Math.abs((vif as number) - (before.vif[j] as number)) / (before.vif[j] as number)).toBeLessThan(1e-10)));
    expect(largestRelativeDifference(after.inverse!.data, spectralInverse(before.eigen)!.data)).toBeLessThan(1e-10);
  });

  it('falls back to the eigen path, with no inverse, for a singular matrix (an exact copy)', () => {
    const base = generatedCorrelation(300, 4, 21);
    const order = 5;
    const data = new Float64Array(order * order);
    const source = (k: number): number => (k === 4 ? 0 : k);
    for (let i = 0; i < order; i++) for (let j = 0; j < order; j++) data[i * order + j] = i === j ? 1 : base.data[source(i) * 4 + source(j)];
    const correlation = { order, data };
    const items: EngineItem[] = Array.from({ length: order }, (__, j) => engineItem(`q${j}`));
    const usable = [0, 1, 2, 3, 4];
    const before = inflationAndSpectrum(correlation, items, usable);
    const after = inflationWithInverse(correlation, items, usable);
    expect(after.inverse).toBeNull();
    expect(after.exactDependencies).toEqual(before.exactDependencies);
    expect(after.exactDependencies.length).toBe(1);
    expect(after.vif).toEqual(before.vif);
  });

  it('reuses the eigenvalues of the correlation check (pairwise with missing answers): the same values, the same figures', () => {
    const random = createSeededRandom(77);
    const rows = 300;
    const columns = 9;
    const data = new Float64Array(rows * columns);
    for (let i = 0; i < rows; i++) {
      const common = random.nextNormal();
      for (let j = 0; j < columns; j++) data[j * rows + i] = random.next() < 0.1 ? Number.NaN : Math.round(3 + common + random.nextNormal());
    }
    const correlation = correlationMatrix({ rows, columns, data }, { method: 'pearson', missing: 'pairwise' });
    expect(correlation.repaired).toBe(false);
    expect(Array.from(correlation.eigenvalues!)).toEqual(Array.from(symmetricEigenvalues(correlation.matrix)));
    const items = Array.from({ length: columns }, (__, j) => engineItem(`q${j}`));
    const usable = items.map((__, j) => j);
    const reused = inflationWithInverse(correlation.matrix, items, usable, correlation.eigenvalues);
    const computed = inflationWithInverse(correlation.matrix, items, usable);
    expect(reused).toEqual(computed);
    expect(() => inflationWithInverse(correlation.matrix, items, usable, new Float64Array(3))).toThrow(/3 eigenvalues/);
  });
});
