/**
 * Ordinary least squares of an outcome on items, with an intercept, by Householder QR of the
 * centred predictors (X'X is never formed, let alone inverted).
 *
 * Centring the columns is the exact reparametrisation of a model with an intercept and removes
 * the worst of the ill-conditioning of raw survey or economic data. Columns are reduced in their
 * given order; a column whose remaining norm falls below QR_ALIASING_RELATIVE_TOLERANCE times its
 * original (uncentred) norm is a linear combination of the intercept and earlier columns: it is
 * reported as aliased and left out, the rule R's lm() applies (LINPACK dqrdc2 with limited
 * pivoting). From R (the triangular factor) and Q'y come the estimates, SSR, and R⁻¹, whose row
 * norms give (X_c'X_c)⁻¹_jj = 1 / (SST_j (1 − R²_j)); hence each standard error splits into
 * sqrt(SSR/(n − k − 1)) / (sqrt(SST_j) · sqrt(1 − R²_j)), R²_j being the R² of predictor j on the
 * other predictors (VIF_j = 1/(1 − R²_j)).
 *
 * References: Householder 1958, "Unitary triangularization of a nonsymmetric matrix" (J. ACM
 * 5:339-342); Golub 1965, "Numerical methods for solving linear least squares problems" (Numer.
 * Math. 7:206-216); Golub & Van Loan 2013, Matrix Computations, 4th ed., §5.2-5.3; Dongarra,
 * Bunch, Moler & Stewart 1979, LINPACK Users' Guide (limited pivoting); Wooldridge 2013,
 * Introductory Econometrics, 5th ed., §3.4 (the decomposition of the standard error); Marquardt
 * 1970, "Generalized inverses, ridge regression, biased linear estimation, and nonlinear
 * estimation" (Technometrics 12:591-612, VIF).
 */
import { fUpperTail } from './f-distribution';
import { tTwoSidedPValue } from './t-distribution';
import { CONSTANT_ITEM_RELATIVE_SD, EXACT_FIT_RELATIVE_RESIDUAL, QR_ALIASING_RELATIVE_TOLERANCE } from './tolerances';
import type { ItemMatrix, NumericalNotice } from './types';

/** One coefficient of the model. Values are null (with a notice) where they are undefined. */
export interface OlsCoefficient {
  readonly estimate: number | null;
  readonly standardError: number | null;
  readonly tStatistic: number | null;
  /** Two-sided p-value from Student's t on the residual degrees of freedom. */
  readonly pValue: number | null;
}

/**
 * The three factors of a predictor's standard error:
 * se_j = residualScale / (spread · overlap).
 */
export interface StandardErrorFactors {
  /** sqrt(SSR / (n − k − 1)), the residual standard error (shared by all predictors). */
  readonly residualScale: number;
  /** sqrt(SST_j), the predictor's spread: root of its sum of squares about its mean. */
  readonly spread: number;
  /** sqrt(1 − R²_j): how much of the predictor the others leave unexplained. */
  readonly overlap: number;
}

/** A predictor's coefficient and the overlap diagnostics behind its standard error. */
export interface OlsPredictor extends OlsCoefficient {
  /** 0-based column of the predictor matrix. */
  readonly column: number;
  /** True when the column depends linearly on the intercept and earlier columns (all values null). */
  readonly aliased: boolean;
  /** SST_j = Σ (x_ij − x̄_j)². */
  readonly sumOfSquaresAboutMean: number;
  /** R²_j of this predictor regressed on the other (non-aliased) predictors. */
  readonly auxiliaryRSquared: number | null;
  /** 1 − R²_j. */
  readonly tolerance: number | null;
  /** 1 / (1 − R²_j). */
  readonly varianceInflationFactor: number | null;
  /** The decomposition of the standard error; null when the standard error is. */
  readonly standardErrorFactors: StandardErrorFactors | null;
}

/** The overall F test of the model against the intercept alone. */
export interface OlsModelTest {
  readonly fStatistic: number;
  readonly numeratorDegreesOfFreedom: number;
  readonly denominatorDegreesOfFreedom: number;
  readonly pValue: number;
}

