/**
 * Bootstrap resamples decided on worker threads: a `ResampleRunner` (engine/bootstrap-stability.ts)
 * that starts its threads through the one worker mechanism (src/lib/workers, RESAMPLE_WORKER),
 * sends each thread the matrix and the resample context once, then each resample's respondents to
 * the thread with the fewest resamples in hand. The engine counts the outcomes as they come back;
 * the counts are sums, so the stability figures do not depend on the number of threads or on the
 * order of the answers (tests/unit/resample-threads.test.ts).
 * docs/decisions/021-bootstrap-resample-decision.md.
 */
import type { Worker } from 'node:worker_threads';
import type { ResampleRunner } from '../engine/bootstrap-stability';
import type { ResampleContext, ResampleOutcome } from '../engine/resample-decision';
import type { ItemMatrix } from '../stats/types';
import { locateBundledWorker, spawnWorker } from '../workers/start-worker';
import { RESAMPLE_WORKER } from '../workers/worker-entries';
import type { ResampleAnswer, ResampleRequest } from './resample-protocol';

/** Most threads a bootstrap uses (this machine class has 2 cores; more only queue for them). */
export const MAX_RESAMPLE_THREADS = 2;

interface Pending {
  readonly resolve: (outcome: ResampleOutcome) => void;
  readonly reject: (error: Error) => void;
}

interface Thread {
  readonly worker: Worker;
  readonly pending: Map<number, Pending>;
  /** Why the thread can take no more resamples (it died), or null. */
  failure: Error | null;
}

/**
 * A runner that decides resamples on `threads` worker threads (started on `start`, ended on `close`).
 * @param threads Worker threads, an integer from 1 to MAX_RESAMPLE_THREADS.
 * @throws {RangeError} when `threads` is out of range.
 * @returns The runner; `decide` rejects when a thread dies or the engine throws (other than a
 *   RangeError, which marks the resample failed).
 * References: Node.js 20 documentation, "worker_threads" (structured clone of workerData and messages).
 */
export function createResampleThreadRunner(threads: number): ResampleRunner {
  if (!(Number.isInteger(threads) && threads >= 1 && threads <= MAX_RESAMPLE_THREADS)) {
    throw new RangeError(`createResampleThreadRunner: threads must be an integer from 1 to ${MAX_RESAMPLE_THREADS}, got ${threads}`);
  }
  const pool: Thread[] = [];
  let nextId = 0;
  return {
    parallelism: threads,
    async start(matrix: ItemMatrix, context: ResampleContext): Promise<void> {
      if (pool.length > 0) throw new Error('createResampleThreadRunner: start was called twice');
      const origin = locateBundledWorker(RESAMPLE_WORKER);
      for (let index = 0; index < threads; index++) {
        const worker = spawnWorker(origin, { name: `${RESAMPLE_WORKER.name}-${index + 1}` });
        const thread: Thread = { worker, pending: new Map(), failure: null };
        const fail = (error: Error): void => {
          thread.failure ??= error;
          for (const entry of thread.pending.values()) entry.reject(thread.failure);
          thread.pending.clear();
        };
        worker.on('message', (answer: ResampleAnswer) => {
          const entry = thread.pending.get(answer.id);
          if (entry === undefined) return;
          thread.pending.delete(answer.id);
          if (answer.type === 'decided') entry.resolve(answer.outcome);
          else entry.reject(Object.assign(new Error(`A bootstrap resample failed on its thread: ${answer.message}`), { name: answer.name }));
        });
        worker.on('error', (error) => fail(error instanceof Error ? error : new Error(String(error))));
        worker.on('exit', (code) => fail(new Error(`A bootstrap resample thread stopped (exit code ${code})`)));
        const request: ResampleRequest = { type: 'start', matrix, context };
        worker.postMessage(request);
        pool.push(thread);
      }
    },
    decide(rows: Int32Array): Promise<ResampleOutcome> {
      if (pool.length === 0) return Promise.reject(new Error('createResampleThreadRunner: decide before start'));
      let chosen = pool[0];
      for (const thread of pool) if (thread.failure === null && (chosen.failure !== null || thread.pending.size < chosen.pending.size)) chosen = thread;
      if (chosen.failure !== null) return Promise.reject(chosen.failure);
      const id = nextId++;
      return new Promise<ResampleOutcome>((resolve, reject) => {
        chosen.pending.set(id, { resolve, reject });
        const request: ResampleRequest = { type: 'decide', id, rows };
        chosen.worker.postMessage(request, [rows.buffer as ArrayBuffer]);
      });
    },
    async close(): Promise<void> {
      const ending = pool.splice(0);
      for (const thread of ending) thread.failure ??= new Error('The bootstrap resample threads were closed');
      await Promise.all(ending.map((thread) => thread.worker.terminate()));
    },
  };
}
