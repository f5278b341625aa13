/**
 * Belsley-Kuh-Welsch collinearity diagnostics: condition indices and variance-decomposition
 * proportions of the data matrix X = [1, items] over the complete rows, each column scaled to
 * unit length and NOT centred (so the intercept takes part, and reverse-keying an item changes
 * the figures). With the SVD `X = U D Vᵀ`: condition index `η_k = d_max / d_k`, and the share of
 * coefficient j's variance that belongs to dimension k is
 * `π_kj = (v_jk² / d_k²) / Σ_k (v_jk² / d_k²)`. A dimension with a high index on which two or
 * more columns have a proportion of at least one half is a near-dependency among them.
 *
 * Two ways to the same d and V, chosen by `path` (default `auto`):
 * - `qr` (accurate; used while rows × columns² <= BELSLEY_QR_WORK_LIMIT): Householder QR of the
 *   scaled X, then the SVD of the small triangle R (ml-matrix). Backward stable: the relative
 *   error of d_k stays near ε·η_k.
 * - `gram` (fast; larger data): the scaled Gram matrix XᵀX is assembled from the centred
 *   cross-products and the means (`XᵀX = C + n·m·mᵀ`, intercept row `n, n·m`) with no further
 *   pass over the data, and its eigen-decomposition gives V and d². Squaring can lose accuracy on
 *   ill-conditioned data (error bound near ε·η_k² relative; measured 2e-8 against R's svd() on
 *   Longley, η = 43,275, and below 1e-12 on data with η < 300), harmless for survey items.
 *
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics: Identifying Influential Data
 * and Sources of Collinearity", ch. 3; Belsley 1991, "Conditioning Diagnostics: Collinearity and
 * Weak Data in Regression"; Golub & Van Loan 2013, "Matrix Computations", 4th ed., §5.2
 * (Householder QR) and §8.6 (SVD).
 */
import { completeRows } from './complete-rows';
import { SingularValueDecomposition } from 'ml-matrix';
import { centeredCrossProducts, type CenteredCrossProducts } from './cross-products';
import { symmetricEigen } from './symmetric-eigen';
import {
  BELSLEY_QR_WORK_LIMIT,
  BELSLEY_SINGULAR_VALUE_RELATIVE,
  CONDITION_INDEX_MODERATE,
  CONDITION_INDEX_STRONG,
  NULL_SPACE_MEMBERSHIP,
  VARIANCE_PROPORTION_INVOLVED,
} from './tolerances';
import type { ItemMatrix, NumericalNotice, SquareMatrix } from './types';

/** Which computation produced the singular values. */
export type BelsleyPath = 'qr' | 'gram';

/** A dimension with a high condition index and the columns whose variance it carries. */
export interface NearDependency {
  /** Index into `conditionIndices` (0 = the largest singular value). */
  readonly dimension: number;
  /** Its condition index; null for an exact dependency (zero singular value). */
  readonly conditionIndex: number | null;
  /** `exact` (zero singular value), `strong` (>= 30) or `moderate` (10 to 30). */
  readonly strength: 'exact' | 'strong' | 'moderate';
  /** Columns of X (0 = intercept, j + 1 = item j) with a proportion >= 0.5 on it, two or more. */
  readonly columns: readonly number[];
}

/** The result of `belsleyCollinearity`. Columns of X: 0 is the intercept, j + 1 is item j. */
export interface BelsleyCollinearityResult {
  /** Condition indices in ASCENDING order (1 first); null where the singular value is zero. */
  readonly conditionIndices: readonly (number | null)[];
  /** Singular values of the scaled X in DESCENDING order (same order as the indices). */
  readonly singularValues: readonly number[];
  /** `[dimension][column]`; every column sums to 1 over the dimensions. */
  readonly varianceProportions: readonly (readonly number[])[];
  /** Near-dependencies, strongest first. */
  readonly nearDependencies: readonly NearDependency[];
  /** Complete rows used (rows with no missing value). */
  readonly rowsUsed: number;
  /** Rows left out for a missing value. */
  readonly rowsExcluded: number;
  /** Which computation ran. */
  readonly path: BelsleyPath;
  /** `exact-dependency`, `zero-column`, `no-complete-rows`. */
  readonly notices: readonly NumericalNotice[];
}

