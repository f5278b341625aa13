import { describe, expect, it } from 'vitest';
import { symmetricEigen, symmetricEigenUnblocked, symmetricEigenvalues, WEBASSEMBLY_ROTATIONS_MIN_ORDER } from '../../src/lib/stats/symmetric-eigen';
import { squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { overlapFixture, referenceCorrelation, relativeError } from './overlap-fixtures';

/** Largest |(A·V − V·D)_ik| and |(VᵀV − I)_ab|. */
function residuals(matrix: SquareMatrix, values: Float64Array, vectors: Float64Array): { eigen: number; orthogonality: number } {
  const n = matrix.order;
  let eigen = 0;
  let orthogonality = 0;
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      let av = 0;
      for (let j = 0; j < n; j++) av += matrix.data[i * n + j] * vectors[j * n + k];
      eigen = Math.max(eigen, Math.abs(av - vectors[i * n + k] * values[k]));
    }
  }
  for (let a = 0; a < n; a++) {
    for (let b = 0; b < n; b++) {
      let dot = 0;
      for (let i = 0; i < n; i++) dot += vectors[i * n + a] * vectors[i * n + b];
      orthogonality = Math.max(orthogonality, Math.abs(dot - (a === b ? 1 : 0)));
    }
  }
  return { eigen, orthogonality };
}

function randomSymmetric(n: number, seed: number): SquareMatrix {
  const random = createSeededRandom(seed);
  const data = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const value = random.nextNormal();
      data[i * n + j] = value;
      data[j * n + i] = value;
    }
  }
  return { order: n, data };
}

describe('symmetricEigen', () => {
  it('reproduces R eigen() values to 1e-12 relative and vectors (up to sign) to 1e-9 on every dataset', () => {
    // R 4.2.2: eigen(cor(X), symmetric = TRUE), fixtures/reference/overlap.json
    for (const entry of overlapFixture.datasets) {
      const result = symmetricEigen(referenceCorrelation(entry));
      const n = result.order;
      entry.eigen.values.forEach((expected, k) => {
        expect(relativeError(result.values[k], expected), `${entry.name} λ${k}`).toBeLessThan(1e-12);
      });
      for (let k = 0; k < n; k++) {
        let dot = 0;
        for (let i = 0; i < n; i++) dot += result.vectors.data[i * n + k] * entry.eigen.vectors[i][k];
        const sign = dot < 0 ? -1 : 1;
        for (let i = 0; i < n; i++) {
          expect(Math.abs(sign * result.vectors.data[i * n + k] - entry.eigen.vectors[i][k]), `${entry.name} v${k}[${i}]`).toBeLessThan(1e-9);
        }
      }
    }
  });

  it('satisfies A·V = V·D and VᵀV = I, eigenvalues descending, for random symmetric matrices', () => {
    // Identity checks (no outside values): residuals at rounding level for orders 1 to 120
    for (const n of [1, 2, 3, 10, 41, 120]) {
      const matrix = randomSymmetric(n, n);
      const { values, vectors } = symmetricEigen(matrix);
      const scale = Math.max(...Array.from(values, Math.abs));
      const { eigen, orthogonality } = residuals(matrix, values, vectors.data);
      expect(eigen / scale, `order ${n}`).toBeLessThan(1e-13);
      expect(orthogonality, `order ${n}`).toBeLessThan(1e-13);
      for (let k = 1; k < n; k++) expect(values[k]).toBeLessThanOrEqual(values[k - 1]);
    }
  });

  it('fixes each eigenvector sign so its largest component is positive', () => {
    const { order, vectors } = symmetricEigen(randomSymmetric(15, 3));
    for (let k = 0; k < order; k++) {
      const column = Array.from({ length: order }, (_, i) => vectors.data[i * order + k]);
      const largest = column.reduce((best, value) => (Math.abs(value) > Math.abs(best) ? value : best), 0);
      expect(largest).toBeGreaterThan(0);
    }
  });

  it('solves a 2 × 2 correlation matrix exactly: 1 ± r with vectors (1, ±1)/√2', () => {
    // Closed form: eigenvalues of [[1, r], [r, 1]] are 1 + r and 1 − r
    const { values, vectors } = symmetricEigen(squareMatrixFromRows([[1, 0.6], [0.6, 1]]));
    expect(values[0]).toBeCloseTo(1.6, 15);
    expect(values[1]).toBeCloseTo(0.4, 15);
    expect(Math.abs(vectors.data[0])).toBeCloseTo(Math.SQRT1_2, 15);
    expect(vectors.data[0] * vectors.data[2]).toBeGreaterThan(0);
  });

  it('handles repeated eigenvalues, a diagonal and a zero matrix', () => {
    const identity = symmetricEigen(squareMatrixFromRows([[1, 0, 0], [0, 1, 0], [0, 0, 1]]));
    expect(Array.from(identity.values)).toEqual([1, 1, 1]);
    expect(residuals(squareMatrixFromRows([[1, 0, 0], [0, 1, 0], [0, 0, 1]]), identity.values, identity.vectors.data).orthogonality).toBe(0);
    expect(Array.from(symmetricEigen(squareMatrixFromRows([[2, 0], [0, 5]])).values)).toEqual([5, 2]);
    const zero = symmetricEigen(squareMatrixFromRows([[0, 0], [0, 0]]));
    expect(Array.from(zero.values)).toEqual([0, 0]);
  });

  it('returns frozen results and leaves the input untouched', () => {
    const matrix = randomSymmetric(8, 11);
    const before = Float64Array.from(matrix.data);
    const result = symmetricEigen(matrix);
    expect(Array.from(matrix.data)).toEqual(Array.from(before));
    expect(Object.isFrozen(result)).toBe(true);
    expect(Object.isFrozen(result.vectors)).toBe(true);
  });

  it('refuses a non-square, non-symmetric or non-finite matrix', () => {
    expect(() => symmetricEigen({ order: 2, data: new Float64Array(3) })).toThrow(/expected 4 values/);
    expect(() => symmetricEigen(squareMatrixFromRows([[1, 0.5], [0.4, 1]]))).toThrow(/not symmetric at \(0, 1\)/);
    expect(() => symmetricEigen(squareMatrixFromRows([[1, Number.NaN], [Number.NaN, 1]]))).toThrow(/not finite/);
    expect(() => symmetricEigen({ order: 0, data: new Float64Array(0) })).toThrow(/order >= 1/);
  });
});

