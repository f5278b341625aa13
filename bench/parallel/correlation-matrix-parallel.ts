/**
 * The correlation matrix with polychoric pairs spread over worker threads. Pearson and
 * Spearman matrices are computed on the calling thread (they take milliseconds); so is a
 * polychoric matrix too small for workers to pay for their start-up.
 *
 * Node-only (node:worker_threads, node:os): it lives under parallel/ so that importing the rest
 * of the core never pulls these modules in.
 *
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient"; Node.js documentation, "Worker threads".
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import {
  finishCorrelationMatrix,
  prepareCorrelationMatrix,
  type CorrelationMatrixOptions,
  type CorrelationMatrixResult,
} from '../../src/lib/stats/correlation-matrix';
import { estimatePolychoricPairs, POLYCHORIC_PAIR_FIELDS, type PolychoricPairsJob } from '../../src/lib/stats/polychoric-pairs';
import type { ItemMatrix, NumericalNotice } from '../../src/lib/stats/types';
import { polychoricWorkerSource } from './polychoric-worker';

/** Options of `correlationMatrixParallel`. */
export interface ParallelCorrelationMatrixOptions extends CorrelationMatrixOptions {
  /**
   * Worker threads for polychoric pairs (default: available parallelism, at most 8). 1 computes
   * on the calling thread.
   */
  readonly workers?: number;
  /**
   * Smallest amount of work (pairs × respondents) worth starting workers for; below it the
   * calling thread does the work. Default POLYCHORIC_PARALLEL_MIN_WORK; 0 always uses workers.
   */
  readonly minimumWork?: number;
}

/**
 * Pairs × respondents below which workers do not pay. Measured here: starting two eval workers
 * costs about 60 ms, and each then runs its share cold (unoptimised) at first, while one warm
 * thread estimates about 100 million pair-respondents per second (2,000 × 100 five-point items,
 * 9.9 million, in about 0.1 s). Below about 0.3 s of single-thread work the workers only add
 * time. Performance only, not a tolerance.
 */
export const POLYCHORIC_PARALLEL_MIN_WORK = 30_000_000;

/**
 * Same result as `correlationMatrix`, with polychoric pairs estimated by worker threads (each
 * gets every `workers`-th pair, which balances the load). If a worker cannot start or fails
 * its self-check, its pairs are estimated on the calling thread and a `parallel-unavailable`
 * notice says so; the numbers are the same either way.
 * @param matrix Respondents × items, column-major, NaN for missing.
 * @param options Method, missing-data policy, `workers` (integer 1 to 64) and `minimumWork`.
 * @throws {RangeError} as `correlationMatrix` does, and when `workers` is not an integer from
 *   1 to 64 or `minimumWork` is negative.
 * @returns (a promise of) the correlation matrix result.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export async function correlationMatrixParallel(
  matrix: ItemMatrix,
  options: ParallelCorrelationMatrixOptions,
): Promise<CorrelationMatrixResult> {
  const caller = 'correlationMatrixParallel';
  const workers = options?.workers ?? Math.min(8, availableParallelism());
  if (!Number.isInteger(workers) || workers < 1 || workers > 64) {
    throw new RangeError(`${caller}: workers must be an integer from 1 to 64, got ${workers}`);
  }
  const minimumWork = options?.minimumWork ?? POLYCHORIC_PARALLEL_MIN_WORK;
  if (!(minimumWork >= 0)) throw new RangeError(`${caller}: minimumWork must be >= 0, got ${minimumWork}`);
  const prepared = prepareCorrelationMatrix(matrix, options, caller);
  const job = prepared.polychoricJob;
  if (job === null) return finishCorrelationMatrix(prepared, null);
  const pairCount = job.pairs.length / 2;
  const threads = Math.min(workers, pairCount);
  if (threads < 2 || pairCount * job.respondents < minimumWork) return finishCorrelationMatrix(prepared, estimatePolychoricPairs(job));

  const shares = splitPairs(job, threads);
  const source = polychoricWorkerSource();
  const failures: string[] = [];
  const results = await Promise.all(
    shares.map(async (share) => {
      try {
        return await runWorker(source, share);
      } catch (error) {
        failures.push((error as Error).message);
        return estimatePolychoricPairs(share);
      }
    }),
  );
  const merged = new Float64Array(pairCount * POLYCHORIC_PAIR_FIELDS);
  shares.forEach((share, w) => {
    const result = results[w];
    for (let s = 0; s < share.pairs.length / 2; s++) {
      const p = s * threads + w;
      merged.set(result.subarray(s * POLYCHORIC_PAIR_FIELDS, (s + 1) * POLYCHORIC_PAIR_FIELDS), p * POLYCHORIC_PAIR_FIELDS);
    }
  });
  const finished = finishCorrelationMatrix(prepared, merged);
  if (failures.length === 0) return finished;
  const notice: NumericalNotice = {
    code: 'parallel-unavailable',
    items: [],
    message: `Worker threads could not be used (${failures[0]}); the polychoric pairs were estimated on one thread instead, with the same results.`,
  };
  return { ...finished, notices: [...finished.notices, notice] };
}

/** Worker w receives pairs w, w + threads, w + 2·threads, ... */
function splitPairs(job: PolychoricPairsJob, threads: number): PolychoricPairsJob[] {
  const pairCount = job.pairs.length / 2;
  const shares: PolychoricPairsJob[] = [];
  for (let w = 0; w < threads; w++) {
    const size = Math.ceil((pairCount - w) / threads);
    const pairs = new Int32Array(2 * size);
    for (let s = 0; s < size; s++) {
      const p = s * threads + w;
      pairs[2 * s] = job.pairs[2 * p];
      pairs[2 * s + 1] = job.pairs[2 * p + 1];
    }
    shares.push({ ...job, pairs });
  }
  return shares;
}

function runWorker(source: string, share: PolychoricPairsJob): Promise<Float64Array> {
  return new Promise((resolve, reject) => {
    let settled = false;
    const worker = new Worker(source, { eval: true, workerData: share });
    const finish = (error: Error | null, value?: Float64Array): void => {
      if (settled) return;
      settled = true;
      void worker.terminate();
      if (error !== null) reject(error);
      else resolve(value as Float64Array);
    };
    worker.once('message', (message: unknown) => {
      if (message instanceof Float64Array) finish(null, message);
      else finish(new Error(`the worker reported: ${(message as { failed?: string })?.failed ?? 'an unexpected message'}`));
    });
    worker.once('error', (error) => finish(error));
    worker.once('exit', (code) => finish(new Error(`the worker stopped with code ${code} before answering`)));
  });
}
