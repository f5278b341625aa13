import { describe, expect, it } from 'vitest';
import { itemDescriptives } from '../../src/lib/stats/item-descriptives';
import { itemMatrixFromColumns } from '../../src/lib/stats/types';
import { correlationDatasets, datasetMatrix } from './correlation-fixtures';

describe('itemDescriptives', () => {
  it('matches R mean, sd, range and floor/ceiling shares on every data set', () => {
    for (const dataset of correlationDatasets()) {
      const matrix = datasetMatrix(dataset);
      const copy = Float64Array.from(matrix.data);
      const result = itemDescriptives(matrix);
      expect(matrix.data).toEqual(copy); // not mutated
      dataset.descriptives.forEach((expected, j) => {
        // R 4.2.2 over the observed values v: length(v), mean(v), sd(v), min(v), max(v),
        // mean(v == min(v)), mean(v == max(v))
        const item = result[j];
        expect(item.n).toBe(expected.n);
        expect(item.missing).toBe(dataset.rows - expected.n);
        expect(Math.abs((item.mean as number) - expected.mean) / Math.max(1, Math.abs(expected.mean))).toBeLessThan(1e-12);
        expect(Math.abs((item.standardDeviation as number) - expected.sd) / Math.max(1, expected.sd)).toBeLessThan(1e-12);
        expect(item.minimum).toBe(expected.min);
        expect(item.maximum).toBe(expected.max);
        expect(item.floorShare).toBeCloseTo(expected.floorShare, 14);
        expect(item.ceilingShare).toBeCloseTo(expected.ceilingShare, 14);
        expect(item.floorEffect).toBe(expected.floorShare > 0.15);
        expect(item.ceilingEffect).toBe(expected.ceilingShare > 0.15);
      });
    }
  });

  it('uses the stated range for floor and ceiling, counts answers outside it, and flags above 15%', () => {
    // 20 answers on a 1-5 scale: 4 at 5 (20%) and 3 at 1 (15%, not above); a second item never reaches 5.
    const first = [1, 1, 1, 2, 2, 3, 3, 3, 3, 3, 3, 4, 4, 4, 4, 4, 5, 5, 5, 5];
    const second = [2, 2, 3, 3, 3, 3, 3, 3, 3, 4, 4, 4, 4, 4, 4, 4, 4, 4, 4, 7];
    const matrix = itemMatrixFromColumns([first, second]);
    const [a, b] = itemDescriptives(matrix, { ranges: [{ min: 1, max: 5 }, { min: 1, max: 5 }] });
    expect(a.floorShare).toBe(0.15);
    expect(a.floorEffect).toBe(false);
    expect(a.ceilingShare).toBe(0.2);
    expect(a.ceilingEffect).toBe(true);
    expect(b.floorValue).toBe(1);
    expect(b.floorShare).toBe(0);
    expect(b.ceilingShare).toBe(0);
    expect(b.outOfRange).toBe(1);
    // Without a range the observed extremes are the categories.
    const [, observed] = itemDescriptives(matrix);
    expect(observed.floorValue).toBe(2);
    expect(observed.floorShare).toBe(0.1);
    expect(observed.ceilingValue).toBe(7);
  });

  it('gives nulls, not NaN, for an item without answers or with one answer', () => {
    const matrix = itemMatrixFromColumns([[NaN, NaN, NaN], [4, NaN, NaN]]);
    const [none, one] = itemDescriptives(matrix);
    expect(none).toMatchObject({ n: 0, missing: 3, missingRate: 1, mean: null, standardDeviation: null, floorShare: null, floorEffect: false });
    expect(one).toMatchObject({ n: 1, mean: 4, standardDeviation: null, floorShare: 1, ceilingShare: 1 });
    expect(one.missingRate).toBeCloseTo(2 / 3, 15);
  });

  it('checks its inputs', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3]]);
    expect(() => itemDescriptives(matrix, { ranges: [] })).toThrow(/itemDescriptives: ranges must have one entry per item/);
    expect(() => itemDescriptives(matrix, { ranges: [{ min: 5, max: 1 }] })).toThrow(/finite with min < max/);
    expect(() => itemDescriptives(itemMatrixFromColumns([[1, Infinity]]))).toThrow(/infinite value/);
    expect(() => itemDescriptives({ rows: 2, columns: 1, data: new Float64Array(3) })).toThrow(RangeError);
  });
});
