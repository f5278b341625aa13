/**
 * The item correlation matrix (Pearson, Spearman or polychoric) under an explicit missing-data
 * policy, with the number of respondents behind every cell, and which items may enter it.
 *
 * - Listwise: only respondents who answered every item are used; every cell has the same n.
 * - Pairwise: each cell uses the respondents who answered both items, with its own n (means,
 *   standard deviations and ranks are taken over those respondents, as R's
 *   `cor(x, use = "pairwise.complete.obs", method = ...)` does). Polychoric thresholds are an
 *   exception by design: they come from all observed answers of each item (see
 *   polychoric-correlation.ts).
 *
 * Undefined pairs. A pair with fewer than MIN_ROWS_FOR_CORRELATION common respondents, or whose
 * items do not both vary among them, has no correlation. It is entered as 0 (so the matrix never
 * holds NaN), listed in `undefinedPairs`, and reported by a `correlation-undefined` notice. The
 * diagonal is always 1. Callers should first drop the items `usableItems` refuses.
 *
 * Indefinite matrices. A pairwise matrix with missing data, and any polychoric matrix, need not
 * be positive semi-definite. Such a matrix goes through `repairCorrelationMatrix`
 * (nearest-correlation.ts), which detects indefiniteness (smallest eigenvalue below
 * −EXACT_DEPENDENCY_RELATIVE_EIGENVALUE × the largest) and repairs it by Higham's nearest
 * correlation matrix by default; `repaired`, `unrepaired` and a `matrix-repaired` notice say so.
 * Complete-data (and listwise) Pearson and Spearman matrices are Gram matrices, positive
 * semi-definite by construction, and are not checked.
 *
 * References: Pearson 1896, "Mathematical contributions to the theory of evolution. III.
 * Regression, heredity and panmixia"; Spearman 1904, "The proof and measurement of association
 * between two things"; Olsson 1979, "Maximum likelihood estimation of the polychoric
 * correlation coefficient"; Higham 2002, "Computing the nearest correlation matrix" (IMA J.
 * Numer. Anal. 22:329-343) on indefinite pairwise matrices.
 */
import { checkItemMatrix } from './item-matrix-input';
import { centeredCrossProducts, crossProductsOfItems, pearsonFromCrossProducts, type CenteredCrossProducts } from './cross-products';
import { maskedCrossProducts, pairCentredSums } from './masked-cross-products';
import { assignMidRanks, midRanks } from './mid-ranks';
import { pearsonOfPairComplete } from './pearson-correlation';
import { codeOrdinalItem, type OrdinalItem } from './polychoric-coding';
import { createPolychoricPairsJob, estimatePolychoricPairs, POLYCHORIC_PAIR_FIELDS, type PolychoricPairsJob } from './polychoric-pairs';
import { repairCorrelationMatrix, type CorrelationRepairMethod } from './nearest-correlation';
import { summarizeSpectrum } from './spectral-inverse';
import { symmetricEigenvalues } from './symmetric-eigen';
import { MIN_ROWS_FOR_CORRELATION, NEAR_PERFECT_CORRELATION, POLYCHORIC_MAX_CATEGORIES } from './tolerances';
import { completeRows, rowsWithAnyAnswer } from './complete-rows';
import { itemColumn, selectRespondents, type CorrelationMethod, type ItemMatrix, type MissingPolicy, type NumericalNotice, type SquareMatrix } from './types';

/** Options of `correlationMatrix`. */
export interface CorrelationMatrixOptions {
  readonly method: CorrelationMethod;
  readonly missing: MissingPolicy;
  /**
   * How an indefinite matrix is repaired: `higham` (default, the nearest correlation matrix),
   * `clip` (eigenvalue clipping), or `none` (detect and report only).
   */
  readonly repair?: CorrelationRepairMethod | 'none';
  /**
   * Pearson over complete rows only (complete data, or listwise deletion): the centred
   * cross-products of the same matrix's complete rows, already computed by the caller (e.g. for
   * the covariance matrix and the collinearity diagnostics), used instead of another pass over
   * the data. The result is bit for bit the same. Its `rows` must equal the number of complete
   * rows and its order the number of items.
   */
  readonly crossProducts?: CenteredCrossProducts;
}

