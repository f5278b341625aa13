/**
 * Horn's parallel analysis: how many components stand out from what random data of the same
 * size would give. Each iteration draws the Pearson correlation matrix of `rows × items`
 * independent standard normal values from the seeded generator and takes its eigenvalues; an
 * observed eigenvalue is retained while it exceeds the 95th percentile of the random eigenvalues
 * at the same position (Glorfeld's refinement of Horn's mean). The same seed gives the same answer.
 *
 * The matrices are drawn directly, not through the data: the cross-products of normal data are
 * Wishart, drawn by Bartlett's decomposition at O(items³) per draw and nothing in `rows`
 * (wishart-correlation.ts; Odell & Feiveson 1966). The law of the random eigenvalues is the same as
 * correlating `rows × items` normal values; only the draws differ. The random eigenvalues of the
 * last few (rows, items, iterations, seed) are kept in an in-process cache (least recently used
 * first out, RANDOM_EIGENVALUE_CACHE_SIZE entries, per thread), so a second audit of the same
 * size reuses them.
 *
 * Percentiles are R's default (type 7): linear interpolation between order statistics at
 * `(N − 1)·q`.
 *
 * References: Horn 1965, "A rationale and test for the number of factors in factor analysis"
 * (Psychometrika 30:179-185); Glorfeld 1995, "An improvement on Horn's parallel analysis
 * methodology for selecting the correct number of factors to retain" (Educational and
 * Psychological Measurement 55:377-393); Hyndman & Fan 1996, "Sample quantiles in statistical
 * packages" (The American Statistician 50:361-365), definition 7.
 */
import { createSeededRandom } from './seeded-random';
import { symmetricEigenvalues } from './symmetric-eigen';
import { PARALLEL_ANALYSIS_DEFAULT_ITERATIONS, PARALLEL_ANALYSIS_PERCENTILE } from './tolerances';
import { correlationFromWishartFactor, drawWishartFactor } from './wishart-correlation';

/** Sizes whose random eigenvalues are cached in-process (performance only). */
export const RANDOM_EIGENVALUE_CACHE_SIZE = 8;

/** Seed used when none is given (the audit's settings normally pass one). */
export const PARALLEL_ANALYSIS_DEFAULT_SEED = 1;

/** Options of `parallelAnalysis`. */
export interface ParallelAnalysisOptions {
  /** Random data sets to draw (default PARALLEL_ANALYSIS_DEFAULT_ITERATIONS = 100). */
  readonly iterations?: number;
  /** Seed of the generator (default PARALLEL_ANALYSIS_DEFAULT_SEED). */
  readonly seed?: number;
  /** Percentile of the random eigenvalues to beat, in (0, 100] (default 95). */
  readonly percentile?: number;
  /**
   * The random eigenvalues already drawn for these rows, items, iterations and seed (the layout of
   * `randomCorrelationEigenvalues`, e.g. from its worker-thread twin in src/lib/audit); when given,
   * no draws are made here. Not modified.
   */
  readonly randomEigenvalues?: Float64Array;
}

/** The result of `parallelAnalysis`. All arrays are by position, largest eigenvalue first. */
export interface ParallelAnalysisResult {
  /** The observed eigenvalues, as given (descending). */
  readonly observed: readonly number[];
  /** The chosen percentile (95 by default) of the random eigenvalues at each position. */
  readonly random95: readonly number[];
  /** Mean of the random eigenvalues at each position (Horn's original criterion). */
  readonly randomMean: readonly number[];
  /** Number of leading observed eigenvalues above their random percentile. */
  readonly suggested: number;
  readonly iterations: number;
  readonly seed: number;
  readonly percentile: number;
}

/**
 * Parallel analysis of observed correlation-matrix eigenvalues against random normal data of the
 * same number of respondents and items.
 * @param observed Eigenvalues of the observed correlation matrix in descending order (one per item).
 * @param rows Respondents behind the observed matrix (at least 2).
 * @param options Iterations, seed and percentile.
 * @throws {RangeError} when `observed` is empty, holds a non-finite value or is not descending.
 * @throws {RangeError} when `rows` is not an integer of at least 2.
 * @throws {RangeError} when `iterations` is not a positive integer, `seed` not an integer, or
 *   `percentile` not in (0, 100].
 * @throws {RangeError} when `randomEigenvalues` is given with other than items × iterations values.
 * @returns Random percentile and mean eigenvalues per position, and the suggested number of
 *   components.
 * References: Horn 1965, "A rationale and test for the number of factors in factor analysis";
 * Glorfeld 1995, "An improvement on Horn's parallel analysis methodology for selecting the
 * correct number of factors to retain".
 */
