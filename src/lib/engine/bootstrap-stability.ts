/**
 * Bootstrap stability of the recommendations: resample respondents with replacement (seeded, so
 * the shares repeat), run the whole decision again on each resample (evidence, clusters, cut list
 * under the same constraints), and count for each recommendation the share of resamples that make
 * the same one. "The same one" means a recommendation with the same keeper and the same set of
 * items changed (dropped, merged or reworded; the label between drop and merge may differ, since
 * it only reflects how close r is to 1). A recommendation whose share is below the stability
 * threshold (default 0.70) is marked unstable.
 *
 * A second share tells the two kinds of instability apart: the share of resamples in which the
 * cluster's items are again found together in one recommendation's cluster (whatever is kept).
 * Near-identical twins give a high overlap share and a keeper that flips between them: the
 * overlap is stable, the choice between the twins is not (choose by wording).
 *
 * Each resample runs the evidence at `decision` detail (no omega, no alpha if deleted), with the
 * local-dependence evidence recomputed (residuals, network, wTO) but each scale's residual
 * critical value and the network penalty taken from the full sample, to keep it affordable; what
 * else a resample skips without changing its decision is in resample-decision.ts.
 *
 * The resamples' respondents are drawn from one seeded stream, resample after resample, on the
 * calling thread; a `ResampleRunner` may then decide them on other threads, in any order: the
 * counts are sums, so the shares are the same whatever the number of threads.
 */
import { createSeededRandom } from '../stats/seeded-random';
import type { ItemMatrix } from '../stats/types';
import type { EngineSettings } from './engine-settings';
import type { Recommendation } from './recommend-cuts';
import { recommendationSignature, resampleDecision, type ResampleContext, type ResampleOutcome } from './resample-decision';
import type { EngineItem } from './types';
import type { LocalDependenceReuse } from './local-dependence';

export { recommendationSignature } from './resample-decision';

/**
 * Decides resamples, possibly on other threads. `start` receives what every resample shares;
 * `decide` one resample's respondents (row indices into the matrix, repeats allowed) and resolves
 * to what it decided. Results must not depend on which thread decides what.
 */
export interface ResampleRunner {
  /** How many resamples to keep in flight (the runner's threads, or 1). */
  readonly parallelism: number;
  start(matrix: ItemMatrix, context: ResampleContext): Promise<void>;
  decide(rows: Int32Array): Promise<ResampleOutcome>;
  /** Releases the threads; called once, also after a failure or an abort. */
  close(): Promise<void>;
}

/** Progress callback: a stage name and the fraction of it done, in [0, 1]. */
export type EngineProgress = (stage: string, fraction: number) => void;

/** Options of `bootstrapStability`. */
export interface StabilityOptions {
  /** Called after every resample with stage `bootstrap`. */
  readonly onProgress?: EngineProgress;
  /** Aborts between resamples (the promise rejects with the signal's reason). */
  readonly signal?: AbortSignal;
  /** Decides the resamples (default: on the calling thread, yielding to the event loop). */
  readonly runner?: ResampleRunner;
  /**
   * Local-dependence figures reused from the full sample: each scale's residual critical value
   * (not re-bootstrapped inside every resample) and the EBIC-selected network penalty (each
   * resample fits one graphical lasso at it instead of a 100-penalty path). Null: no
   * local-dependence evidence in the resamples (as on the full sample).
   */
  readonly reuse?: LocalDependenceReuse | null;
}

/** The stability of each recommendation. */
export interface StabilityResult {
  /** Resamples drawn. */
  readonly resamples: number;
  /** Share of resamples that made each recommendation (same order as the input). */
  readonly shares: readonly number[];
  /** Share of resamples that found each recommendation's cluster items together in one cluster. */
  readonly overlapShares: readonly number[];
  /** share < threshold. */
  readonly unstable: readonly boolean[];
  readonly threshold: number;
  readonly seed: number;
  /** Resamples on which the core refused the data (counted as not agreeing). */
  readonly failedResamples: number;
}

/** Work between two returns to the event loop, milliseconds (lets an abort or a health check through). */
const YIELD_EVERY_MS = 20;