/** Two item indices (0-based), the smaller first. */
export type ItemPair = readonly [number, number];

/** A correlation matrix with everything needed to report it honestly. */
export interface CorrelationMatrixResult {
  readonly method: CorrelationMethod;
  readonly missing: MissingPolicy;
  /** Full symmetric matrix, row-major, 1 on the diagonal, 0 for undefined pairs. Never NaN. */
  readonly matrix: SquareMatrix;
  /**
   * Respondents behind each cell: pair-complete counts under pairwise (the diagonal holds each
   * item's own count), the number of complete rows everywhere under listwise.
   */
  readonly n: SquareMatrix;
  /** Listwise: complete rows. Pairwise: rows with at least one item answered. */
  readonly rowsUsed: number;
  /** Pairs without a correlation (entered as 0). */
  readonly undefinedPairs: readonly ItemPair[];
  /** Polychoric only: pairs whose empty cells received the zero-cell correction. */
  readonly correctedPairs: readonly ItemPair[];
  /** Polychoric only: each item's thresholds (empty for an item with one category); else null. */
  readonly thresholds: readonly (readonly number[])[] | null;
  /** Smallest eigenvalue (before any repair) when it was checked (pairwise with missing data, or polychoric), else null. */
  readonly smallestEigenvalue: number | null;
  /**
   * The eigenvalues (descending) of the returned `matrix` when the check computed them and left
   * the matrix as it was (not repaired); absent otherwise. Callers that need the spectrum of the
   * same matrix may reuse them (the same values `symmetricEigenvalues` gives).
   */
  readonly eigenvalues?: Float64Array;
  /** True when the matrix was found indefinite (see the module notes). */
  readonly indefinite: boolean;
  /** True when `matrix` was repaired to the nearest correlation matrix (the raw one is `unrepaired`). */
  readonly repaired: boolean;
  /** The matrix before repair, when repaired; else null. */
  readonly unrepaired: SquareMatrix | null;
  /**
   * Polychoric only: each estimate's standard error given the thresholds (Olsson 1979's two-step
   * information in ρ, the analytic second derivative of the log-likelihood), NaN where there is
   * none (undefined, boundary or not converged); else null.
   */
  readonly standardErrors: SquareMatrix | null;
  readonly notices: readonly NumericalNotice[];
}

/**
 * Correlation matrix of the items under the chosen method and missing-data policy, computed on
 * the calling thread (`correlationMatrixParallel` in parallel/ spreads polychoric pairs over
 * worker threads and gives the same result).
 * @param matrix Respondents × items, column-major, NaN for missing.
 * @param options `method`: pearson, spearman or polychoric; `missing`: pairwise or listwise.
 * @throws {RangeError} when the matrix shape is inconsistent, a value is ±Infinity, an option is
 *   unknown, or (polychoric) an item has more than POLYCHORIC_MAX_CATEGORIES distinct values.
 * @throws {RangeError} when `options.crossProducts` is given for another method than Pearson, for
 *   pairwise deletion with missing answers, or does not match the complete rows and items.
 * @returns The matrix, the n of every cell, the rows used, undefined and corrected pairs, the
 *   indefiniteness check and notices. Never NaN.
 * References: Pearson 1896; Spearman 1904; Olsson 1979 (see the module notes).
 */
export function correlationMatrix(matrix: ItemMatrix, options: CorrelationMatrixOptions): CorrelationMatrixResult {
  const prepared = prepareCorrelationMatrix(matrix, options, 'correlationMatrix');
  const polychoric = prepared.polychoricJob === null ? null : estimatePolychoricPairs(prepared.polychoricJob);
  return finishCorrelationMatrix(prepared, polychoric);
}

/**
 * The first half of a correlation matrix: inputs checked, rows selected, Pearson and Spearman
 * cells computed, polychoric pairs packed into a job (not yet estimated). Shared by
 * `correlationMatrix` and `correlationMatrixParallel`; other callers should use those.
 */
