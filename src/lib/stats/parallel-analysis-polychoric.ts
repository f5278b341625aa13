/**
 * Parallel analysis for polychoric correlations: the random reference is of the same correlation
 * type as the observed matrix. Each iteration draws `rows × items` independent standard normal
 * values, cuts each item's column at that item's observed thresholds (so the random items have
 * the observed numbers of categories and marginal proportions, in expectation), estimates the
 * polychoric matrix of the random items and takes its eigenvalues (before any repair). An
 * observed eigenvalue is retained while it exceeds the chosen percentile of the random ones at
 * its position. Polychoric estimation costs far more than Pearson, so callers usually ask for
 * fewer iterations than for Pearson data; the result says how many were drawn.
 *
 * Unlike the Pearson variant, the random matrices cannot be drawn from the Wishart law: the
 * polychoric estimates of cut normal data have their own sampling law, which is the point of
 * simulating the same correlation type (Garrido et al. 2013). What is reused instead: the random
 * eigenvalues of the last few (rows, thresholds, iterations, seed) are kept in an in-process cache
 * (least recently used first out, RANDOM_EIGENVALUE_CACHE_SIZE entries, per thread), so a second
 * audit of the same wave (other settings, a retry) does not estimate them again.
 */
import { correlationMatrix } from './correlation-matrix';
import { PARALLEL_ANALYSIS_DEFAULT_SEED, RANDOM_EIGENVALUE_CACHE_SIZE, summariseRandomEigenvalues, type ParallelAnalysisResult } from './parallel-analysis';
import { createSeededRandom } from './seeded-random';
import { symmetricEigenvalues } from './symmetric-eigen';
import { PARALLEL_ANALYSIS_PERCENTILE, POLYCHORIC_PARALLEL_DEFAULT_ITERATIONS } from './tolerances';

/** Options of `polychoricParallelAnalysis`. */
export interface PolychoricParallelAnalysisOptions {
  /** Random data sets (default POLYCHORIC_PARALLEL_DEFAULT_ITERATIONS). */
  readonly iterations?: number;
  readonly seed?: number;
  /** Percentile of the random eigenvalues to beat, in (0, 100] (default 95). */
  readonly percentile?: number;
}

/**
 * Parallel analysis of polychoric eigenvalues against random ordinal data at the observed thresholds.
 * @param observed Eigenvalues of the observed polychoric matrix, descending (one per item).
 * @param rows Respondents to simulate per data set (at least 3).
 * @param thresholds Each item's thresholds on the standard normal scale, ascending (as the
 *   polychoric estimator found them; at least one per item).
 * @param options Iterations, seed and percentile.
 * @throws {RangeError} when `observed` is empty, not finite or not descending; when its length
 *   differs from the number of items; when `rows` is not an integer of at least 3; when an item
 *   has no thresholds or they are not finite and ascending; when an option is out of range.
 * @returns The random percentile and mean eigenvalues per position and the suggested number.
 * References: Garrido, Abad & Ponsoda 2013, "A new look at Horn's parallel analysis with ordinal
 *   variables", Psychological Methods 18:454-474 (simulate the same correlation type); Horn 1965,
 *   Psychometrika 30:179-185; Olsson 1979, Psychometrika 44:443-460 (thresholds as normal quantiles).
 */
export function polychoricParallelAnalysis(
  observed: ArrayLike<number>,
  rows: number,
  thresholds: readonly (readonly number[])[],
  options: PolychoricParallelAnalysisOptions = {},
): ParallelAnalysisResult {
  const items = observed.length;
  if (items < 1) throw new RangeError('polychoricParallelAnalysis: at least one observed eigenvalue is required');
  for (let k = 0; k < items; k++) {
    if (!Number.isFinite(observed[k])) throw new RangeError(`polychoricParallelAnalysis: observed eigenvalue ${k} is not finite`);
    if (k > 0 && observed[k] > observed[k - 1]) throw new RangeError('polychoricParallelAnalysis: observed eigenvalues must be in descending order');
  }
  if (thresholds.length !== items) throw new RangeError(`polychoricParallelAnalysis: ${thresholds.length} threshold lists for ${items} eigenvalues`);
  thresholds.forEach((limits, j) => {
    if (limits.length < 1) throw new RangeError(`polychoricParallelAnalysis: item ${j} has no thresholds (a single category)`);
    for (let t = 0; t < limits.length; t++) {
      if (!Number.isFinite(limits[t]) || (t > 0 && !(limits[t] > limits[t - 1]))) throw new RangeError(`polychoricParallelAnalysis: the thresholds of item ${j} must be finite and ascending`);
    }
  });
  if (!Number.isInteger(rows) || rows < 3) throw new RangeError(`polychoricParallelAnalysis: rows must be an integer of at least 3, got ${rows}`);
  const iterations = options.iterations ?? POLYCHORIC_PARALLEL_DEFAULT_ITERATIONS;
  const seed = options.seed ?? PARALLEL_ANALYSIS_DEFAULT_SEED;
  const percentile = options.percentile ?? PARALLEL_ANALYSIS_PERCENTILE;
  if (!Number.isInteger(iterations) || iterations < 1) throw new RangeError(`polychoricParallelAnalysis: iterations must be a positive integer, got ${iterations}`);
  if (!Number.isInteger(seed)) throw new RangeError(`polychoricParallelAnalysis: seed must be an integer, got ${seed}`);
  if (!(percentile > 0 && percentile <= 100)) throw new RangeError(`polychoricParallelAnalysis: percentile must lie in (0, 100], got ${percentile}`);

  const key = `${rows}:${iterations}:${seed}:${thresholds.map((limits) => limits.join(',')).join(';')}`;
  let randomValues = eigenvalueCache.get(key);
  if (randomValues === undefined) {
    randomValues = randomPolychoricEigenvalues(rows, thresholds, iterations, seed);
    eigenvalueCache.set(key, randomValues);
    if (eigenvalueCache.size > RANDOM_EIGENVALUE_CACHE_SIZE) eigenvalueCache.delete(eigenvalueCache.keys().next().value as string);
  } else {
    eigenvalueCache.delete(key);
    eigenvalueCache.set(key, randomValues);
  }
  // The summary sorts its input in place: hand it a copy, never the cached array.
  return summariseRandomEigenvalues(observed, randomValues.slice(), iterations, seed, percentile);
}

const eigenvalueCache = new Map<string, Float64Array>();

/** `values[k * iterations + t]`: eigenvalue k (descending) of the polychoric matrix of random ordinal data set t. */
function randomPolychoricEigenvalues(rows: number, thresholds: readonly (readonly number[])[], iterations: number, seed: number): Float64Array {
  const items = thresholds.length;
  const random = createSeededRandom(seed);
  const randomValues = new Float64Array(items * iterations);
  const data = new Float64Array(rows * items);
  for (let t = 0; t < iterations; t++) {
    for (let j = 0; j < items; j++) {
      const limits = thresholds[j];
      for (let i = 0; i < rows; i++) {
        const z = random.nextNormal();
        let code = 0;
        while (code < limits.length && z > limits[code]) code++;
        data[j * rows + i] = code;
      }
    }
    let values: Float64Array;
    if (items === 1) {
      values = Float64Array.of(1);
    } else {
      const result = correlationMatrix({ rows, columns: items, data }, { method: 'polychoric', missing: 'listwise', repair: 'none' });
      values = symmetricEigenvalues(result.matrix);
    }
    for (let k = 0; k < items; k++) randomValues[k * iterations + t] = values[k];
  }
  return randomValues;
}
