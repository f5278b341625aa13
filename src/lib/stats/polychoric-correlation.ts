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
 * WORKER NOTE: `countPolychoricTable`, `polychoricLikelihood`, `fitPolychoricTable`,
 * `estimatePolychoricFromTable` and `createPolychoricWorkspace` also run inside the
 * polychoric worker thread from their source text (parallel/polychoric-worker-source.ts).
 * Keep them top-level function declarations that refer only to their locals, `Math`, typed
 * arrays, each other, the tolerance values passed in `limits`, and the bivariate normal
 * functions.
 *
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (Psychometrika 44:443-460); Pearson & Pearson 1922, "On polychoric
 * coefficients of correlation" (Biometrika 14:127-156); Plackett 1954, "A reduction formula for
 * normal multivariate integrals"; Brown & Benedetti 1977, "On the mean and variance of the
 * tetrachoric correlation coefficient" (Psychometrika 42:347-355) for the ½ cell correction.
 */
import { bivariateNormalGrid, type BivariateGridMargin } from './bivariate-normal-cdf';
import { normalQuantile } from './normal-distribution';
import { checkPairedVectors } from './pearson-correlation';
import {
  MIN_ROWS_FOR_CORRELATION,
  POLYCHORIC_BOUNDARY_GAP,
  POLYCHORIC_LIKELIHOOD_RELATIVE_SLACK,
  POLYCHORIC_MAX_CATEGORIES,
  POLYCHORIC_MAX_ITERATIONS,
  POLYCHORIC_RHO_TOLERANCE,
  POLYCHORIC_ZERO_CELL_CORRECTION,
} from './tolerances';

/** One ordinal item prepared for polychoric work: category codes and thresholds. */
export interface OrdinalItem {
  /** Distinct observed values, ascending; category c is `categories[c]`. */
  readonly categories: Float64Array;
  /** Category index of each respondent; `categories.length` marks a missing answer. */
  readonly codes: Uint8Array;
  /** Respondents in each category. */
  readonly counts: Float64Array;
  /** Respondents who answered. */
  readonly observed: number;
  /** Thresholds τ_k = Φ⁻¹(share at or below category k), k = 0 .. categories − 2. */
  readonly thresholds: BivariateGridMargin;
}

/**
 * Codes one item for polychoric work: its distinct observed values become categories
 * 0, 1, ..., and its thresholds come from all of its observed answers.
 * @param values The item's answers, NaN for missing.
 * @param maxCategories Most distinct values allowed (POLYCHORIC_MAX_CATEGORIES by default).
 * @throws {RangeError} when a value is ±Infinity, or the item has more than maxCategories
 *   distinct values (polychoric correlation is meant for ordinal items).
 * @returns The coded item. An item with one category (or none) has no thresholds.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (first step: thresholds from the marginal proportions).
 */
export function codeOrdinalItem(values: ArrayLike<number>, maxCategories: number = POLYCHORIC_MAX_CATEGORIES): OrdinalItem {
  if (!Number.isInteger(maxCategories) || maxCategories < 2 || maxCategories > 254) {
    throw new RangeError(`codeOrdinalItem: maxCategories must be an integer from 2 to 254, got ${maxCategories}`);
  }
  const distinct = new Set<number>();
  for (let i = 0; i < values.length; i++) {
    const value = values[i];
    if (value === Infinity || value === -Infinity) throw new RangeError(`codeOrdinalItem: value ${i} is infinite; use NaN for a missing answer`);
    if (value !== value) continue;
    distinct.add(value === 0 ? 0 : value);
    if (distinct.size > maxCategories) {
      throw new RangeError(`codeOrdinalItem: the item has more than ${maxCategories} distinct values; polychoric correlation needs ordinal items`);
    }
  }
  const categories = Float64Array.from(distinct).sort();
  const count = categories.length;
  const index = new Map<number, number>();
  categories.forEach((value, c) => index.set(value, c));
  const codes = new Uint8Array(values.length);
  const counts = new Float64Array(count);
  let observed = 0;
  for (let i = 0; i < values.length; i++) {
    const value = values[i];
    if (value !== value) {
      codes[i] = count;
    } else {
      const c = index.get(value === 0 ? 0 : value) as number;
      codes[i] = c;
      counts[c]++;
      observed++;
    }
  }
  const limitCount = Math.max(0, count - 1);
  const limits = new Float64Array(limitCount);
  const lower = new Float64Array(limitCount);
  const upper = new Float64Array(limitCount);
  let below = 0;
  for (let c = 0; c < limitCount; c++) {
    below += counts[c];
    // Both tails as exact ratios of counts, so Φ(τ) and Φ(−τ) carry no rounding from 1 − p.
    lower[c] = below / observed;
    upper[c] = (observed - below) / observed;
    limits[c] = lower[c] <= 0.5 ? normalQuantile(lower[c]) : -normalQuantile(upper[c]);
  }
  return { categories, codes, counts, observed, thresholds: { limits, lower, upper, count: limitCount } };
}

