/**
 * The graphical lasso: a sparse estimate of the inverse covariance (precision) matrix Θ that
 * maximises the L1-penalised Gaussian log-likelihood
 *   log det Θ − tr(SΘ) − ρ Σ_{i≠j} |θ_ij|   (− ρ Σ_i θ_ii as well when the diagonal is penalised),
 * found by block coordinate descent as Friedman, Hastie & Tibshirani (2008) describe it.
 *
 * The covariance estimate W = Θ⁻¹ is updated one column at a time. For column j, with W₁₁ the
 * other rows and columns of W and s₁₂ the j-th column of S without its diagonal element, the
 * lasso problem  min_β ½ βᵀW₁₁β − βᵀs₁₂ + ρ‖β‖₁  is solved, and the column is replaced by
 * w₁₂ = W₁₁β. Each column's lasso first tries the face of its current support and signs, solved
 * exactly (W_AA β_A = s_A − ρ sign(β_A) by Cholesky), and keeps it when the signs agree and no
 * coordinate off the support violates its optimality condition; otherwise coordinate descent (a
 * soft-threshold update of one β_k at a time) moves the support, and the face is tried again
 * whenever a pass leaves the support unchanged. The diagonal of W is
 * fixed at s_jj (+ ρ when the diagonal is penalised), as in glasso. Sweeps over all columns
 * repeat until the mean absolute change of the off-diagonal of W falls below
 * GRAPHICAL_LASSO_TOLERANCE × the mean absolute off-diagonal of S (glasso's criterion, with a
 * much tighter default). At the end θ_jj = 1 / (w_jj − w₁₂ᵀβ) and θ₁₂ = −β θ_jj.
 *
 * The precision matrix returned is symmetrised: (θ_ij + θ_ji)/2. At convergence both halves
 * agree (to the tolerance) and share their zero pattern, because the optimum is symmetric.
 * Zeros are exact (they come from the soft threshold).
 *
 * Screening: the connected components of the graph {|s_ij| > ρ} are the blocks of the solution
 * (Witten, Friedman & Simon 2011; Mazumder & Hastie 2012), so each block is fitted alone, pairs
 * across blocks are exactly zero in Θ and W, and a lone item has θ_ii = 1 / w_ii. The stopping
 * rule is applied block by block (the mean change over a block's off-diagonal, which is no looser
 * than the mean over the whole matrix).
 *
 * Performance: flat Float64Arrays, one workspace allocated per call, no allocation in the
 * sweeps; `graphicalLassoWarm` continues from a previous solution, which is how a penalty path
 * is walked cheaply (qgraph's EBICglasso walks the path through glasso::glassopath, which does
 * the same). Along a path the support of most columns is already right, so most column solves
 * are one Cholesky of the active set, with no coordinate-descent pass. That active-set solve
 * (Cholesky of W_AA, the two triangular solves, wb = W₁₁β and the optimality test) runs in a
 * WebAssembly SIMD kernel (glasso-support-kernel.ts), and so do the coordinate-descent passes,
 * bit for bit the JavaScript they replaced; S, W and β are kept in the kernel's memory during a
 * call and W and β copied back to the state.
 *
 * References: Friedman, Hastie & Tibshirani 2008, "Sparse inverse covariance estimation with the
 * graphical lasso" (Biostatistics 9:432-441); Friedman, Hastie, Höfling & Tibshirani 2007,
 * "Pathwise coordinate optimization" (Annals of Applied Statistics 1:302-332), for the
 * coordinate-wise soft-threshold update; Witten, Friedman & Simon 2011, "New insights and faster
 * computations for the graphical lasso" (Journal of Computational and Graphical Statistics
 * 20:892-900) and Mazumder & Hastie 2012, "Exact covariance thresholding into connected
 * components for large-scale graphical lasso" (Journal of Machine Learning Research 13:781-794),
 * for the screening. Checked against R glasso::glasso (glasso 1.11).
 */
