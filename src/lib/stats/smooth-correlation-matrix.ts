/**
 * Smoothing of an indefinite correlation matrix (a pairwise or polychoric matrix with a negative
 * eigenvalue) to a positive-definite one by Bentler & Yuan's (2011) off-diagonal scaling, the
 * method Debelak & Tran (2013, 2016) found to serve polychoric matrices best.
 *
 * Step 1, minimum trace factor analysis (MTFA; Bentler 1972; Jamshidian & Bentler 1998): the
 * communalities h minimise Σ h_i subject to R − I + diag(h) ⪰ 0 and 0 ≤ h_i ≤ 2.5 (the bounds
 * Debelak & Tran used). For an indefinite R some h_i exceed 1: those items carry the
 * inconsistency (a Heywood-like excess of shared variance, typically a near-duplicate pair whose
 * polychoric r is close to 1 while its correlations with the rest disagree).
 * Step 2, scaling: every off-diagonal element in the row and column of an item with h_i ≥ 1 is
 * multiplied by sqrt(k / h_i), k = BENTLER_YUAN_SCALING_CONSTANT (.98, Bentler & Yuan's example and
 * Debelak & Tran's value); the diagonal stays 1.
 *
 * Why the result is safely positive definite (Bentler & Yuan 2011): with D the scaling and
 * M = R − I + diag(h) ⪰ 0, the smoothed matrix is D M D + diag(1 − d_i² h_i), a positive
 * semidefinite matrix plus a diagonal whose elements are 1 − k = .02 for a scaled item and
 * 1 − h_i for the others. Its smallest eigenvalue is therefore at least min(1 − k, min over
 * unscaled items of 1 − h_i) (`guaranteedFloor`), not a rounding-level 1e-8 as after an
 * eigenvalue clip or Higham's projection onto the semidefinite cone, so the inverse (VIF,
 * partial correlations, KMO) and the condition number stay on the scale of the data. Only the
 * rows of the offending items change; every other correlation is kept exactly.
 *
 * MTFA is solved here as a convex problem by a log-barrier interior-point method (Newton steps on
 * Σh − μ log det M − μ Σ log h_i − μ Σ log(2.5 − h_i), μ reduced until the duality-gap bound 3pμ
 * is below MTFA_GAP_TOLERANCE; Boyd & Vandenberghe 2004, ch. 11), instead of Debelak & Tran's
 * general SDP solver (CSDP via R's Rcsdp).
 *
 * A matrix that is positive definite, or positive semidefinite with an exact dependency (a
 * smallest eigenvalue within rounding of 0), is returned unchanged: an exact copy must stay an
 * exact dependency, reported as such, not be smoothed into a large but finite VIF.
 *
 * References: Bentler & Yuan 2011, "Positive definiteness via off-diagonal scaling of a symmetric
 * indefinite matrix" (Psychometrika 76:119-123); Debelak & Tran 2013, "Principal component
 * analysis of smoothed tetrachoric correlation matrices as a measure of dimensionality"
 * (Educational and Psychological Measurement 73:63-77); Debelak & Tran 2016, "Comparing the
 * effects of different smoothing algorithms on the assessment of dimensionality of ordered
 * categorical items with parallel analysis" (PLOS ONE 11(2):e0148143); Bentler 1972, "A lower-bound
 * method for the dimension-free measurement of internal consistency" (Social Science Research
 * 1:343-357); Boyd & Vandenberghe 2004, Convex Optimization, ch. 11.
 */
import { checkCorrelationMatrix } from './correlation-input';
import { positiveDefiniteWorkspace } from './positive-definite-kernels';
import { summarizeSpectrum } from './spectral-inverse';
import { symmetricEigenvalues } from './symmetric-eigen';
import {
  BENTLER_YUAN_SCALING_CONSTANT,
  MTFA_COMMUNALITY_UPPER_BOUND,
  MTFA_GAP_TOLERANCE,
  MTFA_MAX_NEWTON_STEPS,
  MTFA_NEWTON_DECREMENT_TOLERANCE,
} from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Options of `smoothCorrelationMatrix`. */
export interface SmoothCorrelationOptions {
  /** Bentler & Yuan's k in (0, 1) (default BENTLER_YUAN_SCALING_CONSTANT = .98). */
  readonly scalingConstant?: number;
}

