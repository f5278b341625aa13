/**
 * Local dependence within a scale from residual correlations after its one-factor model (Yen's
 * Q3 idea carried to a factor model of the correlation matrix). Two forms of the residual:
 * - `q3` (default): the correlation of the two items' residuals given the factor,
 *   (r_ij − λ_iλ_j) / sqrt((1 − λ_i²)(1 − λ_j²)). This is what Q3 is (a correlation between
 *   residuals), it is on the scale of a latent residual correlation, which is the scale the .20
 *   rule of thumb for Q3 was set on, and it has more power than the raw form: the raw residual
 *   of a pair shrinks with the items' uniquenesses (figures in docs/decisions/009).
 * - `residual`: the raw residual r_ij − λ_iλ_j (psych::fa's $residual).
 * Then the relative residual, that residual minus the scale's mean off-diagonal residual, and a
 * critical value for the largest relative residual from a parametric bootstrap of the fitted
 * model (Christensen, Makransky & Horton 2017).
 *
 * Why relative, and why a bootstrap: the residuals of a fitted model average slightly below zero
 * (by about −1/(k − 1) for Q3 in Yen's setting), and their spread depends on the number of items,
 * of respondents and of categories, so no fixed cut-off holds across scales; subtracting the
 * mean removes the first effect, and the bootstrap gives the second for the scale at hand. The
 * fixed rule of thumb (relative residual above .20; Chen & Thissen 1997 / Christensen et al.
 * 2017) is exported as RELATIVE_RESIDUAL_RULE_OF_THUMB for display beside it.
 *
 * The bootstrap statistic is the LARGEST relative residual over the scale's pairs, as
 * Christensen et al. (2017) tabulate it (Q3,max − mean Q3 = Q3*): one critical value per scale,
 * whose 95th percentile keeps the chance of any false alarm in a scale without local dependence
 * near 5% however many pairs it has (a per-pair percentile would flag about 5% of the pairs of
 * every clean scale). Both the 95th and the 99th percentiles are returned.
 *
 * Each draw simulates n rows from the fitted model, x_j = λ_j f + sqrt(1 − λ_j²) e_j with f and
 * e_j independent standard normal (exactly the model-implied correlation matrix λλᵀ + diag(1 − λ²)),
 * optionally cuts each x_j into categories at given thresholds (ordinal items: the draws then
 * carry the coarsening and the extra sampling variance of few categories), correlates (Pearson
 * on the values or category codes, by the fast cross-product kernel; or polychoric on the codes),
 * refits the one-factor minres model and records the largest relative residual. Seeded: the same
 * seed gives the same draws.
 *
 * References: Yen 1984, "Effects of local item dependence on the fit and equating performance of
 * the three-parameter logistic model" (Applied Psychological Measurement 8:125-145); Christensen,
 * Makransky & Horton 2017, "Critical values for Yen's Q3: Identification of local dependence in
 * the Rasch model using residual correlations" (Applied Psychological Measurement 41:178-194);
 * Chen & Thissen 1997, "Local dependence indexes for item pairs using item response theory"
 * (Journal of Educational and Behavioral Statistics 22:265-289); Harman & Jones 1966 (minres).
 */
import { checkCorrelationMatrix } from './correlation-input';
import { correlationMatrix } from './correlation-matrix';
import { centeredCrossProducts, pearsonFromCrossProducts } from './cross-products';
import { minresOneFactor } from './minres-factor';
import { createSeededRandom } from './seeded-random';
import { RESIDUAL_BOOTSTRAP_DRAWS, RESIDUAL_BOOTSTRAP_MIN_USABLE_SHARE, RESIDUAL_BOOTSTRAP_PERCENTILES, RESIDUAL_MIN_UNIQUENESS } from './tolerances';
import type { ItemPair } from './correlation-matrix';
import type { NumericalNotice, SquareMatrix } from './types';

/**
 * Which residual is computed: `q3` (default), the correlation of the two items' residuals given
 * the factor, (r_ij − λ_iλ_j) / sqrt((1 − λ_i²)(1 − λ_j²)), Yen's Q3 carried to the factor
 * model and on the scale of a latent residual correlation; or `residual`, the raw residual
 * r_ij − λ_iλ_j of the correlation matrix (psych::fa's $residual).
 */
export type ResidualStatistic = 'q3' | 'residual';

