/**
 * Loadings of k common factors by minimum residual (minres, unweighted least squares): the
 * loadings Λ (items × k) minimise the sum of squared off-diagonal residuals of R − ΛΛᵀ.
 *
 * Found by iterated principal axes run to convergence: the diagonal of R is replaced by the
 * communalities h, Λ is the leading k eigenvectors of that matrix times the square roots of their
 * eigenvalues, h = diag(ΛΛᵀ), and so on until no communality moves by more than
 * MINRES_FACTORS_TOLERANCE. The fixed point is a stationary point of the ULS criterion with the
 * diagonal fitted exactly, the solution psych::fa(fm = "minres") reaches by optimising the
 * uniquenesses (Harman & Jones 1966). Starting communalities: squared multiple correlations,
 * 1 − 1/diag(R⁻¹), as psych uses (R not positive definite: the row's largest |r|).
 *
 * Unrotated: the columns are the principal axes of the reduced matrix (largest first); each
 * column's sign makes its sum positive (as psych::fa does). Rotation is a separate step
 * (obliminRotation).
 *
 * References: Harman & Jones 1966, "Factor analysis by minimizing residuals (minres)"
 * (Psychometrika 31:351-368); Harman 1976, Modern Factor Analysis, 3rd ed. (iterated principal
 * axes); Revelle, psych::fa (R package), for the starting values and the sign convention.
 */
import { checkCorrelationMatrix } from './correlation-input';
import { spectralInverse } from './spectral-inverse';
import { symmetricEigen } from './symmetric-eigen';
import { HEYWOOD_COMMUNALITY, MINRES_FACTORS_MAX_ITERATIONS, MINRES_FACTORS_TOLERANCE } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** A k-factor minres solution. */
export interface MinresFactorsResult {
  readonly items: number;
  readonly factors: number;
  /** Unrotated loadings, row-major items × factors: item i on factor f is `loadings[i * factors + f]`. */
  readonly loadings: Float64Array;
  /** Communalities (row sums of squared loadings). */
  readonly communalities: Float64Array;
  readonly iterations: number;
  readonly converged: boolean;
  /** `not-converged`, `heywood-case`, `too-many-factors`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * k-factor minres (ULS) loadings of a correlation matrix, unrotated.
 * @param correlation item correlation matrix (unit diagonal, symmetric, finite); not modified.
 * @param factors number of factors k, an integer from 1 to items − 1.
 * @throws {RangeError} when the matrix is not a correlation matrix or k is out of range.
 * @returns the loadings, communalities and convergence, with Heywood cases as notices.
 * References: Harman & Jones 1966 (minres); Harman 1976 (iterated principal axes).
 */
export function minresFactors(correlation: SquareMatrix, factors: number): MinresFactorsResult {
  checkCorrelationMatrix(correlation, 'minresFactors');
  const p = correlation.order;
  if (!Number.isInteger(factors) || factors < 1 || factors >= p) {
    throw new RangeError(`minresFactors: factors must be an integer from 1 to ${p - 1} (items − 1), got ${factors}`);
  }
  const r = correlation.data;
  const communalities = startingCommunalities(correlation);
  const reduced = new Float64Array(r);
  let loadings = new Float64Array(p * factors);
  let iterations = 0;
  let converged = false;
  while (iterations < MINRES_FACTORS_MAX_ITERATIONS) {
    iterations++;
    for (let i = 0; i < p; i++) reduced[i * p + i] = communalities[i];
    const eigen = symmetricEigen({ order: p, data: reduced });
    loadings = new Float64Array(p * factors);
    for (let f = 0; f < factors; f++) {
      const root = Math.sqrt(Math.max(eigen.values[f], 0));
      for (let i = 0; i < p; i++) loadings[i * factors + f] = eigen.vectors.data[i * p + f] * root;
    }
    let largestMove = 0;
    for (let i = 0; i < p; i++) {
      let h = 0;
      for (let f = 0; f < factors; f++) h += loadings[i * factors + f] ** 2;
      largestMove = Math.max(largestMove, Math.abs(h - communalities[i]));
      communalities[i] = h;
    }
    if (largestMove <= MINRES_FACTORS_TOLERANCE) {
      converged = true;
      break;
    }
  }
  for (let f = 0; f < factors; f++) {
    let sum = 0;
    for (let i = 0; i < p; i++) sum += loadings[i * factors + f];
    if (sum < 0) for (let i = 0; i < p; i++) loadings[i * factors + f] = -loadings[i * factors + f];
  }
  const notices: NumericalNotice[] = [];
  if (!converged) notices.push({ code: 'not-converged', items: [], message: `Minres factoring (${factors} factors) did not settle within ${MINRES_FACTORS_MAX_ITERATIONS} iterations; the loadings are the last iterate.` });
  const heywood = [...communalities.keys()].filter((i) => communalities[i] >= HEYWOOD_COMMUNALITY);
  if (heywood.length > 0) notices.push({ code: 'heywood-case', items: heywood, message: 'A communality reaches 1 or more (a Heywood case): too many factors for these items, or an item that duplicates another.' });
  if ((p - factors) ** 2 < p + factors) {
    notices.push({ code: 'too-many-factors', items: [], message: `${factors} factors for ${p} items leave the model with no degrees of freedom; fewer factors or more items are needed.` });
  }
  return { items: p, factors, loadings, communalities, iterations, converged, notices };
}

/** Squared multiple correlations, or the largest |r| of each row when R cannot be inverted. */
function startingCommunalities(correlation: SquareMatrix): Float64Array {
  const p = correlation.order;
  const start = new Float64Array(p);
  const inverse = spectralInverse(symmetricEigen(correlation));
  if (inverse !== null) {
    for (let i = 0; i < p; i++) start[i] = 1 - 1 / inverse.data[i * p + i];
    if (start.every((value) => Number.isFinite(value) && value >= 0 && value < 1)) return start;
  }
  for (let i = 0; i < p; i++) {
    let largest = 0;
    for (let j = 0; j < p; j++) if (j !== i) largest = Math.max(largest, Math.abs(correlation.data[i * p + j]));
    start[i] = largest;
  }
  return start;
}