/** The result of `smoothCorrelationMatrix`. */
export interface SmoothCorrelationResult {
  /** The smoothed matrix, or a copy of the input when it needed no smoothing. */
  readonly matrix: SquareMatrix;
  /** True when the input was indefinite and has been smoothed. */
  readonly smoothed: boolean;
  /** `bentler-yuan` when smoothed, else null. */
  readonly method: 'bentler-yuan' | null;
  /** MTFA communalities of the input (null when nothing was smoothed). */
  readonly communalities: Float64Array | null;
  /** Items whose rows were scaled (communality ≥ 1), 0-based. */
  readonly scaledItems: readonly number[];
  /** The k used. */
  readonly scalingConstant: number;
  /** Smallest eigenvalue of the input. */
  readonly smallestEigenvalueBefore: number;
  /** Smallest eigenvalue of the returned matrix. */
  readonly smallestEigenvalueAfter: number;
  /** Lower bound on the smoothed matrix's smallest eigenvalue that the construction guarantees (null when not smoothed). */
  readonly guaranteedFloor: number | null;
  /** Largest absolute change of any correlation. */
  readonly largestChange: number;
  /** `matrix-smoothed`; `smoothing-not-converged` if the MTFA iterations hit their limit. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Smooths an indefinite correlation matrix by Bentler & Yuan's MTFA off-diagonal scaling.
 * @param correlation Square, symmetric, unit-diagonal matrix (pairwise or polychoric); not modified.
 * @param options Bentler & Yuan's k.
 * @throws {RangeError} when the matrix is not a correlation matrix in shape, or k is not in (0, 1).
 * @throws {RangeError} when the matrix is so far from positive semidefinite (smallest eigenvalue
 *   at or below 1 − MTFA_COMMUNALITY_UPPER_BOUND) that no communality within the bound makes it so.
 * @returns The matrix to use (smoothed, or an unchanged copy), the communalities, the scaled
 *   items, the eigenvalue before and after, the guaranteed floor and notices.
 * References: Bentler & Yuan 2011, Psychometrika 76:119-123; Debelak & Tran 2016, PLOS ONE
 * 11(2):e0148143.
 */
export function smoothCorrelationMatrix(correlation: SquareMatrix, options: SmoothCorrelationOptions = {}): SmoothCorrelationResult {
  checkCorrelationMatrix(correlation, 'smoothCorrelationMatrix');
  const k = options.scalingConstant ?? BENTLER_YUAN_SCALING_CONSTANT;
  if (!(k > 0 && k < 1)) throw new RangeError(`smoothCorrelationMatrix: scalingConstant must lie in (0, 1), got ${k}`);
  const p = correlation.order;
  const eigenvaluesBefore = symmetricEigenvalues(correlation);
  const before = summarizeSpectrum(eigenvaluesBefore);
  if (!before.indefinite) {
    return {
      matrix: { order: p, data: Float64Array.from(correlation.data) },
      smoothed: false,
      method: null,
      communalities: null,
      scaledItems: [],
      scalingConstant: k,
      smallestEigenvalueBefore: before.smallest,
      smallestEigenvalueAfter: before.smallest,
      guaranteedFloor: null,
      largestChange: 0,
      notices: [],
    };
  }
  const mtfa = minimumTraceCommunalities(correlation, before.smallest);
  const h = mtfa.communalities;
  const scale = new Float64Array(p).fill(1);
  const scaledItems: number[] = [];
  let floor = 1 - k;
  for (let i = 0; i < p; i++) {
    if (h[i] >= 1) {
      scale[i] = Math.sqrt(k / h[i]);
      scaledItems.push(i);
    } else {
      floor = Math.min(floor, 1 - h[i]);
    }
  }
  const data = new Float64Array(p * p);
  let largestChange = 0;
  for (let i = 0; i < p; i++) {
    data[i * p + i] = 1;
    for (let j = i + 1; j < p; j++) {
      const value = correlation.data[i * p + j] * scale[i] * scale[j];
      data[i * p + j] = value;
      data[j * p + i] = value;
      largestChange = Math.max(largestChange, Math.abs(value - correlation.data[i * p + j]));
    }
  }
  const matrix: SquareMatrix = { order: p, data };
  const after = symmetricEigenvalues(matrix);
  const notices: NumericalNotice[] = [
    {
      code: 'matrix-smoothed',
      items: scaledItems,
      message: `The correlation matrix was not positive semi-definite (smallest eigenvalue ${before.smallest.toPrecision(3)}); the correlations of ${scaledItems.length} item(s) were scaled down by Bentler and Yuan's minimum-trace smoothing (largest change ${largestChange.toPrecision(3)}; smallest eigenvalue now ${after[p - 1].toPrecision(3)}).`,
    },
  ];
  if (!mtfa.converged) {
    notices.push({
      code: 'smoothing-not-converged',
      items: [],
      message: 'The minimum-trace factor analysis behind the smoothing stopped at its step limit; the smoothed matrix is positive definite but its communalities may not be the minimal ones.',
    });
  }
  return {
    matrix,
    smoothed: true,
    method: 'bentler-yuan',
    communalities: h,
    scaledItems,
    scalingConstant: k,
    smallestEigenvalueBefore: before.smallest,
    smallestEigenvalueAfter: after[p - 1],
    guaranteedFloor: floor,
    largestChange,
    notices,
  };
}

/** Result of the MTFA solve. */
export interface MinimumTraceResult {
  /** Communalities h (each in [0, MTFA_COMMUNALITY_UPPER_BOUND]). */
  readonly communalities: Float64Array;
  /** Σ h (the minimum trace). */
  readonly trace: number;
  /** Newton steps taken. */
  readonly newtonSteps: number;
  /** True when the duality-gap bound reached MTFA_GAP_TOLERANCE. */
  readonly converged: boolean;
}

/**
 * Minimum trace factor analysis communalities with bounds 0 ≤ h_i ≤ MTFA_COMMUNALITY_UPPER_BOUND:
 * minimise Σ h_i subject to R − I + diag(h) ⪰ 0, by a log-barrier interior-point method.
 * @param correlation Square symmetric unit-diagonal matrix (checked by the caller or here).
 * @param smallestEigenvalue Its smallest eigenvalue, if already known (else computed).
 * @throws {RangeError} when the matrix is not a correlation matrix in shape, or when its smallest
 *   eigenvalue is at or below 1 − MTFA_COMMUNALITY_UPPER_BOUND (no feasible communalities).
 * @returns The communalities, their sum, the Newton steps and convergence.
 * References: Bentler 1972, "A lower-bound method for the dimension-free measurement of internal
 * consistency"; Jamshidian & Bentler 1998, "A quasi-Newton method for minimum trace factor
 * analysis" (Journal of Statistical Computation and Simulation 62:73-89); Boyd & Vandenberghe
 * 2004, Convex Optimization, §11.3 (the barrier method).
 */
export function minimumTraceCommunalities(correlation: SquareMatrix, smallestEigenvalue?: number): MinimumTraceResult {
  checkCorrelationMatrix(correlation, 'minimumTraceCommunalities');
  const p = correlation.order;
  const r = correlation.data;
  const upper = MTFA_COMMUNALITY_UPPER_BOUND;
  const lambdaMin = smallestEigenvalue ?? symmetricEigenvalues(correlation)[p - 1];
  const needed = 1 - lambdaMin;
  if (!(needed < upper)) {
    throw new RangeError(
      `minimumTraceCommunalities: the smallest eigenvalue ${lambdaMin.toPrecision(3)} is too negative for communalities below ${upper}; the matrix is not a usable correlation matrix`,
    );
  }
  // Strictly feasible start: every h_i halfway between the feasibility edge and the bound.
  const h = new Float64Array(p).fill((Math.max(needed, 0) + upper) / 2);
  const trial = new Float64Array(p);
  // The factorisations, the inverse and the solve run in the positive-definite kernels
  // (WebAssembly SIMD, bit for bit the plain loops); they read the upper triangle, so R enters as
  // its transpose (R is symmetric only within SYMMETRY_TOLERANCE) and the Hessian is written
  // transposed: the elements used are those of the lower triangles, as before.
  const transposed = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) transposed[j * p + i] = r[i * p + j];
  const workspace = positiveDefiniteWorkspace(p, 3, 2);
  const [m, inverse, hessian] = workspace.matrices;
  const [gradient, step] = workspace.vectors;

