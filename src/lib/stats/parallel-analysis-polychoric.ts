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
import {
  drawMajorToPositionMajor,
  PARALLEL_ANALYSIS_DEFAULT_SEED,
  RANDOM_EIGENVALUE_CACHE_SIZE,
  summariseRandomEigenvalues,
  type ParallelAnalysisResult,
} from './parallel-analysis';
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
  /**
   * The random eigenvalues already drawn for these rows, thresholds, iterations and seed (the
   * layout of `randomPolychoricEigenvalues`, e.g. from its worker-thread twin in src/lib/audit);
   * when given, no data sets are drawn here. Not modified.
   */
  readonly randomEigenvalues?: Float64Array;
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
 *   has no thresholds or they are not finite and ascending; when an option is out of range;
 *   when `randomEigenvalues` is given with other than items × iterations values.
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

  const given = options.randomEigenvalues;
  if (given !== undefined && given.length !== items * iterations) {
    throw new RangeError(`polychoricParallelAnalysis: randomEigenvalues holds ${given.length} values, expected items × iterations = ${items * iterations}`);
  }
  // The summary sorts its input in place: hand it a copy, never the cached or the given array.
  const randomValues = given !== undefined ? given.slice() : randomPolychoricEigenvalues(rows, thresholds, iterations, seed);
  return summariseRandomEigenvalues(observed, randomValues, iterations, seed, percentile);
}

const eigenvalueCache = new Map<string, Float64Array>();

function cacheKey(rows: number, thresholds: readonly (readonly number[])[], iterations: number, seed: number): string {
  return `${rows}:${iterations}:${seed}:${thresholds.map((limits) => limits.join(',')).join(';')}`;
}

/**
 * The eigenvalues of the polychoric matrices of `iterations` random ordinal data sets cut at
 * `thresholds` (the random reference of `polychoricParallelAnalysis`), cached by (rows,
 * thresholds, iterations, seed): the codes of every data set are drawn first, in order, from one
 * generator (`randomOrdinalCodes`), then each set's matrix is estimated (`polychoricCodeEigenvalues`).
 * @param rows Respondents per data set (at least 1).
 * @param thresholds Each item's thresholds, ascending (at least one per item; not checked here:
 *   `polychoricParallelAnalysis` checks them).
 * @param iterations Data sets (at least 1).
 * @param seed Seed of the generator.
 * @returns A fresh array, `values[k * iterations + t]`: eigenvalue k (descending) of data set t.
 * References: Garrido, Abad & Ponsoda 2013, "A new look at Horn's parallel analysis with ordinal variables".
 */
export function randomPolychoricEigenvalues(rows: number, thresholds: readonly (readonly number[])[], iterations: number, seed: number): Float64Array {
  const cached = cachedRandomPolychoricEigenvalues(rows, thresholds, iterations, seed);
  if (cached !== null) return cached;
  const items = thresholds.length;
  const codes = randomOrdinalCodes(rows, thresholds, iterations, seed);
  const values = drawMajorToPositionMajor(polychoricCodeEigenvalues(codes, rows, items), items, iterations);
  rememberRandomPolychoricEigenvalues(rows, thresholds, iterations, seed, values);
  return values;
}

/**
 * The category codes of `iterations` random ordinal data sets: for each set, item after item,
 * respondent after respondent, one standard normal value from the seeded generator, coded by how
 * many of the item's thresholds it exceeds. Drawn in this one order from one generator, so the
 * sets can then be estimated anywhere (worker threads) and give the same answer.
 * @param rows Respondents per data set (a positive integer).
 * @param thresholds Each item's thresholds, ascending (at most 254 per item, so a code fits a byte).
 * @param iterations Data sets (a positive integer).
 * @param seed Seed of the generator.
 * @throws {RangeError} when rows or iterations is not a positive integer, or an item has more than 254 thresholds.
 * @returns `codes[(t * items + j) * rows + i]`: the code (0 to the item's number of thresholds) of
 *   respondent i on item j in data set t.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 *   coefficient" (Psychometrika 44:443-460): the ordinal item as a cut standard normal variable.
 */
export function randomOrdinalCodes(rows: number, thresholds: readonly (readonly number[])[], iterations: number, seed: number): Uint8Array {
  if (!Number.isInteger(rows) || rows < 1) throw new RangeError(`randomOrdinalCodes: rows must be a positive integer, got ${rows}`);
  if (!Number.isInteger(iterations) || iterations < 1) throw new RangeError(`randomOrdinalCodes: iterations must be a positive integer, got ${iterations}`);
  if (thresholds.some((limits) => limits.length > 254)) throw new RangeError('randomOrdinalCodes: an item has more than 254 thresholds');
  const items = thresholds.length;
  const random = createSeededRandom(seed);
  const codes = new Uint8Array(iterations * items * rows);
  for (let t = 0; t < iterations; t++) {
    for (let j = 0; j < items; j++) {
      const limits = thresholds[j];
      const at = (t * items + j) * rows;
      for (let i = 0; i < rows; i++) {
        const z = random.nextNormal();
        let code = 0;
        while (code < limits.length && z > limits[code]) code++;
        codes[at + i] = code;
      }
    }
  }
  return codes;
}

