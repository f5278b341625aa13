/**
 * A regularised partial-correlation network: the graphical lasso fitted along a path of
 * penalties, the penalty chosen by the extended Bayesian information criterion (EBIC), exactly
 * as qgraph::EBICglasso does it by default (qgraph 1.9.3, read from its source):
 * - S is scaled to a correlation matrix (cov2cor);
 * - λ_max = the largest |s_ij| off the diagonal, λ_min = 0.01 λ_max, and 100 penalties
 *   log-spaced from λ_min to λ_max (ascending, as qgraph stores them);
 * - the graphical lasso at each penalty with the diagonal not penalised;
 * - EBIC(λ) = −2 ℓ + E log n + 4 E γ log p, with ℓ = n/2 (log det Θ − tr(ΘS)), E the number of
 *   non-zero θ_ij with i > j, and γ = 0.5;
 * - the smallest EBIC wins (the first one on ties, as R's which.min), and the network is the
 *   partial-correlation matrix of that Θ: −θ_ij / sqrt(θ_ii θ_jj), zero diagonal. No refit and
 *   no thresholding (EBICglasso's defaults refit = FALSE, threshold = FALSE).
 * The path is walked from the largest penalty down with warm starts at EBIC_PATH_TOLERANCE (1e-7,
 * against glasso's default 1e-4), and the selected penalty is then refitted, from its own fit on
 * the path, to GRAPHICAL_LASSO_TOLERANCE, so the network returned is the optimum itself: it matches
 * EBICglasso with thr = 1e-12 to about 1e-11, and EBICglasso's default call to glasso's
 * stopping error there (about 1e-5 on the partial correlations).
 *
 * References: Foygel & Drton 2010, "Extended Bayesian information criteria for Gaussian
 * graphical models" (Advances in Neural Information Processing Systems 23:604-612); Friedman,
 * Hastie & Tibshirani 2008, "Sparse inverse covariance estimation with the graphical lasso"
 * (Biostatistics 9:432-441); Epskamp & Fried 2018, "A tutorial on regularized partial
 * correlation networks" (Psychological Methods 23:617-634), which describes EBICglasso.
 */
import { createGraphicalLassoState, graphicalLassoWarm } from './graphical-lasso';
import { checkCovarianceMatrix } from './covariance-input';
import { symmetricEigenvalues } from './symmetric-eigen';
import {
  EBIC_DENSE_PENALTY_RATIO,
  EBIC_GAMMA,
  EBIC_MINIMUM_PENALTY_RATIO,
  EBIC_PATH_TOLERANCE,
  EBIC_PENALTY_COUNT,
  EXACT_DEPENDENCY_RELATIVE_EIGENVALUE,
  GRAPHICAL_LASSO_TOLERANCE,
} from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Options of `ebicGlasso`. */
export interface EbicGlassoOptions {
  /** EBIC tuning parameter γ ≥ 0 (default EBIC_GAMMA = 0.5). */
  readonly gamma?: number;
  /** Penalties on the path (default EBIC_PENALTY_COUNT = 100), an integer ≥ 2. */
  readonly penaltyCount?: number;
  /** Smallest penalty as a share of the largest (default EBIC_MINIMUM_PENALTY_RATIO = 0.01), in (0, 1). */
  readonly minimumPenaltyRatio?: number;
  /** Graphical-lasso tolerance along the path (default EBIC_PATH_TOLERANCE), > 0. */
  readonly pathTolerance?: number;
  /** Graphical-lasso tolerance of the final refit at the selected penalty (default GRAPHICAL_LASSO_TOLERANCE), > 0. */
  readonly tolerance?: number;
  /** Called after each penalty of the path with the penalties fitted and their count (for a progress bar). */
  readonly onPenalty?: (done: number, total: number) => void;
}

/** The result of `ebicGlasso`. */
export interface EbicGlassoResult {
  /** Signed partial correlations of the selected Θ, zero diagonal (qgraph's network). */
  readonly partialCorrelations: SquareMatrix;
  /** |partial correlations|, zero diagonal: the weights a in the weighted topological overlap. */
  readonly absoluteNetwork: SquareMatrix;
  /** Selected precision matrix Θ (of the correlation-scaled input). */
  readonly precision: SquareMatrix;
  /** The selected penalty λ. */
  readonly penalty: number;
  /** Index of the selected penalty in `penalties` (0-based; R's which.min minus 1). */
  readonly selectedIndex: number;
  /** Every penalty, ascending (as qgraph stores them). */
  readonly penalties: Float64Array;
  /** EBIC at each penalty (same order). */
  readonly ebic: Float64Array;
  /** Edges (non-zero partial correlations, i < j) at each penalty. */
  readonly edges: Int32Array;
  /** Edges of the selected network. */
  readonly selectedEdges: number;
  /** False when a fit on the path hit the sweep limit. */
  readonly converged: boolean;
  /**
   * `lowest-penalty-selected` (sparsity may not hold), `empty-network`, `dense-network`
   * (λ < 0.1 λ_max, qgraph's warning), `not-converged`.
   */
  readonly notices: readonly NumericalNotice[];
}