function yieldToEventLoop(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

/**
 * Bootstrap share of resamples that repeat each recommendation.
 * @param matrix The recoded matrix of the audit; not modified.
 * @param items The engine's items (same order as the matrix columns).
 * @param settings The engine settings the recommendations were made with (`bootstrap` resamples,
 *   `seed`, `stabilityThreshold`, thresholds and constraints).
 * @param wording Wording similarity in items[] order.
 * @param recommendations The recommendations on the full sample.
 * @param options `onProgress` and `signal`.
 * @throws {RangeError} when `settings.bootstrap` is not a positive integer or the matrix has no respondents.
 * @throws the signal's reason when aborted.
 * @returns The share per recommendation, the share that found its cluster again, which are
 *   unstable, and how many resamples failed.
 * References: Efron 1979, "Bootstrap methods: another look at the jackknife" (Annals of
 * Statistics 7:1-26).
 */
export async function bootstrapStability(
  matrix: ItemMatrix,
  items: readonly EngineItem[],
  settings: EngineSettings,
  wording: readonly (readonly (number | null)[])[],
  recommendations: readonly Recommendation[],
  options: StabilityOptions = {},
): Promise<StabilityResult> {
  const resamples = settings.bootstrap;
  if (!(Number.isInteger(resamples) && resamples >= 1)) throw new RangeError(`bootstrapStability: bootstrap must be a positive integer, got ${resamples}`);
  if (!(matrix.rows >= 1)) throw new RangeError('bootstrapStability: the matrix has no respondents');
  const targets = recommendations.map(recommendationSignature);
  const agreeing = new Array<number>(targets.length).fill(0);
  const overlapping = new Array<number>(targets.length).fill(0);
  const random = createSeededRandom(settings.seed);
  let failedResamples = 0;
  let finished = 0;
  const count = (outcome: ResampleOutcome): void => {
    if (outcome.failed) failedResamples++;
    const made = new Set(outcome.made);
    const clustersMade = outcome.clusters.map((cluster) => new Set(cluster));
    targets.forEach((target, k) => {
      if (made.has(target)) agreeing[k]++;
      if (clustersMade.some((cluster) => recommendations[k].cluster.every((id) => cluster.has(id)))) overlapping[k]++;
    });
    finished++;
    options.onProgress?.('bootstrap', finished / resamples);
  };
  const context: ResampleContext = {
    items,
    settings,
    wording,
    reuse: options.reuse ?? null,
  };
  // Resample b's respondents: the b-th block of draws from the one stream, drawn in order here.
  const draw = (): Int32Array => {
    const rows = new Int32Array(matrix.rows);
    for (let i = 0; i < matrix.rows; i++) rows[i] = random.nextInt(matrix.rows);
    return rows;
  };

  if (options.runner === undefined) {
    let lastYield = Date.now();
    for (let b = 0; b < resamples; b++) {
      options.signal?.throwIfAborted();
      count(resampleDecision(matrix, draw(), context));
      if (Date.now() - lastYield >= YIELD_EVERY_MS) {
        await yieldToEventLoop();
        lastYield = Date.now();
      }
    }
  } else {
    const runner = options.runner;
    try {
      await runner.start(matrix, context);
      const inFlight = new Set<Promise<void>>();
      let failure: { error: unknown } | null = null;
      for (let b = 0; b < resamples && failure === null; b++) {
        options.signal?.throwIfAborted();
        const pending: Promise<void> = runner
          .decide(draw())
          .then(count, (error: unknown) => {
            failure ??= { error };
          })
          .finally(() => inFlight.delete(pending));
        inFlight.add(pending);
        if (inFlight.size >= Math.max(1, runner.parallelism) * 2) await Promise.race(inFlight);
      }
      await Promise.all(inFlight);
      if (failure !== null) throw (failure as { error: unknown }).error;
    } finally {
      await runner.close();
    }
  }
  options.signal?.throwIfAborted();
  const shares = agreeing.map((count) => count / resamples);
  return {
    resamples,
    shares,
    overlapShares: overlapping.map((count) => count / resamples),
    unstable: shares.map((share) => share < settings.stabilityThreshold),
    threshold: settings.stabilityThreshold,
    seed: settings.seed,
    failedResamples,
  };
}
