/**
 * One-factor loadings by minimum residual (minres) factoring, the unweighted least-squares (ULS)
 * fit of a single common factor to a correlation matrix: the loadings λ minimise the sum of
 * squared off-diagonal residuals Σ_{i≠j} (r_ij − λ_i λ_j)².
 *
 * The minimum is found as Harman & Jones did, one loading at a time: with the others fixed the
 * objective is quadratic in λ_i and its minimiser is λ_i = Σ_{j≠i} r_ij λ_j / Σ_{j≠i} λ_j²;
 * sweeps repeat until no loading moves by more than MINRES_CONVERGENCE_TOLERANCE. Every step
 * lowers the objective. A stationary point satisfies (R − I + diag(λ²)) λ = (λᵀλ) λ, which is the
 * fixed point of iterated principal-axis factoring, so iterated principal axes run to
 * convergence reach the same ULS solution. Starting values: the leading eigenvector of R with
 * each diagonal element replaced by the row's largest |r|, by power iteration.
 *
 * The solution is unbounded: a communality λ_i² ≥ 1 (a Heywood case) is reported, not clipped.
 * Sign convention: the loadings are negated if needed so that their sum is positive.
 *
 * References: Harman & Jones 1966, "Factor analysis by minimizing residuals (minres)"
 * (Psychometrika 31:351-368); Harman 1976, Modern Factor Analysis, 3rd ed.; Heywood 1931, "On
 * finite sequences of real numbers" (Proc. Royal Society A 134:486-501).
 */
import { checkCorrelationMatrix } from './correlation-input';
import {
  HEYWOOD_COMMUNALITY,
  MINRES_CONVERGENCE_TOLERANCE,
  MINRES_MAX_SWEEPS,
  MINRES_START_POWER_STEPS,
  ZERO_VARIANCE_RELATIVE_TOLERANCE,
} from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** A one-factor minres solution. Arrays follow the item order of the correlation matrix. */
export interface MinresOneFactorResult {
  /** Loadings λ (sum positive); null for a single item. */
  readonly loadings: Float64Array | null;
  /** Communalities λ². */
  readonly communalities: Float64Array | null;
  /** Uniquenesses 1 − λ² (negative in a Heywood case). */
  readonly uniquenesses: Float64Array | null;
  /** Σ_{i≠j} (r_ij − λ_i λ_j)² over both triangles at the solution. */
  readonly residualSumOfSquares: number | null;
  /** Sweeps over all loadings that were run. */
  readonly sweeps: number;
  /** True when the last sweep moved no loading by more than MINRES_CONVERGENCE_TOLERANCE. */
  readonly converged: boolean;
  /** Items with communality ≥ 1 (Heywood cases), 0-based. */
  readonly heywoodItems: readonly number[];
  /**
   * Conditions met: `too-few-items`, `underidentified` (two items), `not-converged`,
   * `heywood-case`, `no-common-factor`.
   */
  readonly notices: readonly NumericalNotice[];
}

/**
 * One-factor minimum residual (ULS) loadings of a correlation matrix.
 * @param correlation Item correlation matrix (unit diagonal, symmetric, finite); not modified.
 * @throws {RangeError} when the matrix is empty, not symmetric, not finite, or its diagonal is
 *   not 1.
 * @returns Loadings, communalities, uniquenesses and the residual sum of squares, with
 *   convergence, Heywood cases and under-identification reported as results.
 * References: Harman & Jones 1966, "Factor analysis by minimizing residuals (minres)",
 * Psychometrika 31:351-368.
 */
