/**
 * Shared data shapes of the numerical core. Plain objects and typed arrays only, so every
 * function runs unchanged in a worker thread, a test, the command line and the server.
 */

/**
 * Respondents × items, stored column-major: the value of item `j` for respondent `i` sits at
 * `data[j * rows + i]`. A missing answer is `NaN`. Values are already recoded (reverse-keyed
 * items flipped, missing codes turned into `NaN`) before they reach the core.
 */
export interface ItemMatrix {
  /** Number of respondents. */
  readonly rows: number;
  /** Number of items. */
  readonly columns: number;
  /** `rows * columns` values, column-major, `NaN` for missing. */
  readonly data: Float64Array;
}

/**
 * A square matrix of order `order`, stored row-major in full (both triangles): element
 * (i, j) at `data[i * order + j]`. Used for correlation, covariance and count matrices.
 */
export interface SquareMatrix {
  readonly order: number;
  readonly data: Float64Array;
}

/** Missing-data policy for anything computed from pairs of items. */
export type MissingPolicy = 'pairwise' | 'listwise';

/** Correlation coefficient family. */
export type CorrelationMethod = 'pearson' | 'spearman' | 'polychoric';

/**
 * A numerical condition worth telling the analyst about (a constant item, an exact
 * dependency, a repaired matrix). Conditions are results, not exceptions.
 */
export interface NumericalNotice {
  /** kebab-case code, e.g. `constant-item`, `exact-dependency`, `matrix-repaired`. */
  readonly code: string;
  /** Indices (0-based columns) of the items concerned. */
  readonly items: readonly number[];
  /** One plain sentence. */
  readonly message: string;
}

/** Builds an ItemMatrix from columns of equal length (copies the values). */
export function itemMatrixFromColumns(columns: readonly ArrayLike<number>[]): ItemMatrix {
  if (columns.length === 0) throw new RangeError('itemMatrixFromColumns: at least one column is required');
  const rows = columns[0].length;
  const data = new Float64Array(rows * columns.length);
  columns.forEach((column, j) => {
    if (column.length !== rows) {
      throw new RangeError(`itemMatrixFromColumns: column ${j} has ${column.length} values, expected ${rows}`);
    }
    for (let i = 0; i < rows; i++) data[j * rows + i] = column[i];
  });
  return { rows, columns: columns.length, data };
}

/** Builds an ItemMatrix from rows of equal length (respondent-major input, e.g. a parsed CSV). */
export function itemMatrixFromRows(rowValues: readonly ArrayLike<number>[]): ItemMatrix {
  if (rowValues.length === 0) throw new RangeError('itemMatrixFromRows: at least one row is required');
  const rows = rowValues.length;
  const columns = rowValues[0].length;
  const data = new Float64Array(rows * columns);
  rowValues.forEach((row, i) => {
    if (row.length !== columns) {
      throw new RangeError(`itemMatrixFromRows: row ${i} has ${row.length} values, expected ${columns}`);
    }
    for (let j = 0; j < columns; j++) data[j * rows + i] = row[j];
  });
  return { rows, columns, data };
}

/** The values of one item as a view (no copy) into the matrix. */
export function itemColumn(matrix: ItemMatrix, j: number): Float64Array {
  return matrix.data.subarray(j * matrix.rows, (j + 1) * matrix.rows);
}

/** Keeps only the listed items (by 0-based index), in the order given. */
export function selectItems(matrix: ItemMatrix, indices: readonly number[]): ItemMatrix {
  const data = new Float64Array(matrix.rows * indices.length);
  indices.forEach((j, k) => data.set(itemColumn(matrix, j), k * matrix.rows));
  return { rows: matrix.rows, columns: indices.length, data };
}

/** Keeps only the listed respondents (by 0-based index), in the order given. */
export function selectRespondents(matrix: ItemMatrix, indices: ArrayLike<number>): ItemMatrix {
  const rows = indices.length;
  const data = new Float64Array(rows * matrix.columns);
  for (let j = 0; j < matrix.columns; j++) {
    const source = j * matrix.rows;
    const target = j * rows;
    for (let k = 0; k < rows; k++) data[target + k] = matrix.data[source + indices[k]];
  }
  return { rows, columns: matrix.columns, data };
}

/**
 * The listed respondents (by 0-based index, repeats allowed, in the order given) and items of a
 * matrix, the values of `selectItems(selectRespondents(matrix, respondents), items)`, copied only
 * when `data` is first read (then kept): a bootstrap resample whose figures come from the
 * original rows with weights reads its own copy only where a figure still needs one.
 * @param matrix The original matrix; not to be modified while the selection is in use.
 * @param respondents Row indices into `matrix`, each in range.
 * @param items Column indices into `matrix` (default every column).
 * @throws {RangeError} when a respondent or an item is out of range.
 * @returns A matrix of respondents.length × items.length whose `data` is built on first read.
 * References: none (a copy, deferred).
 */