/** Scratch arrays for one pair, reused across pairs (sized for the largest item). */
export interface PolychoricWorkspace {
  /** Largest number of categories the workspace serves. */
  readonly maxCategories: number;
  /** Contingency table, row stride maxCategories + 1 (the extra column counts missing answers). */
  readonly table: Float64Array;
  /** Corrected copy of the table (same layout). */
  readonly corrected: Float64Array;
  /** Φ2, φ2 and ∂φ2/∂ρ on the threshold grid including the ±∞ borders, stride maxCategories + 1. */
  readonly cdf: Float64Array;
  readonly density: Float64Array;
  readonly slope: Float64Array;
  /** ℓ, ℓ′, ℓ″ and a validity flag (1 when every observed cell has positive probability). */
  readonly derivatives: Float64Array;
}

/**
 * Allocates the scratch arrays for polychoric work on items of up to `maxCategories` categories.
 * @param maxCategories Largest number of categories of any item (2 to 254).
 * @throws {RangeError} when maxCategories is not an integer from 2 to 254.
 * @returns A workspace for `countPolychoricTable` and `estimatePolychoricFromTable`.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export function createPolychoricWorkspace(maxCategories: number): PolychoricWorkspace {
  if (!Number.isInteger(maxCategories) || maxCategories < 2 || maxCategories > 254) {
    throw new RangeError(`createPolychoricWorkspace: maxCategories must be an integer from 2 to 254, got ${maxCategories}`);
  }
  const side = maxCategories + 1;
  return {
    maxCategories,
    table: new Float64Array(side * side),
    corrected: new Float64Array(side * side),
    cdf: new Float64Array(side * side),
    density: new Float64Array(side * side),
    slope: new Float64Array(side * side),
    derivatives: new Float64Array(4),
  };
}

/**
 * Counts the contingency table of two coded items in one pass over the respondents. The
 * table has row stride `columnCategories + 1`; row `rowCategories` and column
 * `columnCategories` collect respondents missing on one item and are ignored afterwards.
 * @param rowCodes Codes of the first item (missing = its category count).
 * @param rowCategories Categories of the first item.
 * @param columnCodes Codes of the second item.
 * @param columnCategories Categories of the second item.
 * @param respondents Respondents to count (the length of the code arrays).
 * @param table Output, at least (rowCategories + 1) × (columnCategories + 1) long; overwritten.
 * @returns The number of pair-complete respondents.
 * References: Pearson & Pearson 1922, "On polychoric coefficients of correlation" (the
 * contingency table of two ordinal items).
 */
export function countPolychoricTable(
  rowCodes: Uint8Array,
  rowCategories: number,
  columnCodes: Uint8Array,
  columnCategories: number,
  respondents: number,
  table: Float64Array,
): number {
  const stride = columnCategories + 1;
  table.fill(0, 0, (rowCategories + 1) * stride);
  for (let r = 0; r < respondents; r++) table[rowCodes[r] * stride + columnCodes[r]]++;
  let n = 0;
  for (let i = 0; i < rowCategories; i++) {
    for (let j = 0; j < columnCategories; j++) n += table[i * stride + j];
  }
  return n;
}

/**
 * ℓ(ρ), ℓ′(ρ) and ℓ″(ρ) of a contingency table under the bivariate normal model with fixed
 * thresholds, written into `work.derivatives` as [ℓ, ℓ′, ℓ″, valid]; valid is 0 when a
 * non-empty cell has zero probability at this ρ (ρ too close to ±1), and then ℓ′, ℓ″ are 0.
 * @param rho Correlation strictly inside (−1, 1).
 * @param table Cell counts, row stride `columns.count + 2`.
 * @param rows Thresholds of the row item (count = row categories − 1).
 * @param columns Thresholds of the column item.
 * @param work Workspace from `createPolychoricWorkspace`.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient"; Plackett 1954, "A reduction formula for normal multivariate integrals".
 */
