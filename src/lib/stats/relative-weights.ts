/**
 * Johnson's relative weights: each predictor's share of the model R², computed through the
 * orthonormal variables closest to the predictors, so that the shares stay sensible when the
 * predictors overlap.
 *
 * With R_xx = V diag(λ) Vᵀ (the predictors' correlation matrix) and r_xy their correlations with
 * the outcome: Λ = V diag(√λ) Vᵀ holds the correlations of the predictors with the orthonormal
 * variables Z; β = V diag(1/√λ) Vᵀ r_xy are the weights of the outcome on Z; the raw weight of
 * predictor j is ε_j = Σ_k Λ_jk² β_k². Since each column of Λ² sums to 1, Σ_j ε_j = Σ_k β_k² =
 * r_xyᵀ R_xx⁻¹ r_xy = R².
 *
 * References: Johnson 2000, "A heuristic method for estimating the relative weight of predictor
 * variables in multiple regression" (Multivariate Behavioral Research 35:1-19); Johnson &
 * LeBreton 2004, "History and use of relative importance indices in organizational research"
 * (Organizational Research Methods 7:238-257).
 */
import { checkCorrelationMatrix } from './correlation-input';
import { symmetricEigen } from './symmetric-eigen';
import { NULL_SPACE_MEMBERSHIP, RELATIVE_WEIGHTS_EIGENVALUE_TOLERANCE } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Relative weights of a set of predictors, in the order of the correlation matrix. */
export interface RelativeWeightsResult {
  /** Raw weights ε_j; they sum to R². Null (with a notice) when R_xx is singular. */
  readonly weights: Float64Array | null;
  /** ε_j / R², summing to 1; null with the weights or when R² is 0. */
  readonly shares: Float64Array | null;
  /** R² = r_xyᵀ R_xx⁻¹ r_xy = Σ ε_j; null when R_xx is singular. */
  readonly rSquared: number | null;
  /** Conditions met: `singular-matrix` (items: those in the exact dependency), `no-explained-variance`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Johnson's (2000) relative weights from correlations.
 * @param predictorCorrelation Correlation matrix of the predictors (unit diagonal, symmetric,
 *   finite); not modified.
 * @param outcomeCorrelations Correlation of each predictor with the outcome, same order, finite,
 *   each within [−1, 1]; not modified.
 * @throws {RangeError} when the matrix is not a finite symmetric matrix with a unit diagonal, the
 *   lengths differ, or an outcome correlation is not finite or outside [−1, 1].
 * @returns Raw weights summing to R², their shares of R², and R²; a singular predictor
 *   matrix gives nulls and names the items in the exact dependency.
 * References: Johnson 2000, "A heuristic method for estimating the relative weight of predictor
 * variables in multiple regression", Multivariate Behavioral Research 35:1-19.
 */
export function relativeWeights(predictorCorrelation: SquareMatrix, outcomeCorrelations: ArrayLike<number>): RelativeWeightsResult {
  checkCorrelationMatrix(predictorCorrelation, 'relativeWeights');
  const p = predictorCorrelation.order;
  if (outcomeCorrelations.length !== p) {
    throw new RangeError(`relativeWeights: expected ${p} outcome correlations, got ${outcomeCorrelations.length}`);
  }
  for (let j = 0; j < p; j++) {
    const r = outcomeCorrelations[j];
    if (!Number.isFinite(r) || Math.abs(r) > 1) {
      throw new RangeError(`relativeWeights: outcome correlation ${j} must be finite and within [-1, 1], got ${r}`);
    }
  }
  const { values, vectors } = symmetricEigen(predictorCorrelation);
  const v = vectors.data;
  const largest = values[0];
  const nullDimensions: number[] = [];
  for (let k = 0; k < p; k++) if (!(values[k] > RELATIVE_WEIGHTS_EIGENVALUE_TOLERANCE * largest)) nullDimensions.push(k);
  if (nullDimensions.length > 0) {
    const involved: number[] = [];
    for (let j = 0; j < p; j++) {
      let membership = 0;
      for (const k of nullDimensions) membership += v[j * p + k] ** 2;
      if (membership >= NULL_SPACE_MEMBERSHIP * NULL_SPACE_MEMBERSHIP) involved.push(j);
    }
    return {
      weights: null,
      shares: null,
      rSquared: null,
      notices: [
        {
          code: 'singular-matrix',
          items: involved,
          message: 'The predictors are exactly dependent (their correlation matrix is singular), so relative weights are undefined.',
        },
      ],
    };
  }
  // β = V diag(1/√λ) Vᵀ r_xy; Λ = V diag(√λ) Vᵀ.
  const projected = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    let sum = 0;
    for (let j = 0; j < p; j++) sum += v[j * p + k] * outcomeCorrelations[j];
    projected[k] = sum / Math.sqrt(values[k]);
  }
  const beta = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let sum = 0;
    for (let k = 0; k < p; k++) sum += v[j * p + k] * projected[k];
    beta[j] = sum;
  }
  const roots = values.map(Math.sqrt);
  const weights = new Float64Array(p);
  let rSquared = 0;
  for (let j = 0; j < p; j++) {
    let weight = 0;
    for (let m = 0; m < p; m++) {
      let lambda = 0;
      for (let k = 0; k < p; k++) lambda += v[j * p + k] * roots[k] * v[m * p + k];
      weight += lambda * lambda * beta[m] * beta[m];
    }
    weights[j] = weight;
    rSquared += weight;
  }
  if (!(rSquared > 0)) {
    return {
      weights,
      shares: null,
      rSquared,
      notices: [{ code: 'no-explained-variance', items: [], message: 'The predictors explain none of the outcome (R² = 0), so shares of R² are undefined.' }],
    };
  }
  return { weights, shares: weights.map((weight) => weight / rSquared), rSquared, notices: [] };
}
