/**
 * Polychoric correlation: the correlation ρ of two latent standard normal variables that,
 * cut at thresholds, produce the two observed ordinal items. Two-step estimator (Olsson 1979):
 *
 * 1. Thresholds of each item from its own marginal proportions, using ALL observed answers of
 *    the item (not only the rows where the partner item is also observed): τ_k = Φ⁻¹(share of
 *    answers at or below category k). This is what psych::polychoric calls `global = TRUE`, and
 *    it keeps each item's thresholds the same in every pair.
 * 2. ρ maximising the multinomial log-likelihood ℓ(ρ) = Σ n_ij log P_ij(ρ) of the pair's
 *    contingency table (pair-complete rows), where P_ij is the bivariate normal probability of
 *    cell (i, j) between the thresholds. The search is Newton's method on ℓ'(ρ) with the
 *    analytic first and second derivatives (∂Φ2/∂ρ = φ2 by Plackett's identity, and ∂φ2/∂ρ in
 *    closed form), safeguarded by a bracket and bisection, started from the Pearson r of the
 *    category codes and stopped when a step is below POLYCHORIC_RHO_TOLERANCE.
 *
 * Categories are the distinct observed values of each item, in ascending order. A category no
 * respondent chose carries no information and is simply absent (psych gives it a repeated
 * threshold, which amounts to the same likelihood).
 *
 * Degenerate tables. When ℓ keeps rising up to ρ = ±1 (the maximum lies on the boundary):
 * - if one item is a monotone function of the other over the pair-complete rows (every observed
 *   row of the table, or every observed column, has a single non-empty cell; exact duplicates
 *   are the common case), ρ = ±1 is the answer and is reported as `perfect-association`;
 * - otherwise the boundary maximum comes from empty cells: POLYCHORIC_ZERO_CELL_CORRECTION is
 *   added to every empty cell inside the observed rows and columns, ρ is estimated again, and
 *   the status `zero-cell-corrected` says so. Tables with an interior maximum are never
 *   corrected, whatever their empty cells.
 * A pair with fewer than MIN_ROWS_FOR_CORRELATION common respondents, or with a single observed
 * category of either item among them, has no polychoric correlation (status `undefined`).
 *
 * The standard error is 1/√(−ℓ''(ρ̂)), conditional on the thresholds (it ignores their
 * sampling error, so it is slightly too small; Olsson 1979 gives the full two-step form).
 *
 * The method is spread over four files, one concern each:
 * - polychoric-coding.ts: ordinal items coded to categories and thresholds, and the
 *   contingency table of a pair;
 * - polychoric-likelihood.ts: ℓ(ρ) with its derivatives, and the safeguarded Newton search;
 * - this file: the estimate of one table (degenerate cases, zero-cell correction, status) and
 *   the public two-item function `polychoricCorrelation`;
 * - polychoric-pairs.ts: many pairs packed into one job, as the worker threads run it.
 *
 * bench/parallel/polychoric-worker.ts (a benchmark's kernel; the audit starts no such thread)
 * runs `estimatePolychoricFromTable` in a worker thread from its source text, with the functions
 * it calls; the tolerance values travel in `limits`.
 *
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (Psychometrika 44:443-460); Pearson & Pearson 1922, "On polychoric
 * coefficients of correlation" (Biometrika 14:127-156); Plackett 1954, "A reduction formula for
 * normal multivariate integrals"; Brown & Benedetti 1977, "On the mean and variance of the
 * tetrachoric correlation coefficient" (Psychometrika 42:347-355) for the ½ cell correction.
 */
import type { BivariateGridMargin } from './bivariate-normal-cdf';
import { checkPairedVectors } from './pearson-correlation';
import { codeOrdinalItem, countPolychoricTable } from './polychoric-coding';
import { createPolychoricWorkspace, fitPolychoricTable, type PolychoricWorkspace } from './polychoric-likelihood';
import {
  MIN_ROWS_FOR_CORRELATION,
  POLYCHORIC_BOUNDARY_GAP,
  POLYCHORIC_LIKELIHOOD_RELATIVE_SLACK,
  POLYCHORIC_MAX_ITERATIONS,
  POLYCHORIC_RHO_TOLERANCE,
  POLYCHORIC_ZERO_CELL_CORRECTION,
} from './tolerances';

/** Outcome codes of `estimatePolychoricFromTable` (numbers, so they cross worker boundaries). */
export const POLYCHORIC_STATUS = Object.freeze({
  estimated: 0,
  perfectAssociation: 1,
  zeroCellCorrected: 2,
  tooFewRows: 3,
  noVariation: 4,
  notConverged: 5,
} as const);

/** The numeric tuning values the estimator needs (passed in, so worker code needs no imports). */
export interface PolychoricLimits {
  readonly minRows: number;
  readonly tolerance: number;
  readonly maxIterations: number;
  readonly boundaryGap: number;
  readonly likelihoodSlack: number;
  readonly correction: number;
}

