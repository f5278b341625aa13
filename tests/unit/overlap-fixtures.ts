/**
 * Helpers for the tests of the overlap and structure part of the core (not a module under test):
 * the committed reference fixture written by scripts/reference/overlap.R, conversions from its
 * row-major arrays to the core's shapes, small independent computations used as second opinions,
 * and scans for NaN/Infinity.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { centeredCrossProducts, pearsonFromCrossProducts } from '../../src/lib/stats/cross-products';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { itemMatrixFromRows, squareMatrixFromRows, type ItemMatrix, type SquareMatrix } from '../../src/lib/stats/types';

/** One dataset of fixtures/reference/overlap.json (see scripts/reference/overlap.R). */
export interface OverlapDataset {
  name: string;
  source: string;
  columns: string[];
  rows: number;
  data: (number | null)[][];
  correlation: { call: string; value: number[][] };
  vifFromInverse: { call: string; value: number[] };
  vifCar?: { call: string; value: number[] };
  outcome?: number[];
  eigen: { call: string; values: number[]; vectors: number[][] };
  conditionNumber: { call: string; value: number };
  kmo: { call: string; overall: number; items: number[] };
  bkw: BkwReference;
  reversedKeys?: {
    items: number[];
    call: string;
    bkw: BkwReference;
    vifFromInverse: number[];
    eigenValues: number[];
    kmoOverall: number;
  };
}

/** Belsley-Kuh-Welsch values from base R svd() of the scaled [1, X]. */
export interface BkwReference {
  call: string;
  singularValues: number[];
  conditionIndices: number[];
  proportions: number[][];
}

export interface NearestReference {
  name: string;
  input: number[][];
  inputEigenvalues: number[];
  call: string;
  nearest: number[][];
  iterations: number;
  converged: boolean;
}

export interface RandomPercentiles {
  rows: number;
  items: number;
  replications: number;
  call: string;
  random95: number[];
  randomMean: number[];
}

export interface OverlapFixture {
  generatedBy: string;
  versions: Record<string, string>;
  datasets: OverlapDataset[];
  nearestCorrelation: NearestReference[];
  parallelAnalysis: {
    small: RandomPercentiles;
    bfi: RandomPercentiles & { observed: number[]; suggested: number; margins: number[] };
  };
}

const fixturePath = fileURLToPath(new URL('../../fixtures/reference/overlap.json', import.meta.url));

/** The parsed fixture (read once per test file). */
export const overlapFixture = JSON.parse(readFileSync(fixturePath, 'utf8')) as OverlapFixture;

/** A dataset of the fixture by name. */
export function dataset(name: string): OverlapDataset {
  const found = overlapFixture.datasets.find((candidate) => candidate.name === name);
  if (found === undefined) throw new Error(`overlap.json has no dataset ${name}`);
  return found;
}

/** The dataset's raw values as an ItemMatrix (null → NaN). */
export function itemMatrixOf(entry: OverlapDataset): ItemMatrix {
  return itemMatrixFromRows(entry.data.map((row) => row.map((value) => (value === null ? Number.NaN : value))));
}

/** Only the rows with every value present. */
export function completeCases(matrix: ItemMatrix): ItemMatrix {
  const keep: number[] = [];
  for (let i = 0; i < matrix.rows; i++) {
    let complete = true;
    for (let j = 0; j < matrix.columns; j++) if (Number.isNaN(matrix.data[j * matrix.rows + i])) complete = false;
    if (complete) keep.push(i);
  }
  const data = new Float64Array(keep.length * matrix.columns);
  for (let j = 0; j < matrix.columns; j++) keep.forEach((i, k) => (data[j * keep.length + k] = matrix.data[j * matrix.rows + i]));
  return { rows: keep.length, columns: matrix.columns, data };
}

/** The dataset's rows with every value present, as an ItemMatrix. */
export function completeItemMatrix(entry: OverlapDataset): ItemMatrix {
  return completeCases(itemMatrixOf(entry));
}

/** Pearson correlations of a complete matrix, computed the library's way (centred cross-products). */
export function pearsonOf(matrix: ItemMatrix): SquareMatrix {
  return pearsonFromCrossProducts(centeredCrossProducts(matrix));
}

/**
 * A 3 × 3 "correlation" matrix that is not positive semi-definite (one eigenvalue is negative:
 * R 4.2.2, eigen(matrix(c(1, .9, .9, .9, 1, -.5, .9, -.5, 1), 3))$values[3] = -0.5471122), a fresh copy each call.
 */