export function parallelAnalysis(observed: ArrayLike<number>, rows: number, options: ParallelAnalysisOptions = {}): ParallelAnalysisResult {
  const items = observed.length;
  if (items < 1) throw new RangeError('parallelAnalysis: at least one observed eigenvalue is required');
  for (let k = 0; k < items; k++) {
    if (!Number.isFinite(observed[k])) throw new RangeError(`parallelAnalysis: observed eigenvalue ${k} is not finite`);
    if (k > 0 && observed[k] > observed[k - 1]) throw new RangeError('parallelAnalysis: observed eigenvalues must be in descending order');
  }
  if (!Number.isInteger(rows) || rows < 2) throw new RangeError(`parallelAnalysis: rows must be an integer of at least 2, got ${rows}`);
  const iterations = options.iterations ?? PARALLEL_ANALYSIS_DEFAULT_ITERATIONS;
  const seed = options.seed ?? PARALLEL_ANALYSIS_DEFAULT_SEED;
  const percentile = options.percentile ?? PARALLEL_ANALYSIS_PERCENTILE;
  if (!Number.isInteger(iterations) || iterations < 1) throw new RangeError(`parallelAnalysis: iterations must be a positive integer, got ${iterations}`);
  if (!Number.isInteger(seed)) throw new RangeError(`parallelAnalysis: seed must be an integer, got ${seed}`);
  if (!(percentile > 0 && percentile <= 100)) throw new RangeError(`parallelAnalysis: percentile must lie in (0, 100], got ${percentile}`);

  const given = options.randomEigenvalues;
  if (given !== undefined && given.length !== items * iterations) {
    throw new RangeError(`parallelAnalysis: randomEigenvalues holds ${given.length} values, expected items × iterations = ${items * iterations}`);
  }
  const randomValues = given !== undefined ? given.slice() : randomCorrelationEigenvalues(rows, items, iterations, seed);
  return summariseRandomEigenvalues(observed, randomValues, iterations, seed, percentile);
}

/**
 * The parallel-analysis result from the eigenvalues of the random data sets: per component the
 * percentile and mean of the random eigenvalues, and how many observed ones exceed the percentile.
 * Shared by the Pearson and the polychoric variants.
 * @param observed observed eigenvalues, descending.
 * @param randomValues `randomValues[k * iterations + t]`: eigenvalue k of random data set t (sorted in place per k).
 * @param iterations random data sets.
 * @param seed the seed used (echoed).
 * @param percentile the percentile compared with (0-100).
 * @returns the result.
 * References: Horn 1965; Glorfeld 1995 (the 95th percentile).
 */
export function summariseRandomEigenvalues(
  observed: ArrayLike<number>,
  randomValues: Float64Array,
  iterations: number,
  seed: number,
  percentile: number,
): ParallelAnalysisResult {
  const items = observed.length;
  const random95: number[] = [];
  const randomMean: number[] = [];
  for (let k = 0; k < items; k++) {
    const sorted = randomValues.subarray(k * iterations, (k + 1) * iterations).sort();
    random95.push(quantileType7(sorted, percentile / 100));
    let sum = 0;
    for (let t = 0; t < iterations; t++) sum += sorted[t];
    randomMean.push(sum / iterations);
  }
  let suggested = 0;
  while (suggested < items && observed[suggested] > random95[suggested]) suggested++;
  return { observed: Array.from(observed), random95, randomMean, suggested, iterations, seed, percentile };
}

const eigenvalueCache = new Map<string, Float64Array>();

function cacheKey(rows: number, items: number, iterations: number, seed: number): string {
  return `${rows}:${items}:${iterations}:${seed}`;
}

/**
 * The eigenvalues of `iterations` random correlation matrices of `rows × items` independent
 * standard normal values (Bartlett's decomposition of the Wishart cross-products), cached by
 * (rows, items, iterations, seed).
 * @param rows Respondents (at least 2).
 * @param items Items (at least 1).
 * @param iterations Random matrices (at least 1).
 * @param seed Seed of the generator.
 * @throws {RangeError} when a size is out of range (from drawWishartFactor).
 * @returns A fresh array, `values[k * iterations + t]`: eigenvalue k (descending) of draw t.
 * References: Odell & Feiveson 1966, "A numerical procedure to generate a sample covariance matrix".
 */
export function randomCorrelationEigenvalues(rows: number, items: number, iterations: number, seed: number): Float64Array {
  const cached = cachedRandomCorrelationEigenvalues(rows, items, iterations, seed);
  if (cached !== null) return cached;
  const values = drawMajorToPositionMajor(randomCorrelationEigenvalueDraws(rows, items, seed, 0, iterations), items, iterations);
  rememberRandomCorrelationEigenvalues(rows, items, iterations, seed, values);
  return values;
}

/**
 * The eigenvalues of draws `firstDraw` to `endDraw − 1` of the sequence `randomCorrelationEigenvalues`
 * makes from `seed`: the draws before `firstDraw` take their generator values (their factors are
 * drawn and dropped, O(items²) each) but no products or eigenvalues. Any split of 0..N into ranges
 * therefore gives, draw for draw, the same values as one pass; this is what lets the draws be spread
 * over threads without the answer depending on how many there are.
 * @param rows Respondents (at least 2).
 * @param items Items (at least 1).
 * @param seed Seed of the generator.
 * @param firstDraw First draw computed (0-based, inclusive).
 * @param endDraw Draw after the last one computed (exclusive), at least `firstDraw`.
 * @throws {RangeError} when the draw range is not 0 <= firstDraw <= endDraw of integers, or a size is
 *   out of range (from drawWishartFactor).
 * @returns `values[(t − firstDraw) * items + k]`: eigenvalue k (descending) of draw t.
 * References: Odell & Feiveson 1966, "A numerical procedure to generate a sample covariance matrix".
 */