import { checkCovarianceMatrix } from './covariance-input';
import { glassoSupportMemory, lassoPassKernel, solveOnSupportKernel, type GlassoSupportMemory } from './glasso-support-kernel';
import {
  GRAPHICAL_LASSO_EXTRAPOLATION_RATIOS,
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
  /** Scratch list of the active (non-zero) coordinates of one column. */
  readonly active: Int32Array;
  /** Scratch of the screening: each item's block and where each block starts (the items block by block are in the kernel's memory). */
  readonly blockOf: Int32Array;
  readonly blockStart: Int32Array;
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
  return {
    order: p,
    covariance: w,
    coefficients: new Float64Array(p * p),
    active: new Int32Array(p),
    blockOf: new Int32Array(p),
    blockStart: new Int32Array(p + 1),
  };
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
  // S, W and β are worked on in the WebAssembly kernel's memory (glasso-support-kernel.ts) and W
  // and β copied back to the state at the end.
  const memory = glassoSupportMemory(p);
  memory.s.set(covariance.data);
  memory.w.set(state.covariance);
  memory.beta.set(state.coefficients);
  const { s, w, beta } = memory;

  let meanAbsoluteOffDiagonal = 0;
  for (let i = 0; i < p; i++) {
    w[i * p + i] = s[i * p + i] + (penalizeDiagonal ? penalty : 0);
    for (let j = 0; j < p; j++) if (j !== i) meanAbsoluteOffDiagonal += Math.abs(s[i * p + j]);
  }
  meanAbsoluteOffDiagonal = p > 1 ? meanAbsoluteOffDiagonal / (p * (p - 1)) : 0;
  // Scale for both stopping rules; an all-zero off-diagonal input converges in one sweep.
  const threshold = tolerance * (meanAbsoluteOffDiagonal > 0 ? meanAbsoluteOffDiagonal : 1);

  // Block-diagonal screening (Witten, Friedman & Simon 2011; Mazumder & Hastie 2012): the
  // connected components of the graph {|s_ij| > ρ} are exactly the blocks of the solution, so
  // each block is fitted on its own and every pair across blocks is zero in Θ and in W. A warm
  // state from another penalty may hold values across the new blocks: they are cleared.
  const blocks = screeningBlocks(s, p, penalty, state.blockOf, memory.members, state.blockStart);
  clearAcrossBlocks(state.blockOf, w, beta, p);

  const workspace: ColumnWorkspace = {
    memory,
    previous: new Float64Array(p * p),
    // W starts as S (or a state fitted to S) and every update writes w_kj and w_jk alike, so W stays
    // exactly symmetric when both are; the kernel then reads wb's sums along rows (same bits).
    symmetric: isExactlySymmetric(covariance.data, p) && isExactlySymmetric(state.covariance, p),
  };
  let sweeps = 0;
  let converged = true;
  for (let block = 0; block < blocks; block++) {
    const first = state.blockStart[block];
    const size = state.blockStart[block + 1] - first;
    if (size < 2) continue; // a lone item: θ_ii = 1 / w_ii, nothing to fit
    const blockSweeps = fitBlock(memory.members.subarray(first, first + size), p, penalty, threshold, maxSweeps, state.active, workspace);
    if (Math.abs(blockSweeps) > sweeps) sweeps = Math.abs(blockSweeps);
    if (blockSweeps < 0) converged = false;
  }

  state.covariance.set(w);
  state.coefficients.set(beta);
  const precision = precisionFromState(w, beta, p);
  const edges = symmetrizeAndCountEdges(precision, p);
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
 * Sweeps over the columns of one block (its members ascending) until the mean absolute change of
 * the block's off-diagonal of W is at most the threshold (glasso's criterion on this block alone:
 * a mean over the block is at least the mean over the whole matrix, so this is no looser).
 * Returns the sweeps run, negative when the sweep limit was hit first.
 */
