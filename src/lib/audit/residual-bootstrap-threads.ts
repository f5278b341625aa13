/**
 * The local-dependence residual bootstrap of the full sample on worker threads: each scale's
 * parametric bootstrap (residualBootstrap, its own seed: settings.seed + the scale's position) is
 * independent of the others', so the scales are spread over a few threads while the calling thread
 * goes on with the rest of the evidence (the graphical-lasso network); the critical values are
 * gathered in scale order and put where the one-thread path puts them.
 *
 * How: the evidence is computed with `deferredResidualCriticals().detectors`, the core's detectors
 * except that a scale's critical value is only written down as a job (and left null); the jobs go
 * to the threads (`residualCriticalsOnThreads`), and `withResidualCriticals` puts the answers into
 * the evidence. Each thread runs the core's own `residualCritical` on its scales, so every value is
 * the one-thread value to the last bit. A scale whose bootstrap fails (too few usable draws) fails
 * the audit with the same RangeError as on one thread.
 *
 * Below RESIDUAL_BOOTSTRAP_THREAD_MIN_WORK (draws × respondents × items, summed over the scales)
 * the bootstrap stays on the calling thread: a thread costs about 60 ms to start (more from
 * source, where it is bundled once per process). docs/decisions/020-speed-whole-audit.md
 * (addendum: local-dependence bootstrap on threads).
 */
import { availableParallelism } from 'node:os';
import { coreDetectors } from '../engine/core-detectors';
import { MIN_ITEMS_FOR_RESIDUALS, type LocalDependenceDetectors } from '../engine/local-dependence';
import type { EngineEvidence } from '../engine/types';
import { runWorkerOnce } from '../workers/start-worker';
import { RESIDUAL_BOOTSTRAP_WORKER } from '../workers/worker-entries';

/**
 * Work (draws × respondents × items, over all scales) from which the scales go to worker threads:
 * 200 draws of 500 respondents on 20 items, roughly 0.15-0.25 s on one thread here; a 2,000 × 10
 * scale with 200 draws is 4e6 of it (about 0.3-0.5 s).
 */
export const RESIDUAL_BOOTSTRAP_THREAD_MIN_WORK = 2e6;

/** The most threads the scales are spread over (performance only). */
export const RESIDUAL_BOOTSTRAP_MAX_THREADS = 4;

/** A thread's time limit: far above any bootstrap here, it ends only a thread that hangs. */
const THREAD_TIME_LIMIT_MS = 30 * 60 * 1000;

/** A thread's old-generation heap limit in MB: a draw holds respondents × (items + 1) doubles twice. */
const THREAD_HEAP_MB = 512;

/** One scale's bootstrap: the arguments of `LocalDependenceDetectors.residualCritical`. */
export interface ResidualCriticalJob {
  readonly loadings: readonly number[];
  readonly sampleSize: number;
  readonly options: Parameters<LocalDependenceDetectors['residualCritical']>[2];
}

/** One thread's job (its `workerData`): the scales it computes. */
export interface ResidualCriticalThreadJob {
  readonly jobs: readonly ResidualCriticalJob[];
}

/** A thread's answer: the critical values in job order, or the RangeError a bootstrap threw. */
export type ResidualCriticalThreadAnswer =
  | { readonly kind: 'values'; readonly values: readonly (number | null)[] }
  | { readonly kind: 'range-error'; readonly message: string };

/**
 * Runs the jobs of one thread with the core's detectors (the worker's work; also callable here).
 * @param job The scales.
 * @returns Their critical values, or the message of the RangeError one of them threw.
 */
export function runResidualCriticalJobs(job: ResidualCriticalThreadJob): ResidualCriticalThreadAnswer {
  try {
    return { kind: 'values', values: job.jobs.map((scale) => coreDetectors.residualCritical(scale.loadings, scale.sampleSize, scale.options)) };
  } catch (error) {
    if (error instanceof RangeError) return { kind: 'range-error', message: error.message };
    throw error;
  }
}

/**
 * How many worker threads the scales' bootstraps of a wave get, known before its evidence: none
 * when fewer than two scales have enough items for residuals or their work (draws × respondents ×
 * items over those scales) is below RESIDUAL_BOOTSTRAP_THREAD_MIN_WORK; otherwise one per core, at
 * most RESIDUAL_BOOTSTRAP_MAX_THREADS and at most one per scale.
 * @param itemScales Each item's scale (null: none).
 * @param respondents Rows of the matrix.
 * @param draws Bootstrap draws per scale (0: no bootstrap).
 * @param cores Cores to use (the machine's `availableParallelism()` by default).
 * @returns 0 (bootstrap on the calling thread) or the number of threads.
 */
export function residualBootstrapThreadCount(itemScales: readonly (string | null)[], respondents: number, draws: number, cores: number = availableParallelism()): number {
  const members = new Map<string, number>();
  for (const scale of itemScales) if (scale !== null) members.set(scale, (members.get(scale) ?? 0) + 1);
  let scales = 0;
  let items = 0;
  for (const count of members.values()) {
    if (count < MIN_ITEMS_FOR_RESIDUALS) continue;
    scales += 1;
    items += count;
  }
  if (scales < 2 || draws * respondents * items < RESIDUAL_BOOTSTRAP_THREAD_MIN_WORK) return 0;
  return Math.max(1, Math.min(cores, RESIDUAL_BOOTSTRAP_MAX_THREADS, scales));
}

