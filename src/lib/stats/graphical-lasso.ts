/**
 * The graphical lasso: a sparse estimate of the inverse covariance (precision) matrix Θ that
 * maximises the L1-penalised Gaussian log-likelihood
 *   log det Θ − tr(SΘ) − ρ Σ_{i≠j} |θ_ij|   (− ρ Σ_i θ_ii as well when the diagonal is penalised),
 * found by block coordinate descent as Friedman, Hastie & Tibshirani (2008) describe it.
 *
 * The covariance estimate W = Θ⁻¹ is updated one column at a time. For column j, with W₁₁ the
 * other rows and columns of W and s₁₂ the j-th column of S without its diagonal element, the
 * lasso problem  min_β ½ βᵀW₁₁β − βᵀs₁₂ + ρ‖β‖₁  is solved by coordinate descent (a soft-threshold
 * update of one β_k at a time), and the column is replaced by w₁₂ = W₁₁β. The diagonal of W is
 * fixed at s_jj (+ ρ when the diagonal is penalised), as in glasso. Sweeps over all columns
 * repeat until the mean absolute change of the off-diagonal of W falls below
 * GRAPHICAL_LASSO_TOLERANCE × the mean absolute off-diagonal of S (glasso's criterion, with a
 * much tighter default). At the end θ_jj = 1 / (w_jj − w₁₂ᵀβ) and θ₁₂ = −β θ_jj.
 *
 * The precision matrix returned is symmetrised: (θ_ij + θ_ji)/2. At convergence both halves
 * agree (to the tolerance) and share their zero pattern, because the optimum is symmetric.
 * Zeros are exact (they come from the soft threshold).
 *
 * Performance: flat Float64Arrays, one workspace allocated per call, no allocation in the
 * sweeps; `graphicalLassoWarm` continues from a previous solution, which is how a penalty path
 * is walked cheaply (qgraph's EBICglasso walks the path through glasso::glassopath, which does
 * the same).
 *
 * References: Friedman, Hastie & Tibshirani 2008, "Sparse inverse covariance estimation with the
 * graphical lasso" (Biostatistics 9:432-441); Friedman, Hastie, Höfling & Tibshirani 2007,
 * "Pathwise coordinate optimization" (Annals of Applied Statistics 1:302-332), for the
 * coordinate-wise soft-threshold update. Checked against R glasso::glasso (glasso 1.11).
 */
import { checkCovarianceMatrix } from './covariance-input';
import {
  GRAPHICAL_LASSO_MAX_INNER_PASSES,
  GRAPHICAL_LASSO_MAX_SWEEPS,
  GRAPHICAL_LASSO_TOLERANCE,
  ZERO_VARIANCE_RELATIVE_TOLERANCE,
} from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Options of `graphicalLasso`. */
export interface GraphicalLassoOptions {
  /**
   * Penalise the diagonal of Θ as well (glasso's `penalize.diagonal`). Default false, as
   * qgraph::EBICglasso calls glasso.
   */
  readonly penalizeDiagonal?: boolean;
  /** Relative convergence threshold (default GRAPHICAL_LASSO_TOLERANCE), > 0. */
  readonly tolerance?: number;
  /** Sweep limit (default GRAPHICAL_LASSO_MAX_SWEEPS), a positive integer. */
  readonly maxSweeps?: number;
}

