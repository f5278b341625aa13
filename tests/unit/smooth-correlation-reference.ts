/**
 * The reference for the tests of smooth-correlation-matrix.ts (not a module under test): the
 * minimum-trace factor analysis as it was before its linear algebra moved to the WebAssembly
 * positive-definite kernels (commit 11149ab), plain JavaScript loops throughout, renamed
 * `...Plain`. The module must give bit for bit these results (communalities, trace, Newton
 * steps); the scaling around them is unchanged code.
 */
import { checkCorrelationMatrix } from '../../src/lib/stats/correlation-input';
import { symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import {
  MTFA_COMMUNALITY_UPPER_BOUND,
  MTFA_GAP_TOLERANCE,
  MTFA_MAX_NEWTON_STEPS,
  MTFA_NEWTON_DECREMENT_TOLERANCE,
} from '../../src/lib/stats/tolerances';
import type { SquareMatrix } from '../../src/lib/stats/types';

/** Result of the MTFA solve. */
interface MinimumTraceResult {
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
export function minimumTraceCommunalitiesPlain(correlation: SquareMatrix, smallestEigenvalue?: number): MinimumTraceResult {
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
  const m = new Float64Array(p * p);
  const inverse = new Float64Array(p * p);
  const hessian = new Float64Array(p * p);
  const gradient = new Float64Array(p);
  const step = new Float64Array(p);
  const trial = new Float64Array(p);
  const work = new Float64Array(p * p);

  const objective = (values: Float64Array, mu: number): number => {
    for (let i = 0; i < p; i++) {
      if (!(values[i] > 0 && values[i] < upper)) return Number.POSITIVE_INFINITY;
    }
    buildM(r, values, p, work);
    const logDet = choleskyLogDet(work, p);
    if (Number.isNaN(logDet)) return Number.POSITIVE_INFINITY;
    let sum = 0;
    for (let i = 0; i < p; i++) sum += values[i] - mu * (Math.log(values[i]) + Math.log(upper - values[i]));
    return sum - mu * logDet;
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
      buildM(r, h, p, m);
      if (!invertPositiveDefinite(m, p, inverse, work)) break outer; // cannot happen from a feasible point
      for (let i = 0; i < p; i++) {
        gradient[i] = 1 - mu * inverse[i * p + i] - mu / h[i] + mu / (upper - h[i]);
        for (let j = 0; j < p; j++) {
          const value = inverse[i * p + j];
          hessian[i * p + j] = mu * value * value;
        }
        hessian[i * p + i] += mu / (h[i] * h[i]) + mu / ((upper - h[i]) * (upper - h[i]));
      }
      if (!solvePositiveDefinite(hessian, gradient, p, step, work)) break outer;
      let decrement = 0;
      for (let i = 0; i < p; i++) {
        step[i] = -step[i];
        decrement -= gradient[i] * step[i];
      }
      newtonSteps++;
      if (decrement / 2 <= MTFA_NEWTON_DECREMENT_TOLERANCE) break;
      const current = objective(h, mu);
      let t = 1;
      for (let halving = 0; halving < 60; halving++) {
        for (let i = 0; i < p; i++) trial[i] = h[i] + t * step[i];
        if (objective(trial, mu) <= current - 0.25 * t * decrement) break;
        t /= 2;
      }
      h.set(trial);
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

/** M = R − I + diag(h). */
function buildM(r: Float64Array, h: Float64Array, p: number, out: Float64Array): void {
  out.set(r.subarray(0, p * p));
  for (let i = 0; i < p; i++) out[i * p + i] = r[i * p + i] - 1 + h[i];
}

/** In-place lower Cholesky factor of a (row-major, full) matrix; false when not positive definite. */
export function choleskyInPlace(a: Float64Array, p: number): boolean {
  for (let j = 0; j < p; j++) {
    let diagonal = a[j * p + j];
    for (let k = 0; k < j; k++) diagonal -= a[j * p + k] * a[j * p + k];
    if (!(diagonal > 0)) return false;
    const root = Math.sqrt(diagonal);
    a[j * p + j] = root;
    for (let i = j + 1; i < p; i++) {
      let sum = a[i * p + j];
      for (let k = 0; k < j; k++) sum -= a[i * p + k] * a[j * p + k];
      a[i * p + j] = sum / root;
    }
  }
  return true;
}

/** log det by Cholesky of `a` (overwritten); NaN when not positive definite. */
function choleskyLogDet(a: Float64Array, p: number): number {
  if (!choleskyInPlace(a, p)) return Number.NaN;
  let sum = 0;
  for (let i = 0; i < p; i++) sum += 2 * Math.log(a[i * p + i]);
  return sum;
}

/** Solves A x = b for positive-definite A (not modified) through its Cholesky factor in `work`. */
function solvePositiveDefinite(a: Float64Array, b: Float64Array, p: number, x: Float64Array, work: Float64Array): boolean {
  work.set(a.subarray(0, p * p));
  if (!choleskyInPlace(work, p)) return false;
  solveWithLowerFactor(work, b, p, x);
  return true;
}

/** Solves L Lᵀ x = b from the lower factor L (row-major, lower triangle read): forward, then backward. */
export function solveWithLowerFactor(factor: Float64Array, b: Float64Array, p: number, x: Float64Array): void {
  for (let i = 0; i < p; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= factor[i * p + k] * x[k];
    x[i] = sum / factor[i * p + i];
  }
  for (let i = p - 1; i >= 0; i--) {
    let sum = x[i];
    for (let k = i + 1; k < p; k++) sum -= factor[k * p + i] * x[k];
    x[i] = sum / factor[i * p + i];
  }
}

/**
 * Inverse of a positive-definite matrix (not modified) into `out`, by Cholesky in `work`: L y = e_c
 * forward, then Lᵀ x = y backward, for every column c at once. Row by row, each step subtracts
 * one multiple of an earlier row from a running row (`sums`), so the products of each element are
 * subtracted in the order of the column-by-column substitutions (k ascending), giving the same
 * bits with contiguous inner loops. In the forward solve y_kc = 0 for k < c: those terms (±0,
 * which leave a sum unchanged) are skipped.
 */
function invertPositiveDefinite(a: Float64Array, p: number, out: Float64Array, work: Float64Array): boolean {
  work.set(a.subarray(0, p * p));
  if (!choleskyInPlace(work, p)) return false;
  const sums = new Float64Array(p);
  // Forward: row i of Y = L⁻¹ (lower triangular) into out.
  for (let i = 0; i < p; i++) {
    sums.fill(0, 0, i + 1);
    sums[i] = 1;
    for (let k = 0; k < i; k++) {
      const factor = work[i * p + k];
      const row = k * p;
      for (let c = 0; c <= k; c++) sums[c] -= factor * out[row + c];
    }
    const diagonal = work[i * p + i];
    for (let c = 0; c <= i; c++) out[i * p + c] = sums[c] / diagonal;
    for (let c = i + 1; c < p; c++) out[i * p + c] = 0;
  }
  // Backward: row i of X = L⁻ᵀ Y, from the last row up, over rows of Y already replaced by X.
  for (let i = p - 1; i >= 0; i--) {
    const row = i * p;
    for (let c = 0; c < p; c++) sums[c] = out[row + c];
    for (let k = i + 1; k < p; k++) {
      const factor = work[k * p + i];
      const later = k * p;
      for (let c = 0; c < p; c++) sums[c] -= factor * out[later + c];
    }
    const diagonal = work[row + i];
    for (let c = 0; c < p; c++) out[row + c] = sums[c] / diagonal;
  }
  return true;
}
