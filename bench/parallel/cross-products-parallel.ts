/**
 * Centred cross-products summed by worker threads, each over its own share of the respondents,
 * the partial sums then added. Same result as `centeredCrossProducts` up to the order of the
 * additions (a relative difference near 1e-15).
 *
 * Node-only (node:worker_threads, node:os): it lives under parallel/ so that importing the
 * rest of the core never pulls these modules in.
 *
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance:
 * analysis and recommendations" (partial sums combined); Node.js documentation, "Worker threads".
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import {
  CROSS_PRODUCT_BLOCK_ROWS,
  checkItemMatrixShape,
  checkedItemMeans,
  mirrorUpperTriangle,
  type CenteredCrossProducts,
} from '../../src/lib/stats/cross-products';
import type { ItemMatrix } from '../../src/lib/stats/types';
import { crossProductsWorkerSource, type CrossProductsTask } from './cross-products-worker';

/** Options of `centeredCrossProductsParallel`. */
export interface ParallelCrossProductsOptions {
  /** Worker threads to start (default: the machine's available parallelism, at most 8). */
  readonly workers?: number;
}

/**
 * Respondents below which a worker is not worth starting (a worker costs about 30 ms to start,
 * the pass over 1,000 rows of 300 items about 20 ms). Performance only, not a tolerance.
 */
export const MINIMUM_ROWS_PER_WORKER = 1_000;

/**
 * Centred cross-products of complete data computed by worker threads sharing the data through
 * a SharedArrayBuffer. When `matrix.data` already lives in a SharedArrayBuffer it is used in
 * place; otherwise it is copied once into one (rows × columns × 8 bytes more memory while the
 * call runs). The means are computed (and the data checked) on the calling thread first. Fewer
 * workers than asked are started when there are fewer than MINIMUM_ROWS_PER_WORKER respondents
 * per worker (at least one is always started).
 * @param matrix Respondents × items, column-major, every value finite.
 * @param options `workers`: worker threads to use (an integer from 1 to 64).
 * @throws {RangeError} when the matrix has no respondents or no items, or its data length is wrong.
 * @throws {RangeError} naming the first item that holds a missing (NaN) or non-finite value.
 * @throws {RangeError} when `workers` is not an integer from 1 to 64.
 * @returns (a promise of) the same result as `centeredCrossProducts`.
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance:
 * analysis and recommendations".
 */
export async function centeredCrossProductsParallel(
  matrix: ItemMatrix,
  options: ParallelCrossProductsOptions = {},
): Promise<CenteredCrossProducts> {
  const caller = 'centeredCrossProductsParallel';
  checkItemMatrixShape(matrix, caller);
  const requested = options.workers ?? Math.min(8, availableParallelism());
  if (!Number.isInteger(requested) || requested < 1 || requested > 64) {
    throw new RangeError(`${caller}: workers must be an integer from 1 to 64, got ${requested}`);
  }
  const means = checkedItemMeans(matrix, caller);
  const { rows, columns } = matrix;
  const workerCount = Math.max(1, Math.min(requested, Math.floor(rows / MINIMUM_ROWS_PER_WORKER)));

  const { buffer, byteOffset } = sharedCopyOf(matrix.data);
  const source = crossProductsWorkerSource();
  const partials = await Promise.all(
    Array.from({ length: workerCount }, (_, w) => {
      const task: CrossProductsTask = {
        buffer,
        byteOffset,
        rows,
        columns,
        means: means.slice(),
        rowStart: Math.floor((w * rows) / workerCount),
        rowEnd: Math.floor(((w + 1) * rows) / workerCount),
        blockRows: CROSS_PRODUCT_BLOCK_ROWS,
      };
      return runWorker(source, task);
    }),
  );

  const sums = partials[0];
  for (let w = 1; w < partials.length; w++) {
    const partial = partials[w];
    for (let index = 0; index < sums.length; index++) sums[index] += partial[index];
  }
  mirrorUpperTriangle(sums, columns);
  return { rows, means, centered: { order: columns, data: sums } };
}

/** The data inside a SharedArrayBuffer: the original when it already is shared, else a copy. */
function sharedCopyOf(data: Float64Array): { buffer: SharedArrayBuffer; byteOffset: number } {
  if (data.buffer instanceof SharedArrayBuffer) return { buffer: data.buffer, byteOffset: data.byteOffset };
  const buffer = new SharedArrayBuffer(data.byteLength);
  new Float64Array(buffer).set(data);
  return { buffer, byteOffset: 0 };
}

/** Starts one worker on one task and resolves with its partial sums. */
function runWorker(source: string, task: CrossProductsTask): Promise<Float64Array> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(source, { eval: true, workerData: task });
    let settled = false;
    worker.once('message', (sums: Float64Array) => {
      settled = true;
      resolve(sums);
      void worker.terminate();
    });
    worker.once('error', (error) => {
      settled = true;
      reject(new Error(`centeredCrossProductsParallel: a worker failed: ${error.message}`));
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`centeredCrossProductsParallel: a worker exited with code ${code} before answering`));
    });
  });
}