export function indefiniteCorrelation(): SquareMatrix {
  return squareMatrixFromRows([[1, 0.9, 0.9], [0.9, 1, -0.5], [0.9, -0.5, 1]]);
}

/** R's correlation matrix of a dataset as a SquareMatrix. */
export function referenceCorrelation(entry: OverlapDataset): SquareMatrix {
  return squareMatrixFromRows(entry.correlation.value);
}

/** |actual − expected| / |expected| (|actual| when expected is 0). */
export function relativeError(actual: number, expected: number): number {
  return expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
}

/** Every number in a nested structure (typed arrays included). */
export function collectNumbers(value: unknown, out: number[] = []): number[] {
  if (typeof value === 'number') out.push(value);
  else if (ArrayBuffer.isView(value)) out.push(...Array.from(value as unknown as ArrayLike<number>));
  else if (Array.isArray(value)) value.forEach((item) => collectNumbers(item, out));
  else if (value !== null && typeof value === 'object') Object.values(value).forEach((item) => collectNumbers(item, out));
  return out;
}

/** True when no number anywhere in the structure is NaN or ±Infinity. */
export function allFinite(value: unknown): boolean {
  return collectNumbers(value).every((number) => Number.isFinite(number));
}

/** Keeps and reorders the items of a matrix: column k of the result is column order[k]. */
export function permuteItems(matrix: ItemMatrix, order: readonly number[]): ItemMatrix {
  const data = new Float64Array(matrix.rows * order.length);
  order.forEach((j, k) => data.set(matrix.data.subarray(j * matrix.rows, (j + 1) * matrix.rows), k * matrix.rows));
  return { rows: matrix.rows, columns: order.length, data };
}

/** Reorders a square matrix symmetrically: element (a, b) of the result is (order[a], order[b]). */
export function permuteSquare(matrix: SquareMatrix, order: readonly number[]): SquareMatrix {
  const n = order.length;
  const data = new Float64Array(n * n);
  for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) data[a * n + b] = matrix.data[order[a] * matrix.order + order[b]];
  return { order: n, data };
}

/** Textbook two-pass Pearson matrix (double loop over pairs), as an independent second opinion. */
export function naivePearson(matrix: ItemMatrix): SquareMatrix {
  const { rows, columns, data } = matrix;
  const means = Array.from({ length: columns }, (_, j) => {
    let sum = 0;
    for (let i = 0; i < rows; i++) sum += data[j * rows + i];
    return sum / rows;
  });
  const out = new Float64Array(columns * columns);
  for (let j = 0; j < columns; j++) {
    for (let k = 0; k < columns; k++) {
      let sxy = 0;
      let sxx = 0;
      let syy = 0;
      for (let i = 0; i < rows; i++) {
        const x = data[j * rows + i] - means[j];
        const y = data[k * rows + i] - means[k];
        sxy += x * y;
        sxx += x * x;
        syy += y * y;
      }
      out[j * columns + k] = sxy / Math.sqrt(sxx * syy);
    }
  }
  return { order: columns, data: out };
}

/**
 * Seeded random data with some correlation: `factors` normal factors, each item loading on one
 * of them (item j on factor j mod factors) plus unit noise, rounded to 5-point answers when
 * `likert` is set.
 */
export function correlatedData(rows: number, columns: number, seed: number, factors = 3, likert = false): ItemMatrix {
  const random = createSeededRandom(seed);
  const scores = Array.from({ length: factors }, () => Float64Array.from({ length: rows }, () => random.nextNormal()));
  const data = new Float64Array(rows * columns);
  for (let j = 0; j < columns; j++) {
    const loading = 0.5 + 0.4 * random.next();
    for (let i = 0; i < rows; i++) {
      const value = loading * scores[j % factors][i] + random.nextNormal();
      data[j * rows + i] = likert ? Math.min(5, Math.max(1, Math.round(3 + value))) : value;
    }
  }
  return { rows, columns, data };
}

/** Replaces item j by (low + high) − x, as reverse-keying does. */
export function reverseItem(matrix: ItemMatrix, j: number, low: number, high: number): ItemMatrix {
  const data = Float64Array.from(matrix.data);
  for (let i = 0; i < matrix.rows; i++) data[j * matrix.rows + i] = low + high - data[j * matrix.rows + i];
  return { rows: matrix.rows, columns: matrix.columns, data };
}