  // `m` holds the factor of M(h) while `factorOfH` is true. Factoring the same M again gives the
  // same bits, so the objective at h reuses the factor of the step's inverse, and the factor of
  // the accepted trial point becomes the next step's.
  let factorOfH = false;
  let trialFactored = false;
  const barrier = (values: Float64Array, mu: number, logDet: number): number => {
    let sum = 0;
    for (let i = 0; i < p; i++) sum += values[i] - mu * (Math.log(values[i]) + Math.log(upper - values[i]));
    return sum - mu * logDet;
  };
  const inBounds = (values: Float64Array): boolean => {
    for (let i = 0; i < p; i++) {
      if (!(values[i] > 0 && values[i] < upper)) return false;
    }
    return true;
  };
  /** The barrier objective at a trial point, factoring M there into `m`. */
  const objective = (values: Float64Array, mu: number): number => {
    trialFactored = false;
    if (!inBounds(values)) return Number.POSITIVE_INFINITY;
    buildM(transposed, values, p, m);
    if (!workspace.factorInPlace(m)) return Number.POSITIVE_INFINITY;
    trialFactored = true;
    return barrier(values, mu, workspace.logDeterminantFromFactor(m));
  };

  // Barrier method settings (Boyd & Vandenberghe 2004, §11.3: any start μ > 0 and reduction
  // factor in (0, 1) converge; these keep each centring to a few Newton steps). Armijo slope 0.25
  // and step halving as in §9.2. Algorithm settings, not tolerances.
  let mu = 0.1;
  let newtonSteps = 0;
  let converged = false;
  const gapFactor = 3 * p;
  outer: while (newtonSteps < MTFA_MAX_NEWTON_STEPS) {
    // Centre for this μ by damped Newton steps.
    for (;;) {
      if (newtonSteps >= MTFA_MAX_NEWTON_STEPS) break outer;
      if (!factorOfH) {
        buildM(transposed, h, p, m);
        if (!workspace.factorInPlace(m)) break outer; // cannot happen from a feasible point
        factorOfH = true;
      }
      // Only the lower triangle of M⁻¹ is used (its diagonal for the gradient, its squares for the Hessian).
      workspace.lowerInverseFromFactor(m, inverse);
      // Hessian element (i, j) = μ·inverse[i][j]² for j ≤ i, at (j, i): the upper triangle the
      // factor reads.
      workspace.scaledSquaresIntoUpper(inverse, hessian, mu);
      for (let i = 0; i < p; i++) {
        gradient[i] = 1 - mu * inverse[i * p + i] - mu / h[i] + mu / (upper - h[i]);
        hessian[i * p + i] += mu / (h[i] * h[i]) + mu / ((upper - h[i]) * (upper - h[i]));
      }
      if (!workspace.factorInPlace(hessian)) break outer;
      workspace.solveFromFactor(hessian, gradient, step);
      let decrement = 0;
      for (let i = 0; i < p; i++) {
        step[i] = -step[i];
        decrement -= gradient[i] * step[i];
      }
      newtonSteps++;
      if (decrement / 2 <= MTFA_NEWTON_DECREMENT_TOLERANCE) break;
      const current = inBounds(h) ? barrier(h, mu, workspace.logDeterminantFromFactor(m)) : Number.POSITIVE_INFINITY;
      let t = 1;
      for (let halving = 0; halving < 60; halving++) {
        for (let i = 0; i < p; i++) trial[i] = h[i] + t * step[i];
        if (objective(trial, mu) <= current - 0.25 * t * decrement) break;
        t /= 2;
      }
      h.set(trial);
      factorOfH = trialFactored;
      if (t * t * decrement <= MTFA_NEWTON_DECREMENT_TOLERANCE) break;
    }
    if (gapFactor * mu <= MTFA_GAP_TOLERANCE) {
      converged = true;
      break;
    }
    mu *= 0.2;
  }
  let trace = 0;
  for (let i = 0; i < p; i++) trace += h[i];
  return { communalities: h, trace, newtonSteps, converged };
}

/** M = R − I + diag(h), from R (or its transpose: the diagonal is the same). */
function buildM(r: Float64Array, h: Float64Array, p: number, out: Float64Array): void {
  out.set(r.subarray(0, p * p));
  for (let i = 0; i < p; i++) out[i * p + i] = r[i * p + i] - 1 + h[i];
}
