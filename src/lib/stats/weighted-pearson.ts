/**
 * Pearson correlations and covariances of a bootstrap resample without building it: a resample
 * that draws respondent i w_i times has the moments Σ w_i x_i, Σ w_i (x_i − x̄)(y_i − ȳ), ... of
 * the original rows with weights, so one pass per pair over the distinct rows drawn (about 63% of
 * n) gives both the correlation and the covariance, each pair over its own complete rows
 * (pairwise deletion) or over every row (complete data). The results are those of
 * `correlationMatrix` and `covarianceMatrix` on the resampled matrix up to rounding (the same
 * two-pass sums, grouped by respondent; tests/unit/weighted-pearson.test.ts).
 *
 * Listwise deletion with missing answers, Spearman and polychoric correlations are not covered
 * (they are computed on the resampled matrix itself). Integer answers take the exact path of
 * weighted-integer-pairs.ts; any others two passes per pair here.
 */
import { finishCorrelationMatrix, type CorrelationMatrixResult } from './correlation-matrix';
import type { CovarianceMatrixResult } from './covariance-matrix';
import type { CorrelationRepairMethod } from './nearest-correlation';
import { MIN_ROWS_FOR_CORRELATION, MIN_ROWS_FOR_COVARIANCE } from './tolerances';
import { distinctDraws, keptPerMatrix, type ItemMatrix, type NumericalNotice } from './types';
import { fillIntegerColumns, integerPairs, packedLanes, recordPairCount, weightWithAnswer, type PairTargets } from './weighted-integer-pairs';

/** Both matrices of one resample over the chosen items. */
export interface WeightedPearsonResult {
  readonly correlation: CorrelationMatrixResult;
  readonly covariance: CovarianceMatrixResult;
}

/**
 * Pearson correlation and covariance matrices of the weighted rows over the listed items.
 * @param matrix The original respondents × items (column-major, NaN for missing); not modified,
 *   and not to be modified between calls either: whether its answers are all integers is found
 *   once per matrix (by its data array) and kept (a bootstrap's resamples share one matrix).
 * @param weights How often each respondent is drawn (non-negative integers), one per row.
 * @param columns The items to correlate (0-based, ascending or not), at least one.
 * @param missing The missing-data policy.
 * @param repair How an indefinite matrix is repaired, as in `correlationMatrix` (default `higham`;
 *   `none` leaves it as computed, with a `matrix-indefinite` notice).
 * @throws {RangeError} when the weights do not match the rows or an item is out of range.
 * @returns The correlation result (finished as `correlationMatrix` finishes it: diagonal,
 *   undefined pairs, indefiniteness and repair) and the covariance result; null under listwise
 *   deletion when a drawn row misses an answer (compute on the resampled matrix then).
 * References: Efron & Tibshirani 1993, "An Introduction to the Bootstrap", ch. 6 (the resample
 *   as weights on the observed rows); Chan, Golub & LeVeque 1983 (two-pass sums).
 */
export function weightedPearson(
  matrix: ItemMatrix,
  weights: Float64Array,
  columns: readonly number[],
  missing: 'pairwise' | 'listwise',
  repair: CorrelationRepairMethod | 'none' = 'higham',
): WeightedPearsonResult | null {
  const rows = matrix.rows;
  if (weights.length !== rows) throw new RangeError(`weightedPearson: ${weights.length} weights for ${rows} rows`);
  const order = columns.length;
  if (order < 1) throw new RangeError('weightedPearson: at least one item is required');
  for (const j of columns) if (!Number.isInteger(j) || j < 0 || j >= matrix.columns) throw new RangeError(`weightedPearson: item ${j} is outside 0..${matrix.columns - 1}`);

  const { drawn, w, total } = distinctDraws(weights);
  const out: PairTargets = {
    r: new Float64Array(order * order),
    rN: new Float64Array(order * order),
    cov: new Float64Array(order * order),
    covN: new Float64Array(order * order),
    undefinedR: [],
    undefinedCov: [],
  };
  // Whether every answer is an integer (any negative, the largest |answer|): read from the whole
  // matrix, found once per matrix, when that already allows the integer path (a resample's
  // answers are some of the matrix's); otherwise from the drawn rows of the listed items.
  const exact = (answers: AnswerTraits): boolean => answers.integral && total * Math.max(1, answers.largest) < EXACT_INTEGER_SCALE;
  const whole = answerTraits(matrix);
  const traits = exact(whole) ? whole : drawnAnswerTraits(matrix, columns, drawn);
  let hasMissing: boolean;
  let withAnswer: number;
  if (exact(traits)) {
    const filled = fillIntegerColumns(matrix, columns, drawn, w, traits.negative ? 1 : packedLanes(total * traits.largest * traits.largest));
    if (missing === 'listwise' && filled.hasMissing) return null;
    ({ hasMissing, withAnswer } = filled);
    integerPairs(filled, total, out);
  } else {
    const drawnValues = drawnColumns(matrix, columns, drawn, w);
    if (missing === 'listwise' && drawnValues.hasMissing) return null;
    ({ hasMissing, withAnswer } = drawnValues);
    twoPassPairs(drawnValues.values, w, hasMissing, total, out);
  }
  const { r, rN, cov, covN, undefinedR, undefinedCov } = out;
  const rowsUsed = missing === 'listwise' ? total : withAnswer;
  const correlation = finishCorrelationMatrix(
    {
      method: 'pearson',
      missing,
      repair,
      order,
      rowsUsed,
      pairwiseWithMissing: missing === 'pairwise' && hasMissing,
      values: r,
      counts: rN,
      undefinedPairs: undefinedR,
      polychoricItems: null,
      polychoricJob: null,
    },
    null,
  );
  const notices: NumericalNotice[] = [];
  if (undefinedCov.length > 0) {
    notices.push({
      code: 'covariance-undefined',
      items: Array.from(new Set(undefinedCov.flat())).sort((p, q) => p - q),
      message: `${undefinedCov.length} cell(s) of the covariance matrix rest on fewer than ${MIN_ROWS_FOR_COVARIANCE} respondents and are entered as 0.`,
    });
  }
  return {
    correlation,
    covariance: {
      missing,
      matrix: { order, data: cov },
      n: { order, data: covN },
      rowsUsed,
      undefinedPairs: undefinedCov,
      notices,
    },
  };
}

