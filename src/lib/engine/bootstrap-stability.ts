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
 * critical value and the network penalty taken from the full sample, to keep it affordable. With no
 * missing answer the core's complete-data path (one cross-product pass) computes the Pearson
 * matrix; with missing answers each pair is computed over its own complete rows.
 */
import { createSeededRandom } from '../stats/seeded-random';
import { selectRespondents, type ItemMatrix } from '../stats/types';
import { computeEvidence, scaleAlphaOracle } from './compute-evidence';
import type { EngineSettings } from './engine-settings';
import { findOverlapClusters } from './overlap-clusters';
import { recommendCuts, type Recommendation } from './recommend-cuts';
import type { EngineItem } from './types';
import type { LocalDependenceReuse } from './local-dependence';

/** Progress callback: a stage name and the fraction of it done, in [0, 1]. */
export type EngineProgress = (stage: string, fraction: number) => void;

/** Options of `bootstrapStability`. */
export interface StabilityOptions {
  /** Called after every resample with stage `bootstrap`. */
  readonly onProgress?: EngineProgress;
  /** Aborts between resamples (the promise rejects with the signal's reason). */
  readonly signal?: AbortSignal;
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

/**
 * What identifies a recommendation across resamples: the keeper and the sorted ids of the items
 * changed (dropped, merged or reworded).
 * @param recommendation A recommendation (its keeper and actions).
 * @returns `keeper|id,id,...`.
 * References: none (an identity key, not a method).
 */
export function recommendationSignature(recommendation: Pick<Recommendation, 'keep' | 'actions'>): string {
  const changed = recommendation.actions
    .filter((action) => action.action !== 'keep')
    .map((action) => action.item)
    .sort();
  return `${recommendation.keep}|${changed.join(',')}`;
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
  const rows = new Array<number>(matrix.rows);
  let failedResamples = 0;
  let lastYield = Date.now();

  for (let b = 0; b < resamples; b++) {
    options.signal?.throwIfAborted();
    for (let i = 0; i < matrix.rows; i++) rows[i] = random.nextInt(matrix.rows);
    const sample = selectRespondents(matrix, rows);
    let made: Set<string>;
    let clustersMade: Set<string>[] = [];
    try {
      const evidence = computeEvidence(sample, items, settings, {
        detail: 'decision',
        localDependence: options.reuse === undefined || options.reuse === null ? false : { reuse: options.reuse },
      });
      const { clusters } = findOverlapClusters(evidence, wording, settings);
      const cuts = recommendCuts(evidence, clusters, settings, scaleAlphaOracle(evidence, sample));
      made = new Set(cuts.recommendations.map(recommendationSignature));
      clustersMade = cuts.recommendations.map((recommendation) => new Set(recommendation.cluster));
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
      failedResamples++;
      made = new Set();
    }
    targets.forEach((target, k) => {
      if (made.has(target)) agreeing[k]++;
      if (clustersMade.some((cluster) => recommendations[k].cluster.every((id) => cluster.has(id)))) overlapping[k]++;
    });
    options.onProgress?.('bootstrap', (b + 1) / resamples);
    if (Date.now() - lastYield >= YIELD_EVERY_MS) {
      await yieldToEventLoop();
      lastYield = Date.now();
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