export function deferredSelection(matrix: ItemMatrix, respondents: ArrayLike<number>, items?: readonly number[]): ItemMatrix {
  const columns = items ?? Array.from({ length: matrix.columns }, (_, j) => j);
  for (const j of columns) if (!Number.isInteger(j) || j < 0 || j >= matrix.columns) throw new RangeError(`deferredSelection: item ${j} is outside 0..${matrix.columns - 1}`);
  for (let i = 0; i < respondents.length; i++) {
    const row = respondents[i];
    if (!(Number.isInteger(row) && row >= 0 && row < matrix.rows)) throw new RangeError(`deferredSelection: respondent ${i} is row ${row}, outside 0..${matrix.rows - 1}`);
  }
  let data: Float64Array | null = null;
  const build = (): Float64Array => {
    const rows = respondents.length;
    const copy = new Float64Array(rows * columns.length);
    columns.forEach((j, k) => {
      const source = j * matrix.rows;
      const target = k * rows;
      for (let i = 0; i < rows; i++) copy[target + i] = matrix.data[source + respondents[i]];
    });
    return copy;
  };
  return {
    rows: respondents.length,
    columns: columns.length,
    get data(): Float64Array {
      data ??= build();
      return data;
    },
  };
}

/**
 * A function of a matrix whose result is found once per matrix and kept while the matrix lives,
 * by its data array and shape (a bootstrap's resamples, or the correlations and covariances of
 * one wave, read the same original matrix). The matrix is not to be modified once seen: the kept
 * result would no longer be its own.
 * @param compute The function, of the matrix alone.
 * @returns The same function, computing once per matrix.
 * References: none (memoisation).
 */
export function keptPerMatrix<T>(compute: (matrix: ItemMatrix) => T): (matrix: ItemMatrix) => T {
  const kept = new WeakMap<Float64Array, { readonly rows: number; readonly columns: number; readonly value: T }>();
  return (matrix) => {
    const known = kept.get(matrix.data);
    if (known !== undefined && known.rows === matrix.rows && known.columns === matrix.columns) return known.value;
    const value = compute(matrix);
    kept.set(matrix.data, { rows: matrix.rows, columns: matrix.columns, value });
    return value;
  };
}

/** The rows a bootstrap resample draws, each once, with how often it is drawn (see `distinctDraws`). */
export interface DistinctDraws {
  /** The drawn rows, ascending. */
  readonly drawn: Int32Array;
  /** How often each is drawn, in the same order. */
  readonly w: Float64Array;
  /** All draws: the resample's rows. */
  readonly total: number;
}

/**
 * The rows a resample draws at least once, with their weights: what a pass over the original
 * rows with weights reads instead of the resampled matrix.
 * @param weights How often each original row is drawn (0 for a row not drawn).
 * @returns The drawn rows ascending, their weights, and the sum of the weights.
 * References: Efron & Tibshirani 1993, "An Introduction to the Bootstrap", ch. 6 (the resample as
 *   weights on the observed rows).
 */
export function distinctDraws(weights: ArrayLike<number>): DistinctDraws {
  const rows = weights.length;
  let distinct = 0;
  for (let i = 0; i < rows; i++) if (weights[i] > 0) distinct++;
  const drawn = new Int32Array(distinct);
  const w = new Float64Array(distinct);
  let total = 0;
  for (let i = 0, t = 0; i < rows; i++) {
    if (weights[i] > 0) {
      drawn[t] = i;
      w[t++] = weights[i];
      total += weights[i];
    }
  }
  return { drawn, w, total };
}

/** A square matrix from nested arrays (checks it is square). */
export function squareMatrixFromRows(values: readonly (readonly number[])[]): SquareMatrix {
  const order = values.length;
  const data = new Float64Array(order * order);
  values.forEach((row, i) => {
    if (row.length !== order) throw new RangeError(`squareMatrixFromRows: row ${i} has ${row.length} values, expected ${order}`);
    for (let j = 0; j < order; j++) data[i * order + j] = row[j];
  });
  return { order, data };
}

/** Nested arrays (for JSON) from a square matrix. */
export function squareMatrixToRows(matrix: SquareMatrix): number[][] {
  const out: number[][] = [];
  for (let i = 0; i < matrix.order; i++) out.push(Array.from(matrix.data.subarray(i * matrix.order, (i + 1) * matrix.order)));
  return out;
}