export interface PreparedCorrelationMatrix {
  readonly method: CorrelationMethod;
  readonly missing: MissingPolicy;
  readonly repair: CorrelationRepairMethod | 'none';
  readonly order: number;
  readonly rowsUsed: number;
  /** Whether the cells came from differing sets of respondents (pairwise with missing data). */
  readonly pairwiseWithMissing: boolean;
  /** Row-major values and counts, filled for Pearson and Spearman (and counts' diagonal always). */
  readonly values: Float64Array;
  readonly counts: Float64Array;
  readonly undefinedPairs: ItemPair[];
  /** Polychoric: the coded items and the job listing every pair j < k; else null. */
  readonly polychoricItems: readonly OrdinalItem[] | null;
  readonly polychoricJob: PolychoricPairsJob | null;
}

/**
 * Checks the inputs and computes everything but the polychoric pairs (see
 * `PreparedCorrelationMatrix`).
 * @param matrix Respondents × items, NaN for missing.
 * @param options Method and missing-data policy.
 * @param caller Name used in error messages.
 * @throws {RangeError} as `correlationMatrix` does.
 * @returns The prepared state for `finishCorrelationMatrix`.
 * References: Pearson 1896; Spearman 1904; Olsson 1979 (see the module notes).
 */
export function prepareCorrelationMatrix(matrix: ItemMatrix, options: CorrelationMatrixOptions, caller: string): PreparedCorrelationMatrix {
  checkItemMatrix(matrix, caller);
  const { method, missing, repair = 'higham' } = options ?? ({} as CorrelationMatrixOptions);
  if (method !== 'pearson' && method !== 'spearman' && method !== 'polychoric') {
    throw new RangeError(`${caller}: method must be pearson, spearman or polychoric, got ${String(method)}`);
  }
  if (missing !== 'pairwise' && missing !== 'listwise') {
    throw new RangeError(`${caller}: missing must be pairwise or listwise, got ${String(missing)}`);
  }
  if (repair !== 'higham' && repair !== 'clip' && repair !== 'none') {
    throw new RangeError(`${caller}: repair must be higham, clip or none, got ${String(repair)}`);
  }
  const order = matrix.columns;
  const values = new Float64Array(order * order);
  const counts = new Float64Array(order * order);
  const undefinedPairs: ItemPair[] = [];

  const complete = completeRows(matrix);
  const given = options?.crossProducts;
  if (given !== undefined) {
    if (method !== 'pearson') throw new RangeError(`${caller}: crossProducts are used for Pearson only, not ${method}`);
    if (missing === 'pairwise' && complete.length < matrix.rows) throw new RangeError(`${caller}: crossProducts cannot serve pairwise deletion with missing answers`);
    if (given.rows !== complete.length || given.centered.order !== order || given.means.length !== order) {
      throw new RangeError(`${caller}: the crossProducts cover ${given.rows} rows and ${given.centered.order} items, the complete data ${complete.length} rows and ${order} items`);
    }
  }
  const hasMissing = complete.length < matrix.rows;
  let data = matrix;
  let rowsUsed: number;
  if (missing === 'listwise') {
    if (hasMissing) data = selectRespondents(matrix, complete);
    rowsUsed = complete.length;
  } else {
    // Without a missing answer every row answered an item: no pass needed to count them.
    rowsUsed = hasMissing ? rowsWithAnyAnswer(matrix) : matrix.rows;
  }
  const pairwiseWithMissing = missing === 'pairwise' && hasMissing;

  let polychoricItems: OrdinalItem[] | null = null;
  let polychoricJob: PolychoricPairsJob | null = null;
  if (method === 'polychoric') {
    polychoricItems = [];
    for (let j = 0; j < order; j++) {
      try {
        polychoricItems.push(codeOrdinalItem(itemColumn(data, j), POLYCHORIC_MAX_CATEGORIES));
      } catch (error) {
        throw new RangeError(`${caller}: item ${j}: ${(error as Error).message}`);
      }
    }
    polychoricJob = createPolychoricPairsJob(polychoricItems, allPairs(order));
    for (let j = 0; j < order; j++) counts[j * order + j] = polychoricItems[j].observed;
  } else if (pairwiseWithMissing) {
    fillPairwiseWithMissing(data, method, values, counts, undefinedPairs);
  } else {
    fillComplete(data, method, values, counts, undefinedPairs, given);
  }
  return { method, missing, repair, order, rowsUsed, pairwiseWithMissing, values, counts, undefinedPairs, polychoricItems, polychoricJob };
}

