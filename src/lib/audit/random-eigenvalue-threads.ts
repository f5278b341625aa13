/**
 * Parallel analysis's random draws on worker threads, started early and collected late: the audit
 * starts them as soon as it knows the size of the correlation matrix and goes on with the rest of
 * its work on the calling thread; the percentiles are taken when the JSON is written.
 *
 * Each thread computes a contiguous range of the draws with `randomCorrelationEigenvalueDraws`,
 * which replays the generator's values of the draws before its range; so every draw gets the same
 * values, and the answer is the same to the last bit, whatever the number of threads (and the same
 * as the core's one-thread `randomCorrelationEigenvalues`). Results are kept in the calling thread's
 * cache of the core (same key), so a second audit of the same size starts no thread.
 *
 * Below PARALLEL_ANALYSIS_THREAD_MIN_WORK (draws × items³) the draws are made on the calling thread
 * at once: a thread costs about 60 ms to start (more from source, where it is bundled once per
 * process), more than small draws take. docs/decisions/020-speed-whole-audit.md.
 *
 * The polychoric variant (`randomPolychoricEigenvaluesOnThreads`) cannot replay cheaply (a data
 * set's codes are rows × items generator values, its matrix far dearer): the calling thread draws
 * every data set's codes in order from the one generator (`randomOrdinalCodes`, a small share of
 * the work), hands each thread a contiguous range of data sets (moved, not copied), and the
 * threads estimate their polychoric matrices and eigenvalues; the answers are placed by data set,
 * so they are the core's `randomPolychoricEigenvalues` to the last bit, kept in the core's cache
 * under its key. Below POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS it all happens on the calling thread.
 */
import { availableParallelism } from 'node:os';
import {
  cachedRandomCorrelationEigenvalues,
  drawMajorToPositionMajor,
  randomCorrelationEigenvalues,
  rememberRandomCorrelationEigenvalues,
} from '../stats/parallel-analysis';
import {
  cachedRandomPolychoricEigenvalues,
  randomOrdinalCodes,
  randomPolychoricEigenvalues,
  rememberRandomPolychoricEigenvalues,
} from '../stats/parallel-analysis-polychoric';
import { runWorkerOnce } from '../workers/start-worker';
import { RANDOM_EIGENVALUE_WORKER } from '../workers/worker-entries';

/**
 * Work (draws × items³) from which the draws go to worker threads: 100 draws of about 100 items,
 * roughly 0.2 s on one thread here; one 300 × 300 draw is about 2.7e7 of it (40-80 ms).
 */
export const PARALLEL_ANALYSIS_THREAD_MIN_WORK = 1e8;

/** The most threads the draws are spread over (performance only). */
export const PARALLEL_ANALYSIS_MAX_THREADS = 4;

/** A thread's time limit: far above any draw range here, it ends only a thread that hangs. */
const THREAD_TIME_LIMIT_MS = 30 * 60 * 1000;

/** A thread's old-generation heap limit in MB: a draw holds a few items × items arrays. */
const THREAD_HEAP_MB = 256;

/**
 * Polychoric pair fits (data sets × items × (items − 1) / 2) from which the polychoric draws go to
 * worker threads. A thread starts cold: its first data sets of 1,000 × 40 took 160, 114, 54 and
 * 55 ms against 23 ms once compiled (about 0.35 s more per thread), while the calling thread has
 * just compiled the same code for the observed matrix. Case A (15,600 fits, about 0.5 s) and the
 * web demo (16,400) were slower on two threads than on the calling thread here. From 200,000 fits
 * (about 6 s on one thread, some 140 items) the warm-up is under a tenth of each thread's share,
 * so threads pay wherever a core is free; on the shared 2-core machine of 2026-12-03 none was
 * (150 items: 6.6-6.9 s on two threads against 5.5-6.0 s on one, wall time equal to CPU time),
 * so this threshold rests on that arithmetic, not on a measured gain. docs/decisions/020-speed-whole-audit.md.
 */
export const POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS = 200_000;

/** One thread's job (its `workerData`) of Pearson draws. */
export interface RandomEigenvalueJob {
  readonly rows: number;
  readonly items: number;
  readonly seed: number;
  /** First draw computed (inclusive). */
  readonly firstDraw: number;
  /** Draw after the last one computed (exclusive). */
  readonly endDraw: number;
}