/**
 * EBIC-selected graphical-lasso partial-correlation network of a correlation (or covariance) matrix.
 * @param matrix Correlation or covariance matrix S: symmetric, finite, positive diagonal, and
 *   positive definite (as qgraph requires: the EBIC's log-likelihood needs it). Smooth an
 *   indefinite pairwise or polychoric matrix first (`smoothCorrelationMatrix`). Not modified.
 * @param sampleSize Respondents n behind S (for the EBIC), an integer ≥ 2.
 * @param options γ, the path length and its smallest ratio, the tolerance.
 * @throws {RangeError} when S is not a finite symmetric matrix with positive diagonal, has fewer
 *   than two items, or is not positive definite (smallest eigenvalue ≤
 *   EXACT_DEPENDENCY_RELATIVE_EIGENVALUE × the largest).
 * @throws {RangeError} when n, γ, the path length or the ratio is out of range.
 * @returns The selected network (signed and absolute), its Θ and λ, and the whole EBIC path.
 * References: Foygel & Drton 2010, "Extended Bayesian information criteria for Gaussian
 * graphical models"; Friedman, Hastie & Tibshirani 2008, "Sparse inverse covariance estimation
 * with the graphical lasso".
 */
export function ebicGlasso(matrix: SquareMatrix, sampleSize: number, options: EbicGlassoOptions = {}): EbicGlassoResult {
  checkCovarianceMatrix(matrix, 'ebicGlasso');
  const p = matrix.order;
  if (p < 2) throw new RangeError('ebicGlasso: a network needs at least two items');
  const gamma = options.gamma ?? EBIC_GAMMA;
  const count = options.penaltyCount ?? EBIC_PENALTY_COUNT;
  const ratio = options.minimumPenaltyRatio ?? EBIC_MINIMUM_PENALTY_RATIO;
  const tolerance = options.tolerance ?? GRAPHICAL_LASSO_TOLERANCE;
  const pathTolerance = options.pathTolerance ?? EBIC_PATH_TOLERANCE;
  if (!(tolerance > 0) || !(pathTolerance > 0)) throw new RangeError(`ebicGlasso: tolerances must be positive, got ${pathTolerance} and ${tolerance}`);
  if (!Number.isInteger(sampleSize) || sampleSize < 2) throw new RangeError(`ebicGlasso: sampleSize must be an integer >= 2, got ${sampleSize}`);
  if (!(gamma >= 0 && Number.isFinite(gamma))) throw new RangeError(`ebicGlasso: gamma must be a finite number >= 0, got ${gamma}`);
  if (!Number.isInteger(count) || count < 2) throw new RangeError(`ebicGlasso: penaltyCount must be an integer >= 2, got ${count}`);
  if (!(ratio > 0 && ratio < 1)) throw new RangeError(`ebicGlasso: minimumPenaltyRatio must lie in (0, 1), got ${ratio}`);

  // cov2cor
  const s = new Float64Array(p * p);
  const scale = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    const variance = matrix.data[i * p + i];
    if (!(variance > 0)) throw new RangeError(`ebicGlasso: the variance of item ${i} is ${variance}; exclude constant items first`);
    scale[i] = 1 / Math.sqrt(variance);
  }
  let largestOffDiagonal = 0;
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      const value = i === j ? 1 : matrix.data[i * p + j] * scale[i] * scale[j];
      s[i * p + j] = value;
      if (i !== j) largestOffDiagonal = Math.max(largestOffDiagonal, Math.abs(value));
    }
  }
  const correlation: SquareMatrix = { order: p, data: s };
  const eigenvalues = symmetricEigenvalues(correlation);
  if (!(eigenvalues[p - 1] > EXACT_DEPENDENCY_RELATIVE_EIGENVALUE * eigenvalues[0])) {
    throw new RangeError(
      `ebicGlasso: the matrix is not positive definite (smallest eigenvalue ${eigenvalues[p - 1].toPrecision(3)}); smooth it first (smoothCorrelationMatrix) or drop exactly dependent items`,
    );
  }
  if (!(largestOffDiagonal > 0)) throw new RangeError('ebicGlasso: every correlation is zero, so there is no network to estimate');

  const penalties = new Float64Array(count);
  const logMax = Math.log(largestOffDiagonal);
  const logMin = Math.log(ratio * largestOffDiagonal);
  for (let k = 0; k < count; k++) penalties[k] = Math.exp(logMin + ((logMax - logMin) * k) / (count - 1));
  // Exactly λ_max at the top (exp(log x) can miss x by an ulp): there the network is empty.
  penalties[count - 1] = largestOffDiagonal;

  const ebic = new Float64Array(count);
  const edges = new Int32Array(count);
  const logN = Math.log(sampleSize);
  const logP = Math.log(p);
  let bestIndex = -1;
  let converged = true;
  const state = createGraphicalLassoState(correlation, penalties[count - 1], false);
  // The fit of the best penalty so far (R's which.min: the lowest index on ties, and the path runs
  // downward), kept to start the final refit from.
  const best = createGraphicalLassoState(correlation, penalties[count - 1], false);
  for (let k = count - 1; k >= 0; k--) {
    const fit = graphicalLassoWarm(correlation, penalties[k], state, { tolerance: pathTolerance });
    if (!fit.converged) converged = false;
    const theta = fit.precision.data;
    const logLikelihood = (sampleSize / 2) * (logDeterminantPositiveDefinite(theta, p) - traceOfProduct(theta, s, p));
    edges[k] = fit.edges;
    ebic[k] = -2 * logLikelihood + fit.edges * logN + 4 * fit.edges * gamma * logP;
    if (Number.isNaN(ebic[k])) ebic[k] = Number.POSITIVE_INFINITY; // Θ not positive definite: never selected
    if (bestIndex < 0 || ebic[k] <= ebic[bestIndex]) {
      bestIndex = k;
      best.covariance.set(state.covariance);
      best.coefficients.set(state.coefficients);
    }
    options.onPenalty?.(count - k, count);
  }
  // The selected penalty refitted to the tight tolerance, from its own fit on the path.
  const refit = graphicalLassoWarm(correlation, penalties[bestIndex], best, { tolerance });
  if (!refit.converged) converged = false;
  const bestPrecision = refit.precision.data;
  edges[bestIndex] = refit.edges;

  const partial = new Float64Array(p * p);
  const absolute = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      if (i === j) continue;
      const value = -bestPrecision[i * p + j] / Math.sqrt(bestPrecision[i * p + i] * bestPrecision[j * p + j]);
      partial[i * p + j] = value === 0 ? 0 : value; // no −0
      absolute[i * p + j] = Math.abs(value);
    }
  }

  const notices: NumericalNotice[] = [];
  const everyItem = Array.from({ length: p }, (_, i) => i);
  if (bestIndex === 0) {
    notices.push({
      code: 'lowest-penalty-selected',
      items: everyItem,
      message: 'The extended BIC chose the smallest penalty on the path: the network may not be sparse, and its weakest edges are uncertain.',
    });
  }
  if (edges[bestIndex] === 0) {
    notices.push({ code: 'empty-network', items: everyItem, message: 'The extended BIC chose a network without edges: no pair shares variance beyond the others.' });
  } else if (penalties[bestIndex] < EBIC_DENSE_PENALTY_RATIO * largestOffDiagonal) {
    notices.push({
      code: 'dense-network',
      items: everyItem,
      message: 'The selected penalty is below a tenth of the largest: a dense network, whose smallest edges should be read with care.',
    });
  }
  if (!converged) notices.push({ code: 'not-converged', items: [], message: 'A graphical-lasso fit on the penalty path did not settle within its sweep limit.' });

  return {
    partialCorrelations: { order: p, data: partial },
    absoluteNetwork: { order: p, data: absolute },
    precision: { order: p, data: bestPrecision },
    penalty: penalties[bestIndex],
    selectedIndex: bestIndex,
    penalties,
    ebic,
    edges,
    selectedEdges: edges[bestIndex],
    converged,
    notices,
  };
}

/** log det of a positive-definite matrix by Cholesky; NaN when a pivot is not positive. */
function logDeterminantPositiveDefinite(a: Float64Array, p: number): number {
  const l = new Float64Array(p * p);
  let logDet = 0;
  for (let j = 0; j < p; j++) {
    let diagonal = a[j * p + j];
    for (let k = 0; k < j; k++) diagonal -= l[j * p + k] * l[j * p + k];
    if (!(diagonal > 0)) return Number.NaN;
    const root = Math.sqrt(diagonal);
    l[j * p + j] = root;
    logDet += 2 * Math.log(root);
    for (let i = j + 1; i < p; i++) {
      let sum = a[i * p + j];
      for (let k = 0; k < j; k++) sum -= l[i * p + k] * l[j * p + k];
      l[i * p + j] = sum / root;
    }
  }
  return logDet;
}

/** tr(AB) for symmetric A and B: Σ a_ij b_ij. */
function traceOfProduct(a: Float64Array, b: Float64Array, p: number): number {
  let sum = 0;
  for (let index = 0; index < p * p; index++) sum += a[index] * b[index];
  return sum;
}