/**
 * The second half: polychoric results entered, diagonal set, the matrix checked for
 * indefiniteness and the notices written.
 * @param prepared From `prepareCorrelationMatrix` (its arrays are filled in place).
 * @param polychoric For polychoric, the output of `estimatePolychoricPairs` on the prepared job
 *   (or the concatenation of its shares, in pair order); null otherwise.
 * @throws {RangeError} when polychoric results are missing or of the wrong length.
 * @returns The finished result.
 * References: Higham 2002, "Computing the nearest correlation matrix" (repair of an indefinite
 * result, through repairCorrelationMatrix).
 */
export function finishCorrelationMatrix(prepared: PreparedCorrelationMatrix, polychoric: Float64Array | null): CorrelationMatrixResult {
  const { order, values, counts, undefinedPairs, method, missing } = prepared;
  const correctedPairs: ItemPair[] = [];
  const notConverged: ItemPair[] = [];
  let standardErrors: SquareMatrix | null = null;
  if (prepared.polychoricJob !== null) {
    standardErrors = { order, data: new Float64Array(order * order).fill(Number.NaN) };
    for (let j = 0; j < order; j++) standardErrors.data[j * order + j] = 0;
    const pairs = prepared.polychoricJob.pairs;
    const pairCount = pairs.length / 2;
    if (polychoric === null || polychoric.length !== pairCount * POLYCHORIC_PAIR_FIELDS) {
      throw new RangeError(`finishCorrelationMatrix: expected ${pairCount * POLYCHORIC_PAIR_FIELDS} polychoric values, got ${polychoric?.length ?? 'none'}`);
    }
    for (let p = 0; p < pairCount; p++) {
      const j = pairs[2 * p];
      const k = pairs[2 * p + 1];
      const at = p * POLYCHORIC_PAIR_FIELDS;
      const rho = polychoric[at];
      const status = polychoric[at + 2];
      const n = polychoric[at + 3];
      standardErrors.data[j * order + k] = polychoric[at + 1];
      standardErrors.data[k * order + j] = polychoric[at + 1];
      counts[j * order + k] = n;
      counts[k * order + j] = n;
      if (Number.isNaN(rho)) {
        undefinedPairs.push([j, k]);
        continue;
      }
      values[j * order + k] = rho;
      values[k * order + j] = rho;
      if (status === 2) correctedPairs.push([j, k]);
      if (status === 5) notConverged.push([j, k]);
    }
  }
  for (let j = 0; j < order; j++) values[j * order + j] = 1;

  const notices: NumericalNotice[] = [];
  if (undefinedPairs.length > 0) {
    notices.push({
      code: 'correlation-undefined',
      items: itemsOf(undefinedPairs),
      message:
        `${undefinedPairs.length} item pair(s) have no correlation: fewer than ${MIN_ROWS_FOR_CORRELATION} respondents answered both, ` +
        'or one of the two items did not vary among them. They are entered as 0.',
    });
  }
  if (correctedPairs.length > 0) {
    notices.push({
      code: 'zero-cell-correction',
      items: itemsOf(correctedPairs),
      message:
        `${correctedPairs.length} item pair(s) had empty answer combinations that pushed the polychoric estimate to ±1; ` +
        'half a count was added to those empty cells before estimating.',
    });
  }
  if (notConverged.length > 0) {
    notices.push({
      code: 'polychoric-not-converged',
      items: itemsOf(notConverged),
      message: `The polychoric estimate of ${notConverged.length} item pair(s) did not converge; the last value is shown.`,
    });
  }

  let matrix: SquareMatrix = { order, data: values };
  let smallestEigenvalue: number | null = null;
  let eigenvalues: Float64Array | undefined;
  let indefinite = false;
  let repaired = false;
  let unrepaired: SquareMatrix | null = null;
  if ((prepared.pairwiseWithMissing || method === 'polychoric') && order > 1) {
    if (prepared.repair === 'none') {
      eigenvalues = symmetricEigenvalues(matrix);
      const spectrum = summarizeSpectrum(eigenvalues);
      smallestEigenvalue = spectrum.smallest;
      indefinite = spectrum.indefinite;
    } else {
      const repair = repairCorrelationMatrix(matrix, { method: prepared.repair });
      smallestEigenvalue = repair.smallestEigenvalueBefore;
      indefinite = repair.repaired;
      if (repair.repaired) {
        repaired = true;
        unrepaired = matrix;
        matrix = repair.matrix;
        notices.push(...repair.notices);
      } else {
        eigenvalues = repair.eigenvaluesBefore;
      }
    }
    if (indefinite && !repaired) {
      notices.push({
        code: 'matrix-indefinite',
        items: Array.from({ length: order }, (_, j) => j),
        message: `The correlation matrix is not positive semi-definite (smallest eigenvalue ${smallestEigenvalue.toPrecision(3)}), as can happen when each cell uses different respondents or with polychoric estimates; it was left as computed.`,
      });
    }
  }
  const thresholds = prepared.polychoricItems === null ? null : prepared.polychoricItems.map((item) => Array.from(item.thresholds.limits));
  return {
    method,
    missing,
    matrix,
    n: { order, data: counts },
    rowsUsed: prepared.rowsUsed,
    undefinedPairs,
    correctedPairs,
    thresholds,
    smallestEigenvalue,
    ...(eigenvalues === undefined ? {} : { eigenvalues }),
    indefinite,
    repaired,
    unrepaired,
    standardErrors,
    notices,
  };
}