export function randomCorrelationEigenvalueDraws(rows: number, items: number, seed: number, firstDraw: number, endDraw: number): Float64Array {
  if (!Number.isInteger(firstDraw) || !Number.isInteger(endDraw) || firstDraw < 0 || endDraw < firstDraw) {
    throw new RangeError(`randomCorrelationEigenvalueDraws: the draws must satisfy 0 <= firstDraw <= endDraw (integers), got ${firstDraw} and ${endDraw}`);
  }
  const random = createSeededRandom(seed);
  const values = new Float64Array(items * (endDraw - firstDraw));
  for (let t = 0; t < endDraw; t++) {
    if (items === 1) {
      if (t >= firstDraw) values[t - firstDraw] = 1;
      continue;
    }
    const factor = drawWishartFactor(rows, items, random);
    if (t < firstDraw) continue;
    values.set(symmetricEigenvalues(correlationFromWishartFactor(factor)), (t - firstDraw) * items);
  }
  return values;
}

/**
 * Reorders draw-major eigenvalues (`(t * items + k)`, as `randomCorrelationEigenvalueDraws` gives
 * them) into the position-major layout of `randomCorrelationEigenvalues` (`k * iterations + t`).
 * @param drawMajor Eigenvalues of `iterations` draws, draw after draw.
 * @param items Eigenvalues per draw.
 * @param iterations Draws.
 * @throws {RangeError} when the length is not items × iterations.
 * @returns A fresh position-major array.
 * References: none (storage order).
 */
export function drawMajorToPositionMajor(drawMajor: Float64Array, items: number, iterations: number): Float64Array {
  if (drawMajor.length !== items * iterations) {
    throw new RangeError(`drawMajorToPositionMajor: ${drawMajor.length} values, expected items × iterations = ${items * iterations}`);
  }
  const values = new Float64Array(items * iterations);
  for (let t = 0; t < iterations; t++) for (let k = 0; k < items; k++) values[k * iterations + t] = drawMajor[t * items + k];
  return values;
}

/**
 * The cached random eigenvalues of (rows, items, iterations, seed), if this thread has them; a hit
 * becomes the most recently used entry.
 * @param rows Respondents.
 * @param items Items.
 * @param iterations Draws.
 * @param seed Seed.
 * @returns A fresh copy in the layout of `randomCorrelationEigenvalues`, or null.
 * References: none (a cache; it never changes an answer).
 */
export function cachedRandomCorrelationEigenvalues(rows: number, items: number, iterations: number, seed: number): Float64Array | null {
  const key = cacheKey(rows, items, iterations, seed);
  const cached = eigenvalueCache.get(key);
  if (cached === undefined) return null;
  eigenvalueCache.delete(key);
  eigenvalueCache.set(key, cached);
  return cached.slice();
}

/**
 * Empties this thread's cache of random eigenvalues (tests use it to make every call draw).
 * @returns Nothing.
 * References: none (a cache; it never changes an answer).
 */
export function forgetRandomCorrelationEigenvalues(): void {
  eigenvalueCache.clear();
}

/**
 * Keeps random eigenvalues for (rows, items, iterations, seed) in this thread's cache (the oldest
 * entry leaves past RANDOM_EIGENVALUE_CACHE_SIZE).
 * @param rows Respondents.
 * @param items Items.
 * @param iterations Draws.
 * @param seed Seed.
 * @param values The layout of `randomCorrelationEigenvalues`; copied.
 * @throws {RangeError} when `values` does not hold items × iterations values.
 * @returns Nothing.
 * References: none (a cache; it never changes an answer).
 */
export function rememberRandomCorrelationEigenvalues(rows: number, items: number, iterations: number, seed: number, values: Float64Array): void {
  if (values.length !== items * iterations) {
    throw new RangeError(`rememberRandomCorrelationEigenvalues: ${values.length} values, expected items × iterations = ${items * iterations}`);
  }
  eigenvalueCache.set(cacheKey(rows, items, iterations, seed), values.slice());
  if (eigenvalueCache.size > RANDOM_EIGENVALUE_CACHE_SIZE) eigenvalueCache.delete(eigenvalueCache.keys().next().value as string);
}

/**
 * Hyndman & Fan definition 7 on sorted values: interpolate at (N − 1)·q.
 * @param sorted Values in ascending order (at least one).
 * @param q Probability in [0, 1].
 * @returns The quantile.
 * References: Hyndman & Fan 1996, "Sample quantiles in statistical packages", definition 7.
 */
export function quantileType7(sorted: Float64Array, q: number): number {
  const position = (sorted.length - 1) * q;
  const below = Math.floor(position);
  const above = Math.min(below + 1, sorted.length - 1);
  return sorted[below] + (position - below) * (sorted[above] - sorted[below]);
}