export function polychoricLikelihood(
  rho: number,
  table: Float64Array,
  rows: BivariateGridMargin,
  columns: BivariateGridMargin,
  work: PolychoricWorkspace,
): void {
  const rowCategories = rows.count + 1;
  const columnCategories = columns.count + 1;
  const stride = columnCategories + 1;
  const cdf = work.cdf;
  const density = work.density;
  const slope = work.slope;
  // Interior corners from the quadrature; borders (±∞ limits) from the margins.
  bivariateNormalGrid(rows, columns, rho, { cdf, density, slope, offset: stride + 1, stride });
  for (let j = 0; j <= columnCategories; j++) {
    cdf[j] = 0;
    density[j] = 0;
    slope[j] = 0;
    const last = rowCategories * stride + j;
    cdf[last] = j === 0 ? 0 : j === columnCategories ? 1 : columns.lower[j - 1];
    density[last] = 0;
    slope[last] = 0;
  }
  for (let i = 1; i < rowCategories; i++) {
    const first = i * stride;
    cdf[first] = 0;
    density[first] = 0;
    slope[first] = 0;
    cdf[first + columnCategories] = rows.lower[i - 1];
    density[first + columnCategories] = 0;
    slope[first + columnCategories] = 0;
  }
  let logLikelihood = 0;
  let first = 0;
  let second = 0;
  let valid = 1;
  for (let i = 0; i < rowCategories; i++) {
    const top = i * stride;
    const bottom = top + stride;
    for (let j = 0; j < columnCategories; j++) {
      const count = table[top + j];
      if (count === 0) continue;
      const probability = cdf[bottom + j + 1] - cdf[top + j + 1] - cdf[bottom + j] + cdf[top + j];
      if (!(probability > 0)) {
        valid = 0;
        continue;
      }
      const change = density[bottom + j + 1] - density[top + j + 1] - density[bottom + j] + density[top + j];
      const curvature = slope[bottom + j + 1] - slope[top + j + 1] - slope[bottom + j] + slope[top + j];
      const ratio = change / probability;
      logLikelihood += count * Math.log(probability);
      first += count * ratio;
      second += count * (curvature / probability - ratio * ratio);
    }
  }
  const out = work.derivatives;
  out[0] = valid === 1 ? logLikelihood : -Infinity;
  out[1] = valid === 1 ? first : 0;
  out[2] = valid === 1 ? second : 0;
  out[3] = valid;
}

/** Outcome of the ρ search on one table. */
export interface PolychoricFit {
  /** The maximising ρ (±1 on a boundary). */
  readonly rho: number;
  /** 0: interior maximum; 1 or −1: ℓ still rises at ρ = ±(1 − gap); 2: no convergence. */
  readonly boundary: number;
  /** ℓ″ at ρ (0 on a boundary). */
  readonly secondDerivative: number;
  /** Likelihood evaluations spent. */
  readonly iterations: number;
}

/**
 * Maximises the polychoric log-likelihood of one table over ρ: Newton steps on ℓ′ inside a
 * shrinking bracket, bisection when a step leaves the bracket or ℓ is not concave there, and a
 * probe at ±(1 − boundaryGap): a boundary maximum is declared when ℓ still rises there, or when
 * ℓ there is at least as high as at the converged estimate.
 * @param table Cell counts, row stride `columns.count + 2`.
 * @param rows Thresholds of the row item.
 * @param columns Thresholds of the column item.
 * @param start Starting ρ (e.g. the Pearson r of the codes), clamped into (−0.99, 0.99).
 * @param work Workspace from `createPolychoricWorkspace`.
 * @param tolerance Step size at which the search stops (POLYCHORIC_RHO_TOLERANCE).
 * @param maxIterations Ceiling on evaluations (POLYCHORIC_MAX_ITERATIONS).
 * @param boundaryGap Distance from ±1 of the boundary probe (POLYCHORIC_BOUNDARY_GAP).
 * @param likelihoodSlack Relative slack when ℓ at the boundary probe is compared with ℓ at the
 *   estimate (POLYCHORIC_LIKELIHOOD_RELATIVE_SLACK): at least as high means a boundary maximum.
 * @returns The fit.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient"; Press et al. 2007, "Numerical Recipes", 3rd ed., §9.4 (Newton-Raphson with
 * bisection safeguard).
 */