/** The result of `graphicalLasso`. Arrays are fresh and owned by the caller. */
export interface GraphicalLassoResult {
  /** The penalty ρ used. */
  readonly penalty: number;
  /** Estimated precision matrix Θ (symmetrised, exact zeros off the diagonal where the lasso set them). */
  readonly precision: SquareMatrix;
  /** Estimated covariance matrix W = Θ⁻¹ (glasso's `w`). */
  readonly covariance: SquareMatrix;
  /** Sweeps over all columns that were run. */
  readonly sweeps: number;
  /** True when the last sweep met the tolerance. */
  readonly converged: boolean;
  /** Pairs i < j with θ_ij ≠ 0 (the edges of the network). */
  readonly edges: number;
  /** `not-converged` when the sweep limit was hit. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Working state of a graphical-lasso fit, reusable along a penalty path. Treat as opaque: the
 * fields are the covariance estimate W (row-major) and the lasso coefficients (row j holds the
 * β of column j), both of order `order`.
 */
export interface GraphicalLassoState {
  readonly order: number;
  readonly covariance: Float64Array;
  readonly coefficients: Float64Array;
  /** Scratch vector W₁₁β of one column. */
  readonly product: Float64Array;
  /** Scratch list of the active (non-zero) coordinates of one column. */
  readonly active: Int32Array;
}

/**
 * Graphical lasso estimate of a sparse precision matrix from a covariance or correlation matrix.
 * @param covariance Symmetric input S (a covariance or correlation matrix) with positive
 *   diagonal; not modified. It need not be positive definite when ρ > 0.
 * @param penalty The L1 penalty ρ ≥ 0 on the off-diagonal of Θ (and on the diagonal if
 *   `penalizeDiagonal`). ρ = 0 gives the plain inverse, which needs S positive definite.
 * @param options Diagonal penalty, tolerance, sweep limit.
 * @throws {RangeError} when S is not a finite symmetric matrix or a diagonal element is not
 *   positive.
 * @throws {RangeError} when the penalty is negative or not finite, the tolerance not positive or
 *   the sweep limit not a positive integer.
 * @returns Θ, W, sweeps, convergence and the number of edges.
 * References: Friedman, Hastie & Tibshirani 2008, "Sparse inverse covariance estimation with the
 * graphical lasso", Biostatistics 9:432-441.
 */
export function graphicalLasso(covariance: SquareMatrix, penalty: number, options: GraphicalLassoOptions = {}): GraphicalLassoResult {
  checkGraphicalLassoInput(covariance, penalty, options, 'graphicalLasso');
  const state = createGraphicalLassoState(covariance, penalty, options.penalizeDiagonal ?? false);
  return graphicalLassoWarm(covariance, penalty, state, options);
}

/**
 * A cold-start state for `graphicalLassoWarm`: W = S (with ρ added to the diagonal when the
 * diagonal is penalised) and every β zero, as glasso starts.
 * @param covariance The input S (checked by the caller); not modified.
 * @param penalty The penalty ρ of the first fit.
 * @param penalizeDiagonal Whether the diagonal is penalised.
 * @throws {RangeError} when S is not square.
 * @returns A fresh state.
 * References: Friedman, Hastie & Tibshirani 2008 (the starting value W = S + ρI).
 */
export function createGraphicalLassoState(covariance: SquareMatrix, penalty: number, penalizeDiagonal: boolean): GraphicalLassoState {
  const p = covariance.order;
  if (covariance.data.length !== p * p) throw new RangeError(`createGraphicalLassoState: expected ${p * p} values for order ${p}, got ${covariance.data.length}`);
  const w = Float64Array.from(covariance.data);
  if (penalizeDiagonal) for (let i = 0; i < p; i++) w[i * p + i] += penalty;
  return { order: p, covariance: w, coefficients: new Float64Array(p * p), product: new Float64Array(p), active: new Int32Array(p) };
}

/**
 * Graphical lasso continued from a previous state (a warm start along a penalty path). The
 * state is updated in place and the result copies what it needs, so the state can be passed to
 * the next penalty. The diagonal of W is reset to s_jj (+ ρ) for the new penalty.
 * @param covariance The input S; not modified.
 * @param penalty The penalty ρ ≥ 0.
 * @param state A state from `createGraphicalLassoState` (or a previous call) of the same order.
 * @param options Diagonal penalty, tolerance, sweep limit.
 * @throws {RangeError} on the same input conditions as `graphicalLasso`, or a state of another order.
 * @returns As `graphicalLasso`.
 * References: Friedman, Hastie & Tibshirani 2008, "Sparse inverse covariance estimation with the
 * graphical lasso", Biostatistics 9:432-441.
 */
export function graphicalLassoWarm(
  covariance: SquareMatrix,
  penalty: number,
  state: GraphicalLassoState,
  options: GraphicalLassoOptions = {},
): GraphicalLassoResult {
  checkGraphicalLassoInput(covariance, penalty, options, 'graphicalLassoWarm');
  const p = covariance.order;
  if (state.order !== p) throw new RangeError(`graphicalLassoWarm: the state has order ${state.order}, the matrix ${p}`);
  const penalizeDiagonal = options.penalizeDiagonal ?? false;
  const tolerance = options.tolerance ?? GRAPHICAL_LASSO_TOLERANCE;
  const maxSweeps = options.maxSweeps ?? GRAPHICAL_LASSO_MAX_SWEEPS;
  const s = covariance.data;
  const w = state.covariance;
  const beta = state.coefficients;
  const wb = state.product;
  const active = state.active;

  let meanAbsoluteOffDiagonal = 0;
  for (let i = 0; i < p; i++) {
    w[i * p + i] = s[i * p + i] + (penalizeDiagonal ? penalty : 0);
    for (let j = 0; j < p; j++) if (j !== i) meanAbsoluteOffDiagonal += Math.abs(s[i * p + j]);
  }
  meanAbsoluteOffDiagonal = p > 1 ? meanAbsoluteOffDiagonal / (p * (p - 1)) : 0;
  // Scale for both stopping rules; an all-zero off-diagonal input converges in one sweep.
  const threshold = tolerance * (meanAbsoluteOffDiagonal > 0 ? meanAbsoluteOffDiagonal : 1);

  let sweeps = 0;
  let converged = p < 2;
  while (!converged && sweeps < maxSweeps) {
    sweeps++;
    let change = 0;
    for (let j = 0; j < p; j++) {
      const row = j * p;
      // wb = W₁₁β for the current β of column j (k ≠ j), summed over the non-zero β only, in
      // ascending order: a zero term adds ±0, so the sum is bit for bit the full one.
      let nonZero = 0;
      for (let l = 0; l < p; l++) if (l !== j && beta[row + l] !== 0) active[nonZero++] = l;
      for (let k = 0; k < p; k++) {
        if (k === j) continue;
        let sum = 0;
        const wk = k * p;
        for (let t = 0; t < nonZero; t++) {
          const l = active[t];
          sum += w[wk + l] * beta[row + l];
        }
        wb[k] = sum;
      }
      // Coordinate descent with an active set (Friedman, Hastie, Höfling & Tibshirani 2007): a
      // full pass over every coordinate, then passes over the non-zero ones only until they
      // settle, then a full pass again to check that no other coordinate wants to enter.
      let passes = 0;
      while (passes < GRAPHICAL_LASSO_MAX_INNER_PASSES) {
        passes++;
        if (lassoPass(j, p, penalty, s, w, beta, wb, active, p) <= threshold) break;
        let activeCount = 0;
        for (let k = 0; k < p; k++) if (k !== j && beta[row + k] !== 0) active[activeCount++] = k;
        while (passes < GRAPHICAL_LASSO_MAX_INNER_PASSES) {
          passes++;
          if (lassoPass(j, p, penalty, s, w, beta, wb, active, activeCount) <= threshold) break;
        }
      }
      for (let k = 0; k < p; k++) {
        if (k === j) continue;
        change += Math.abs(wb[k] - w[k * p + j]);
        w[k * p + j] = wb[k];
        w[row + k] = wb[k];
      }
    }
    if (change / (p * (p - 1)) <= threshold) converged = true;
  }

  const precision = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    const row = j * p;
    let quadratic = 0;
    for (let k = 0; k < p; k++) if (k !== j) quadratic += w[k * p + j] * beta[row + k];
    const diagonal = 1 / (w[row + j] - quadratic);
    precision[row + j] = diagonal;
    for (let k = 0; k < p; k++) if (k !== j) precision[k * p + j] = -beta[row + k] * diagonal;
  }
  let edges = 0;
  for (let i = 0; i < p; i++) {
    for (let j = i + 1; j < p; j++) {
      const sum = 0.5 * (precision[i * p + j] + precision[j * p + i]);
      const value = sum === 0 ? 0 : sum; // no −0 from −β·θ_jj
      precision[i * p + j] = value;
      precision[j * p + i] = value;
      if (value !== 0) edges++;
    }
  }
  const notices: NumericalNotice[] = [];
  if (!converged) {
    notices.push({
      code: 'not-converged',
      items: [],
      message: `The graphical lasso did not settle within ${maxSweeps} sweeps at penalty ${penalty}; the estimate is the last iterate.`,
    });
  }
  return {
    penalty,
    precision: { order: p, data: precision },
    covariance: { order: p, data: Float64Array.from(w) },
    sweeps,
    converged,
    edges,
    notices,
  };
}

