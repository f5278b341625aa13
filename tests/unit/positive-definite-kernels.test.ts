import { describe, expect, it } from 'vitest';
import { positiveDefiniteWorkspace } from '../../src/lib/stats/positive-definite-kernels';
import { createSeededRandom, type SeededRandom } from '../../src/lib/stats/seeded-random';
import { positiveDefiniteWasmBytes } from '../../scripts/make-positive-definite-wasm.mjs';
import { choleskyInPlace, solveWithLowerFactor } from './smooth-correlation-reference';

// The plain loops the kernels must reproduce bit for bit: the lower Cholesky factor, the inverse
// and the solve of smooth-correlation-matrix.ts before they moved to WebAssembly (row-major,
// lower triangle read; the factor and the solve from the smoothing's reference).

/** The column-by-column substitutions: L y = e_c, then Lᵀ x = y, for each column c. */
function inverseFromLowerFactor(factor: Float64Array, p: number): Float64Array {
  const out = new Float64Array(p * p);
  const column = new Float64Array(p);
  for (let c = 0; c < p; c++) {
    for (let i = 0; i < p; i++) {
      let sum = i === c ? 1 : 0;
      for (let k = 0; k < i; k++) sum -= factor[i * p + k] * column[k];
      column[i] = sum / factor[i * p + i];
    }
    for (let i = p - 1; i >= 0; i--) {
      let sum = column[i];
      for (let k = i + 1; k < p; k++) sum -= factor[k * p + i] * column[k];
      column[i] = sum / factor[i * p + i];
    }
    for (let i = 0; i < p; i++) out[i * p + c] = column[i];
  }
  return out;
}

function solveWithFactor(factor: Float64Array, b: Float64Array, p: number): Float64Array {
  const x = new Float64Array(p);
  solveWithLowerFactor(factor, b, p, x);
  return x;
}

function logDeterminantOfLowerFactor(factor: Float64Array, p: number): number {
  let sum = 0;
  for (let i = 0; i < p; i++) sum += 2 * Math.log(factor[i * p + i]);
  return sum;
}

function transpose(a: Float64Array, p: number): Float64Array {
  const t = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) t[j * p + i] = a[i * p + j];
  return t;
}

/**
 * A random positive-definite matrix B Bᵀ/columns + ridge·I with B of order × columns on mixed
 * scales; columns < order with a tiny ridge makes it nearly singular (condition number up to
 * about 1/ridge). The upper triangle is then moved by a rounding-level amount, so that reading
 * the wrong triangle shows.
 */
function randomPositiveDefinite(random: SeededRandom, order: number, columns: number, ridge: number): Float64Array {
  const b = new Float64Array(order * columns);
  for (let i = 0; i < order; i++) {
    const scale = 10 ** (random.nextInt(5) - 2);
    for (let k = 0; k < columns; k++) b[i * columns + k] = scale * random.nextNormal();
  }
  const a = new Float64Array(order * order);
  for (let i = 0; i < order; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = 0;
      for (let k = 0; k < columns; k++) sum += b[i * columns + k] * b[j * columns + k];
      a[i * order + j] = sum / columns + (i === j ? ridge : 0);
      a[j * order + i] = a[i * order + j] * (1 + (i === j ? 0 : 1e-13 * random.nextNormal()));
    }
  }
  return a;
}

function differing(actual: Float64Array, expected: Float64Array): number[] {
  const indices: number[] = [];
  for (let index = 0; index < expected.length; index++) if (!Object.is(actual[index], expected[index])) indices.push(index);
  return indices;
}

/** Orders 1..40 one by one (every remainder of the 8-column chunks), then up to 130. */
const orders = [...Array.from({ length: 40 }, (_, index) => index + 1), 41, 47, 53, 64, 77, 90, 101, 117, 128, 129, 130];