export function fitPolychoricTable(
  table: Float64Array,
  rows: BivariateGridMargin,
  columns: BivariateGridMargin,
  start: number,
  work: PolychoricWorkspace,
  tolerance: number,
  maxIterations: number,
  boundaryGap: number,
  likelihoodSlack: number,
): PolychoricFit {
  const edge = 1 - boundaryGap;
  let low = -1;
  let high = 1;
  let rho = start > 0.99 ? 0.99 : start < -0.99 ? -0.99 : start;
  const derivatives = work.derivatives;
  let estimate = NaN;
  let curvatureAtEstimate = 0;
  let logLikelihoodAtEstimate = 0;
  let iteration = 0;
  while (iteration < maxIterations) {
    iteration++;
    polychoricLikelihood(rho, table, rows, columns, work);
    let next: number;
    if (derivatives[3] === 0) {
      // A non-empty cell has no probability left: ρ is beyond the region the data allow.
      if (rho > 0) high = rho;
      else low = rho;
      next = (low + high) / 2;
    } else {
      const gradient = derivatives[1];
      const curvature = derivatives[2];
      // Near ±1 every density term can underflow, leaving ℓ flat to double precision: the
      // likelihood has reached its limit at the boundary on that side.
      const flat = gradient === 0 && curvature === 0;
      if (gradient === 0 && !flat) {
        estimate = rho;
        curvatureAtEstimate = curvature;
        logLikelihoodAtEstimate = derivatives[0];
        break;
      }
      const rising = gradient > 0 || (flat && rho > 0);
      if (rising) {
        if (rho >= edge) return { rho: 1, boundary: 1, secondDerivative: 0, iterations: iteration };
        low = rho;
      } else {
        if (rho <= -edge) return { rho: -1, boundary: -1, secondDerivative: 0, iterations: iteration };
        high = rho;
      }
      next = curvature < 0 ? rho - gradient / curvature : NaN;
      // A Newton step this small means ρ is the root (to within the step), wherever the
      // rounding put it relative to the bracket.
      if (Math.abs(next - rho) < tolerance) {
        estimate = next;
        curvatureAtEstimate = curvature;
        logLikelihoodAtEstimate = derivatives[0];
        break;
      }
      if (!(next > low && next < high)) {
        if (rising && high === 1) next = edge;
        else if (!rising && low === -1) next = -edge;
        else next = (low + high) / 2;
      }
    }
    if (high - low < tolerance) {
      estimate = next;
      curvatureAtEstimate = derivatives[2];
      logLikelihoodAtEstimate = derivatives[0];
      break;
    }
    rho = next;
  }
  if (Number.isNaN(estimate)) return { rho, boundary: 2, secondDerivative: derivatives[2], iterations: iteration };
  // Confirm the maximum against the boundary on its side: when ℓ still rises toward ±1 ever
  // more slowly, the Newton steps shrink below the tolerance short of the boundary.
  const side = estimate >= 0 ? 1 : -1;
  polychoricLikelihood(side * edge, table, rows, columns, work);
  iteration++;
  if (derivatives[3] === 1 && derivatives[0] >= logLikelihoodAtEstimate - likelihoodSlack * Math.abs(logLikelihoodAtEstimate)) {
    return { rho: side, boundary: side, secondDerivative: 0, iterations: iteration };
  }
  return { rho: estimate, boundary: 0, secondDerivative: curvatureAtEstimate, iterations: iteration };
}

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
  const n = countPolychoricTable(itemX.codes, categoriesX, itemY.codes, categoriesY, x.length, work.table);
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

/**
 * Everything needed to estimate many polychoric pairs, in typed arrays and plain numbers only,
 * so that it can be posted to a worker thread unchanged.
 */
export interface PolychoricPairsJob {
  /** Respondents (length of each item's code run). */
  readonly respondents: number;
  /** Category codes, item j at `j * respondents` (missing = the item's category count). */
  readonly codes: Uint8Array;
  /** Categories of each item. */
  readonly categories: Int32Array;
  /** Where each item's thresholds start in `limits`, `lower` and `upper`. */
  readonly thresholdOffsets: Int32Array;
  /** Thresholds of all items, concatenated; Φ of them; Φ of their negatives. */
  readonly limits: Float64Array;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  /** Item pairs to estimate, flattened: [a0, b0, a1, b1, ...]. */
  readonly pairs: Int32Array;
  /** Tuning values (POLYCHORIC_LIMITS). */
  readonly tuning: PolychoricLimits;
}

