import { describe, expect, it } from 'vitest';
import { accumulateCenteredProducts } from '../../src/lib/stats/centered-products-kernel';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { crossProductsWasmBytes } from '../../scripts/make-cross-products-wasm.mjs';

/** Column-major random values on different scales and signs, so that every rounding shows. */
function randomColumns(rows: number, columns: number, seed: number): Float64Array {
  const random = createSeededRandom(seed);
  const data = new Float64Array(rows * columns);
  for (let j = 0; j < columns; j++) {
    const scale = 10 ** (random.nextInt(7) - 3);
    const shift = random.nextNormal() * 100;
    for (let i = 0; i < rows; i++) data[j * rows + i] = shift + scale * random.nextNormal();
  }
  return data;
}

function meansOf(data: Float64Array, rows: number, columns: number): Float64Array {
  const means = new Float64Array(columns);
  for (let j = 0; j < columns; j++) {
    let sum = 0;
    for (let i = 0; i < rows; i++) sum += data[j * rows + i];
    means[j] = sum / rows;
  }
  return means;
}

/**
 * The sums the kernel promises, one pair at a time with plain loops: for each tile of
 * `blockRows` respondents a sum from 0 over them in order, added to the pair's total, which is
 * added to `sums` at the end. Second opinion: no blocking of items, no WebAssembly.
 */
function referenceProducts(
  data: Float64Array,
  rows: number,
  columns: number,
  means: Float64Array,
  rowStart: number,
  rowEnd: number,
  sums: Float64Array,
  blockRows: number,
): void {
  for (let j = 0; j < columns; j++) {
    for (let k = j; k < columns; k++) {
      let total = 0;
      for (let first = rowStart; first < rowEnd; first += blockRows) {
        let partial = 0;
        for (let i = first; i < Math.min(first + blockRows, rowEnd); i++) {
          partial += (data[j * rows + i] - means[j]) * (data[k * rows + i] - means[k]);
        }
        total += partial;
      }
      sums[j * columns + k] += total;
    }
  }
}

function differingEntries(actual: Float64Array, expected: Float64Array): number[] {
  const differing: number[] = [];
  for (let index = 0; index < expected.length; index++) if (!Object.is(actual[index], expected[index])) differing.push(index);
  return differing;
}

describe('accumulateCenteredProducts', () => {
  // Orders that are and are not multiples of the 4 × 4 register tile, rows that are and are not
  // multiples of the row tile, sub-ranges of respondents, and tiles of one respondent. They run
  // one after another on this thread, so each call after the first finds the kernel's memory
  // holding an earlier, differently shaped call's values (the instance is kept per thread).
  const cases = [
    { rows: 1031, columns: 7, rowStart: 0, rowEnd: 1031, blockRows: 512 },
    { rows: 2000, columns: 13, rowStart: 0, rowEnd: 2000, blockRows: 64 },
    { rows: 777, columns: 30, rowStart: 101, rowEnd: 650, blockRows: 100 },
    { rows: 300, columns: 1, rowStart: 0, rowEnd: 300, blockRows: 512 },
    { rows: 9, columns: 6, rowStart: 0, rowEnd: 9, blockRows: 1 },
    { rows: 2, columns: 3, rowStart: 1, rowEnd: 2, blockRows: 512 },
    { rows: 1500, columns: 41, rowStart: 0, rowEnd: 1500, blockRows: 512 },
  ];

  it('gives bit for bit the sums of a plain loop over each pair (Object.is on every entry)', () => {
    for (const [index, { rows, columns, rowStart, rowEnd, blockRows }] of cases.entries()) {
      const data = randomColumns(rows, columns, 1000 + index);
      const means = meansOf(data, rows, columns);
      // Non-zero starting sums: the kernel adds into them.
      const start = randomColumns(columns, columns, 2000 + index);
      const fast = Float64Array.from(start);
      const slow = Float64Array.from(start);
      const dataBefore = Float64Array.from(data);
      accumulateCenteredProducts(data, rows, columns, means, rowStart, rowEnd, fast, blockRows);
      referenceProducts(data, rows, columns, means, rowStart, rowEnd, slow, blockRows);
      const label = `${rows} x ${columns}, rows ${rowStart}-${rowEnd}, tiles of ${blockRows}`;
      expect(differingEntries(fast, slow), label).toEqual([]);
      // The lower triangle is left as it was, and the data are not written.
      for (let j = 0; j < columns; j++) {
        for (let k = 0; k < j; k++) expect(Object.is(fast[j * columns + k], start[j * columns + k]), `${label} (${j}, ${k})`).toBe(true);
      }
      expect(differingEntries(data, dataBefore), label).toEqual([]);
    }
  });

  it('is sensitive to the order of summation, so the comparison above can fail', () => {
    // The same reference with one tile over all respondents sums in another order; on these data
    // some entries round differently. Were they all equal, bit-identity would prove nothing here.
    const rows = 1500;
    const columns = 41;
    const data = randomColumns(rows, columns, 1006);
    const means = meansOf(data, rows, columns);
    const tiled = new Float64Array(columns * columns);
    const untiled = new Float64Array(columns * columns);
    accumulateCenteredProducts(data, rows, columns, means, 0, rows, tiled, 512);
    referenceProducts(data, rows, columns, means, 0, rows, untiled, rows);
    expect(differingEntries(tiled, untiled).length).toBeGreaterThan(0);
  });

  it('agrees with the textbook covariance to rounding (R 4.2.2: cov(cbind(c(1,2,3,4), c(2,4,5,9))) * 3 = 5, 11, 26)', () => {
    const data = Float64Array.of(1, 2, 3, 4, 2, 4, 5, 9);
    const sums = new Float64Array(4);
    accumulateCenteredProducts(data, 4, 2, Float64Array.of(2.5, 5), 0, 4, sums, 512);
    expect(Array.from(sums)).toEqual([5, 11, 0, 26]);
  });

  it('holds the WebAssembly bytes that scripts/make-cross-products-wasm.mjs assembles from its listing', () => {
    const source = accumulateCenteredProducts.toString();
    const literal = /Uint8Array\.of\(([\d,\s]+)\)/.exec(source);
    expect(literal).not.toBeNull();
    const embedded = (literal?.[1] ?? '').split(',').map((text) => text.trim()).filter((text) => text !== '').map(Number);
    expect(embedded).toEqual(Array.from(crossProductsWasmBytes()));
    expect(WebAssembly.validate(Uint8Array.from(embedded))).toBe(true);
  });
});