/** A fitted OLS model. */
export interface OlsRegressionResult {
  /** n, the rows used. */
  readonly observations: number;
  /** Rank of the design including the intercept (1 + predictors kept). */
  readonly rank: number;
  /** n − rank. */
  readonly residualDegreesOfFreedom: number;
  readonly intercept: OlsCoefficient;
  /** One entry per column of the predictor matrix, in order. */
  readonly predictors: readonly OlsPredictor[];
  /** 0-based columns left out as linear combinations of the intercept and earlier columns. */
  readonly aliasedColumns: readonly number[];
  /** SSR = Σ residual². */
  readonly sumOfSquaredResiduals: number;
  /** SST = Σ (y − ȳ)². */
  readonly totalSumOfSquares: number;
  /** 1 − SSR/SST; null for a constant outcome. */
  readonly rSquared: number | null;
  /** 1 − (1 − R²)(n − 1)/(n − rank); null for a constant outcome or no residual degrees of freedom. */
  readonly adjustedRSquared: number | null;
  /** sigma = sqrt(SSR / (n − rank)); null with no residual degrees of freedom. */
  readonly residualStandardError: number | null;
  /** F test of all kept predictors; null when undefined (no predictor, no residual df, exact fit, constant outcome). */
  readonly modelTest: OlsModelTest | null;
  /**
   * Conditions met: `aliased-column` (items: the aliased column, then the columns it depends on),
   * `constant-outcome`, `exact-fit`, `no-residual-df`.
   */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Least-squares fit of y = b₀ + Σ b_j x_j + e.
 * @param predictors Respondents × predictors, column-major, complete (no NaN): drop incomplete
 *   rows first. May have zero columns (intercept-only model). Not modified.
 * @param outcome One finite value per respondent. Not modified.
 * @throws {RangeError} when there are no rows, the outcome length differs from the rows, or any
 *   value is not finite.
 * @returns Estimates, standard errors, t, two-sided p, R², adjusted R², SSR, sigma, the F test,
 *   and per predictor SST_j, R²_j, tolerance, VIF and the factors of its standard error. Aliased
 *   columns, a constant outcome, an exact fit and zero residual degrees of freedom are reported
 *   as notices with null values, never NaN.
 * References: Golub 1965, "Numerical methods for solving linear least squares problems";
 * Golub & Van Loan 2013, Matrix Computations, §5.2-5.3; Wooldridge 2013, Introductory
 * Econometrics, §3.4.
 */
export function olsRegression(predictors: ItemMatrix, outcome: ArrayLike<number>): OlsRegressionResult {
  const n = predictors.rows;
  const p = predictors.columns;
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`olsRegression: at least one row is required, got ${n}`);
  if (!Number.isInteger(p) || p < 0 || predictors.data.length !== n * p) {
    throw new RangeError(`olsRegression: the predictor matrix should hold rows × columns = ${n * p} values, got ${predictors.data.length}`);
  }
  if (outcome.length !== n) throw new RangeError(`olsRegression: the outcome has ${outcome.length} values for ${n} rows`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(outcome[i])) throw new RangeError(`olsRegression: the outcome is missing or not finite at row ${i}; drop incomplete rows first`);
  }
  for (let index = 0; index < n * p; index++) {
    if (!Number.isFinite(predictors.data[index])) {
      throw new RangeError(
        `olsRegression: predictor ${Math.floor(index / n)} is missing or not finite at row ${index % n}; drop incomplete rows first`,
      );
    }
  }

  // Centre (two-pass means, corrected) and record the norms the aliasing rule needs.
  const work = new Float64Array(n * p);
  const means = new Float64Array(p);
  const originalNorms = new Float64Array(p);
  const sumsOfSquaresAboutMean = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    const column = predictors.data.subarray(j * n, (j + 1) * n);
    means[j] = correctedMean(column);
    let squares = 0;
    let centredSquares = 0;
    for (let i = 0; i < n; i++) {
      const value = column[i];
      const centred = value - means[j];
      work[j * n + i] = centred;
      squares += value * value;
      centredSquares += centred * centred;
    }
    originalNorms[j] = Math.sqrt(squares);
    sumsOfSquaresAboutMean[j] = centredSquares;
  }
  const outcomeMean = correctedMean(outcome);
  const transformedOutcome = new Float64Array(n);
  let totalSumOfSquares = 0;
  let outcomeSquares = 0;
  for (let i = 0; i < n; i++) {
    transformedOutcome[i] = outcome[i] - outcomeMean;
    totalSumOfSquares += transformedOutcome[i] * transformedOutcome[i];
    outcomeSquares += outcome[i] * outcome[i];
  }

  // Householder QR of the centred columns, in order, skipping aliased ones.
  const kept: number[] = [];
  const aliased: number[] = [];
  const aliasedPartners = new Map<number, number[]>();
  const reflector = new Float64Array(n);
  for (let j = 0; j < p; j++) {
    const rank = kept.length;
    const column = work.subarray(j * n, (j + 1) * n);
    let remaining = 0;
    for (let i = rank; i < n; i++) remaining += column[i] * column[i];
    remaining = Math.sqrt(remaining);
    if (rank >= n - 1 || !(remaining > QR_ALIASING_RELATIVE_TOLERANCE * originalNorms[j])) {
      aliased.push(j);
      aliasedPartners.set(j, dependencyPartners(work, n, kept, column, sumsOfSquaresAboutMean, j));
      continue;
    }
    const head = column[rank];
    const diagonal = head >= 0 ? -remaining : remaining;
    const length = n - rank;
    reflector[0] = head - diagonal;
    for (let i = 1; i < length; i++) reflector[i] = column[rank + i];
    const scale = -1 / (diagonal * reflector[0]); // 2 / (vᵀv)
    column[rank] = diagonal;
    for (let i = rank + 1; i < n; i++) column[i] = 0;
    for (let m = j + 1; m < p; m++) applyReflector(work, m * n + rank, reflector, length, scale);
    applyReflector(transformedOutcome, rank, reflector, length, scale);
    kept.push(j);
  }

  const rank = kept.length;
  const residualDegreesOfFreedom = n - 1 - rank;
  let sumOfSquaredResiduals = 0;
  for (let i = rank; i < n; i++) sumOfSquaredResiduals += transformedOutcome[i] * transformedOutcome[i];

  // Triangular factor R (rank × rank, row-major) of the kept columns, its inverse and the estimates.
  const triangle = new Float64Array(rank * rank);
  for (let a = 0; a < rank; a++) for (let b = a; b < rank; b++) triangle[a * rank + b] = work[kept[b] * n + a];
  const inverse = upperTriangularInverse(triangle, rank);
  const estimates = new Float64Array(rank);
  for (let a = 0; a < rank; a++) {
    let sum = 0;
    for (let b = a; b < rank; b++) sum += inverse[a * rank + b] * transformedOutcome[b];
    estimates[a] = sum;
  }

  const notices: NumericalNotice[] = [];
  for (const column of aliased) {
    notices.push({
      code: 'aliased-column',
      items: [column, ...(aliasedPartners.get(column) ?? [])],
      message: `Predictor ${column} is a linear combination of the intercept and earlier predictors, so its coefficient cannot be estimated and it is left out.`,
    });
  }
  const constantOutcome =
    totalSumOfSquares === 0 || Math.sqrt(totalSumOfSquares / n) <= CONSTANT_ITEM_RELATIVE_SD * Math.abs(outcomeMean);
  if (constantOutcome) {
    notices.push({ code: 'constant-outcome', items: [], message: 'The outcome does not vary, so R² is undefined.' });
  }
  let residualStandardError: number | null = null;
  let exactFit = false;
  if (residualDegreesOfFreedom < 1) {
    notices.push({
      code: 'no-residual-df',
      items: [],
      message: `With ${n} rows and ${rank} predictors kept there are no residual degrees of freedom, so standard errors are undefined.`,
    });
  } else {
    residualStandardError = Math.sqrt(sumOfSquaredResiduals / residualDegreesOfFreedom);
    exactFit = Math.sqrt(sumOfSquaredResiduals / n) <= EXACT_FIT_RELATIVE_RESIDUAL * Math.sqrt(outcomeSquares / n);
    if (exactFit) {
      notices.push({
        code: 'exact-fit',
        items: [],
        message: 'The predictors reproduce the outcome exactly (no residual variation), so t statistics and p-values are undefined.',
      });
    }
  }

  const coefficient = (estimate: number, varianceFactor: number): OlsCoefficient => {
    if (residualStandardError === null) return { estimate, standardError: null, tStatistic: null, pValue: null };
    const standardError = residualStandardError * Math.sqrt(varianceFactor);
    if (exactFit) return { estimate, standardError, tStatistic: null, pValue: null };
    const tStatistic = estimate / standardError;
    return { estimate, standardError, tStatistic, pValue: tTwoSidedPValue(tStatistic, residualDegreesOfFreedom) };
  };

  const predictorResults: OlsPredictor[] = [];
  const keptPosition = new Map(kept.map((column, position) => [column, position]));
  for (let j = 0; j < p; j++) {
    const position = keptPosition.get(j);
    if (position === undefined) {
      predictorResults.push({
        column: j,
        aliased: true,
        estimate: null,
        standardError: null,
        tStatistic: null,
        pValue: null,
        sumOfSquaresAboutMean: sumsOfSquaresAboutMean[j],
        auxiliaryRSquared: null,
        tolerance: null,
        varianceInflationFactor: null,
        standardErrorFactors: null,
      });
      continue;
    }
    // (X_c'X_c)⁻¹_jj = squared norm of row `position` of R⁻¹.
    let varianceFactor = 0;
    for (let b = position; b < rank; b++) varianceFactor += inverse[position * rank + b] ** 2;
    const varianceInflationFactor = sumsOfSquaresAboutMean[j] * varianceFactor;
    const tolerance = 1 / varianceInflationFactor;
    const base = coefficient(estimates[position], varianceFactor);
    predictorResults.push({
      column: j,
      aliased: false,
      ...base,
      sumOfSquaresAboutMean: sumsOfSquaresAboutMean[j],
      auxiliaryRSquared: 1 - tolerance,
      tolerance,
      varianceInflationFactor,
      standardErrorFactors:
        base.standardError === null || residualStandardError === null
          ? null
          : { residualScale: residualStandardError, spread: Math.sqrt(sumsOfSquaresAboutMean[j]), overlap: Math.sqrt(tolerance) },
    });
  }

  // Intercept: b₀ = ȳ − Σ b_j x̄_j, var(b₀) = σ² (1/n + ‖R⁻ᵀ x̄‖²).
  let interceptEstimate = outcomeMean;
  for (let a = 0; a < rank; a++) interceptEstimate -= estimates[a] * means[kept[a]];
  let interceptFactor = 1 / n;
  for (let b = 0; b < rank; b++) {
    let sum = 0;
    for (let a = 0; a <= b; a++) sum += inverse[a * rank + b] * means[kept[a]];
    interceptFactor += sum * sum;
  }
  const intercept = coefficient(interceptEstimate, interceptFactor);

  const rSquared = constantOutcome ? null : 1 - sumOfSquaredResiduals / totalSumOfSquares;
  const adjustedRSquared =
    rSquared === null || residualDegreesOfFreedom < 1 ? null : 1 - ((1 - rSquared) * (n - 1)) / residualDegreesOfFreedom;
  let modelTest: OlsModelTest | null = null;
  if (rSquared !== null && rank > 0 && residualDegreesOfFreedom >= 1 && !exactFit) {
    const fStatistic = ((totalSumOfSquares - sumOfSquaredResiduals) / rank) / (sumOfSquaredResiduals / residualDegreesOfFreedom);
    modelTest = {
      fStatistic,
      numeratorDegreesOfFreedom: rank,
      denominatorDegreesOfFreedom: residualDegreesOfFreedom,
      pValue: fUpperTail(fStatistic, rank, residualDegreesOfFreedom),
    };
  }

  return {
    observations: n,
    rank: rank + 1,
    residualDegreesOfFreedom: n - rank - 1,
    intercept,
    predictors: predictorResults,
    aliasedColumns: aliased,
    sumOfSquaredResiduals,
    totalSumOfSquares,
    rSquared,
    adjustedRSquared,
    residualStandardError,
    modelTest,
    notices,
  };
}