export function minresOneFactor(correlation: SquareMatrix): MinresOneFactorResult {
  checkCorrelationMatrix(correlation, 'minresOneFactor');
  const k = correlation.order;
  const r = correlation.data;
  const notices: NumericalNotice[] = [];
  if (k < 2) {
    notices.push({ code: 'too-few-items', items: [0], message: 'A common factor needs at least two items.' });
    return {
      loadings: null,
      communalities: null,
      uniquenesses: null,
      residualSumOfSquares: null,
      sweeps: 0,
      converged: false,
      heywoodItems: [],
      notices,
    };
  }
  let loadings: Float64Array;
  let sweeps = 0;
  let converged = true;
  if (k === 2) {
    // λ₁λ₂ = r₁₂ fits exactly for any split; the symmetric one is reported.
    const root = Math.sqrt(Math.abs(r[1]));
    loadings = Float64Array.of(root, r[1] < 0 ? -root : root);
    notices.push({
      code: 'underidentified',
      items: [0, 1],
      message: 'With two items one factor is not identified; the loadings shown split the correlation equally.',
    });
  } else {
    loadings = startingLoadings(correlation);
    converged = false;
    while (sweeps < MINRES_MAX_SWEEPS) {
      sweeps++;
      let largestMove = 0;
      let sumOfSquares = 0;
      for (let j = 0; j < k; j++) sumOfSquares += loadings[j] * loadings[j];
      for (let i = 0; i < k; i++) {
        const others = sumOfSquares - loadings[i] * loadings[i];
        let crossProduct = 0;
        for (let j = 0; j < k; j++) if (j !== i) crossProduct += r[i * k + j] * loadings[j];
        const updated = others > ZERO_VARIANCE_RELATIVE_TOLERANCE ? crossProduct / others : 0;
        largestMove = Math.max(largestMove, Math.abs(updated - loadings[i]));
        sumOfSquares = others + updated * updated;
        loadings[i] = updated;
      }
      if (largestMove <= MINRES_CONVERGENCE_TOLERANCE) {
        converged = true;
        break;
      }
    }
    if (!converged) {
      notices.push({
        code: 'not-converged',
        items: [],
        message: `Minres factoring did not settle within ${MINRES_MAX_SWEEPS} sweeps; the loadings are the last iterate.`,
      });
    }
  }
  let sum = 0;
  let sumOfSquares = 0;
  for (let i = 0; i < k; i++) {
    sum += loadings[i];
    sumOfSquares += loadings[i] * loadings[i];
  }
  if (sum < 0) for (let i = 0; i < k; i++) loadings[i] = -loadings[i];
  if (!(sumOfSquares > ZERO_VARIANCE_RELATIVE_TOLERANCE)) {
    notices.push({
      code: 'no-common-factor',
      items: [],
      message: 'The items share no variance (all correlations are zero), so every loading is zero.',
    });
  }
  const communalities = loadings.map((value) => value * value);
  const uniquenesses = communalities.map((value) => 1 - value);
  const heywoodItems: number[] = [];
  communalities.forEach((value, i) => {
    if (value >= HEYWOOD_COMMUNALITY) heywoodItems.push(i);
  });
  if (heywoodItems.length > 0) {
    notices.push({
      code: 'heywood-case',
      items: heywoodItems,
      message: 'A communality reached 1 or more (a Heywood case): the one-factor model does not fit these items.',
    });
  }
  let residualSumOfSquares = 0;
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      if (i === j) continue;
      const residual = r[i * k + j] - loadings[i] * loadings[j];
      residualSumOfSquares += residual * residual;
    }
  }
  return { loadings, communalities, uniquenesses, residualSumOfSquares, sweeps, converged, heywoodItems, notices };
}

/**
 * Leading eigenvector (scaled by the root of its eigenvalue) of R with its diagonal replaced by
 * each row's largest |r|, by power iteration on the matrix shifted to be positive semidefinite.
 */
function startingLoadings(correlation: SquareMatrix): Float64Array {
  const k = correlation.order;
  const reduced = Float64Array.from(correlation.data);
  let shift = 0;
  for (let i = 0; i < k; i++) {
    let largest = 0;
    for (let j = 0; j < k; j++) if (j !== i) largest = Math.max(largest, Math.abs(reduced[i * k + j]));
    reduced[i * k + i] = largest;
    let rowSum = 0;
    for (let j = 0; j < k; j++) rowSum += Math.abs(reduced[i * k + j]);
    shift = Math.max(shift, rowSum);
  }
  let vector: Float64Array = new Float64Array(k).fill(1 / Math.sqrt(k));
  const product = new Float64Array(k);
  for (let step = 0; step < MINRES_START_POWER_STEPS; step++) {
    let norm = 0;
    for (let i = 0; i < k; i++) {
      let sum = shift * vector[i];
      for (let j = 0; j < k; j++) sum += reduced[i * k + j] * vector[j];
      product[i] = sum;
      norm += sum * sum;
    }
    norm = Math.sqrt(norm);
    if (!(norm > 0)) break;
    for (let i = 0; i < k; i++) vector[i] = product[i] / norm;
  }
  let rayleigh = 0;
  for (let i = 0; i < k; i++) {
    let sum = 0;
    for (let j = 0; j < k; j++) sum += reduced[i * k + j] * vector[j];
    rayleigh += vector[i] * sum;
  }
  const scale = Math.sqrt(Math.max(rayleigh, 0));
  return vector.map((value) => value * scale);
}
