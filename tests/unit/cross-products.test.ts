import { describe, expect, it } from 'vitest';
import { CROSS_PRODUCT_BLOCK_ROWS, centeredCrossProducts, crossProductsOfItems, pearsonFromCrossProducts } from '../../src/lib/stats/cross-products';
import { centeredCrossProductsParallel } from '../../bench/parallel/cross-products-parallel';
import { crossProductsWorkerSource } from '../../bench/parallel/cross-products-worker';
import { itemMatrixFromColumns, selectItems } from '../../src/lib/stats/types';
import {
  completeCases,
  correlatedData,
  dataset,
  itemMatrixOf,
  naivePearson,
  overlapFixture,
  relativeError,
} from './overlap-fixtures';

describe('centeredCrossProducts and pearsonFromCrossProducts', () => {
  it('reproduce R cor(X) to 1e-12 on every reference dataset', () => {
    // R 4.2.2: cor(X), fixtures/reference/overlap.json (scripts/reference/overlap.R)
    for (const entry of overlapFixture.datasets) {
      const matrix = completeCases(itemMatrixOf(entry));
      expect(matrix.rows, entry.name).toBe(entry.rows);
      const r = pearsonFromCrossProducts(centeredCrossProducts(matrix));
      const p = entry.columns.length;
      for (let j = 0; j < p; j++) {
        for (let k = 0; k < p; k++) {
          expect(Math.abs(r.data[j * p + k] - entry.correlation.value[j][k]), `${entry.name} (${j}, ${k})`).toBeLessThan(1e-12);
        }
      }
    }
  });

  it('gives the centred sums of a hand-worked example', () => {
    // Hand-computed: x = 1,2,3,4 (mean 2.5), y = 2,4,5,9 (mean 5):
    // Σ(x−2.5)² = 5, Σ(y−5)² = 26, Σ(x−2.5)(y−5) = 11, r = 11/√130
    const result = centeredCrossProducts(itemMatrixFromColumns([[1, 2, 3, 4], [2, 4, 5, 9]]));
    expect(result.rows).toBe(4);
    expect(Array.from(result.means)).toEqual([2.5, 5]);
    expect(Array.from(result.centered.data)).toEqual([5, 11, 11, 26]);
    expect(pearsonFromCrossProducts(result).data[1]).toBeCloseTo(11 / Math.sqrt(130), 15);
  });

  it('agrees with a textbook double loop when the order and rows are not multiples of the tiles', () => {
    // Second opinion: naivePearson (two-pass formula, one pair at a time)
    for (const [rows, columns] of [[1031, 7], [513, 1], [2, 3], [600, 9]] as const) {
      const matrix = correlatedData(rows, columns, rows + columns);
      const fast = pearsonFromCrossProducts(centeredCrossProducts(matrix));
      const slow = naivePearson(matrix);
      for (let index = 0; index < fast.data.length; index++) {
        expect(Math.abs(fast.data[index] - slow.data[index]), `${rows}x${columns} @${index}`).toBeLessThan(1e-13);
      }
    }
  });

  it('returns a symmetric matrix with an exact unit diagonal and leaves the input untouched', () => {
    const matrix = correlatedData(300, 11, 5, 2, true);
    const before = Float64Array.from(matrix.data);
    const cross = centeredCrossProducts(matrix);
    const r = pearsonFromCrossProducts(cross);
    expect(Array.from(matrix.data)).toEqual(Array.from(before));
    for (let j = 0; j < 11; j++) {
      expect(r.data[j * 11 + j]).toBe(1);
      for (let k = 0; k < 11; k++) {
        expect(r.data[j * 11 + k]).toBe(r.data[k * 11 + j]);
        expect(cross.centered.data[j * 11 + k]).toBe(cross.centered.data[k * 11 + j]);
      }
    }
  });

  it('handles more items than respondents', () => {
    const matrix = correlatedData(4, 9, 17);
    const r = pearsonFromCrossProducts(centeredCrossProducts(matrix));
    const slow = naivePearson(matrix);
    for (let index = 0; index < r.data.length; index++) expect(Math.abs(r.data[index] - slow.data[index])).toBeLessThan(1e-13);
  });

  it('refuses missing and infinite values, naming the first offending item', () => {
    expect(() => centeredCrossProducts(itemMatrixFromColumns([[1, 2, 3], [1, Number.NaN, 3], [Number.NaN, 1, 2]]))).toThrow(
      /centeredCrossProducts: item 1 has a missing or non-finite value at respondent 1/,
    );
    expect(() => centeredCrossProducts(itemMatrixFromColumns([[1, 2, Number.POSITIVE_INFINITY]]))).toThrow(/item 0/);
    expect(() => centeredCrossProducts({ rows: 0, columns: 2, data: new Float64Array(0) })).toThrow(/at least one respondent/);
    expect(() => centeredCrossProducts({ rows: 2, columns: 2, data: new Float64Array(3) })).toThrow(/expected rows × columns = 4/);
  });

  it('names a constant item instead of returning NaN', () => {
    const cross = centeredCrossProducts(itemMatrixFromColumns([[1, 2, 3, 4], [3, 3, 3, 3], [0.1, 0.1, 0.1, 0.1]]));
    // 0.1 repeated leaves a rounding residue after centring; it is still constant.
    expect(() => pearsonFromCrossProducts(cross)).toThrow(/item\(s\) 1, 2 are constant/);
  });
});