/** Residual correlations of one scale after its one-factor minres model. */
export interface OneFactorResiduals {
  /** The statistic computed (`q3` or `residual`). */
  readonly statistic: ResidualStatistic;
  /** Minres loadings (sum positive). */
  readonly loadings: Float64Array;
  /** Q3 (default) or raw residual r_ij − λ_i λ_j off the diagonal, 0 on it. */
  readonly residuals: SquareMatrix;
  /** Mean of the k(k − 1)/2 off-diagonal residuals. */
  readonly meanResidual: number;
  /** residual − meanResidual off the diagonal, 0 on it. */
  readonly relative: SquareMatrix;
  /** The largest relative residual, and its pair (smaller index first). */
  readonly largestRelative: number;
  readonly largestPair: ItemPair;
  /** Notices of the minres fit (`not-converged`, `heywood-case`, `no-common-factor`). */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Residual and relative residual correlations after a one-factor minres model.
 * @param correlation The scale's item correlation matrix (unit diagonal, symmetric, finite),
 *   with items keyed the same way (reverse-keyed items recoded); not modified.
 * @param options `statistic`: `q3` (default) or `residual` (see ResidualStatistic).
 * @throws {RangeError} when the matrix is not a correlation matrix in shape.
 * @throws {RangeError} when it has fewer than three items (with two, one factor fits exactly and
 *   every residual is zero: there is nothing to detect), or the statistic is unknown.
 * @returns Loadings, residuals, their mean, relative residuals and the largest one.
 * References: Christensen, Makransky & Horton 2017, Applied Psychological Measurement
 * 41:178-194; Harman & Jones 1966, "Factor analysis by minimizing residuals (minres)".
 */
export function oneFactorResiduals(correlation: SquareMatrix, options: { readonly statistic?: ResidualStatistic } = {}): OneFactorResiduals {
  const statistic = options.statistic ?? 'q3';
  if (statistic !== 'q3' && statistic !== 'residual') throw new RangeError(`oneFactorResiduals: unknown statistic ${String(statistic)}`);
  checkCorrelationMatrix(correlation, 'oneFactorResiduals');
  const k = correlation.order;
  if (k < 3) throw new RangeError(`oneFactorResiduals: a scale needs at least three items for residual correlations, got ${k}`);
  const fit = minresOneFactor(correlation);
  const loadings = fit.loadings as Float64Array;
  const residuals = new Float64Array(k * k);
  const relative = new Float64Array(k * k);
  const summary = residualSummary(correlation.data, loadings, k, residuals, relative, statistic);
  return {
    statistic,
    loadings,
    residuals: { order: k, data: residuals },
    meanResidual: summary.mean,
    relative: { order: k, data: relative },
    largestRelative: summary.largest,
    largestPair: [summary.first, summary.second],
    notices: fit.notices,
  };
}

/** How the bootstrap draws are correlated. */
export type ResidualBootstrapCorrelation = 'pearson' | 'polychoric';

/** Options of `residualBootstrap`. */
export interface ResidualBootstrapOptions {
  /** Simulated data sets (default RESIDUAL_BOOTSTRAP_DRAWS = 200), an integer ≥ 20. */
  readonly draws?: number;
  /** Seed of the generator (default 1): the same seed gives the same critical values. */
  readonly seed?: number;
  /**
   * Ordinal items: for each item its thresholds on the latent normal scale, ascending (e.g.
   * `correlationMatrix(..., { method: 'polychoric' }).thresholds`, or Φ⁻¹ of the cumulative
   * answer shares). Each draw is cut into categories there. Omit for continuous normal draws.
   */
  readonly thresholds?: readonly (readonly number[])[];
  /**
   * How each draw is correlated: `pearson` (default; on the category codes when thresholds are
   * given) or `polychoric` (needs thresholds; slower, for a polychoric audit).
   */
  readonly correlation?: ResidualBootstrapCorrelation;
  /** The statistic, as in `oneFactorResiduals` (default `q3`); both calls must use the same. */
  readonly statistic?: ResidualStatistic;
}

/** The result of `residualBootstrap`. */
export interface ResidualBootstrapResult {
  /** 95th percentile (R type 7) of the largest relative residual under the model. */
  readonly criticalValue95: number;
  /** 99th percentile of the same. */
  readonly criticalValue99: number;
  /** The largest relative residual of every usable draw, ascending. */
  readonly maxRelative: Float64Array;
  /** Draws requested. */
  readonly draws: number;
  /** Draws that gave a correlation matrix (an ordinal draw with a constant item is skipped). */
  readonly usableDraws: number;
  /** `heywood-loadings-clipped`, `draws-skipped`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Parametric-bootstrap null distribution of the largest relative residual of a one-factor scale.
 * @param loadings The fitted one-factor loadings (e.g. `oneFactorResiduals(r).loadings`), at
 *   least three; a |λ| above 1 (a Heywood case) is clipped to 1 with a notice.
 * @param sampleSize Respondents n of the observed wave, an integer ≥ 10.
 * @param options Draws, seed, ordinal thresholds, how draws are correlated, the statistic (the
 *   same as the observed one's).
 * @throws {RangeError} when there are fewer than three loadings or one is not finite, n or the
 *   draws are out of range, the thresholds do not match the items or are not ascending, or
 *   `polychoric` is asked for without thresholds.
 * @throws {RangeError} when fewer than RESIDUAL_BOOTSTRAP_MIN_USABLE_SHARE of the draws are
 *   usable (too few respondents for the categories).
 * @returns The 95th and 99th percentiles of the largest relative residual and every draw.
 * References: Christensen, Makransky & Horton 2017, "Critical values for Yen's Q3", Applied
 * Psychological Measurement 41:178-194; Hyndman & Fan 1996 (percentile definition 7).
 */
export function residualBootstrap(loadings: ArrayLike<number>, sampleSize: number, options: ResidualBootstrapOptions = {}): ResidualBootstrapResult {
  const k = loadings.length;
  if (k < 3) throw new RangeError(`residualBootstrap: at least three loadings are required, got ${k}`);
  const draws = options.draws ?? RESIDUAL_BOOTSTRAP_DRAWS;
  const seed = options.seed ?? 1;
  const method = options.correlation ?? 'pearson';
  const statistic = options.statistic ?? 'q3';
  if (statistic !== 'q3' && statistic !== 'residual') throw new RangeError(`residualBootstrap: unknown statistic ${String(statistic)}`);
  const thresholds = options.thresholds;
  if (!Number.isInteger(sampleSize) || sampleSize < 10) throw new RangeError(`residualBootstrap: sampleSize must be an integer >= 10, got ${sampleSize}`);
  if (!Number.isInteger(draws) || draws < 20) throw new RangeError(`residualBootstrap: draws must be an integer >= 20, got ${draws}`);
  if (method !== 'pearson' && method !== 'polychoric') throw new RangeError(`residualBootstrap: unknown correlation ${String(method)}`);
  if (method === 'polychoric' && thresholds === undefined) throw new RangeError('residualBootstrap: polychoric draws need the items\' thresholds');
  if (thresholds !== undefined) {
    if (thresholds.length !== k) throw new RangeError(`residualBootstrap: ${thresholds.length} threshold lists for ${k} items`);
    thresholds.forEach((list, j) => {
      for (let c = 0; c < list.length; c++) {
        if (!Number.isFinite(list[c]) || (c > 0 && !(list[c] > list[c - 1]))) {
          throw new RangeError(`residualBootstrap: the thresholds of item ${j} must be finite and strictly ascending`);
        }
      }
    });
  }
  const notices: NumericalNotice[] = [];
  const weight = new Float64Array(k);
  const unique = new Float64Array(k);
  const clipped: number[] = [];
  for (let j = 0; j < k; j++) {
    const value = loadings[j];
    if (!Number.isFinite(value)) throw new RangeError(`residualBootstrap: loading ${j} is not finite`);
    if (Math.abs(value) > 1) clipped.push(j);
    weight[j] = Math.max(-1, Math.min(1, value));
    unique[j] = Math.sqrt(Math.max(0, 1 - weight[j] * weight[j]));
  }
  if (clipped.length > 0) {
    notices.push({
      code: 'heywood-loadings-clipped',
      items: clipped,
      message: 'A loading above 1 (a Heywood case) was set to 1 for the simulation: the model cannot generate it.',
    });
  }

  const random = createSeededRandom(seed);
  const n = sampleSize;
  const data = new Float64Array(n * k);
  const matrix = { rows: n, columns: k, data };
  const residuals = new Float64Array(k * k);
  const relative = new Float64Array(k * k);
  const maxima = new Float64Array(draws);
  // One draw's normal variates in the order the generator gives them: per respondent the common
  // factor, then one unique variate per item.
  const stride = k + 1;
  const normals = new Float64Array(n * stride);
  // The thresholds flat: item j's cuts are cuts[cutStart[j]] to cuts[cutStart[j + 1] - 1].
  const cutStart = new Int32Array(k + 1);
  const cuts = new Float64Array(thresholds === undefined ? 0 : thresholds.reduce((total, list) => total + list.length, 0));
  if (thresholds !== undefined) {
    for (let j = 0; j < k; j++) {
      cuts.set(thresholds[j], cutStart[j]);
      cutStart[j + 1] = cutStart[j] + thresholds[j].length;
    }
  }
  let usable = 0;
  for (let draw = 0; draw < draws; draw++) {
    random.fillNormal(normals, 0, n * stride);
    if (thresholds === undefined) combineDraw(normals, weight, unique, data, n, k);
    else combineAndCutDraw(normals, weight, unique, cuts, cutStart, data, n, k);
    const simulated = correlateDraw(matrix, method);
    if (simulated === null) continue;
    const fit = minresOneFactor(simulated);
    if (fit.loadings === null) continue;
    maxima[usable++] = residualSummary(simulated.data, fit.loadings, k, residuals, relative, statistic).largest;
  }
  if (usable < RESIDUAL_BOOTSTRAP_MIN_USABLE_SHARE * draws) {
    throw new RangeError(
      `residualBootstrap: only ${usable} of ${draws} simulated data sets had a variable answer in every category pattern; with ${n} respondents the items have too many sparse categories for a bootstrap`,
    );
  }
  if (usable < draws) {
    notices.push({
      code: 'draws-skipped',
      items: [],
      message: `${draws - usable} of ${draws} simulated data sets had a constant item and were skipped.`,
    });
  }
  const sorted = maxima.slice(0, usable).sort();
  return {
    criticalValue95: quantileType7(sorted, RESIDUAL_BOOTSTRAP_PERCENTILES.flag),
    criticalValue99: quantileType7(sorted, RESIDUAL_BOOTSTRAP_PERCENTILES.strict),
    maxRelative: sorted,
    draws,
    usableDraws: usable,
    notices,
  };
}

/**
 * One draw's values x_j = λ_j f + u_j e_j, item-major (`data[j * n + i]`), from the draw's normal
 * variates (`normals[i * (k + 1)]` is respondent i's f, `normals[i * (k + 1) + 1 + j]` its e_j).
 */
function combineDraw(normals: Float64Array, weight: Float64Array, unique: Float64Array, data: Float64Array, n: number, k: number): void {
  const stride = k + 1;
  for (let j = 0; j < k; j++) {
    const loading = weight[j];
    const uniqueness = unique[j];
    const offset = j * n;
    for (let i = 0, at = 0; i < n; i++, at += stride) data[offset + i] = loading * normals[at] + uniqueness * normals[at + 1 + j];
  }
}

/**
 * As combineDraw, each value cut into its category as it is made: the number of item j's cuts
 * (`cuts[cutStart[j]]` to `cuts[cutStart[j + 1] - 1]`, ascending) below it. An item of up to four
 * or up to eight cuts (five- and nine-point scales and shorter) is cut against its cuts held in
 * locals, the missing ones +∞ (no finite value lies above it, so the count is the same): about
 * half the time of a loop over the cuts per value, measured on 2,000 × 10 values.
 */
function combineAndCutDraw(
  normals: Float64Array,
  weight: Float64Array,
  unique: Float64Array,
  cuts: Float64Array,
  cutStart: Int32Array,
  data: Float64Array,
  n: number,
  k: number,
): void {
  for (let j = 0; j < k; j++) {
    const count = cutStart[j + 1] - cutStart[j];
    if (count <= 4) combineAndCutItemFour(normals, weight[j], unique[j], cuts, cutStart[j], count, data, n, k, j);
    else if (count <= 8) combineAndCutItemEight(normals, weight[j], unique[j], cuts, cutStart[j], count, data, n, k, j);
    else combineAndCutItem(normals, weight[j], unique[j], cuts, cutStart[j], count, data, n, k, j);
  }
}

/** Item j of combineAndCutDraw, with at most four cuts (from `first`, `count` of them). */
function combineAndCutItemFour(
  normals: Float64Array,
  loading: number,
  uniqueness: number,
  cuts: Float64Array,
  first: number,
  count: number,
  data: Float64Array,
  n: number,
  k: number,
  j: number,
): void {
  const stride = k + 1;
  const offset = j * n;
  const c0 = count > 0 ? cuts[first] : Infinity;
  const c1 = count > 1 ? cuts[first + 1] : Infinity;
  const c2 = count > 2 ? cuts[first + 2] : Infinity;
  const c3 = count > 3 ? cuts[first + 3] : Infinity;
  for (let i = 0, at = 0; i < n; i++, at += stride) {
    const value = loading * normals[at] + uniqueness * normals[at + 1 + j];
    // Counted without a branch per cut: a data-dependent exit mispredicts on random values.
    data[offset + i] = (above(value, c0) + above(value, c1)) + (above(value, c2) + above(value, c3));
  }
}

/** Item j of combineAndCutDraw, with five to eight cuts (from `first`, `count` of them). */
function combineAndCutItemEight(
  normals: Float64Array,
  loading: number,
  uniqueness: number,
  cuts: Float64Array,
  first: number,
  count: number,
  data: Float64Array,
  n: number,
  k: number,
  j: number,
): void {
  const stride = k + 1;
  const offset = j * n;
  const c0 = cuts[first];
  const c1 = cuts[first + 1];
  const c2 = cuts[first + 2];
  const c3 = cuts[first + 3];
  const c4 = cuts[first + 4];
  const c5 = count > 5 ? cuts[first + 5] : Infinity;
  const c6 = count > 6 ? cuts[first + 6] : Infinity;
  const c7 = count > 7 ? cuts[first + 7] : Infinity;
  for (let i = 0, at = 0; i < n; i++, at += stride) {
    const value = loading * normals[at] + uniqueness * normals[at + 1 + j];
    data[offset + i] = (above(value, c0) + above(value, c1)) + (above(value, c2) + above(value, c3)) + ((above(value, c4) + above(value, c5)) + (above(value, c6) + above(value, c7)));
  }
}

/** Item j of combineAndCutDraw, any number of cuts (from `first`, `count` of them). */
function combineAndCutItem(
  normals: Float64Array,
  loading: number,
  uniqueness: number,
  cuts: Float64Array,
  first: number,
  count: number,
  data: Float64Array,
  n: number,
  k: number,
  j: number,
): void {
  const stride = k + 1;
  const offset = j * n;
  const last = first + count;
  for (let i = 0, at = 0; i < n; i++, at += stride) {
    const value = loading * normals[at] + uniqueness * normals[at + 1 + j];
    let category = 0;
    for (let cut = first; cut < last; cut++) category += above(value, cuts[cut]);
    data[offset + i] = category;
  }
}

/** 1 when value > cut, else 0, without a branch. */
function above(value: number, cut: number): number {
  return ((value > cut) as unknown as number) | 0;
}

/** The correlation matrix of one draw, or null when an item came out constant. */
function correlateDraw(matrix: { rows: number; columns: number; data: Float64Array }, method: ResidualBootstrapCorrelation): SquareMatrix | null {
  for (let j = 0; j < matrix.columns; j++) {
    const offset = j * matrix.rows;
    const first = matrix.data[offset];
    let constant = true;
    for (let i = 1; i < matrix.rows && constant; i++) if (matrix.data[offset + i] !== first) constant = false;
    if (constant) return null;
  }
  if (method === 'pearson') return pearsonFromCrossProducts(centeredCrossProducts(matrix));
  return correlationMatrix(matrix, { method: 'polychoric', missing: 'pairwise' }).matrix;
}

/**
 * Fills residuals and relative residuals (zero diagonals) and returns their mean and the largest
 * relative residual with its pair.
 */
function residualSummary(
  r: Float64Array,
  loadings: ArrayLike<number>,
  k: number,
  residuals: Float64Array,
  relative: Float64Array,
  statistic: ResidualStatistic,
): { mean: number; largest: number; first: number; second: number } {
  let sum = 0;
  for (let i = 0; i < k; i++) {
    residuals[i * k + i] = 0;
    const uniqueI = statistic === 'q3' ? Math.sqrt(Math.max(RESIDUAL_MIN_UNIQUENESS, 1 - loadings[i] * loadings[i])) : 1;
    for (let j = i + 1; j < k; j++) {
      const uniqueJ = statistic === 'q3' ? Math.sqrt(Math.max(RESIDUAL_MIN_UNIQUENESS, 1 - loadings[j] * loadings[j])) : 1;
      const value = (r[i * k + j] - loadings[i] * loadings[j]) / (uniqueI * uniqueJ);
      residuals[i * k + j] = value;
      residuals[j * k + i] = value;
      sum += value;
    }
  }
  const mean = sum / ((k * (k - 1)) / 2);
  let largest = Number.NEGATIVE_INFINITY;
  let first = 0;
  let second = 1;
  for (let i = 0; i < k; i++) {
    relative[i * k + i] = 0;
    for (let j = i + 1; j < k; j++) {
      const value = residuals[i * k + j] - mean;
      relative[i * k + j] = value;
      relative[j * k + i] = value;
      if (value > largest) {
        largest = value;
        first = i;
        second = j;
      }
    }
  }
  return { mean, largest, first, second };
}

/** Hyndman & Fan definition 7 on sorted values: interpolate at (N − 1)·q. */
function quantileType7(sorted: Float64Array, q: number): number {
  const position = (sorted.length - 1) * q;
  const below = Math.floor(position);
  const above = Math.min(below + 1, sorted.length - 1);
  return sorted[below] + (position - below) * (sorted[above] - sorted[below]);
}
