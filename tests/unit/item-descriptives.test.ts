import { describe, expect, it } from 'vitest';
import { itemDescriptives } from '../../src/lib/stats/item-descriptives';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { itemMatrixFromColumns, selectRespondents } from '../../src/lib/stats/types';
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

  it('reads a bootstrap resample from weights on the original rows as it reads the resample itself', () => {
    // Rating answers with gaps; a resample draws rows with replacement. Counts, shares, extremes
    // and the mean of integer answers are exact either way (Object.is); the spread agrees to rounding.
    const random = createSeededRandom(41);
    const rows = 300;
    const columns = Array.from({ length: 6 }, (_, j) => Array.from({ length: rows }, () => (random.next() < 0.08 ? NaN : 1 + Math.floor(random.next() * (j === 5 ? 1 : 5)))));
    const matrix = itemMatrixFromColumns(columns);
    const ranges = columns.map((_, j) => (j === 0 ? null : { min: 1, max: 5 }));
    for (let resample = 0; resample < 5; resample++) {
      const drawn = Array.from({ length: rows }, () => random.nextInt(rows));
      const weights = new Float64Array(rows);
      for (const i of drawn) weights[i]++;
      const direct = itemDescriptives(selectRespondents(matrix, drawn), { ranges });
      const weighted = itemDescriptives(matrix, { ranges, weights });
      direct.forEach((expected, j) => {
        const { standardDeviation, ...exact } = weighted[j];
        const { standardDeviation: expectedSd, ...expectedExact } = expected;
        for (const key of Object.keys(expectedExact) as (keyof typeof expectedExact)[]) {
          expect(Object.is(exact[key], expectedExact[key]), `resample ${resample}, item ${j}, ${key}`).toBe(true);
        }
        if (expectedSd === null) expect(standardDeviation).toBeNull();
        else expect(Math.abs((standardDeviation as number) - expectedSd)).toBeLessThan(1e-13);
      });
    }
    expect(() => itemDescriptives(matrix, { weights: new Float64Array(rows - 1) })).toThrow(/weights must have one entry per row/);
  });

  it('checks its inputs', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3]]);
    expect(() => itemDescriptives(matrix, { ranges: [] })).toThrow(/itemDescriptives: ranges must have one entry per item/);
    expect(() => itemDescriptives(matrix, { ranges: [{ min: 5, max: 1 }] })).toThrow(/finite with min < max/);
    expect(() => itemDescriptives(itemMatrixFromColumns([[1, Infinity]]))).toThrow(/infinite value/);
    expect(() => itemDescriptives({ rows: 2, columns: 1, data: new Float64Array(3) })).toThrow(RangeError);
  });
});