/** Values per pair in the output of `estimatePolychoricPairs`: ρ, SE, status, n, iterations. */
export const POLYCHORIC_PAIR_FIELDS = 5;

/**
 * Packs coded items and a list of pairs into a job for `estimatePolychoricPairs`.
 * @param items Coded items (from `codeOrdinalItem`), all over the same respondents.
 * @param pairs Pairs of item indices, flattened [a0, b0, a1, b1, ...].
 * @throws {RangeError} when the items do not share one number of respondents, or a pair
 *   names an item that does not exist.
 * @returns The job.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export function createPolychoricPairsJob(items: readonly OrdinalItem[], pairs: Int32Array): PolychoricPairsJob {
  const respondents = items.length > 0 ? items[0].codes.length : 0;
  let thresholdTotal = 0;
  items.forEach((item, j) => {
    if (item.codes.length !== respondents) {
      throw new RangeError(`createPolychoricPairsJob: item ${j} has ${item.codes.length} respondents, expected ${respondents}`);
    }
    thresholdTotal += item.thresholds.count;
  });
  for (let p = 0; p < pairs.length; p++) {
    if (!(pairs[p] >= 0 && pairs[p] < items.length)) throw new RangeError(`createPolychoricPairsJob: pair entry ${p} names item ${pairs[p]}, which does not exist`);
  }
  const codes = new Uint8Array(respondents * items.length);
  const categories = new Int32Array(items.length);
  const thresholdOffsets = new Int32Array(items.length);
  const limits = new Float64Array(thresholdTotal);
  const lower = new Float64Array(thresholdTotal);
  const upper = new Float64Array(thresholdTotal);
  let offset = 0;
  items.forEach((item, j) => {
    codes.set(item.codes, j * respondents);
    categories[j] = item.categories.length;
    thresholdOffsets[j] = offset;
    const count = item.thresholds.count;
    limits.set(item.thresholds.limits.subarray(0, count), offset);
    lower.set(item.thresholds.lower.subarray(0, count), offset);
    upper.set(item.thresholds.upper.subarray(0, count), offset);
    offset += count;
  });
  return { respondents, codes, categories, thresholdOffsets, limits, lower, upper, pairs, tuning: POLYCHORIC_LIMITS };
}

/**
 * Estimates every pair of a job, one after the other (the worker threads run this same function
 * on their share of the pairs).
 * @param job From `createPolychoricPairsJob`.
 * @returns POLYCHORIC_PAIR_FIELDS values per pair, in pair order: ρ (NaN when undefined),
 *   standard error (NaN when not available), status (POLYCHORIC_STATUS), n, iterations.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export function estimatePolychoricPairs(job: PolychoricPairsJob): Float64Array {
  const respondents = job.respondents;
  const categories = job.categories;
  const items = categories.length;
  let maxCategories = 2;
  for (let j = 0; j < items; j++) if (categories[j] > maxCategories) maxCategories = categories[j];
  const work = createPolychoricWorkspace(maxCategories);
  const margins = [];
  const codeRuns = [];
  for (let j = 0; j < items; j++) {
    const start = job.thresholdOffsets[j];
    const count = categories[j] > 1 ? categories[j] - 1 : 0;
    margins.push({
      limits: job.limits.subarray(start, start + count),
      lower: job.lower.subarray(start, start + count),
      upper: job.upper.subarray(start, start + count),
      count,
    });
    codeRuns.push(job.codes.subarray(j * respondents, (j + 1) * respondents));
  }
  const pairCount = job.pairs.length / 2;
  const out = new Float64Array(pairCount * 5);
  for (let p = 0; p < pairCount; p++) {
    const a = job.pairs[2 * p];
    const b = job.pairs[2 * p + 1];
    const n = countPolychoricTable(codeRuns[a], categories[a], codeRuns[b], categories[b], respondents, work.table);
    const at = p * 5;
    if (categories[a] < 2 || categories[b] < 2) {
      out[at] = NaN;
      out[at + 1] = NaN;
      out[at + 2] = n < job.tuning.minRows ? 3 : 4;
      out[at + 3] = n;
      out[at + 4] = 0;
      continue;
    }
    const estimate = estimatePolychoricFromTable(work.table, margins[a], margins[b], work, job.tuning);
    out[at] = estimate.rho;
    out[at + 1] = estimate.standardError;
    out[at + 2] = estimate.status;
    out[at + 3] = estimate.n;
    out[at + 4] = estimate.iterations;
  }
  return out;
}