/** The tuning values from tolerances.ts. */
export const POLYCHORIC_LIMITS: PolychoricLimits = Object.freeze({
  minRows: MIN_ROWS_FOR_CORRELATION,
  tolerance: POLYCHORIC_RHO_TOLERANCE,
  maxIterations: POLYCHORIC_MAX_ITERATIONS,
  boundaryGap: POLYCHORIC_BOUNDARY_GAP,
  likelihoodSlack: POLYCHORIC_LIKELIHOOD_RELATIVE_SLACK,
  correction: POLYCHORIC_ZERO_CELL_CORRECTION,
});

/** Polychoric estimate of one pair, in plain numbers. */
export interface PolychoricTableEstimate {
  /** ρ̂, or NaN when status is tooFewRows or noVariation (callers turn that into null). */
  readonly rho: number;
  /** 1/√(−ℓ″(ρ̂)) given the thresholds; NaN on a boundary or when undefined. */
  readonly standardError: number;
  /** One of POLYCHORIC_STATUS. */
  readonly status: number;
  /** Pair-complete respondents. */
  readonly n: number;
  /** Likelihood evaluations spent (both fits when corrected). */
  readonly iterations: number;
}

/**
 * Estimates ρ for one counted table (see the module notes for the degenerate cases).
 * @param table Counts from `countPolychoricTable` (row stride columns.count + 2); not modified.
 * @param rows Thresholds of the row item.
 * @param columns Thresholds of the column item.
 * @param work Workspace from `createPolychoricWorkspace`.
 * @param limits Tuning values (POLYCHORIC_LIMITS).
 * @returns The estimate with its status.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient"; Brown & Benedetti 1977, "On the mean and variance of the tetrachoric
 * correlation coefficient" (½ correction of empty cells).
 */
export function estimatePolychoricFromTable(
  table: Float64Array,
  rows: BivariateGridMargin,
  columns: BivariateGridMargin,
  work: PolychoricWorkspace,
  limits: PolychoricLimits,
): PolychoricTableEstimate {
  const rowCategories = rows.count + 1;
  const columnCategories = columns.count + 1;
  const stride = columnCategories + 1;
  let n = 0;
  let sumRow = 0;
  let sumColumn = 0;
  let sumRowSquares = 0;
  let sumColumnSquares = 0;
  let sumProducts = 0;
  let filledRows = 0;
  let filledColumns = 0;
  let singleCellRows = true;
  let singleCellColumns = true;
  for (let i = 0; i < rowCategories; i++) {
    let rowTotal = 0;
    let cells = 0;
    for (let j = 0; j < columnCategories; j++) {
      const count = table[i * stride + j];
      if (count === 0) continue;
      cells++;
      rowTotal += count;
      sumColumn += count * j;
      sumColumnSquares += count * j * j;
      sumProducts += count * i * j;
    }
    if (rowTotal > 0) filledRows++;
    if (cells > 1) singleCellRows = false;
    n += rowTotal;
    sumRow += rowTotal * i;
    sumRowSquares += rowTotal * i * i;
  }
  for (let j = 0; j < columnCategories; j++) {
    let cells = 0;
    for (let i = 0; i < rowCategories; i++) if (table[i * stride + j] > 0) cells++;
    if (cells > 0) filledColumns++;
    if (cells > 1) singleCellColumns = false;
  }
  if (n < limits.minRows) return { rho: NaN, standardError: NaN, status: 3, n, iterations: 0 };
  if (filledRows < 2 || filledColumns < 2) return { rho: NaN, standardError: NaN, status: 4, n, iterations: 0 };
  const covariance = sumProducts - (sumRow * sumColumn) / n;
  const rowVariance = sumRowSquares - (sumRow * sumRow) / n;
  const columnVariance = sumColumnSquares - (sumColumn * sumColumn) / n;
  const start = covariance / Math.sqrt(rowVariance * columnVariance);
  const fit = fitPolychoricTable(table, rows, columns, start, work, limits.tolerance, limits.maxIterations, limits.boundaryGap, limits.likelihoodSlack);
  if (fit.boundary === 0) {
    return { rho: fit.rho, standardError: 1 / Math.sqrt(-fit.secondDerivative), status: 0, n, iterations: fit.iterations };
  }
  if (fit.boundary === 2) return { rho: fit.rho, standardError: NaN, status: 5, n, iterations: fit.iterations };
  if (singleCellRows || singleCellColumns) {
    return { rho: fit.boundary, standardError: NaN, status: 1, n, iterations: fit.iterations };
  }
  // Boundary maximum caused by empty cells: add the correction to the empty cells of the
  // observed rows and columns, and estimate again.
  const corrected = work.corrected;
  corrected.set(table.subarray(0, rowCategories * stride));
  for (let i = 0; i < rowCategories; i++) {
    let rowTotal = 0;
    for (let j = 0; j < columnCategories; j++) rowTotal += table[i * stride + j];
    if (rowTotal === 0) continue;
    for (let j = 0; j < columnCategories; j++) {
      if (table[i * stride + j] !== 0) continue;
      let columnTotal = 0;
      for (let r = 0; r < rowCategories; r++) columnTotal += table[r * stride + j];
      if (columnTotal > 0) corrected[i * stride + j] = limits.correction;
    }
  }
  const refit = fitPolychoricTable(corrected, rows, columns, start, work, limits.tolerance, limits.maxIterations, limits.boundaryGap, limits.likelihoodSlack);
  const iterations = fit.iterations + refit.iterations;
  if (refit.boundary !== 0) return { rho: refit.boundary === 2 ? refit.rho : refit.boundary, standardError: NaN, status: 5, n, iterations };
  return { rho: refit.rho, standardError: 1 / Math.sqrt(-refit.secondDerivative), status: 2, n, iterations };
}