/** Options of `belsleyCollinearity`. */
export interface BelsleyCollinearityOptions {
  /** `auto` (default) picks `qr` while rows × (items + 1)² <= BELSLEY_QR_WORK_LIMIT. */
  readonly path?: 'auto' | BelsleyPath;
  /**
   * Centred cross-products of the complete rows of the same matrix (e.g. already computed for
   * the Pearson matrix); used by the `gram` path instead of another pass over the data. Its
   * `rows` must equal the number of complete rows and its order the number of items.
   */
  readonly crossProducts?: CenteredCrossProducts;
  /**
   * The complete rows of the same matrix (ascending, as `completeRows(matrix, caller)` gives them,
   * infinite values already refused), when the caller has them; otherwise they are found here.
   */
  readonly completeRows?: readonly number[];
}

/**
 * Belsley-Kuh-Welsch condition indices and variance-decomposition proportions of the items with
 * an intercept, over the complete rows.
 * @param matrix Respondents × items, column-major; NaN marks a missing answer (its row is left out).
 * @param options `path` and reusable `crossProducts` (see BelsleyCollinearityOptions).
 * @throws {RangeError} when the matrix has no items, its data length is wrong, or a value is infinite.
 * @throws {RangeError} when `options.crossProducts` does not match the complete rows or items.
 * @returns Indices (ascending), singular values, proportions `[dimension][column]`,
 *   near-dependencies, rows used and notices. Zero singular values (exact dependencies, a
 *   constant or all-zero item) give null indices and proportions concentrated on the zero
 *   dimensions, never NaN or Infinity.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics", ch. 3; Belsley 1991,
 * "Conditioning Diagnostics".
 */
export function belsleyCollinearity(matrix: ItemMatrix, options: BelsleyCollinearityOptions = {}): BelsleyCollinearityResult {
  const { rows, columns, data } = matrix;
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError(`belsleyCollinearity: at least one item is required, got ${columns}`);
  if (!Number.isInteger(rows) || rows < 0 || data.length !== rows * columns) {
    throw new RangeError(`belsleyCollinearity: data holds ${data.length} values, expected rows × columns = ${rows * columns}`);
  }
  const kept = options.completeRows ?? completeRows(matrix, 'belsleyCollinearity');
  const complete = kept.length === rows ? null : kept;
  const rowsUsed = kept.length;
  const width = columns + 1;
  if (rowsUsed === 0) {
    return {
      conditionIndices: [],
      singularValues: [],
      varianceProportions: [],
      nearDependencies: [],
      rowsUsed: 0,
      rowsExcluded: rows,
      path: 'qr',
      notices: [{ code: 'no-complete-rows', items: [], message: 'No respondent answered every item, so no collinearity diagnostics exist.' }],
    };
  }
  const requested = options.path ?? 'auto';
  const path: BelsleyPath = requested === 'auto' ? (rowsUsed * width * width <= BELSLEY_QR_WORK_LIMIT ? 'qr' : 'gram') : requested;
  const used = complete === null ? matrix : keepRows(matrix, complete);

  const spectrum = path === 'qr' ? spectrumByQr(used) : spectrumByGram(used, options.crossProducts);
  return assemble(spectrum, rowsUsed, rows - rowsUsed, path);
}