/** Mean with the second-pass correction, Σ(x − m)/n added to m (Björck 1996, §2.7). */
function correctedMean(values: ArrayLike<number>): number {
  const n = values.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += values[i];
  const first = sum / n;
  let correction = 0;
  for (let i = 0; i < n; i++) correction += values[i] - first;
  return first + correction / n;
}

/** y ← y − scale · (vᵀy) · v on `length` entries of `target` from `offset`. */
function applyReflector(target: Float64Array, offset: number, reflector: Float64Array, length: number, scale: number): void {
  let dot = 0;
  for (let i = 0; i < length; i++) dot += reflector[i] * target[offset + i];
  const factor = scale * dot;
  if (factor === 0) return;
  for (let i = 0; i < length; i++) target[offset + i] -= factor * reflector[i];
}

/** Inverse of an upper-triangular matrix (row-major, order m) by back substitution. */
function upperTriangularInverse(triangle: Float64Array, m: number): Float64Array {
  const inverse = new Float64Array(m * m);
  for (let column = 0; column < m; column++) {
    inverse[column * m + column] = 1 / triangle[column * m + column];
    for (let row = column - 1; row >= 0; row--) {
      let sum = 0;
      for (let k = row + 1; k <= column; k++) sum += triangle[row * m + k] * inverse[k * m + column];
      inverse[row * m + column] = -sum / triangle[row * m + row];
    }
  }
  return inverse;
}

/**
 * The earlier kept columns an aliased column depends on: solve R c = (Q'x)[0..rank) and keep the
 * columns whose share c_l · sqrt(SST_l) is not negligible against sqrt(SST_j).
 */
function dependencyPartners(
  work: Float64Array,
  n: number,
  kept: readonly number[],
  column: Float64Array,
  sumsOfSquaresAboutMean: Float64Array,
  j: number,
): number[] {
  const rank = kept.length;
  const coefficients = new Float64Array(rank);
  for (let a = rank - 1; a >= 0; a--) {
    let sum = column[a];
    for (let b = a + 1; b < rank; b++) sum -= work[kept[b] * n + a] * coefficients[b];
    coefficients[a] = sum / work[kept[a] * n + a];
  }
  const yardstick = Math.sqrt(sumsOfSquaresAboutMean[j]);
  const partners: number[] = [];
  for (let a = 0; a < rank; a++) {
    if (Math.abs(coefficients[a]) * Math.sqrt(sumsOfSquaresAboutMean[kept[a]]) > QR_ALIASING_RELATIVE_TOLERANCE * yardstick && yardstick > 0) {
      partners.push(kept[a]);
    }
  }
  return partners.sort((x, y) => x - y);
}