/** Polychoric correlation of two ordinal vectors, with what went into it. */
export interface PolychoricCorrelation {
  /** ρ̂ in [−1, 1], or null when it does not exist (status `undefined`). */
  readonly rho: number | null;
  /** Standard error given the thresholds, or null (boundary, undefined or not converged). */
  readonly standardError: number | null;
  /** Respondents who answered both. */
  readonly n: number;
  /**
   * `estimated`; `perfect-association` (ρ = ±1, one item a monotone function of the other);
   * `zero-cell-corrected` (empty cells made the likelihood degenerate and were given
   * POLYCHORIC_ZERO_CELL_CORRECTION); `undefined` (too few common rows, or one category);
   * `not-converged` (the search hit POLYCHORIC_MAX_ITERATIONS; ρ is the last value).
   */
  readonly status: 'estimated' | 'perfect-association' | 'zero-cell-corrected' | 'undefined' | 'not-converged';
  /** For `undefined`: why. */
  readonly undefinedReason: 'too-few-rows' | 'no-variation' | null;
  /** Observed categories of x and y (ascending distinct values). */
  readonly categoriesX: readonly number[];
  readonly categoriesY: readonly number[];
  /** Thresholds of x and y from all of their own observed answers. */
  readonly thresholdsX: readonly number[];
  readonly thresholdsY: readonly number[];
  /** Likelihood evaluations spent. */
  readonly iterations: number;
}

/**
 * Maps a numeric status (POLYCHORIC_STATUS) to its name.
 * @param status A POLYCHORIC_STATUS value.
 * @returns The name used in `PolychoricCorrelation.status` (3 and 4 are both `undefined`).
 */
export function polychoricStatusName(status: number): PolychoricCorrelation['status'] {
  switch (status) {
    case 0:
      return 'estimated';
    case 1:
      return 'perfect-association';
    case 2:
      return 'zero-cell-corrected';
    case 5:
      return 'not-converged';
    default:
      return 'undefined';
  }
}

/**
 * Polychoric correlation of two ordinal items (two-step estimator). Thresholds come from all
 * observed answers of each item; the likelihood from the rows where both are observed.
 * @param x First item, NaN for missing.
 * @param y Second item, NaN for missing, same length.
 * @throws {RangeError} when the lengths differ, a value is ±Infinity, or an item has more than
 *   POLYCHORIC_MAX_CATEGORIES distinct values.
 * @returns ρ̂ with its standard error, status, n and the thresholds.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (Psychometrika 44:443-460).
 */
export function polychoricCorrelation(x: ArrayLike<number>, y: ArrayLike<number>): PolychoricCorrelation {
  checkPairedVectors(x, y, 'polychoricCorrelation');
  const itemX = codeOrdinalItem(x);
  const itemY = codeOrdinalItem(y);
  const categoriesX = itemX.categories.length;
  const categoriesY = itemY.categories.length;
  const base = {
    categoriesX: Array.from(itemX.categories),
    categoriesY: Array.from(itemY.categories),
    thresholdsX: Array.from(itemX.thresholds.limits),
    thresholdsY: Array.from(itemY.thresholds.limits),
  };
  const work = createPolychoricWorkspace(Math.max(2, categoriesX, categoriesY));
  const n = countPolychoricTable(itemX.codes, categoriesX, itemY.codes, categoriesY, x.length, work.table, work.tally);
  if (categoriesX < 2 || categoriesY < 2) {
    const reason = n < MIN_ROWS_FOR_CORRELATION ? 'too-few-rows' : 'no-variation';
    return { rho: null, standardError: null, n, status: 'undefined', undefinedReason: reason, iterations: 0, ...base };
  }
  const estimate = estimatePolychoricFromTable(work.table, itemX.thresholds, itemY.thresholds, work, POLYCHORIC_LIMITS);
  const status = polychoricStatusName(estimate.status);
  const undefinedReason = estimate.status === 3 ? 'too-few-rows' : estimate.status === 4 ? 'no-variation' : null;
  return {
    rho: Number.isNaN(estimate.rho) ? null : estimate.rho,
    standardError: Number.isFinite(estimate.standardError) ? estimate.standardError : null,
    n,
    status,
    undefinedReason,
    iterations: estimate.iterations,
    ...base,
  };
}