/**
 * Belsley-Kuh-Welsch diagnostics from the moments of the items instead of complete rows: the
 * uncentred cross-product matrix of [1, X] over n rows is
 * `XᵀX = n · [[1, μᵀ], [μ, Σ + μ μᵀ]]` (per pair of items `n (σ_jk + μ_j μ_k)`, intercept row
 * `n, n μ`), with Σ the covariance matrix of divisor n. Given an estimate of μ and Σ from every
 * row (for example `emCovariance`, the maximum-likelihood estimate under missing at random), the
 * scaled Gram matrix and its eigen-decomposition give the same indices and proportions as the
 * `gram` path would on complete data. n cancels in the scaling, so it only labels `rowsUsed`.
 * @param means Each item's mean μ_j (finite).
 * @param covariance Covariance matrix Σ with divisor n (symmetric, finite, of the same order).
 * @param rows Respondents n behind the estimate (reported as `rowsUsed`), an integer ≥ 1.
 * @throws {RangeError} when the orders disagree, a value is not finite, or rows is not a positive integer.
 * @returns As `belsleyCollinearity`, with `path` 'gram' and `rowsExcluded` 0.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics", ch. 3; Dempster, Laird &
 * Rubin 1977 (the EM moments it is meant for).
 */
export function belsleyCollinearityFromMoments(means: ArrayLike<number>, covariance: SquareMatrix, rows: number): BelsleyCollinearityResult {
  const columns = means.length;
  if (columns < 1) throw new RangeError('belsleyCollinearityFromMoments: at least one item is required');
  if (covariance.order !== columns || covariance.data.length !== columns * columns) {
    throw new RangeError(`belsleyCollinearityFromMoments: ${columns} means but a covariance matrix of order ${covariance.order}`);
  }
  if (!Number.isInteger(rows) || rows < 1) throw new RangeError(`belsleyCollinearityFromMoments: rows must be a positive integer, got ${rows}`);
  const centered = new Float64Array(columns * columns);
  for (let index = 0; index < centered.length; index++) {
    const value = covariance.data[index];
    if (!Number.isFinite(value)) throw new RangeError('belsleyCollinearityFromMoments: the covariance matrix holds a non-finite value');
    centered[index] = rows * value;
  }
  const meanArray = Float64Array.from(means);
  if (meanArray.some((value) => !Number.isFinite(value))) throw new RangeError('belsleyCollinearityFromMoments: a mean is not finite');
  const spectrum = spectrumFromCrossProducts(rows, columns, { rows, means: meanArray, centered: { order: columns, data: centered } });
  return assemble(spectrum, rows, 0, 'gram');
}

/** Singular values (descending), right singular vectors (columns, row-major) and zero columns. */
interface ScaledSpectrum {
  readonly width: number;
  readonly singularValues: Float64Array;
  readonly vectors: Float64Array;
  readonly zeroColumns: readonly number[];
}

function keepRows(matrix: ItemMatrix, kept: readonly number[]): ItemMatrix {
  const rows = kept.length;
  const data = new Float64Array(rows * matrix.columns);
  for (let j = 0; j < matrix.columns; j++) {
    const source = j * matrix.rows;
    const target = j * rows;
    for (let k = 0; k < rows; k++) data[target + k] = matrix.data[source + kept[k]];
  }
  return { rows, columns: matrix.columns, data };
}

