/**
 * TEST REFERENCE ONLY: weighted-pearson.ts as it was before the masked, packed products (its
 * integer path a plain pair loop over the six sums, four partners at a time), kept so that
 * tests/unit/weighted-pearson.test.ts can compare the current function with it bit for bit.
 * The original module comment follows.
 *
 * Pearson correlations and covariances of a bootstrap resample without building it: a resample
 * that draws respondent i w_i times has the moments Σ w_i x_i, Σ w_i (x_i − x̄)(y_i − ȳ), ... of
 * the original rows with weights, so one pass per pair over the distinct rows drawn (about 63% of
 * n) gives both the correlation and the covariance, each pair over its own complete rows
 * (pairwise deletion) or over every row (complete data). The results are those of
 * `correlationMatrix` and `covarianceMatrix` on the resampled matrix up to rounding (the same
 * two-pass sums, grouped by respondent; tests/unit/weighted-pearson.test.ts).
 *
 * Listwise deletion with missing answers, Spearman and polychoric correlations are not covered
 * (they are computed on the resampled matrix itself).
 */
import { finishCorrelationMatrix, type CorrelationMatrixResult, type ItemPair } from '../../src/lib/stats/correlation-matrix';
import type { CovarianceMatrixResult } from '../../src/lib/stats/covariance-matrix';
import { MIN_ROWS_FOR_CORRELATION, MIN_ROWS_FOR_COVARIANCE } from '../../src/lib/stats/tolerances';
import type { ItemMatrix, NumericalNotice } from '../../src/lib/stats/types';

/** Both matrices of one resample over the chosen items. */
export interface WeightedPearsonResult {
  readonly correlation: CorrelationMatrixResult;
  readonly covariance: CovarianceMatrixResult;
}

/**
 * Pearson correlation and covariance matrices of the weighted rows over the listed items.
 * @param matrix The original respondents × items (column-major, NaN for missing); not modified.
 * @param weights How often each respondent is drawn (non-negative integers), one per row.
 * @param columns The items to correlate (0-based, ascending or not), at least one.
 * @param missing The missing-data policy.
 * @throws {RangeError} when the weights do not match the rows or an item is out of range.
 * @returns The correlation result (finished as `correlationMatrix` finishes it: diagonal,
 *   undefined pairs, indefiniteness and repair) and the covariance result; null under listwise
 *   deletion when a drawn row misses an answer (compute on the resampled matrix then).
 * References: Efron & Tibshirani 1993, "An Introduction to the Bootstrap", ch. 6 (the resample
 *   as weights on the observed rows); Chan, Golub & LeVeque 1983 (two-pass sums).
 */