/** Gram matrix XᵀX of `rows` seeded normal rows of `order` columns: singular when rows < order. */
function randomGram(order: number, rows: number, seed: number): SquareMatrix {
  const random = createSeededRandom(seed);
  const x = Float64Array.from({ length: rows * order }, () => random.nextNormal());
  const data = new Float64Array(order * order);
  for (let j = 0; j < order; j++) {
    for (let k = j; k < order; k++) {
      let sum = 0;
      for (let r = 0; r < rows; r++) sum += x[r * order + j] * x[r * order + k];
      data[j * order + k] = sum;
      data[k * order + j] = sum;
    }
  }
  return { order, data };
}

/** Correlation-like matrix whose last items repeat earlier ones exactly (exact dependencies). */
function withDuplicatedItems(order: number, seed: number): SquareMatrix {
  const base = randomGram(order, 3 * order, seed);
  const data = new Float64Array(order * order);
  const source = (j: number): number => (j >= order - 3 && order >= 6 ? j - 3 : j);
  for (let j = 0; j < order; j++) {
    for (let k = 0; k < order; k++) data[j * order + k] = base.data[source(j) * order + source(k)];
  }
  return { order, data };
}

/** I + u·uᵀ and a matrix with two equal 3 × 3 blocks: repeated eigenvalues. */
function withRepeatedValues(order: number, seed: number): SquareMatrix {
  const random = createSeededRandom(seed);
  const data = new Float64Array(order * order);
  if (seed % 2 === 0) {
    const u = Float64Array.from({ length: order }, () => random.nextNormal());
    for (let j = 0; j < order; j++) for (let k = 0; k < order; k++) data[j * order + k] = (j === k ? 1 : 0) + u[j] * u[k];
  } else {
    const block = randomSymmetric(3, seed).data;
    for (let j = 0; j < order; j++) {
      for (let k = 0; k < order; k++) {
        if (Math.floor(j / 3) === Math.floor(k / 3)) data[j * order + k] = block[(j % 3) * 3 + (k % 3)];
      }
    }
  }
  return { order, data };
}