/** Householder QR of the unit-length-scaled [1, X], then the SVD of the k × k triangle. */
function spectrumByQr(matrix: ItemMatrix): ScaledSpectrum {
  const { rows: n, columns } = matrix;
  const width = columns + 1;
  const x = new Float64Array(n * width);
  const zeroColumns: number[] = [];
  x.fill(1 / Math.sqrt(n), 0, n);
  for (let j = 0; j < columns; j++) {
    const source = j * n;
    const target = (j + 1) * n;
    let sumOfSquares = 0;
    for (let i = 0; i < n; i++) sumOfSquares += matrix.data[source + i] * matrix.data[source + i];
    if (sumOfSquares === 0) zeroColumns.push(j + 1);
    const scale = sumOfSquares === 0 ? 1 : 1 / Math.sqrt(sumOfSquares);
    for (let i = 0; i < n; i++) x[target + i] = matrix.data[source + i] * scale;
  }

  const triangle = new Float64Array(width * width);
  const steps = Math.min(n, width);
  for (let c = 0; c < steps; c++) {
    const column = c * n;
    let norm = 0;
    for (let i = c; i < n; i++) norm += x[column + i] * x[column + i];
    norm = Math.sqrt(norm);
    if (norm === 0) continue;
    const alpha = x[column + c] > 0 ? -norm : norm;
    x[column + c] -= alpha;
    let vv = 0;
    for (let i = c; i < n; i++) vv += x[column + i] * x[column + i];
    triangle[c * width + c] = alpha;
    if (vv === 0) continue;
    const beta = 2 / vv;
    for (let t = c + 1; t < width; t++) {
      const other = t * n;
      let dot = 0;
      for (let i = c; i < n; i++) dot += x[column + i] * x[other + i];
      const factor = beta * dot;
      for (let i = c; i < n; i++) x[other + i] -= factor * x[column + i];
    }
  }
  for (let c = 0; c < steps; c++) for (let t = c + 1; t < width; t++) triangle[c * width + t] = x[t * n + c];

  const rowsOfTriangle: number[][] = [];
  for (let r = 0; r < width; r++) rowsOfTriangle.push(Array.from(triangle.subarray(r * width, (r + 1) * width)));
  const svd = new SingularValueDecomposition(rowsOfTriangle, { computeLeftSingularVectors: false, computeRightSingularVectors: true });
  const values = svd.diagonal;
  const right = svd.rightSingularVectors;
  const order = values.map((_, k) => k).sort((a, b) => values[b] - values[a] || a - b);
  const singularValues = new Float64Array(width);
  const vectors = new Float64Array(width * width);
  order.forEach((source, k) => {
    singularValues[k] = Math.max(0, values[source]);
    for (let j = 0; j < width; j++) vectors[j * width + k] = right.get(j, source);
  });
  return { width, singularValues, vectors, zeroColumns };
}

/** Eigen-decomposition of the unit-diagonal-scaled Gram matrix of [1, X], from cross-products. */
function spectrumByGram(matrix: ItemMatrix, given: CenteredCrossProducts | undefined): ScaledSpectrum {
  const { rows: n, columns } = matrix;
  if (given !== undefined && (given.rows !== n || given.centered.order !== columns || given.means.length !== columns)) {
    throw new RangeError(
      `belsleyCollinearity: the cross-products cover ${given.rows} rows and ${given.centered.order} items, the complete data ${n} rows and ${columns} items`,
    );
  }
  return spectrumFromCrossProducts(n, columns, given ?? centeredCrossProducts(matrix));
}

/** The scaled Gram matrix of [1, X] from centred cross-products and means, and its eigen-decomposition. */
function spectrumFromCrossProducts(n: number, columns: number, crossProducts: CenteredCrossProducts): ScaledSpectrum {
  const width = columns + 1;
  const { means, centered } = crossProducts;
  const gram = new Float64Array(width * width);
  gram[0] = n;
  for (let j = 0; j < columns; j++) {
    gram[j + 1] = n * means[j];
    gram[(j + 1) * width] = n * means[j];
    for (let k = 0; k < columns; k++) gram[(j + 1) * width + k + 1] = centered.data[j * columns + k] + n * means[j] * means[k];
  }
  const zeroColumns: number[] = [];
  const scale = new Float64Array(width);
  for (let a = 0; a < width; a++) {
    const diagonal = gram[a * width + a];
    if (diagonal <= 0) zeroColumns.push(a);
    scale[a] = diagonal > 0 ? 1 / Math.sqrt(diagonal) : 1;
  }
  // A zero column has a zero row and column in XᵀX; it stays zero (and unscaled).
  for (let a = 0; a < width; a++) {
    for (let b = a; b < width; b++) {
      const value = a === b ? (zeroColumns.includes(a) ? 0 : 1) : gram[a * width + b] * scale[a] * scale[b];
      gram[a * width + b] = value;
      gram[b * width + a] = value;
    }
  }
  const eigen = symmetricEigen({ order: width, data: gram });
  const singularValues = new Float64Array(width);
  for (let k = 0; k < width; k++) singularValues[k] = Math.sqrt(Math.max(0, eigen.values[k]));
  return { width, singularValues, vectors: Float64Array.from(eigen.vectors.data), zeroColumns };
}