function fitBlock(
  blockMembers: Int32Array,
  p: number,
  penalty: number,
  threshold: number,
  maxSweeps: number,
  active: Int32Array,
  workspace: ColumnWorkspace,
): number {
  const { w, beta, wb } = workspace.memory;
  const previous = workspace.previous;
  const size = blockMembers.length;
  const pairs = size * (size - 1);
  let sweeps = 0;
  let lastChange = 0;
  let lastRatio = 0;
  while (sweeps < maxSweeps) {
    sweeps++;
    for (let a = 0; a < size; a++) {
      const row = blockMembers[a] * p;
      for (let b = 0; b < size; b++) previous[row + blockMembers[b]] = w[row + blockMembers[b]];
    }
    let change = 0;
    for (let index = 0; index < size; index++) {
      const j = blockMembers[index];
      const row = j * p;
      solveColumnLasso(j, p, penalty, threshold, w, beta, wb, active, blockMembers, workspace);
      for (let t = 0; t < size; t++) {
        const k = blockMembers[t];
        if (k === j) continue;
        change += Math.abs(wb[k] - w[k * p + j]);
        w[k * p + j] = wb[k];
        w[row + k] = wb[k];
      }
    }
    if (change / pairs <= threshold) return sweeps;
    // Two sweeps in a row that shrank the change by the same ratio r: the iterates move along one
    // slow direction, and the rest of the geometric series, r / (1 − r) times the last step, is
    // added at once (Aitken's extrapolation). The sweeps then go on from there and stop by the
    // same rule, so the answer is the same fixed point; only fewer sweeps reach it.
    const ratio = lastChange > 0 ? change / lastChange : 0;
    if (
      ratio >= GRAPHICAL_LASSO_EXTRAPOLATION_RATIOS.lowest &&
      ratio <= GRAPHICAL_LASSO_EXTRAPOLATION_RATIOS.highest &&
      Math.abs(ratio - lastRatio) <= GRAPHICAL_LASSO_EXTRAPOLATION_RATIOS.agreement
    ) {
      const factor = ratio / (1 - ratio);
      for (let a = 0; a < size; a++) {
        const row = blockMembers[a] * p;
        for (let b = 0; b < size; b++) {
          if (a === b) continue;
          const index = row + blockMembers[b];
          w[index] += factor * (w[index] - previous[index]);
        }
      }
      lastChange = 0;
      lastRatio = 0;
    } else {
      lastChange = change;
      lastRatio = ratio;
    }
  }
  return -sweeps;
}

/** Zeros W and β for every pair of items in different blocks. */
function clearAcrossBlocks(blockOf: Int32Array, w: Float64Array, beta: Float64Array, p: number): void {
  for (let i = 0; i < p; i++) {
    for (let k = 0; k < p; k++) {
      if (blockOf[i] !== blockOf[k]) {
        w[i * p + k] = 0;
        beta[i * p + k] = 0;
      }
    }
  }
}

/** Replaces θ_ij and θ_ji by their mean (no −0) and returns the pairs i < j that are non-zero. */
function symmetrizeAndCountEdges(precision: Float64Array, p: number): number {
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
  return edges;
}

/** θ_jj = 1 / (w_jj − w₁₂ᵀβ) and θ₁₂ = −β θ_jj, column by column (not yet symmetrised). */
function precisionFromState(w: Float64Array, beta: Float64Array, p: number): Float64Array {
  const precision = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    const row = j * p;
    let quadratic = 0;
    for (let k = 0; k < p; k++) if (k !== j) quadratic += w[k * p + j] * beta[row + k];
    const diagonal = 1 / (w[row + j] - quadratic);
    precision[row + j] = diagonal;
    for (let k = 0; k < p; k++) if (k !== j) precision[k * p + j] = -beta[row + k] * diagonal;
  }
  return precision;
}

/**
 * What the active-set solve (`solveOnSupportKernel`) returns: FACE_NOT_TAKEN (β and wb
 * unchanged: an empty support, a sign that flips, or W_AA not numerically positive definite),
 * 1 when the face's minimum was taken but a coordinate off the support wants to enter, or
 * FACE_OPTIMAL when it is the lasso's solution (|s_k − (W₁₁β)_k| ≤ ρ off the support).
 */
const FACE_NOT_TAKEN = 0;
const FACE_OPTIMAL = 2;

/** Scratch of the columns' lassos. */
interface ColumnWorkspace {
  /** S, W, β, wb and the active-set solve's scratch, in the WebAssembly kernel's memory. */
  readonly memory: GlassoSupportMemory;
  /** W before the current sweep (the block's entries), for the extrapolation. */
  readonly previous: Float64Array;
  /** W is exactly symmetric (S and the starting state are). */
  readonly symmetric: boolean;
}

/** Whether a row-major p × p array equals its transpose bit for bit. */
function isExactlySymmetric(a: Float64Array, p: number): boolean {
  for (let i = 0; i < p; i++) for (let k = i + 1; k < p; k++) if (!Object.is(a[i * p + k], a[k * p + i])) return false;
  return true;
}

