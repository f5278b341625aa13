/**
 * A bounded pool of audit worker threads. At most `size` audits run at once, each in its own
 * thread; further ones wait in a first-in, first-out queue. Threads are started when needed and
 * kept for the next job; an idle thread does not keep the process alive (unref). A thread that
 * dies (an uncaught error, an exit) fails the job it held with the reason and is replaced by a
 * fresh one for the next job.
 *
 * References: Node.js documentation, "Worker threads" (Worker, postMessage, 'error' and 'exit').
 */
import type { Worker } from 'node:worker_threads';
import type { AuditJobResult } from './execute-audit-job';
import type { AuditWorkerJob, AuditWorkerMessage } from './worker-protocol';

/** One queued audit: how to make its job when a thread is free, and what to tell on the way. */
export interface PoolTask<Job extends { readonly jobId: string } = AuditWorkerJob> {
  /**
   * Builds the job when a thread is free (so a queued audit holds no data while it waits).
   * Returns null when there is nothing to run any more (e.g. the audit was deleted).
   */
  readonly prepare: () => Job | null;
  /** Called when the job is handed to a thread. */
  readonly onStart?: () => void;
  /** Called with the worker's progress. */
  readonly onProgress?: (stage: string, fraction: number) => void;
}

/** A job that failed: its reason is meant to be stored and shown. */
export class AuditJobFailure extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'AuditJobFailure';
  }
}

interface Pending<Job extends { readonly jobId: string }> {
  readonly task: PoolTask<Job>;
  readonly resolve: (result: AuditJobResult | null) => void;
  readonly reject: (error: unknown) => void;
}

/** Counts for logs and tests. */
export interface PoolState {
  readonly size: number;
  readonly threads: number;
  readonly busy: number;
  readonly queued: number;
}

/**
 * The pool: `run` queues an audit job; at most `size` run at once, each in its own thread. The
 * what-if worker (what-if-jobs.ts) speaks the same protocol with its own job type.
 */
export class AuditWorkerPool<Job extends { readonly jobId: string } = AuditWorkerJob> {
  readonly size: number;
  private readonly spawn: () => Worker;
  private readonly idle: Worker[] = [];
  private readonly threads = new Set<Worker>();
  private readonly queue: Pending<Job>[] = [];
  private busy = 0;
  private nextJob = 1;
  private closed = false;

  /**
   * @param size the most audits running at once (an integer from 1 to 64).
   * @param spawn starts one worker thread.
   * @throws {RangeError} when size is not an integer from 1 to 64.
   */
  constructor(size: number, spawn: () => Worker) {
    if (!Number.isInteger(size) || size < 1 || size > 64) throw new RangeError(`AuditWorkerPool: size must be an integer from 1 to 64, got ${size}`);
    this.size = size;
    this.spawn = spawn;
  }

  /** Threads, busy ones and waiting tasks. */
  state(): PoolState {
    return { size: this.size, threads: this.threads.size, busy: this.busy, queued: this.queue.length };
  }

  /**
   * Queues a task.
   * @param task how to build the job and whom to tell.
   * @returns the result text and timings, or null when `prepare` found nothing to run; rejects
   *   with AuditJobFailure (the audit failed, with its reason) or the error `prepare` threw.
   */
  run(task: PoolTask<Job>): Promise<AuditJobResult | null> {
    if (this.closed) return Promise.reject(new AuditJobFailure('The audit pool is shut down.'));
    return new Promise((resolve, reject) => {
      this.queue.push({ task, resolve, reject });
      this.pump();
    });
  }

  /** Ends every thread; queued and running tasks fail. */
  async close(): Promise<void> {
    this.closed = true;
    for (const pending of this.queue.splice(0)) pending.reject(new AuditJobFailure('The audit pool is shut down.'));
    await Promise.all([...this.threads].map((worker) => worker.terminate()));
    this.threads.clear();
    this.idle.length = 0;
  }

  private pump(): void {
    while (this.queue.length > 0 && (this.idle.length > 0 || this.threads.size < this.size)) {
      const pending = this.queue.shift()!;
      let worker: Worker;
      try {
        worker = this.idle.pop() ?? this.startThread();
      } catch (error) {
        pending.reject(new AuditJobFailure(`An audit worker could not be started: ${(error as Error).message}`));
        continue;
      }
      this.dispatch(worker, pending);
    }
  }

  private startThread(): Worker {
    const worker = this.spawn();
    this.threads.add(worker);
    // A thread that dies while idle is simply forgotten.
    worker.on('exit', () => this.forget(worker));
    worker.on('error', () => this.forget(worker));
    return worker;
  }

  private forget(worker: Worker): void {
    this.threads.delete(worker);
    const at = this.idle.indexOf(worker);
    if (at >= 0) this.idle.splice(at, 1);
  }

  private release(worker: Worker): void {
    this.busy--;
    if (this.threads.has(worker)) {
      worker.unref();
      this.idle.push(worker);
    }
    this.pump();
  }

  private dispatch(worker: Worker, pending: Pending<Job>): void {
    this.busy++;
    let job: Job | null;
    try {
      job = pending.task.prepare();
    } catch (error) {
      this.release(worker);
      pending.reject(error);
      return;
    }
    if (job === null) {
      this.release(worker);
      pending.resolve(null);
      return;
    }
    const jobId = `${job.jobId}#${this.nextJob++}`;
    let settled = false;
    const finish = (outcome: { result: AuditJobResult } | { error: AuditJobFailure }, threadLost: boolean) => {
      if (settled) return;
      settled = true;
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
      if (threadLost) {
        this.forget(worker);
        void worker.terminate();
      }
      this.release(worker);
      if ('result' in outcome) pending.resolve(outcome.result);
      else pending.reject(outcome.error);
    };
    const onMessage = (message: AuditWorkerMessage) => {
      if (message.jobId !== jobId) return;
      if (message.type === 'progress') pending.task.onProgress?.(message.stage, message.fraction);
      else if (message.type === 'done') finish({ result: { resultText: message.resultText, timings: message.timings } }, false);
      else finish({ error: new AuditJobFailure(message.message) }, false);
    };
    const onError = (error: Error) => finish({ error: new AuditJobFailure(`The audit worker failed: ${error.message}`) }, true);
    const onExit = (code: number) => finish({ error: new AuditJobFailure(`The audit worker stopped unexpectedly (exit code ${code}) before the audit finished.`) }, true);
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    worker.ref();
    pending.task.onStart?.();
    worker.postMessage({ ...job, jobId });
  }
}
