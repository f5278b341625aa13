/**
 * Maximum-likelihood mean vector and covariance matrix of items with scattered missing answers,
 * under a multivariate normal model and missing at random, by the EM algorithm.
 *
 * E-step, for each respondent with missing items M and observed items O: the conditional mean
 * of the missing answers, x̂_M = μ_M + Σ_MO Σ_OO⁻¹ (x_O − μ_O), and their conditional covariance
 * C_MM = Σ_MM − Σ_MO Σ_OO⁻¹ Σ_OM. Both are computed here from the precision matrix Θ = Σ⁻¹, which
 * needs one inverse per iteration instead of one per respondent:
 * C_MM = (Θ_MM)⁻¹ and x̂_M = μ_M − (Θ_MM)⁻¹ Θ_MO (x_O − μ_O) (the partitioned-inverse identity).
 * M-step: μ = mean of the completed rows, Σ = mean of (x̂ x̂ᵀ + C) − μ μᵀ (divisor n: the ML
 * estimate). Complete rows enter through sums computed once. Iterations stop when no mean moves
 * by more than EM_TOLERANCE standard deviations and no covariance by more than EM_TOLERANCE
 * times the product of the two standard deviations.
 *
 * Respondents with no answer at all carry no information and are left out (and counted).
 *
 * References: Dempster, Laird & Rubin 1977, "Maximum likelihood from incomplete data via the EM
 * algorithm" (Journal of the Royal Statistical Society B 39:1-38); Little & Rubin 2002,
 * "Statistical Analysis with Missing Data", 2nd ed., §11.2 (the normal model); Schafer 1997,
 * "Analysis of Incomplete Multivariate Data", ch. 5.
 */
import { invertPositiveDefiniteInto } from './cholesky-inverse';
import { checkItemMatrixShape } from './cross-products';
import { EM_MAX_ITERATIONS, EM_TOLERANCE, ZERO_VARIANCE_RELATIVE_TOLERANCE } from './tolerances';
import type { ItemMatrix, NumericalNotice, SquareMatrix } from './types';

/** Options of `emCovariance`. */
/**
 * Why the EM estimate cannot be made, for callers that fall back to complete rows and say why:
 * `items-without-variance` (an item with fewer than two answers or no variation) or `singular`
 * (the covariance estimate has an exact dependency). A RangeError, as every refusal of the core.
 */
export class EmEstimateRefusal extends RangeError {
  readonly reason: 'items-without-variance' | 'singular';

  constructor(reason: EmEstimateRefusal['reason'], message: string) {
    super(message);
    this.name = 'EmEstimateRefusal';
    this.reason = reason;
  }
}

export interface EmCovarianceOptions {
  /** Convergence tolerance (default EM_TOLERANCE), > 0. */
  readonly tolerance?: number;
  /** Iteration limit (default EM_MAX_ITERATIONS), a positive integer. */
  readonly maxIterations?: number;
}