function allPairs(order: number): Int32Array {
  const pairs = new Int32Array(order * (order - 1));
  let at = 0;
  for (let j = 0; j < order; j++) {
    for (let k = j + 1; k < order; k++) {
      pairs[at++] = j;
      pairs[at++] = k;
    }
  }
  return pairs;
}

function itemsOf(pairs: readonly ItemPair[]): number[] {
  const items = new Set<number>();
  for (const [j, k] of pairs) {
    items.add(j);
    items.add(k);
  }
  return Array.from(items).sort((a, b) => a - b);
}

function isConstant(values: Float64Array): boolean {
  for (let i = 1; i < values.length; i++) if (values[i] !== values[0]) return false;
  return true;
}

/** Complete data (listwise rows, or pairwise without any missing value): one Pearson pass. */
function fillComplete(
  data: ItemMatrix,
  method: CorrelationMethod,
  values: Float64Array,
  counts: Float64Array,
  undefinedPairs: ItemPair[],
  given: CenteredCrossProducts | undefined,
): void {
  const order = data.columns;
  const rows = data.rows;
  counts.fill(rows);
  if (rows < MIN_ROWS_FOR_CORRELATION) {
    for (let j = 0; j < order; j++) for (let k = j + 1; k < order; k++) undefinedPairs.push([j, k]);
    return;
  }
  const varying: number[] = [];
  for (let j = 0; j < order; j++) if (!isConstant(itemColumn(data, j))) varying.push(j);
  if (varying.length > 0) {
    let products: CenteredCrossProducts;
    if (given !== undefined) {
      products = varying.length === order ? given : crossProductsOfItems(given, varying);
    } else {
      const working = new Float64Array(rows * varying.length);
      varying.forEach((j, position) => {
        const source = itemColumn(data, j);
        working.set(method === 'spearman' ? midRanks(source) : source, position * rows);
      });
      products = centeredCrossProducts({ rows, columns: varying.length, data: working });
    }
    const correlations = pearsonFromCrossProducts(products);
    const size = varying.length;
    for (let a = 0; a < size; a++) {
      for (let b = 0; b < size; b++) values[varying[a] * order + varying[b]] = correlations.data[a * size + b];
    }
  }
  const isVarying = new Uint8Array(order);
  for (const j of varying) isVarying[j] = 1;
  for (let j = 0; j < order; j++) {
    for (let k = j + 1; k < order; k++) if (isVarying[j] === 0 || isVarying[k] === 0) undefinedPairs.push([j, k]);
  }
}

/**
 * Pairwise deletion with missing data: every pair over its own complete rows. Pearson goes through
 * the masked cross-products (every pair at once); a pair they cannot give to full accuracy (an
 * item constant over the pair, or heavy cancellation) and Spearman (re-ranked per pair) go
 * through the two-pass pair loop.
 */