/**
 * Detectors that write each scale's bootstrap down instead of running it (its critical value is
 * left null until `withResidualCriticals`), and the jobs written, in the order the engine asked.
 * @returns The detectors (the core's otherwise) and the list they fill.
 */
export function deferredResidualCriticals(): { detectors: LocalDependenceDetectors; jobs: ResidualCriticalJob[] } {
  const jobs: ResidualCriticalJob[] = [];
  const detectors: LocalDependenceDetectors = {
    scaleResiduals: coreDetectors.scaleResiduals,
    network: coreDetectors.network,
    modificationIndices: coreDetectors.modificationIndices,
    residualCritical(loadings, sampleSize, options) {
      jobs.push({ loadings: [...loadings], sampleSize, options: { ...options } });
      return null;
    },
  };
  return { detectors, jobs };
}

/**
 * The critical values of the jobs, computed on `threads` worker threads (the jobs dealt out so that
 * each thread has about the same work, largest first) that run while the caller goes on; with 0
 * threads, on the calling thread before this returns.
 * @param jobs The scales' bootstraps, as `deferredResidualCriticals` wrote them.
 * @param threads Worker threads (0: none).
 * @throws {RangeError} when `threads` is not a non-negative integer (synchronously).
 * @returns A promise of the critical values in job order; it rejects with the RangeError of a
 *   bootstrap that could not be made, or the worker mechanism's WorkerRunFailure when a thread fails.
 * References: Christensen, Makransky & Horton 2017 (the bootstrap each job runs).
 */
export function residualCriticalsOnThreads(jobs: readonly ResidualCriticalJob[], threads: number): Promise<(number | null)[]> {
  if (!Number.isInteger(threads) || threads < 0) throw new RangeError(`residualCriticalsOnThreads: threads must be a non-negative integer, got ${threads}`);
  const answerOf = (answer: ResidualCriticalThreadAnswer): readonly (number | null)[] => {
    if (answer.kind === 'range-error') throw new RangeError(answer.message);
    return answer.values;
  };
  if (threads === 0 || jobs.length === 0) {
    try {
      return Promise.resolve([...answerOf(runResidualCriticalJobs({ jobs }))]);
    } catch (error) {
      return Promise.reject(error);
    }
  }
  const used = Math.min(threads, jobs.length);
  const workOf = (job: ResidualCriticalJob): number => job.options.draws * job.sampleSize * job.loadings.length;
  const shares: number[][] = Array.from({ length: used }, () => []);
  const load = new Array<number>(used).fill(0);
  const order = jobs.map((_, index) => index).sort((x, y) => workOf(jobs[y]) - workOf(jobs[x]) || x - y);
  for (const index of order) {
    const lightest = load.indexOf(Math.min(...load));
    shares[lightest].push(index);
    load[lightest] += workOf(jobs[index]);
  }
  const answers = shares.map((share) =>
    runWorkerOnce<ResidualCriticalThreadAnswer>(RESIDUAL_BOOTSTRAP_WORKER, {
      name: RESIDUAL_BOOTSTRAP_WORKER.name,
      workerData: { jobs: share.map((index) => jobs[index]) } satisfies ResidualCriticalThreadJob,
      timeLimitMs: THREAD_TIME_LIMIT_MS,
      resourceLimits: { maxOldGenerationSizeMb: THREAD_HEAP_MB },
    }),
  );
  return Promise.all(answers).then((parts) => {
    const values = new Array<number | null>(jobs.length).fill(null);
    parts.forEach((part, thread) => {
      const got = answerOf(part);
      if (got.length !== shares[thread].length) {
        throw new Error(`residualCriticalsOnThreads: a thread answered ${got.length} values for ${shares[thread].length} scales`);
      }
      shares[thread].forEach((index, position) => (values[index] = got[position]));
    });
    return values;
  });
}

/**
 * The evidence with each scale's critical value from the threads (the scales asked for them in
 * their order, one each: `localDependenceEvidence` calls residualCritical once per scale it keeps).
 * @param evidence Evidence computed with `deferredResidualCriticals().detectors`.
 * @param values The critical values, in the order of its jobs.
 * @throws {Error} when the number of values is not the number of scales.
 * @returns The evidence with the values in place (the same object when there is nothing to set).
 */
export function withResidualCriticals(evidence: EngineEvidence, values: readonly (number | null)[]): EngineEvidence {
  const local = evidence.localDependence;
  if (local === null || values.length === 0) {
    if (values.length !== 0) throw new Error(`withResidualCriticals: ${values.length} critical values for no local-dependence evidence`);
    return evidence;
  }
  if (local.scales.length !== values.length) throw new Error(`withResidualCriticals: ${values.length} critical values for ${local.scales.length} scales`);
  return { ...evidence, localDependence: { ...local, scales: local.scales.map((scale, s) => ({ ...scale, critical: values[s] })) } };
}