/**
 * Largest n · max|x| for which every sum of the integer path stays an exact integer (n² max² <
 * 2^53): the integer path is taken when every observed answer is an integer and n · max|x| is below it.
 */
const EXACT_INTEGER_SCALE = 2 ** 26;

/** Whether answers are all integers, any is negative, and the largest |answer| (0 without answers). */
interface AnswerTraits {
  readonly integral: boolean;
  readonly negative: boolean;
  readonly largest: number;
}

/** The traits of every observed answer of the matrix, found once per matrix (a bootstrap's resamples share one). */
const answerTraits = keptPerMatrix((matrix): AnswerTraits => traitsOf(matrix.data, 0, matrix.data.length, null));

/** The traits of the drawn rows of the listed items. */
function drawnAnswerTraits(matrix: ItemMatrix, columns: readonly number[], drawn: Int32Array): AnswerTraits {
  let integral = true;
  let negative = false;
  let largest = 0;
  for (const j of columns) {
    const traits = traitsOf(matrix.data, j * matrix.rows, drawn.length, drawn);
    integral &&= traits.integral;
    negative ||= traits.negative;
    largest = Math.max(largest, traits.largest);
  }
  return { integral, negative, largest };
}

/** Traits of `count` values from `offset` on: consecutive, or at `offset + rows[t]` when rows are given. */
function traitsOf(data: Float64Array, offset: number, count: number, rows: Int32Array | null): AnswerTraits {
  let integral = true;
  let negative = false;
  let largest = 0;
  for (let t = 0; t < count; t++) {
    const x = data[offset + (rows === null ? t : rows[t])];
    if (x !== x) continue;
    if (integral && !Number.isInteger(x)) integral = false;
    const magnitude = x < 0 ? -x : x;
    if (magnitude > largest) largest = magnitude;
    if (x < 0) negative = true;
  }
  return { integral, negative, largest };
}

/** The drawn rows of each listed item (NaN where missing), whether any is missing, and the weight of the rows that answer any. */
function drawnColumns(matrix: ItemMatrix, columns: readonly number[], drawn: Int32Array, w: Float64Array): { values: Float64Array[]; hasMissing: boolean; withAnswer: number } {
  const distinct = drawn.length;
  const answersAny = new Uint8Array(distinct);
  let hasMissing = false;
  const values = columns.map((j) => {
    const column = new Float64Array(distinct);
    const source = j * matrix.rows;
    for (let t = 0; t < distinct; t++) {
      const x = matrix.data[source + drawn[t]];
      column[t] = x;
      if (x === x) answersAny[t] = 1;
      else hasMissing = true;
    }
    return column;
  });
  return { values, hasMissing, withAnswer: weightWithAnswer(answersAny, w) };
}

/** Any answers: two passes per pair (means, then centred sums), as the core's pair loop. */
function twoPassPairs(values: readonly Float64Array[], w: Float64Array, hasMissing: boolean, total: number, out: PairTargets): void {
  const order = values.length;
  const distinct = w.length;
  const { r, cov, undefinedR } = out;
  for (let a = 0; a < order; a++) {
    const x = values[a];
    for (let b = a; b < order; b++) {
      const y = values[b];
      let n = 0;
      let sumX = 0;
      let sumY = 0;
      let firstX = NaN;
      let firstY = NaN;
      let variesX = false;
      let variesY = false;
      for (let t = 0; t < distinct; t++) {
        const u = x[t];
        const v = y[t];
        if (u !== u || v !== v) continue;
        if (n === 0) {
          firstX = u;
          firstY = v;
        } else {
          if (u !== firstX) variesX = true;
          if (v !== firstY) variesY = true;
        }
        const weight = w[t];
        n += weight;
        sumX += weight * u;
        sumY += weight * v;
      }
      if (!recordPairCount(out, order, a, b, n, hasMissing ? n : total)) continue;
      const meanX = sumX / n;
      const meanY = sumY / n;
      let sxx = 0;
      let syy = 0;
      let sxy = 0;
      for (let t = 0; t < distinct; t++) {
        const u = x[t];
        const v = y[t];
        if (u !== u || v !== v) continue;
        const weight = w[t];
        const dx = u - meanX;
        const dy = v - meanY;
        sxx += weight * dx * dx;
        syy += weight * dy * dy;
        sxy += weight * dx * dy;
      }
      cov[a * order + b] = sxy / (n - 1);
      cov[b * order + a] = sxy / (n - 1);
      if (a === b) continue;
      if (n < MIN_ROWS_FOR_CORRELATION || !variesX || !variesY) {
        undefinedR.push([a, b]);
        continue;
      }
      const value = Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
      r[a * order + b] = value;
      r[b * order + a] = value;
    }
  }
}
