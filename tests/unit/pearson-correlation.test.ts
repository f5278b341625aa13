import { describe, expect, it } from 'vitest';
import { pearsonCorrelation } from '../../src/lib/stats/pearson-correlation';
import { correlationDataset, datasetColumn } from './correlation-fixtures';

describe('pearsonCorrelation', () => {
  it('uses the pair-complete rows with their own means, as R does', () => {
    const x = Object.freeze([2, NaN, 5, 5, 1, 7, 3, NaN, 4, 4]);
    const y = Object.freeze([1, 3, NaN, 6, 2, 8, 2, 5, 3, 9]);
    const result = pearsonCorrelation(x, y);
    // R 4.2.2: cor(x, y, use = "pairwise.complete.obs")
    expect(result.r).toBeCloseTo(0.75890527584508882, 14);
    expect(result.n).toBe(7);
    expect(result.undefinedReason).toBeNull();
  });

  it('matches R on every pair of mtcars with holes and of bfi to 1e-12', () => {
    for (const name of ['mtcars-holes', 'bfi']) {
      const dataset = correlationDataset(name);
      const limit = Math.min(dataset.columns, 8);
      for (let i = 0; i < limit; i++) {
        for (let j = i + 1; j < limit; j++) {
          const result = pearsonCorrelation(datasetColumn(dataset, i), datasetColumn(dataset, j));
          // R 4.2.2: cor(x, use = "pairwise.complete.obs")[i, j] and crossprod(!is.na(x))[i, j]
          expect(Math.abs((result.r as number) - (dataset.pearsonPairwise[i][j] as number)), `${name} ${i},${j}`).toBeLessThan(1e-12);
          expect(result.n).toBe(dataset.pairCounts[i][j]);
        }
      }
    }
  });

  it('gives ±1 for exact linear relations and is invariant to location and scale', () => {
    const x = [1, 4, 2, 8, 5, 7];
    expect(pearsonCorrelation(x, x).r).toBe(1);
    expect(pearsonCorrelation(x, x.map((v) => 10 - 3 * v)).r).toBeCloseTo(-1, 15);
    const y = [2, 3, 3, 9, 4, 6];
    expect(pearsonCorrelation(x.map((v) => 1e6 + 0.5 * v), y).r).toBeCloseTo(pearsonCorrelation(x, y).r as number, 12);
  });

  it('reports an undefined correlation instead of NaN', () => {
    expect(pearsonCorrelation([1, 2, NaN, 4], [NaN, 1, 2, 3])).toEqual({ r: null, n: 2, undefinedReason: 'too-few-rows' });
    expect(pearsonCorrelation([3, 3, 3, 3], [1, 2, 3, 4])).toEqual({ r: null, n: 4, undefinedReason: 'no-variation' });
    // Varies overall but not on the rows both answered.
    expect(pearsonCorrelation([0.1, 0.1, 0.1, 9], [1, 2, 3, NaN]).undefinedReason).toBe('no-variation');
  });

  it('checks its inputs', () => {
    expect(() => pearsonCorrelation([1, 2], [1, 2, 3])).toThrow(/pearsonCorrelation: vectors must have equal length/);
    expect(() => pearsonCorrelation([1, Infinity, 3], [1, 2, 3])).toThrow(/value 1 is infinite/);
  });
});