/**
 * One coordinate-descent pass of column j's lasso over the coordinates `active[0..count)` (or
 * over every coordinate when count = p and `active` is ignored), updating β and wb = W₁₁β.
 * Returns the largest |Δβ_k| w_kk of the pass.
 */
function lassoPass(
  j: number,
  p: number,
  penalty: number,
  s: Float64Array,
  w: Float64Array,
  beta: Float64Array,
  wb: Float64Array,
  active: Int32Array,
  count: number,
): number {
  const row = j * p;
  const full = count === p;
  let largestStep = 0;
  for (let index = 0; index < count; index++) {
    const k = full ? index : active[index];
    if (k === j) continue;
    const wk = k * p;
    const wkk = w[wk + k];
    const old = beta[row + k];
    const partial = s[wk + j] - wb[k] + wkk * old;
    const updated = partial > penalty ? (partial - penalty) / wkk : partial < -penalty ? (partial + penalty) / wkk : 0;
    if (updated !== old) {
      const delta = updated - old;
      beta[row + k] = updated;
      for (let l = 0; l < p; l++) wb[l] += w[wk + l] * delta;
      const step = Math.abs(delta) * wkk;
      if (step > largestStep) largestStep = step;
    }
  }
  return largestStep;
}

function checkGraphicalLassoInput(covariance: SquareMatrix, penalty: number, options: GraphicalLassoOptions, caller: string): void {
  checkCovarianceMatrix(covariance, caller);
  const p = covariance.order;
  let largest = 0;
  for (let i = 0; i < p; i++) largest = Math.max(largest, covariance.data[i * p + i]);
  for (let i = 0; i < p; i++) {
    if (!(covariance.data[i * p + i] > ZERO_VARIANCE_RELATIVE_TOLERANCE * largest) || !(largest > 0)) {
      throw new RangeError(`${caller}: the variance of item ${i} is zero; exclude constant items before fitting a network`);
    }
  }
  if (!Number.isFinite(penalty) || penalty < 0) throw new RangeError(`${caller}: the penalty must be a finite number >= 0, got ${penalty}`);
  const tolerance = options.tolerance ?? GRAPHICAL_LASSO_TOLERANCE;
  if (!(tolerance > 0)) throw new RangeError(`${caller}: tolerance must be positive, got ${tolerance}`);
  const maxSweeps = options.maxSweeps ?? GRAPHICAL_LASSO_MAX_SWEEPS;
  if (!Number.isInteger(maxSweeps) || maxSweeps < 1) throw new RangeError(`${caller}: maxSweeps must be a positive integer, got ${maxSweeps}`);
}