/**
 * Column j's lasso  min_β ½ βᵀW₁₁β − βᵀs₁₂ + ρ‖β‖₁  over the other members of its block, from
 * the β in `beta` (row j), leaving the solution there and wb = W₁₁β in `wb`.
 *
 * Coordinate descent passes (Friedman, Hastie, Höfling & Tibshirani 2007; `lassoPassKernel`)
 * find the support and signs; once a pass leaves the support unchanged, the optimum on that face is solved exactly:
 * β_A = W_AA⁻¹ (s_A − ρ sign(β_A)) by Cholesky (`solveOnSupportKernel`). It is taken when its
 * signs agree (then it lowers the objective, being the minimum over the face), and it is the lasso's solution when every
 * coordinate off the support meets |s_k − (W₁₁β)_k| ≤ ρ, the same test that keeps a coordinate
 * at zero in a pass. Otherwise passes go on, stopping as before when no coordinate moves by more
 * than the threshold (largest |Δβ_k| w_kk).
 */
function solveColumnLasso(
  j: number,
  p: number,
  penalty: number,
  threshold: number,
  w: Float64Array,
  beta: Float64Array,
  wb: Float64Array,
  active: Int32Array,
  blockMembers: Int32Array,
  workspace: ColumnWorkspace,
): void {
  const row = j * p;
  const size = blockMembers.length;
  // Along a penalty path and late in the sweeps the support rarely changes: try its face first.
  const first = solveOnSupportKernel(workspace.memory, j, penalty, blockMembers, workspace.symmetric);
  if (first === FACE_OPTIMAL) return;
  if (first === FACE_NOT_TAKEN) {
    // wb = W₁₁β for the current β, summed over the non-zero β only.
    let nonZero = 0;
    for (let t = 0; t < size; t++) {
      const l = blockMembers[t];
      if (l !== j && beta[row + l] !== 0) active[nonZero++] = l;
    }
    for (let t = 0; t < size; t++) {
      const k = blockMembers[t];
      if (k === j) continue;
      let sum = 0;
      const wk = k * p;
      for (let a = 0; a < nonZero; a++) {
        const l = active[a];
        sum += w[wk + l] * beta[row + l];
      }
      wb[k] = sum;
    }
  }
  let passes = 0;
  while (passes < GRAPHICAL_LASSO_MAX_INNER_PASSES) {
    passes++;
    const largestStep = lassoPassKernel(workspace.memory, j, penalty, blockMembers);
    if (largestStep <= threshold) return;
    if (workspace.memory.supportChanged[0] === 0 && solveOnSupportKernel(workspace.memory, j, penalty, blockMembers, workspace.symmetric) === FACE_OPTIMAL) return;
  }
}

/**
 * Connected components of the graph with an edge wherever |s_ij| > ρ (i ≠ j): `blockOf[i]` is
 * item i's block, `members` lists the items block by block (ascending within a block), block b
 * holding members[blockStart[b] .. blockStart[b + 1]). Returns the number of blocks.
 * References: Witten, Friedman & Simon 2011, "New insights and faster computations for the
 * graphical lasso" (Journal of Computational and Graphical Statistics 20:892-900); Mazumder &
 * Hastie 2012, "Exact covariance thresholding into connected components for large-scale
 * graphical lasso" (Journal of Machine Learning Research 13:781-794).
 */
function screeningBlocks(s: Float64Array, p: number, penalty: number, blockOf: Int32Array, members: Int32Array, blockStart: Int32Array): number {
  blockOf.fill(-1);
  let blocks = 0;
  let filled = 0;
  for (let root = 0; root < p; root++) {
    if (blockOf[root] >= 0) continue;
    blockStart[blocks] = filled;
    blockOf[root] = blocks;
    members[filled++] = root;
    // Breadth-first over the members list itself.
    for (let next = blockStart[blocks]; next < filled; next++) {
      const i = members[next];
      for (let k = 0; k < p; k++) {
        if (blockOf[k] < 0 && k !== i && Math.abs(s[i * p + k]) > penalty) {
          blockOf[k] = blocks;
          members[filled++] = k;
        }
      }
    }
    members.subarray(blockStart[blocks], filled).sort();
    blocks++;
  }
  blockStart[blocks] = filled;
  return blocks;
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