function fillPairwiseWithMissing(
  data: ItemMatrix,
  method: CorrelationMethod,
  values: Float64Array,
  counts: Float64Array,
  undefinedPairs: ItemPair[],
): void {
  const order = data.columns;
  const rows = data.rows;
  const columns: Float64Array[] = [];
  for (let j = 0; j < order; j++) {
    const values_j = itemColumn(data, j);
    columns.push(values_j);
    let observed = 0;
    for (let i = 0; i < rows; i++) if (values_j[i] === values_j[i]) observed++;
    counts[j * order + j] = observed;
  }
  if (method === 'pearson') {
    fillPairwisePearson(data, columns, values, counts, undefinedPairs);
    return;
  }
  // Spearman: each item's observed rows sorted once by value; a pair re-ranks the rows it keeps.
  const sortedRows: Int32Array[] = [];
  let kept: Int32Array | null = null;
  let ranksA: Float64Array | null = null;
  let ranksB: Float64Array | null = null;
  if (method === 'spearman') {
    for (let j = 0; j < order; j++) {
      const values_j = columns[j];
      const observedRows: number[] = [];
      for (let i = 0; i < rows; i++) if (values_j[i] === values_j[i]) observedRows.push(i);
      observedRows.sort((a, b) => values_j[a] - values_j[b] || a - b);
      sortedRows.push(Int32Array.from(observedRows));
    }
    kept = new Int32Array(rows);
    ranksA = new Float64Array(rows);
    ranksB = new Float64Array(rows);
  }
  for (let j = 0; j < order; j++) {
    for (let k = j + 1; k < order; k++) {
      let result;
      if (method === 'spearman') {
        rankWithinPair(sortedRows[j], columns[j], columns[k], kept as Int32Array, ranksA as Float64Array);
        rankWithinPair(sortedRows[k], columns[k], columns[j], kept as Int32Array, ranksB as Float64Array);
        result = pearsonOfPairComplete(ranksA as Float64Array, ranksB as Float64Array);
      } else {
        result = pearsonOfPairComplete(columns[j], columns[k]);
      }
      counts[j * order + k] = result.n;
      counts[k * order + j] = result.n;
      if (result.r === null) {
        undefinedPairs.push([j, k]);
      } else {
        values[j * order + k] = result.r;
        values[k * order + j] = result.r;
      }
    }
  }
}

/** Pairwise Pearson from the masked cross-products, the pair loop only where they are not accurate. */
function fillPairwisePearson(data: ItemMatrix, columns: readonly Float64Array[], values: Float64Array, counts: Float64Array, undefinedPairs: ItemPair[]): void {
  const order = data.columns;
  const masked = maskedCrossProducts(data);
  for (let j = 0; j < order; j++) {
    for (let k = j + 1; k < order; k++) {
      const sums = pairCentredSums(masked, j, k);
      let r: number | null;
      if (sums.n < MIN_ROWS_FOR_CORRELATION) {
        r = null;
      } else {
        const value = sums.accurate ? sums.products / Math.sqrt(sums.squaresJ * sums.squaresK) : Number.NaN;
        // Near ±1 (a duplicated item, say) the pair loop's own arithmetic decides, so that an exact
        // copy stays exactly 1 as it does there and the exact-dependency checks see the same matrix.
        r = Math.abs(value) < NEAR_PERFECT_CORRELATION ? value : pearsonOfPairComplete(columns[j], columns[k]).r;
      }
      counts[j * order + k] = sums.n;
      counts[k * order + j] = sums.n;
      if (r === null) {
        undefinedPairs.push([j, k]);
      } else {
        values[j * order + k] = r;
        values[k * order + j] = r;
      }
    }
  }
}

/**
 * Mid-ranks of `own` over the rows where `partner` is also observed, written into `ranks`
 * (NaN elsewhere), walking `own`'s rows in sorted order.
 */
function rankWithinPair(sorted: Int32Array, own: Float64Array, partner: Float64Array, kept: Int32Array, ranks: Float64Array): void {
  ranks.fill(NaN);
  let count = 0;
  for (let t = 0; t < sorted.length; t++) {
    const row = sorted[t];
    if (partner[row] === partner[row]) kept[count++] = row;
  }
  assignMidRanks(kept, count, own, ranks);
}