describe('positive-definite kernels', () => {
  it('give bit for bit the factor, inverse (full and lower triangle), solve, log-determinant and scaled squares of the plain loops (Object.is), well and nearly singular', () => {
    const random = createSeededRandom(20261203);
    let compared = 0;
    for (const order of orders) {
      const shapes = [
        { columns: order + 3, ridge: 0.1 },
        // rank order − 1 plus a ridge of 1e-10 relative to the scale: nearly singular, as the
        // MTFA's M = R − I + diag(h) becomes at the optimum
        { columns: Math.max(order - 1, 1), ridge: 1e-10 },
      ];
      for (const { columns, ridge } of shapes) {
        const a = randomPositiveDefinite(random, order, columns, ridge);
        const lower = Float64Array.from(a);
        expect(choleskyInPlace(lower, order)).toBe(true);
        const label = `order ${order}, ${columns} columns, ridge ${ridge}`;

        const workspace = positiveDefiniteWorkspace(order, 4, 2);
        const [factor, inverse, squares, lowerInverse] = workspace.matrices;
        const [rightHandSide, solution] = workspace.vectors;
        // The kernel reads the upper triangle: A enters transposed, so it sees the lower one.
        factor.set(transpose(a, order));
        const strictLowerBefore = Float64Array.from(factor);
        expect(workspace.factorInPlace(factor), label).toBe(true);
        for (let i = 0; i < order; i++) {
          for (let j = 0; j < order; j++) {
            const expected = j <= i ? lower[i * order + j] : strictLowerBefore[j * order + i];
            // R[j][i] = L[i][j] in the upper triangle; the strict lower triangle untouched
            if (!Object.is(factor[j * order + i], expected)) expect.fail(`${label}: factor (${j}, ${i}) is ${factor[j * order + i]}, expected ${expected}`);
          }
        }
        workspace.inverseFromFactor(factor, inverse);
        expect(differing(inverse, inverseFromLowerFactor(lower, order)), label).toEqual([]);
        // The lower triangle alone: the same bits there, zeros above
        lowerInverse.fill(-1);
        workspace.lowerInverseFromFactor(factor, lowerInverse);
        const expectedLower = inverse.map((value, index) => (index % order <= Math.floor(index / order) ? value : 0));
        expect(differing(lowerInverse, expectedLower), label).toEqual([]);
        // scale·inverse[i][j]² (as `scale * value * value`) at (j, i); the strict lower triangle kept
        const scale = 10 ** (random.nextInt(7) - 3) * (1 + random.next());
        squares.fill(-1);
        workspace.scaledSquaresIntoUpper(inverse, squares, scale);
        const expectedSquares = new Float64Array(order * order).fill(-1);
        for (let i = 0; i < order; i++) {
          for (let j = 0; j <= i; j++) {
            const value = inverse[i * order + j];
            expectedSquares[j * order + i] = scale * value * value;
          }
        }
        expect(differing(squares, expectedSquares), label).toEqual([]);
        for (let i = 0; i < order; i++) rightHandSide[i] = random.nextNormal() * 10 ** (random.nextInt(5) - 2);
        const b = Float64Array.from(rightHandSide);
        workspace.solveFromFactor(factor, rightHandSide, solution);
        expect(differing(solution, solveWithFactor(lower, b, order)), label).toEqual([]);
        expect(differing(rightHandSide, b), label).toEqual([]);
        // In place: the solution over the right-hand side
        workspace.solveFromFactor(factor, rightHandSide, rightHandSide);
        expect(differing(rightHandSide, solution), label).toEqual([]);
        expect(Object.is(workspace.logDeterminantFromFactor(factor), logDeterminantOfLowerFactor(lower, order)), label).toBe(true);
        compared += 1;
      }
    }
    expect(compared).toBe(2 * orders.length);
  });

  it('is sensitive to the order of the subtractions, so the comparison above can fail', () => {
    // The inverse with each element's products summed first and subtracted once (another order)
    // differs in some bits on these matrices; were it equal everywhere, bit-identity would prove
    // nothing here.
    const random = createSeededRandom(7);
    const order = 41;
    const a = randomPositiveDefinite(random, order, order - 1, 1e-10);
    const lower = Float64Array.from(a);
    choleskyInPlace(lower, order);
    const regrouped = new Float64Array(order * order);
    const column = new Float64Array(order);
    for (let c = 0; c < order; c++) {
      for (let i = 0; i < order; i++) {
        let products = 0;
        for (let k = 0; k < i; k++) products += lower[i * order + k] * column[k];
        column[i] = ((i === c ? 1 : 0) - products) / lower[i * order + i];
      }
      for (let i = order - 1; i >= 0; i--) {
        let products = 0;
        for (let k = i + 1; k < order; k++) products += lower[k * order + i] * column[k];
        column[i] = (column[i] - products) / lower[i * order + i];
      }
      for (let i = 0; i < order; i++) regrouped[i * order + c] = column[i];
    }
    const workspace = positiveDefiniteWorkspace(order, 2, 0);
    const [factor, inverse] = workspace.matrices;
    factor.set(transpose(a, order));
    workspace.factorInPlace(factor);
    workspace.inverseFromFactor(factor, inverse);
    expect(differing(inverse, regrouped).length).toBeGreaterThan(0);
  });

  it('reports a matrix that is not positive definite, as the plain loop does', () => {
    const random = createSeededRandom(11);
    for (const order of [1, 2, 5, 17, 41]) {
      const a = randomPositiveDefinite(random, order, order + 2, 0.1);
      // Subtract more than the smallest eigenvalue can take from the last diagonal element.
      a[order * order - 1] -= 1e3;
      const workspace = positiveDefiniteWorkspace(order, 1, 0);
      const [matrix] = workspace.matrices;
      matrix.set(transpose(a, order));
      expect(workspace.factorInPlace(matrix)).toBe(false);
      expect(choleskyInPlace(Float64Array.from(a), order)).toBe(false);
    }
    const nan = positiveDefiniteWorkspace(2, 1, 0);
    nan.matrices[0].set([Number.NaN, 0, 0, 1]);
    expect(nan.factorInPlace(nan.matrices[0])).toBe(false);
  });

  it('inverts and solves a small matrix to the textbook values (R 4.2.2: solve(matrix(c(4, 2, 2, 3), 2)) and determinant 8)', () => {
    const workspace = positiveDefiniteWorkspace(2, 2, 1);
    const [factor, inverse] = workspace.matrices;
    const [vector] = workspace.vectors;
    factor.set([4, 2, 2, 3]);
    expect(workspace.factorInPlace(factor)).toBe(true);
    expect(Array.from(factor)).toEqual([2, 1, 2, Math.SQRT2]);
    workspace.inverseFromFactor(factor, inverse);
    // solve(...) = [0.375 -0.25; -0.25 0.5]
    [0.375, -0.25, -0.25, 0.5].forEach((value, index) => expect(inverse[index]).toBeCloseTo(value, 15));
    vector.set([1, 2]);
    workspace.solveFromFactor(factor, vector, vector);
    // solve(matrix(c(4, 2, 2, 3), 2), c(1, 2)) = c(-0.125, 0.75)
    expect(vector[0]).toBeCloseTo(-0.125, 15);
    expect(vector[1]).toBeCloseTo(0.75, 15);
    expect(workspace.logDeterminantFromFactor(factor)).toBeCloseTo(Math.log(8), 15);
  });

  it('hands out zeroed arrays, grows its memory for larger orders and refuses a replaced workspace or a foreign array', () => {
    const small = positiveDefiniteWorkspace(3, 1, 1);
    small.matrices[0].fill(7);
    const large = positiveDefiniteWorkspace(130, 4, 3);
    expect(large.matrices.every((matrix) => matrix.length === 130 * 130 && matrix.every((value) => value === 0))).toBe(true);
    expect(large.vectors.every((vector) => vector.length === 130 && vector.every((value) => value === 0))).toBe(true);
    expect(() => small.factorInPlace(small.matrices[0])).toThrow(/replaced/);
    expect(() => large.factorInPlace(new Float64Array(130 * 130))).toThrow(/not one of this workspace's arrays/);
    expect(() => large.inverseFromFactor(large.matrices[0], large.matrices[0])).toThrow(/cannot overwrite/);
    expect(() => large.lowerInverseFromFactor(large.matrices[1], large.matrices[1])).toThrow(/cannot overwrite/);
    expect(() => positiveDefiniteWorkspace(0, 1, 1)).toThrow(RangeError);
    expect(() => positiveDefiniteWorkspace(30_000, 10, 0)).toThrow(/4 GiB/);
  });

  it('holds the WebAssembly bytes that scripts/make-positive-definite-wasm.mjs assembles from its listing', async () => {
    const { readFileSync } = await import('node:fs');
    const source = readFileSync(new URL('../../src/lib/stats/positive-definite-kernels.ts', import.meta.url), 'utf8');
    const literal = /POSITIVE_DEFINITE_WASM = Uint8Array\.of\(([\d,\s]+)\)/.exec(source);
    expect(literal).not.toBeNull();
    const embedded = (literal?.[1] ?? '').split(',').map((text) => text.trim()).filter((text) => text !== '').map(Number);
    expect(embedded).toEqual(Array.from(positiveDefiniteWasmBytes()));
    expect(WebAssembly.validate(Uint8Array.from(embedded))).toBe(true);
    // Under the 4 KB that Chromium compiles synchronously (new WebAssembly.Module) on a page's main thread
    expect(embedded.length).toBeLessThanOrEqual(4096);
  });
});
