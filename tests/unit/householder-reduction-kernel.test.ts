import { describe, expect, it } from 'vitest';
import { HOUSEHOLDER_WASM_BYTES, householderReductionWasm } from '../../src/lib/stats/householder-reduction-kernel';
import { householderReductionScript, symmetricEigen, symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { householderWasmBytes } from '../../scripts/make-householder-wasm.mjs';

/**
 * A random symmetric matrix, row-major: normal entries on a scale drawn per matrix (so that
 * roundings differ from one order to the next), with the last `zeroColumns` rows and columns set
 * to exact zeros and, when `blocks` is set, the entries between the first half and the second half
 * zeroed too (both give steps whose scale is 0).
 */
function randomSymmetric(n: number, seed: number, zeroColumns: number, blocks: boolean): Float64Array {
  const random = createSeededRandom(seed);
  const scale = 10 ** (random.nextInt(7) - 3);
  const data = new Float64Array(n * n);
  const half = Math.floor(n / 2);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let value = scale * random.nextNormal();
      if (i >= n - zeroColumns || j >= n - zeroColumns) value = 0;
      if (blocks && i < half && j >= half) value = 0;
      data[i * n + j] = value;
      data[j * n + i] = value;
    }
  }
  return data;
}

interface Reduction {
  w: Float64Array;
  d: Float64Array;
  e: Float64Array;
}

function reduce(matrix: Float64Array, n: number, run: (w: Float64Array, n: number, d: Float64Array, e: Float64Array) => void): Reduction {
  const w = Float64Array.from(matrix);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  run(w, n, d, e);
  return { w, d, e };
}

function differingEntries(actual: Float64Array, expected: Float64Array): number[] {
  const differing: number[] = [];
  for (let index = 0; index < expected.length; index++) if (!Object.is(actual[index], expected[index])) differing.push(index);
  return differing;
}

function expectSameBits(n: number, matrix: Float64Array, label: string): void {
  const slow = reduce(matrix, n, householderReductionScript);
  const fast = reduce(matrix, n, householderReductionWasm);
  expect(differingEntries(fast.d, slow.d), `${label}: d`).toEqual([]);
  expect(differingEntries(fast.e, slow.e), `${label}: e`).toEqual([]);
  expect(differingEntries(fast.w, slow.w), `${label}: w`).toEqual([]);
}

describe('householderReductionWasm', () => {
  it('gives d, e and w bit for bit as the JavaScript loop (Object.is), orders 1 .. 320', () => {
    // Every order up to 72 (every remainder of the four-row blocks and the pairs of columns, and
    // orders with and without a last odd column), then a spread up to 320 in no particular order
    // (the memory grows and is reused).
    const orders = Array.from({ length: 72 }, (_, index) => index + 1);
    orders.push(320, 97, 150, 203, 255, 298, 299, 300, 301, 131, 318, 319, 164);
    for (const n of orders) {
      expectSameBits(n, randomSymmetric(n, 100 + n, 0, false), `order ${n}`);
    }
  });

  it('is bit for bit the same where steps have a scale of 0 (exact zero columns, block-diagonal matrices)', () => {
    for (const n of [2, 3, 5, 8, 9, 17, 30, 63, 64, 120, 301]) {
      expectSameBits(n, randomSymmetric(n, 500 + n, 1, false), `order ${n}, last column zero`);
      expectSameBits(n, randomSymmetric(n, 600 + n, Math.ceil(n / 3), false), `order ${n}, last third zero`);
      expectSameBits(n, randomSymmetric(n, 700 + n, 0, true), `order ${n}, two blocks`);
      expectSameBits(n, randomSymmetric(n, 800 + n, 2, true), `order ${n}, two blocks and zero columns`);
      const diagonal = new Float64Array(n * n);
      for (let i = 0; i < n; i++) diagonal[i * n + i] = i - n / 2;
      expectSameBits(n, diagonal, `order ${n}, diagonal`);
    }
  });

  it('is bit for bit the same on a correlation matrix of Wishart-like data (the draws of parallel analysis)', () => {
    const n = 300;
    const rows = 400;
    const random = createSeededRandom(42);
    const x = new Float64Array(rows * n);
    for (let index = 0; index < x.length; index++) x[index] = random.nextNormal();
    const correlation = new Float64Array(n * n);
    for (let a = 0; a < n; a++) {
      for (let b = a; b < n; b++) {
        let sum = 0;
        for (let r = 0; r < rows; r++) sum += x[r * n + a] * x[r * n + b];
        correlation[a * n + b] = sum;
        correlation[b * n + a] = sum;
      }
    }
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) correlation[a * n + b] /= Math.sqrt(correlation[a * n + a] * correlation[b * n + b]);
    }
    for (let a = 0; a < n; a++) correlation[a * n + a] = 1;
    expectSameBits(n, correlation, 'correlation of order 300');
  });

  it('leads symmetricEigen and symmetricEigenvalues to A·V = V·D (order 120, through the kernel)', () => {
    const n = 120;
    const data = randomSymmetric(n, 9, 0, false);
    const matrix = { order: n, data };
    const { values, vectors } = symmetricEigen(matrix);
    let largest = 0;
    let residual = 0;
    for (let i = 0; i < n; i++) {
      for (let k = 0; k < n; k++) {
        let av = 0;
        for (let j = 0; j < n; j++) av += data[i * n + j] * vectors.data[j * n + k];
        residual = Math.max(residual, Math.abs(av - vectors.data[i * n + k] * values[k]));
      }
      largest = Math.max(largest, Math.abs(values[i]));
    }
    expect(residual / largest).toBeLessThan(1e-12);
    const valuesOnly = symmetricEigenvalues(matrix);
    expect(differingEntries(valuesOnly, values)).toEqual([]);
  });

  it('holds the WebAssembly bytes that scripts/make-householder-wasm.mjs assembles from its listing', () => {
    expect(Array.from(HOUSEHOLDER_WASM_BYTES)).toEqual(Array.from(householderWasmBytes()));
    expect(WebAssembly.validate(HOUSEHOLDER_WASM_BYTES)).toBe(true);
  });
});