/** One thread's job (its `workerData`) of polychoric data sets. */
export interface RandomPolychoricEigenvalueJob {
  readonly kind: 'polychoric';
  readonly rows: number;
  readonly items: number;
  /** The codes of the thread's data sets, laid out as `randomOrdinalCodes` gives them. */
  readonly codes: Uint8Array;
}

/**
 * How many worker threads the draws of this size get: none below PARALLEL_ANALYSIS_THREAD_MIN_WORK,
 * otherwise one per core the machine reports, at most PARALLEL_ANALYSIS_MAX_THREADS and at most one
 * per draw. The calling thread keeps working on the rest of the audit meanwhile.
 * @param items Items (the order of the random matrices).
 * @param iterations Draws.
 * @param cores Cores to use (the machine's `availableParallelism()` by default).
 * @returns 0 (draw on the calling thread) or the number of threads.
 */
export function parallelAnalysisThreadCount(items: number, iterations: number, cores: number = availableParallelism()): number {
  if (iterations * items ** 3 < PARALLEL_ANALYSIS_THREAD_MIN_WORK) return 0;
  return Math.max(1, Math.min(cores, PARALLEL_ANALYSIS_MAX_THREADS, iterations));
}

/**
 * The random eigenvalues of parallel analysis (`randomCorrelationEigenvalues` of the core, same
 * layout and the same values to the last bit), computed on `threads` worker threads that run while
 * the caller goes on; with 0 threads, on the calling thread before this returns.
 * @param rows Respondents (at least 2).
 * @param items Items (at least 1).
 * @param iterations Draws (at least 1).
 * @param seed Seed of the generator.
 * @param threads Worker threads (0: none); `parallelAnalysisThreadCount` by default.
 * @throws {RangeError} when `threads` is not a non-negative integer (synchronously), or a size is
 *   out of range (synchronously with 0 threads; otherwise the promise rejects).
 * @returns A promise of a fresh array, `values[k * iterations + t]`: eigenvalue k (descending) of
 *   draw t. It rejects with the worker mechanism's WorkerRunFailure when a thread fails.
 * References: Horn 1965, "A rationale and test for the number of factors in factor analysis";
 * Odell & Feiveson 1966, "A numerical procedure to generate a sample covariance matrix".
 */
export function randomCorrelationEigenvaluesOnThreads(
  rows: number,
  items: number,
  iterations: number,
  seed: number,
  threads: number = parallelAnalysisThreadCount(items, iterations),
): Promise<Float64Array> {
  if (!Number.isInteger(threads) || threads < 0) {
    throw new RangeError(`randomCorrelationEigenvaluesOnThreads: threads must be a non-negative integer, got ${threads}`);
  }
  const cached = cachedRandomCorrelationEigenvalues(rows, items, iterations, seed);
  if (cached !== null) return Promise.resolve(cached);
  if (threads === 0) return Promise.resolve(randomCorrelationEigenvalues(rows, items, iterations, seed));
  if (!Number.isInteger(iterations) || iterations < 1) {
    throw new RangeError(`randomCorrelationEigenvaluesOnThreads: iterations must be a positive integer, got ${iterations}`);
  }
  return eigenvaluesOnThreads('randomCorrelationEigenvaluesOnThreads', items, iterations, threads, (firstDraw, endDraw) => ({
    job: { rows, items, seed, firstDraw, endDraw },
    transfer: [],
  })).then((values) => {
    rememberRandomCorrelationEigenvalues(rows, items, iterations, seed, values);
    return values;
  });
}

/**
 * How many worker threads the polychoric parallel analysis of this size gets: none below
 * POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS pair fits, otherwise one per core the machine reports, at
 * most PARALLEL_ANALYSIS_MAX_THREADS and at most one per data set.
 * @param items Items (the order of the random matrices).
 * @param iterations Data sets.
 * @param cores Cores to use (the machine's `availableParallelism()` by default).
 * @returns 0 (estimate on the calling thread) or the number of threads.
 */
export function polychoricParallelAnalysisThreadCount(items: number, iterations: number, cores: number = availableParallelism()): number {
  if ((iterations * items * (items - 1)) / 2 < POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS) return 0;
  return Math.max(1, Math.min(cores, PARALLEL_ANALYSIS_MAX_THREADS, iterations));
}