describe('centeredCrossProductsParallel', () => {
  it('gives the same sums as the single-threaded pass, with 2 workers', async () => {
    const matrix = correlatedData(5003, 13, 99, 3, true);
    const single = centeredCrossProducts(matrix);
    const parallel = await centeredCrossProductsParallel(matrix, { workers: 2 });
    expect(parallel.rows).toBe(5003);
    expect(Array.from(parallel.means)).toEqual(Array.from(single.means));
    const scale = Math.max(...Array.from(single.centered.data, Math.abs));
    for (let index = 0; index < single.centered.data.length; index++) {
      expect(Math.abs(parallel.centered.data[index] - single.centered.data[index]) / scale).toBeLessThan(1e-14);
    }
  });

  it('uses data that already lives in a SharedArrayBuffer in place, and matches R on bfi', async () => {
    const entry = dataset('bfi');
    const complete = completeCases(itemMatrixOf(entry));
    const shared = new Float64Array(new SharedArrayBuffer(complete.data.byteLength));
    shared.set(complete.data);
    const result = await centeredCrossProductsParallel({ rows: complete.rows, columns: complete.columns, data: shared }, { workers: 2 });
    const r = pearsonFromCrossProducts(result);
    // R 4.2.2: cor(na.omit(psych::bfi[, 1:25]))
    for (let j = 0; j < 25; j++) for (let k = 0; k < 25; k++) expect(relativeError(r.data[j * 25 + k], entry.correlation.value[j][k])).toBeLessThan(1e-11);
    expect(Array.from(shared)).toEqual(Array.from(complete.data));
  });

  it('checks its input on the calling thread', async () => {
    await expect(centeredCrossProductsParallel(itemMatrixFromColumns([[1, Number.NaN]]), { workers: 2 })).rejects.toThrow(/item 0/);
    await expect(centeredCrossProductsParallel(correlatedData(10, 2, 1), { workers: 0 })).rejects.toThrow(/workers must be an integer/);
  });

  it('builds worker source that names nothing outside itself', () => {
    const source = crossProductsWorkerSource();
    expect(source).toMatch(/require\(["']node:worker_threads["']\)/);
    expect(source).not.toMatch(/\bimport\b/);
    expect(() => new Function(source)).not.toThrow();
  });
});

describe('crossProductsOfItems', () => {
  it('gives bit for bit the cross-products of the selected items, in the order asked', () => {
    // Identity: each centred sum depends on its own two items only, so selecting items before or
    // after the pass must agree exactly (orders 1-9, rows not a multiple of the 512-row tile).
    const matrix = correlatedData(1031, 9, 17, 2, true);
    const whole = centeredCrossProducts(matrix);
    for (const positions of [[0, 1, 2, 3, 4, 5, 6, 7, 8], [8, 2, 5], [3], [1, 2, 4, 6, 7]]) {
      const picked = crossProductsOfItems(whole, positions);
      const direct = centeredCrossProducts(selectItems(matrix, positions));
      expect(picked.rows).toBe(direct.rows);
      expect(Array.from(picked.means)).toEqual(Array.from(direct.means));
      expect(picked.centered.order).toBe(positions.length);
      expect(Array.from(picked.centered.data)).toEqual(Array.from(direct.centered.data));
    }
  });

  it('refuses a position outside the items or given twice, and leaves its input untouched', () => {
    const whole = centeredCrossProducts(correlatedData(40, 4, 3));
    const before = Float64Array.from(whole.centered.data);
    expect(() => crossProductsOfItems(whole, [0, 4])).toThrow(/crossProductsOfItems: position 4/);
    expect(() => crossProductsOfItems(whole, [1.5])).toThrow(/position 1.5/);
    expect(() => crossProductsOfItems(whole, [2, 2])).toThrow(/given twice/);
    crossProductsOfItems(whole, [3, 1]);
    expect(Array.from(whole.centered.data)).toEqual(Array.from(before));
  });
});

describe('centeredCrossProducts: the blocked kernel sums every pair in a fixed order', () => {
  it('equals, bit for bit, each pair summed tile by tile of 512 respondents, whatever the number of items', () => {
    // Second opinion: the pair's sum over each tile of CROSS_PRODUCT_BLOCK_ROWS respondents, in
    // order, added to its total; the kernel's tiling of items (register blocking, padding) must not
    // change a single bit of it. Orders 1-13 cover every remainder of the item strips.
    for (let columns = 1; columns <= 13; columns++) {
      const matrix = correlatedData(1300, columns, 40 + columns, 2, true);
      const { rows, data } = matrix;
      const result = centeredCrossProducts(matrix);
      for (let j = 0; j < columns; j++) {
        for (let k = j; k < columns; k++) {
          let total = 0;
          for (let first = 0; first < rows; first += CROSS_PRODUCT_BLOCK_ROWS) {
            let tile = 0;
            for (let i = first; i < Math.min(rows, first + CROSS_PRODUCT_BLOCK_ROWS); i++) {
              tile += (data[j * rows + i] - result.means[j]) * (data[k * rows + i] - result.means[k]);
            }
            total += tile;
          }
          expect(Object.is(result.centered.data[j * columns + k], total), `${columns} items, pair (${j}, ${k})`).toBe(true);
          expect(result.centered.data[k * columns + j]).toBe(result.centered.data[j * columns + k]);
        }
      }
    }
  });
});