describe('symmetricEigen: four-row accumulation and the QL rotations in WebAssembly', () => {
  it('gives bit for bit the values and vectors of the listing\'s loops for orders 1 to 130', () => {
    // The reference is the same decomposition with tred2's accumulation one row at a time and
    // tql2's rotation loop in JavaScript (Object.is: the sign of zero and every last bit count).
    // Random, rank-deficient, exactly dependent and repeated-eigenvalue matrices at every order;
    // below WEBASSEMBLY_ROTATIONS_MIN_ORDER only the accumulation differs.
    const mismatches: string[] = [];
    let changedByRotations = 0;
    for (let order = 1; order <= 130; order++) {
      const matrices: [string, SquareMatrix][] = [
        ['random', randomSymmetric(order, 7000 + order)],
        ['rank-deficient Gram', randomGram(order, Math.max(1, Math.floor(order / 2)), 8000 + order)],
      ];
      if (order % 3 === 0 || order <= 12) {
        matrices.push(['duplicated items', withDuplicatedItems(order, 9000 + order)]);
        matrices.push(['repeated values', withRepeatedValues(order, order)]);
      }
      for (const [kind, matrix] of matrices) {
        const kernel = symmetricEigen(matrix);
        const loop = symmetricEigenUnblocked(matrix);
        for (let k = 0; k < order; k++) {
          if (!Object.is(kernel.values[k], loop.values[k])) mismatches.push(`${kind} ${order}: λ${k}`);
        }
        for (let index = 0; index < order * order; index++) {
          if (!Object.is(kernel.vectors.data[index], loop.vectors.data[index])) mismatches.push(`${kind} ${order}: v[${index}]`);
        }
        if (order >= WEBASSEMBLY_ROTATIONS_MIN_ORDER && kernel.vectors.data.some((value) => value !== 0 && Math.abs(value) !== 1)) changedByRotations++;
      }
    }
    expect(mismatches.slice(0, 10)).toEqual([]);
    expect(changedByRotations).toBeGreaterThan(200);
  });

  it('keeps A·V = V·D and VᵀV = I on a singular Gram matrix with duplicated items (order 101)', () => {
    // Identity checks (no outside values), at the order of case E's scaled Gram matrix
    const matrix = withDuplicatedItems(101, 4);
    const { values, vectors } = symmetricEigen(matrix);
    const scale = Math.max(...Array.from(values, Math.abs));
    const { eigen, orthogonality } = residuals(matrix, values, vectors.data);
    expect(eigen / scale).toBeLessThan(1e-13);
    expect(orthogonality).toBeLessThan(1e-13);
    // Three exact dependencies: three eigenvalues at rounding level
    expect(Array.from(values).filter((value) => Math.abs(value) < 1e-10 * scale).length).toBe(3);
  });
});

describe('symmetricEigenvalues', () => {
  it('gives the same eigenvalues as the full decomposition, and R eigen() to 1e-12', () => {
    // R 4.2.2: eigen(cor(X), symmetric = TRUE)$values
    for (const entry of overlapFixture.datasets) {
      const values = symmetricEigenvalues(referenceCorrelation(entry));
      entry.eigen.values.forEach((expected, k) => expect(relativeError(values[k], expected)).toBeLessThan(1e-12));
    }
    const matrix = randomSymmetric(30, 7);
    const full = symmetricEigen(matrix).values;
    const only = symmetricEigenvalues(matrix);
    for (let k = 0; k < 30; k++) expect(Math.abs(only[k] - full[k])).toBeLessThan(1e-13);
  });

  it('gives bit for bit the eigenvalues of the full decomposition (its two-row reduction) for orders around the four-row blocks', () => {
    // The eigenvalues-only reduction takes four rows per pass and symmetricEigen's two, summing in
    // the same order, and QL treats d and e alike with or without vectors: every value is identical.
    for (const order of [1, 2, 3, 4, 5, 6, 7, 8, 9, 13, 31, 64, 97]) {
      for (const seed of [1, 2]) {
        const matrix = randomSymmetric(order, 100 * order + seed);
        const full = symmetricEigen(matrix).values;
        const only = symmetricEigenvalues(matrix);
        const differing = Array.from(only).filter((value, k) => !Object.is(value, full[k]));
        expect(differing, `order ${order}, seed ${seed}`).toEqual([]);
      }
    }
  });
});