/**
 * The eigenvalues (before any repair) of the polychoric matrix of each data set of codes, as
 * `randomOrdinalCodes` lays them out (listwise; the codes have no missing answers).
 * @param codes `codes[(t * items + j) * rows + i]` for data sets t = 0 .. draws − 1.
 * @param rows Respondents per data set (a positive integer).
 * @param items Items per data set (a positive integer).
 * @throws {RangeError} when rows or items is not a positive integer, or the length of `codes` is
 *   not a multiple of rows × items.
 * @returns Draw-major eigenvalues, `values[t * items + k]`: eigenvalue k (descending) of data set
 *   t (one item: 1).
 * References: Garrido, Abad & Ponsoda 2013, "A new look at Horn's parallel analysis with ordinal variables".
 */
export function polychoricCodeEigenvalues(codes: Uint8Array, rows: number, items: number): Float64Array {
  if (!Number.isInteger(rows) || rows < 1 || !Number.isInteger(items) || items < 1) {
    throw new RangeError(`polychoricCodeEigenvalues: rows and items must be positive integers, got ${rows} and ${items}`);
  }
  const size = rows * items;
  if (codes.length % size !== 0) throw new RangeError(`polychoricCodeEigenvalues: ${codes.length} codes is not a whole number of ${rows} × ${items} data sets`);
  const draws = codes.length / size;
  const values = new Float64Array(draws * items);
  const data = new Float64Array(size);
  for (let t = 0; t < draws; t++) {
    if (items === 1) {
      values[t] = 1;
      continue;
    }
    for (let at = 0; at < size; at++) data[at] = codes[t * size + at];
    const result = correlationMatrix({ rows, columns: items, data }, { method: 'polychoric', missing: 'listwise', repair: 'none' });
    values.set(symmetricEigenvalues(result.matrix), t * items);
  }
  return values;
}

/**
 * The cached random polychoric eigenvalues of (rows, thresholds, iterations, seed), if this thread
 * has them; a hit becomes the most recently used entry.
 * @param rows Respondents.
 * @param thresholds Each item's thresholds.
 * @param iterations Data sets.
 * @param seed Seed.
 * @returns A fresh copy in the layout of `randomPolychoricEigenvalues`, or null.
 * References: none (a cache; it never changes an answer).
 */
export function cachedRandomPolychoricEigenvalues(rows: number, thresholds: readonly (readonly number[])[], iterations: number, seed: number): Float64Array | null {
  const key = cacheKey(rows, thresholds, iterations, seed);
  const cached = eigenvalueCache.get(key);
  if (cached === undefined) return null;
  eigenvalueCache.delete(key);
  eigenvalueCache.set(key, cached);
  return cached.slice();
}

/**
 * Keeps random polychoric eigenvalues for (rows, thresholds, iterations, seed) in this thread's
 * cache (the oldest entry leaves past RANDOM_EIGENVALUE_CACHE_SIZE).
 * @param rows Respondents.
 * @param thresholds Each item's thresholds.
 * @param iterations Data sets.
 * @param seed Seed.
 * @param values The layout of `randomPolychoricEigenvalues`; copied.
 * @throws {RangeError} when `values` does not hold items × iterations values.
 * @returns Nothing.
 * References: none (a cache; it never changes an answer).
 */
export function rememberRandomPolychoricEigenvalues(
  rows: number,
  thresholds: readonly (readonly number[])[],
  iterations: number,
  seed: number,
  values: Float64Array,
): void {
  if (values.length !== thresholds.length * iterations) {
    throw new RangeError(`rememberRandomPolychoricEigenvalues: ${values.length} values, expected items × iterations = ${thresholds.length * iterations}`);
  }
  eigenvalueCache.set(cacheKey(rows, thresholds, iterations, seed), values.slice());
  if (eigenvalueCache.size > RANDOM_EIGENVALUE_CACHE_SIZE) eigenvalueCache.delete(eigenvalueCache.keys().next().value as string);
}

/**
 * Empties this thread's cache of random polychoric eigenvalues (tests use it to make every call draw).
 * @returns Nothing.
 * References: none (a cache; it never changes an answer).
 */
export function forgetRandomPolychoricEigenvalues(): void {
  eigenvalueCache.clear();
}