/**
 * The random eigenvalues of polychoric parallel analysis (`randomPolychoricEigenvalues` of the
 * core, same layout and the same values to the last bit): the codes are drawn here, the matrices
 * estimated on `threads` worker threads that run while the caller goes on; with 0 threads, all on
 * the calling thread before this returns.
 * @param rows Respondents per data set (a positive integer).
 * @param thresholds Each item's thresholds, ascending (as the observed polychoric matrix found them).
 * @param iterations Data sets (a positive integer).
 * @param seed Seed of the generator.
 * @param threads Worker threads (0: none); `polychoricParallelAnalysisThreadCount` by default.
 * @throws {RangeError} when `threads` is not a non-negative integer, or a size is out of range
 *   (synchronously).
 * @returns A promise of a fresh array, `values[k * iterations + t]`: eigenvalue k (descending) of
 *   data set t. It rejects with the worker mechanism's WorkerRunFailure when a thread fails.
 * References: Garrido, Abad & Ponsoda 2013, "A new look at Horn's parallel analysis with ordinal
 * variables"; Horn 1965, "A rationale and test for the number of factors in factor analysis".
 */
export function randomPolychoricEigenvaluesOnThreads(
  rows: number,
  thresholds: readonly (readonly number[])[],
  iterations: number,
  seed: number,
  threads: number = polychoricParallelAnalysisThreadCount(thresholds.length, iterations),
): Promise<Float64Array> {
  if (!Number.isInteger(threads) || threads < 0) {
    throw new RangeError(`randomPolychoricEigenvaluesOnThreads: threads must be a non-negative integer, got ${threads}`);
  }
  const cached = cachedRandomPolychoricEigenvalues(rows, thresholds, iterations, seed);
  if (cached !== null) return Promise.resolve(cached);
  if (threads === 0) return Promise.resolve(randomPolychoricEigenvalues(rows, thresholds, iterations, seed));
  const items = thresholds.length;
  const codes = randomOrdinalCodes(rows, thresholds, iterations, seed);
  const size = rows * items;
  return eigenvaluesOnThreads('randomPolychoricEigenvaluesOnThreads', items, iterations, threads, (firstDraw, endDraw) => {
    const job: RandomPolychoricEigenvalueJob = { kind: 'polychoric', rows, items, codes: codes.slice(firstDraw * size, endDraw * size) };
    return { job, transfer: [job.codes.buffer as ArrayBuffer] };
  }).then((values) => {
    rememberRandomPolychoricEigenvalues(rows, thresholds, iterations, seed, values);
    return values;
  });
}

/**
 * Splits `iterations` draws into one range per thread (at most one thread per draw), runs each
 * range's job on the random-eigenvalue worker, and puts the answers together in draw order.
 * @param caller Name of the public function, for the error message.
 * @param items Eigenvalues per draw.
 * @param jobOf The job of draws firstDraw to endDraw − 1, and the buffers to move with it.
 * @returns A promise of `values[k * iterations + t]`: eigenvalue k of draw t.
 * References: none (splitting work over threads).
 */
function eigenvaluesOnThreads(
  caller: string,
  items: number,
  iterations: number,
  threads: number,
  jobOf: (firstDraw: number, endDraw: number) => { job: RandomEigenvalueJob | RandomPolychoricEigenvalueJob; transfer: ArrayBuffer[] },
): Promise<Float64Array> {
  const used = Math.min(threads, iterations);
  const ranges: { firstDraw: number; endDraw: number }[] = [];
  for (let thread = 0; thread < used; thread++) {
    ranges.push({ firstDraw: Math.floor((thread * iterations) / used), endDraw: Math.floor(((thread + 1) * iterations) / used) });
  }
  const answers = ranges.map(({ firstDraw, endDraw }) => {
    const { job, transfer } = jobOf(firstDraw, endDraw);
    return runWorkerOnce<Float64Array>(RANDOM_EIGENVALUE_WORKER, {
      name: RANDOM_EIGENVALUE_WORKER.name,
      workerData: job,
      ...(transfer.length > 0 ? { transferList: transfer } : {}),
      timeLimitMs: THREAD_TIME_LIMIT_MS,
      resourceLimits: { maxOldGenerationSizeMb: THREAD_HEAP_MB },
    });
  });
  return Promise.all(answers).then((parts) => {
    const drawMajor = new Float64Array(items * iterations);
    parts.forEach((part, index) => {
      const { firstDraw, endDraw } = ranges[index];
      if (part.length !== items * (endDraw - firstDraw)) {
        throw new Error(`${caller}: a thread answered ${part.length} values for draws ${firstDraw}-${endDraw - 1}, expected ${items * (endDraw - firstDraw)}`);
      }
      drawMajor.set(part, firstDraw * items);
    });
    return drawMajorToPositionMajor(drawMajor, items, iterations);
  });
}