/** Condition indices, proportions, near-dependencies and notices from d and V. */
function assemble(spectrum: ScaledSpectrum, rowsUsed: number, rowsExcluded: number, path: BelsleyPath): BelsleyCollinearityResult {
  const { width, singularValues: d, vectors: v, zeroColumns } = spectrum;
  const largest = d[0];
  const zeroLimit = BELSLEY_SINGULAR_VALUE_RELATIVE * largest;
  const isZero = Array.from(d, (value) => !(value > zeroLimit));
  const conditionIndices = Array.from(d, (value, k) => (isZero[k] ? null : largest / value));

  const proportions: number[][] = Array.from({ length: width }, () => new Array<number>(width).fill(0));
  const dependentColumns: number[] = [];
  for (let j = 0; j < width; j++) {
    let nullWeight = 0;
    for (let k = 0; k < width; k++) if (isZero[k]) nullWeight += v[j * width + k] * v[j * width + k];
    if (nullWeight >= NULL_SPACE_MEMBERSHIP * NULL_SPACE_MEMBERSHIP) {
      // Limit of the proportions as the zero singular values shrink to 0: all of the column's
      // variance sits on the zero dimensions, shared by its squared loadings there.
      dependentColumns.push(j);
      for (let k = 0; k < width; k++) if (isZero[k]) proportions[k][j] = (v[j * width + k] * v[j * width + k]) / nullWeight;
      continue;
    }
    let total = 0;
    for (let k = 0; k < width; k++) if (!isZero[k]) total += (v[j * width + k] * v[j * width + k]) / (d[k] * d[k]);
    for (let k = 0; k < width; k++) {
      if (!isZero[k]) proportions[k][j] = (v[j * width + k] * v[j * width + k]) / (d[k] * d[k]) / total;
    }
  }

  const nearDependencies: NearDependency[] = [];
  for (let k = width - 1; k >= 0; k--) {
    const index = conditionIndices[k];
    const strength = index === null ? 'exact' : index >= CONDITION_INDEX_STRONG ? 'strong' : index >= CONDITION_INDEX_MODERATE ? 'moderate' : null;
    if (strength === null) continue;
    const involved: number[] = [];
    for (let j = 0; j < width; j++) if (proportions[k][j] >= VARIANCE_PROPORTION_INVOLVED) involved.push(j);
    if (involved.length >= 2) nearDependencies.push({ dimension: k, conditionIndex: index, strength, columns: involved });
  }

  const notices: NumericalNotice[] = [];
  const describe = (columnsOfX: readonly number[]): string =>
    columnsOfX.map((c) => (c === 0 ? 'the intercept' : `item column ${c - 1}`)).join(', ');
  if (zeroColumns.length > 0) {
    notices.push({
      code: 'zero-column',
      items: zeroColumns.filter((c) => c > 0).map((c) => c - 1),
      message: `${describe(zeroColumns)} hold only zeros over the complete rows and cannot be scaled to unit length.`,
    });
  }
  if (dependentColumns.length > 0) {
    notices.push({
      code: 'exact-dependency',
      items: dependentColumns.filter((c) => c > 0).map((c) => c - 1),
      message: `${describe(dependentColumns)} are exactly linearly dependent (a constant item depends on the intercept); their condition index is infinite and reported as null.`,
    });
  }
  return {
    conditionIndices,
    singularValues: Array.from(d),
    varianceProportions: proportions,
    nearDependencies,
    rowsUsed,
    rowsExcluded,
    path,
    notices,
  };
}
