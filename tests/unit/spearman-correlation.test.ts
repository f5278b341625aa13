import { describe, expect, it } from 'vitest';
import { spearmanCorrelation } from '../../src/lib/stats/spearman-correlation';
import { correlationDataset, datasetColumn } from './correlation-fixtures';

describe('spearmanCorrelation', () => {
  it('ranks only the pair-complete rows, as R cor(method = "spearman", use = "pairwise") does', () => {
    const x = Object.freeze([2, NaN, 5, 5, 1, 7, 3, NaN, 4, 4]);
    const y = Object.freeze([1, 3, NaN, 6, 2, 8, 2, 5, 3, 9]);
    const result = spearmanCorrelation(x, y);
    // R 4.2.2: cor(x, y, method = "spearman", use = "pairwise.complete.obs")
    expect(result.r).toBeCloseTo(0.78181818181818186, 14);
    expect(result.n).toBe(7);
  });

  it('matches R on pairs of mtcars with holes and of the ordinal data sets to 1e-12', () => {
    for (const name of ['mtcars-holes', 'ordinal5', 'bfi']) {
      const dataset = correlationDataset(name);
      const limit = Math.min(dataset.columns, 6);
      for (let i = 0; i < limit; i++) {
        for (let j = i + 1; j < limit; j++) {
          const result = spearmanCorrelation(datasetColumn(dataset, i), datasetColumn(dataset, j));
          // R 4.2.2: cor(x, use = "pairwise.complete.obs", method = "spearman")[i, j]
          expect(Math.abs((result.r as number) - (dataset.spearmanPairwise[i][j] as number)), `${name} ${i},${j}`).toBeLessThan(1e-12);
        }
      }
    }
  });

  it('is 1 for any increasing transformation and −1 for a decreasing one', () => {
    const x = [0.3, 2, 1.1, 9, 4];
    expect(spearmanCorrelation(x, x.map((v) => Math.exp(v))).r).toBeCloseTo(1, 15);
    expect(spearmanCorrelation(x, x.map((v) => -(v ** 3))).r).toBeCloseTo(-1, 15);
  });

  it('reports an undefined correlation instead of NaN, and checks its inputs', () => {
    expect(spearmanCorrelation([5, 5, 5], [1, 2, 3]).undefinedReason).toBe('no-variation');
    expect(spearmanCorrelation([1, NaN], [1, 2]).undefinedReason).toBe('too-few-rows');
    expect(() => spearmanCorrelation([1], [1, 2])).toThrow(/spearmanCorrelation: vectors must have equal length/);
  });
});
