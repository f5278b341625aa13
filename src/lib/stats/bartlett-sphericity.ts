/**
 * Bartlett's test of sphericity: does the item correlation matrix differ from the identity,
 * that is, is there any shared variance to factor?
 *
 * chi² = −(n − 1 − (2p + 5)/6) · ln|R| on p(p − 1)/2 degrees of freedom, with ln|R| from the
 * Cholesky factor (ln|R| = 2 Σ ln L_ii), which also detects a singular R.
 *
 * References: Bartlett 1950, "Tests of significance in factor analysis" (British Journal of
 * Psychology, Statistical Section 3:77-85); Bartlett 1951, "The effect of standardization on a
 * chi-square approximation in factor analysis" (Biometrika 38:337-344).
 */
import { chiSquareUpperTail } from './chi-square-distribution';
import { checkCorrelationMatrix } from './correlation-input';
import { CHOLESKY_PIVOT_RELATIVE_TOLERANCE } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Result of Bartlett's test. `null` values come with a notice saying why. */
export interface BartlettSphericityResult {
  /** The chi-square statistic; null when R is singular or n is too small for the test. */
  readonly chiSquare: number | null;
  /** p(p − 1)/2. */
  readonly degreesOfFreedom: number;
  /** Upper-tail chi-square probability of the statistic; null with the statistic. */
  readonly pValue: number | null;
  /** Natural logarithm of |R|; null when R is singular (|R| = 0 or not positive definite). */
  readonly logDeterminant: number | null;
  /** The respondents n the test was computed for. */
  readonly respondents: number;
  /** Conditions met: `singular-matrix`, `too-few-items`, `too-few-respondents`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * ln|A| of a symmetric positive definite matrix from its Cholesky factor (Golub & Van Loan 2013,
 * Matrix Computations, §4.2). When a pivot collapses, `failedAt` is the 0-based index of the
 * item that is (numerically) a linear combination of the earlier ones.
 */
function choleskyLogDeterminant(matrix: SquareMatrix): { logDeterminant: number | null; failedAt: number | null } {
  const { order, data } = matrix;
  const factor = new Float64Array(order * order);
  let logDeterminant = 0;
  for (let j = 0; j < order; j++) {
    let pivot = data[j * order + j];
    for (let k = 0; k < j; k++) pivot -= factor[j * order + k] * factor[j * order + k];
    if (!(pivot > CHOLESKY_PIVOT_RELATIVE_TOLERANCE * data[j * order + j])) return { logDeterminant: null, failedAt: j };
    const root = Math.sqrt(pivot);
    factor[j * order + j] = root;
    logDeterminant += 2 * Math.log(root);
    for (let i = j + 1; i < order; i++) {
      let sum = data[i * order + j];
      for (let k = 0; k < j; k++) sum -= factor[i * order + k] * factor[j * order + k];
      factor[i * order + j] = sum / root;
    }
  }
  return { logDeterminant, failedAt: null };
}

/**
 * Bartlett's test that a correlation matrix is the identity.
 * @param correlation Item correlation matrix (unit diagonal, symmetric); not modified.
 * @param respondents n, the number of respondents the matrix was computed from (for pairwise
 *   matrices, the respondents used).
 * @throws {RangeError} when the matrix is not a finite symmetric matrix with a unit diagonal,
 *   or n is not a positive integer.
 * @returns The statistic, its degrees of freedom and p-value, and ln|R|; a singular matrix or
 *   too few respondents give nulls with a notice, never −Infinity or NaN.
 * References: Bartlett 1950, "Tests of significance in factor analysis", British Journal of
 * Psychology, Statistical Section 3:77-85.
 */
export function bartlettSphericity(correlation: SquareMatrix, respondents: number): BartlettSphericityResult {
  checkCorrelationMatrix(correlation, 'bartlettSphericity');
  if (!Number.isInteger(respondents) || respondents < 1) {
    throw new RangeError(`bartlettSphericity: respondents must be a positive integer, got ${respondents}`);
  }
  const p = correlation.order;
  const degreesOfFreedom = (p * (p - 1)) / 2;
  const notices: NumericalNotice[] = [];
  const empty = (logDeterminant: number | null): BartlettSphericityResult => ({
    chiSquare: null,
    degreesOfFreedom,
    pValue: null,
    logDeterminant,
    respondents,
    notices,
  });
  const { logDeterminant, failedAt } = choleskyLogDeterminant(correlation);
  if (logDeterminant === null) {
    notices.push({
      code: 'singular-matrix',
      items: [failedAt as number],
      message: `The correlation matrix is singular or not positive definite (item ${failedAt} depends on the items before it), so ln|R| and Bartlett's test are undefined.`,
    });
  }
  if (p < 2) {
    notices.push({ code: 'too-few-items', items: [], message: "Bartlett's test needs at least two items." });
    return empty(logDeterminant);
  }
  const multiplier = respondents - 1 - (2 * p + 5) / 6;
  if (!(multiplier > 0)) {
    notices.push({
      code: 'too-few-respondents',
      items: [],
      message: `Bartlett's test needs more than ${1 + (2 * p + 5) / 6} respondents for ${p} items; it had ${respondents}.`,
    });
    return empty(logDeterminant);
  }
  if (logDeterminant === null) return empty(null);
  // ln|R| ≤ 0 for a correlation matrix (Hadamard's inequality); a rounding-sized positive value
  // for an identity matrix would give a statistic of −0.0…, shown as 0.
  const chiSquare = Math.max(0, -multiplier * logDeterminant);
  return {
    chiSquare,
    degreesOfFreedom,
    pValue: chiSquareUpperTail(chiSquare, degreesOfFreedom),
    logDeterminant,
    respondents,
    notices,
  };
}