/** The result of `emCovariance`. */
export interface EmCovarianceResult {
  /** ML estimate of each item's mean. */
  readonly means: Float64Array;
  /** ML estimate of the covariance matrix (divisor n, the respondents used). */
  readonly covariance: SquareMatrix;
  /** Respondents used (with at least one answer). */
  readonly rows: number;
  /** Respondents left out because they answered nothing. */
  readonly rowsWithoutAnswers: number;
  /** Respondents who answered every item. */
  readonly completeRows: number;
  /** Share of missing cells among the respondents used. */
  readonly missingShare: number;
  /** EM iterations run. */
  readonly iterations: number;
  /** True when the tolerance was met. */
  readonly converged: boolean;
  /** `not-converged`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * EM estimate of the mean vector and covariance matrix under missing at random.
 * @param matrix Respondents × items, column-major, NaN for a missing answer.
 * @param options Tolerance and iteration limit.
 * @throws {RangeError} when the shape is wrong or a value is ±Infinity.
 * @throws {EmEstimateRefusal} (`items-without-variance`) naming every item with fewer than two
 *   answers or no variation among its answers (exclude constant items first).
 * @throws {EmEstimateRefusal} (`singular`) when the covariance estimate becomes singular (an exact linear dependency
 *   among the items, or more items than respondents): the EM needs Σ invertible; use complete
 *   rows and report the dependency instead.
 * @returns Means, covariance (divisor n), rows used, iterations and convergence.
 * References: Dempster, Laird & Rubin 1977, "Maximum likelihood from incomplete data via the EM
 * algorithm"; Little & Rubin 2002, "Statistical Analysis with Missing Data", §11.2.
 */
export function emCovariance(matrix: ItemMatrix, options: EmCovarianceOptions = {}): EmCovarianceResult {
  checkItemMatrixShape(matrix, 'emCovariance');
  const tolerance = options.tolerance ?? EM_TOLERANCE;
  const maxIterations = options.maxIterations ?? EM_MAX_ITERATIONS;
  if (!(tolerance > 0)) throw new RangeError(`emCovariance: tolerance must be positive, got ${tolerance}`);
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new RangeError(`emCovariance: maxIterations must be a positive integer, got ${maxIterations}`);
  const { rows: totalRows, columns: p, data } = matrix;

  // Rows with at least one answer; complete rows; missing index lists of the others.
  const incomplete: number[] = [];
  const missingLists: Int32Array[] = [];
  const complete: number[] = [];
  let rowsWithoutAnswers = 0;
  let missingCells = 0;
  for (let i = 0; i < totalRows; i++) {
    const missing: number[] = [];
    for (let j = 0; j < p; j++) {
      const value = data[j * totalRows + i];
      if (Number.isNaN(value)) missing.push(j);
      else if (!Number.isFinite(value)) throw new RangeError(`emCovariance: item ${j} has an infinite value at respondent ${i}`);
    }
    if (missing.length === p) rowsWithoutAnswers++;
    else if (missing.length === 0) complete.push(i);
    else {
      incomplete.push(i);
      missingLists.push(Int32Array.from(missing));
      missingCells += missing.length;
    }
  }
  const n = complete.length + incomplete.length;

  // Starting values: observed means and variances (ML), no covariance.
  const mean = new Float64Array(p);
  const sigma = new Float64Array(p * p);
  const badItems: number[] = [];
  for (let j = 0; j < p; j++) {
    let count = 0;
    let sum = 0;
    for (let i = 0; i < totalRows; i++) {
      const value = data[j * totalRows + i];
      if (!Number.isNaN(value)) {
        count++;
        sum += value;
      }
    }
    const m = count > 0 ? sum / count : 0;
    let squares = 0;
    for (let i = 0; i < totalRows; i++) {
      const value = data[j * totalRows + i];
      if (!Number.isNaN(value)) squares += (value - m) * (value - m);
    }
    const variance = count > 0 ? squares / count : 0;
    if (count < 2 || !(variance > ZERO_VARIANCE_RELATIVE_TOLERANCE * Math.max(1, m * m))) badItems.push(j);
    mean[j] = m;
    sigma[j * p + j] = variance;
  }
  if (badItems.length > 0) {
    throw new EmEstimateRefusal('items-without-variance', `emCovariance: item(s) ${badItems.join(', ')} have fewer than two answers or no variation; exclude them first`);
  }

  // Sums over complete rows, fixed across iterations.
  const completeSum = new Float64Array(p);
  const completeProducts = new Float64Array(p * p);
  const row = new Float64Array(p);
  for (const i of complete) {
    for (let j = 0; j < p; j++) row[j] = data[j * totalRows + i];
    for (let j = 0; j < p; j++) {
      completeSum[j] += row[j];
      const rj = row[j];
      const offset = j * p;
      for (let k = j; k < p; k++) completeProducts[offset + k] += rj * row[k];
    }
  }

  const precision = new Float64Array(p * p);
  const work = new Float64Array(p * p);
  const sum = new Float64Array(p);
  const products = new Float64Array(p * p);
  const small = new Float64Array(p * p);
  const smallInverse = new Float64Array(p * p);
  const residual = new Float64Array(p);
  const shift = new Float64Array(p);
  const newMean = new Float64Array(p);
  let iterations = 0;
  let converged = false;
  while (iterations < maxIterations) {
    iterations++;
    if (!invertPositiveDefiniteInto(sigma, p, precision, work)) {
      throw new EmEstimateRefusal(
        'singular',
        'emCovariance: the covariance estimate is singular (an exact linear dependency among the items, or too few respondents); use complete rows and report the dependency',
      );
    }
    sum.set(completeSum);
    products.set(completeProducts);
    for (let r = 0; r < incomplete.length; r++) {
      const i = incomplete[r];
      const missing = missingLists[r];
      const m = missing.length;
      // Observed deviations (0 where missing) and the row with its missing cells to be filled.
      for (let j = 0; j < p; j++) {
        const value = data[j * totalRows + i];
        residual[j] = Number.isNaN(value) ? 0 : value - mean[j];
        row[j] = value;
      }
      // Θ_MM and b = Θ_MO (x_O − μ_O).
      for (let a = 0; a < m; a++) {
        const ja = missing[a];
        let b = 0;
        const offset = ja * p;
        for (let j = 0; j < p; j++) b += precision[offset + j] * residual[j];
        shift[a] = b;
        for (let c = 0; c < m; c++) small[a * m + c] = precision[offset + missing[c]];
      }
      if (!invertPositiveDefiniteInto(small, m, smallInverse, work)) {
        throw new EmEstimateRefusal('singular', 'emCovariance: a conditional covariance is singular; the covariance estimate has an exact dependency');
      }
      // x̂_M = μ_M − (Θ_MM)⁻¹ b
      for (let a = 0; a < m; a++) {
        let value = mean[missing[a]];
        for (let c = 0; c < m; c++) value -= smallInverse[a * m + c] * shift[c];
        row[missing[a]] = value;
      }
      for (let j = 0; j < p; j++) {
        sum[j] += row[j];
        const rj = row[j];
        const offset = j * p;
        for (let k = j; k < p; k++) products[offset + k] += rj * row[k];
      }
      // + C_MM on the missing block (upper triangle in the item order).
      for (let a = 0; a < m; a++) {
        for (let c = 0; c < m; c++) {
          const ja = missing[a];
          const jc = missing[c];
          if (jc >= ja) products[ja * p + jc] += smallInverse[a * m + c];
        }
      }
    }
    let largestChange = 0;
    for (let j = 0; j < p; j++) newMean[j] = sum[j] / n;
    for (let j = 0; j < p; j++) {
      const sd = Math.sqrt(sigma[j * p + j]);
      largestChange = Math.max(largestChange, Math.abs(newMean[j] - mean[j]) / sd);
    }
    for (let j = 0; j < p; j++) {
      for (let k = j; k < p; k++) {
        const value = products[j * p + k] / n - newMean[j] * newMean[k];
        const scale = Math.sqrt(sigma[j * p + j] * sigma[k * p + k]);
        largestChange = Math.max(largestChange, Math.abs(value - sigma[j * p + k]) / scale);
        sigma[j * p + k] = value;
        sigma[k * p + j] = value;
      }
    }
    mean.set(newMean);
    if (largestChange <= tolerance) {
      converged = true;
      break;
    }
  }
  const notices: NumericalNotice[] = [];
  if (!converged) {
    notices.push({ code: 'not-converged', items: [], message: `The EM estimate did not settle within ${maxIterations} iterations; the moments are the last iterate.` });
  }
  return {
    means: mean,
    covariance: { order: p, data: sigma },
    rows: n,
    rowsWithoutAnswers,
    completeRows: complete.length,
    missingShare: n > 0 ? missingCells / (n * p) : 0,
    iterations,
    converged,
    notices,
  };
}