export function weightedPearsonReference(matrix: ItemMatrix, weights: Float64Array, columns: readonly number[], missing: 'pairwise' | 'listwise'): WeightedPearsonResult | null {
  const rows = matrix.rows;
  if (weights.length !== rows) throw new RangeError(`weightedPearson: ${weights.length} weights for ${rows} rows`);
  const order = columns.length;
  if (order < 1) throw new RangeError('weightedPearson: at least one item is required');
  for (const j of columns) if (!Number.isInteger(j) || j < 0 || j >= matrix.columns) throw new RangeError(`weightedPearson: item ${j} is outside 0..${matrix.columns - 1}`);

  let distinct = 0;
  for (let i = 0; i < rows; i++) if (weights[i] > 0) distinct++;
  const drawn = new Int32Array(distinct);
  const w = new Float64Array(distinct);
  for (let i = 0, t = 0; i < rows; i++) {
    if (weights[i] > 0) {
      drawn[t] = i;
      w[t++] = weights[i];
    }
  }
  const values: Float64Array[] = columns.map((j) => {
    const column = new Float64Array(distinct);
    for (let t = 0; t < distinct; t++) column[t] = matrix.data[j * rows + drawn[t]];
    return column;
  });
  let total = 0;
  let withAnswer = 0;
  let hasMissing = false;
  for (let t = 0; t < distinct; t++) {
    let any = false;
    for (let k = 0; k < order; k++) {
      if (values[k][t] === values[k][t]) any = true;
      else hasMissing = true;
    }
    total += w[t];
    if (any) withAnswer += w[t];
  }
  if (missing === 'listwise' && hasMissing) return null;

  const r = new Float64Array(order * order);
  const rN = new Float64Array(order * order);
  const cov = new Float64Array(order * order);
  const covN = new Float64Array(order * order);
  const undefinedR: ItemPair[] = [];
  const undefinedCov: [number, number][] = [];
  if (integerSumsExact(values, total)) {
    integerPairs(values, w, hasMissing, total, {
      r,
      rN,
      cov,
      covN,
      undefinedR,
      undefinedCov,
    });
  } else {
    twoPassPairs(values, w, hasMissing, total, {
      r,
      rN,
      cov,
      covN,
      undefinedR,
      undefinedCov,
    });
  }
  const rowsUsed = missing === 'listwise' ? total : withAnswer;
  const correlation = finishCorrelationMatrix(
    {
      method: 'pearson',
      missing,
      repair: 'higham',
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

/** Where the pair loops write. */
interface PairTargets {
  readonly r: Float64Array;
  readonly rN: Float64Array;
  readonly cov: Float64Array;
  readonly covN: Float64Array;
  readonly undefinedR: ItemPair[];
  readonly undefinedCov: [number, number][];
}

/** Largest n · max|x| for which every sum of the integer path stays an exact integer (n² max² < 2^53). */
const EXACT_INTEGER_SCALE = 2 ** 26;

/** True when every observed value is an integer and n · max|x| is small enough for exact sums. */
function integerSumsExact(values: readonly Float64Array[], total: number): boolean {
  let largest = 0;
  for (const column of values) {
    for (let t = 0; t < column.length; t++) {
      const x = column[t];
      if (x !== x) continue;
      if (!Number.isInteger(x)) return false;
      largest = Math.max(largest, Math.abs(x));
    }
  }
  return total * Math.max(1, largest) < EXACT_INTEGER_SCALE;
}

/**
 * Stores a pair's (weighted) count in both count matrices (an item's own entry in the correlation
 * counts is `ownCount`: its answers with missing values, all rows without) and marks the pair
 * undefined when too few rows hold it.
 * @returns whether the pair has enough rows for a covariance.
 */
function recordPairCount(out: PairTargets, order: number, a: number, b: number, n: number, ownCount: number): boolean {
  out.covN[a * order + b] = n;
  out.covN[b * order + a] = n;
  if (a !== b) {
    out.rN[a * order + b] = n;
    out.rN[b * order + a] = n;
  } else {
    out.rN[a * order + a] = ownCount;
  }
  if (n >= MIN_ROWS_FOR_COVARIANCE) return true;
  out.undefinedCov.push([a, b]);
  if (a !== b) out.undefinedR.push([a, b]);
  return false;
}

/**
 * Integer answers (rating scales): the six sums of a pair are exact integers, so they may be
 * taken in any grouping, and n·Σxy − ΣxΣy (exact) gives the centred products to one rounding.
 * Five of the six are an item's total less its rows where the partner is missing (few: the
 * complement, as in masked-cross-products.ts); only Σ w·x·y is a product over every distinct row,
 * taken four partners at a time. Exact sums make this bit for bit the one-pass pair loop.
 */
function integerPairs(values: readonly Float64Array[], w: Float64Array, hasMissing: boolean, total: number, out: PairTargets): void {
  const order = values.length;
  const distinct = w.length;
  const { r, cov, undefinedR } = out;
  // Per item, one block each: the answer (0 where missing), weight × answer, and per-item totals
  // of the weight where answered, weight × answer, weight × square; the rows where it is missing.
  const x0 = new Float64Array(order * distinct);
  const wx = new Float64Array(order * distinct);
  const totalWeight = new Float64Array(order);
  const totalX = new Float64Array(order);
  const totalXX = new Float64Array(order);
  const missingRows: Int32Array[] = [];
  for (let a = 0; a < order; a++) {
    const column = values[a];
    const offset = a * distinct;
    let countMissing = 0;
    let sw = 0;
    let sx = 0;
    let sxx = 0;
    for (let t = 0; t < distinct; t++) {
      const x = column[t];
      if (x !== x) {
        countMissing++;
        continue;
      }
      x0[offset + t] = x;
      wx[offset + t] = w[t] * x;
      sw += w[t];
      sx += w[t] * x;
      sxx += w[t] * x * x;
    }
    totalWeight[a] = sw;
    totalX[a] = sx;
    totalXX[a] = sxx;
    const list = new Int32Array(countMissing);
    for (let t = 0, k = 0; t < distinct; t++) if (column[t] !== column[t]) list[k++] = t;
    missingRows.push(list);
  }
  // Σ w·x·y over every distinct row (0 where either is missing), upper triangle, four partners at a time.
  const products = new Float64Array(order * order);
  for (let a = 0; a < order; a++) {
    const oa = a * distinct;
    let b = a;
    for (; b + 3 < order; b += 4) {
      const o0 = b * distinct;
      const o1 = o0 + distinct;
      const o2 = o1 + distinct;
      const o3 = o2 + distinct;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let t = 0; t < distinct; t++) {
        const v = wx[oa + t];
        s0 += v * x0[o0 + t];
        s1 += v * x0[o1 + t];
        s2 += v * x0[o2 + t];
        s3 += v * x0[o3 + t];
      }
      products[a * order + b] = s0;
      products[a * order + b + 1] = s1;
      products[a * order + b + 2] = s2;
      products[a * order + b + 3] = s3;
    }
    for (; b < order; b++) {
      const ob = b * distinct;
      let sum = 0;
      for (let t = 0; t < distinct; t++) sum += wx[oa + t] * x0[ob + t];
      products[a * order + b] = sum;
    }
  }
  for (let a = 0; a < order; a++) {
    const oa = a * distinct;
    const missingA = missingRows[a];
    for (let b = a; b < order; b++) {
      const ob = b * distinct;
      const missingB = missingRows[b];
      // a's sums over the rows where b is answered, and b's over those where a is.
      let n = totalWeight[a];
      let sx = totalX[a];
      let sxx = totalXX[a];
      for (let k = 0; k < missingB.length; k++) {
        const t = missingB[k];
        if (values[a][t] !== values[a][t]) continue; // both missing: not in a's totals
        const x = x0[oa + t];
        n -= w[t];
        sx -= w[t] * x;
        sxx -= w[t] * x * x;
      }
      let sy = totalX[b];
      let syy = totalXX[b];
      for (let k = 0; k < missingA.length; k++) {
        const t = missingA[k];
        if (values[b][t] !== values[b][t]) continue;
        const y = x0[ob + t];
        sy -= w[t] * y;
        syy -= w[t] * y * y;
      }
      const sxy = products[a * order + b];
      if (!recordPairCount(out, order, a, b, n, hasMissing ? n : total)) continue;
      const centredXY = n * sxy - sx * sy;
      cov[a * order + b] = centredXY / (n * (n - 1));
      cov[b * order + a] = cov[a * order + b];
      if (a === b) continue;
      const centredXX = n * sxx - sx * sx;
      const centredYY = n * syy - sy * sy;
      if (n < MIN_ROWS_FOR_CORRELATION || centredXX === 0 || centredYY === 0) {
        undefinedR.push([a, b]);
        continue;
      }
      const value = centredXY / Math.sqrt(centredXX * centredYY);
      r[a * order + b] = value > 1 ? 1 : value < -1 ? -1 : value;
      r[b * order + a] = r[a * order + b];
    }
  }
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
