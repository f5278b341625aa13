/**
 * A bounded pool of audit worker threads. At most `size` audits run at once, each in its own
 * thread; further ones wait. Threads are started when needed and kept for the next job; an idle
 * thread does not keep the process alive (unref). A thread that dies (an uncaught error, an exit)
 * fails the job it held with the reason and is replaced by a fresh one for the next job.
 *
 * Fair across groups (the audits service groups by team): when a thread is free, the next job is
 * the oldest of the group that holds the fewest threads, ties going to the group served least
 * recently (round robin); first in, first out within a group. A group never holds more than
 * `perGroup` threads, so with `perGroup < size` a thread stays free for another group's job.
 * A job can be cancelled by its key (taken from the queue, or its thread ended and replaced), and
 * a job running longer than `maxRunMs` is ended the same way and fails with the `overTime` reason.
 * docs/decisions/016-fair-audits.md.
 *
 * References: Node.js documentation, "Worker threads" (Worker, postMessage, terminate, 'error'
 * and 'exit').
 */
import type { Worker } from 'node:worker_threads';
import type { AuditJobResult } from './execute-audit-job';
import type { EarlyCutListJson } from '../../audit/audit-json';
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
  /** Called with the early cut list, when the worker sends one (before a bootstrap). */
  readonly onCutList?: (cutList: EarlyCutListJson) => void;
  /** Whose job it is, for fair scheduling (the audits service gives the team); one shared group when absent. */
  readonly group?: string;
  /** The name to cancel it by (the audits service gives the audit id). */
  readonly key?: string;
}

/** How the pool shares its threads and how long a job may run. */
export interface PoolOptions {
  /** The most threads one group may hold at once (1 to size; default size, no limit). */
  readonly perGroup?: number;
  /** The longest a job may run in its thread, in milliseconds (default: no limit). */
  readonly maxRunMs?: number;
  /** The failure reason of a job ended for running past maxRunMs. */
  readonly overTime?: (maxRunMs: number) => string;
}

/** A job that failed: its reason is meant to be stored and shown. */
export class AuditJobFailure extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'AuditJobFailure';
  }
}

/** A job that was cancelled (`cancel`): the caller has recorded why. */
export class AuditJobCancelled extends AuditJobFailure {
  constructor(message: string) {
    super(message);
    this.name = 'AuditJobCancelled';
  }
}

/** The group of tasks that name none. */
const SHARED_GROUP = '';

interface Pending<Job extends { readonly jobId: string }> {
  readonly task: PoolTask<Job>;
  readonly group: string;
  readonly resolve: (result: AuditJobResult | null) => void;
  readonly reject: (error: unknown) => void;
}

/** Counts for logs and tests. */
export interface PoolState {
  readonly size: number;
  readonly threads: number;
  readonly busy: number;
  readonly queued: number;
  /** Threads held per group (groups holding none are left out). */
  readonly running: Readonly<Record<string, number>>;
}

/** What `cancel` found: a waiting job taken from the queue, a running one ended, or nothing. */
export type CancelOutcome = 'queued' | 'running' | null;

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
  /** Threads held per group. */
  private readonly running = new Map<string, number>();
  /** When each group was last handed a thread (a dispatch count; absent: never). */
  private readonly lastServed = new Map<string, number>();
  /** Running jobs by key: ends one as cancelled. */
  private readonly active = new Map<string, (reason: string) => void>();
  private readonly perGroup: number;
  private readonly maxRunMs: number;
  private readonly overTime: (maxRunMs: number) => string;
  private busy = 0;
  private nextJob = 1;
  private dispatches = 0;
  private closed = false;

  /**
   * @param size the most audits running at once (an integer from 1 to 64).
   * @param spawn starts one worker thread.
   * @param options perGroup, maxRunMs and overTime (see PoolOptions).
   * @throws {RangeError} when size is not an integer from 1 to 64, perGroup not an integer from 1
   *   to size, or maxRunMs not a positive number.
   */
  constructor(size: number, spawn: () => Worker, options: PoolOptions = {}) {
    if (!Number.isInteger(size) || size < 1 || size > 64) throw new RangeError(`AuditWorkerPool: size must be an integer from 1 to 64, got ${size}`);
    const perGroup = options.perGroup ?? size;
    if (!Number.isInteger(perGroup) || perGroup < 1 || perGroup > size) throw new RangeError(`AuditWorkerPool: perGroup must be an integer from 1 to size (${size}), got ${perGroup}`);
    const maxRunMs = options.maxRunMs ?? Number.POSITIVE_INFINITY;
    if (!(maxRunMs > 0)) throw new RangeError(`AuditWorkerPool: maxRunMs must be a positive number of milliseconds, got ${maxRunMs}`);
    this.size = size;
    this.spawn = spawn;
    this.perGroup = perGroup;
    this.maxRunMs = maxRunMs;
    this.overTime = options.overTime ?? ((ms) => `The job ran longer than its limit of ${ms} ms and was stopped.`);
  }

  /** Threads, busy ones, waiting tasks and the threads each group holds. */
  state(): PoolState {
    const running: Record<string, number> = {};
    for (const [group, count] of this.running) if (count > 0) running[group] = count;
    return { size: this.size, threads: this.threads.size, busy: this.busy, queued: this.queue.length, running };
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
      this.queue.push({ task, group: task.group ?? SHARED_GROUP, resolve, reject });
      this.pump();
    });
  }

  /**
   * Cancels a task by its key: a waiting one leaves the queue, a running one's thread is ended
   * (and replaced for the next job). Its promise rejects with AuditJobCancelled(reason).
   * @param key the task's key.
   * @param reason the rejection's message.
   * @returns where the task was, or null when no waiting or running task has that key.
   */
  cancel(key: string, reason: string): CancelOutcome {
    const at = this.queue.findIndex((pending) => pending.task.key === key);
    if (at >= 0) {
      const [pending] = this.queue.splice(at, 1);
      pending.reject(new AuditJobCancelled(reason));
      return 'queued';
    }
    const end = this.active.get(key);
    if (!end) return null;
    end(reason);
    return 'running';
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
      const at = this.nextIndex();
      if (at < 0) break;
      const [pending] = this.queue.splice(at, 1);
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

  /**
   * The queue index of the next task to run: among groups below perGroup, the one holding the
   * fewest threads, then the one served least recently; its oldest task. -1 when every group
   * with a waiting task is at its limit.
   */
  private nextIndex(): number {
    let best = -1;
    let bestRunning = Number.POSITIVE_INFINITY;
    let bestServed = Number.POSITIVE_INFINITY;
    const seen = new Set<string>();
    for (let index = 0; index < this.queue.length; index++) {
      const group = this.queue[index].group;
      if (seen.has(group)) continue; // a later task of a group already weighed
      seen.add(group);
      const running = this.running.get(group) ?? 0;
      if (running >= this.perGroup) continue;
      const served = this.lastServed.get(group) ?? 0;
      if (running < bestRunning || (running === bestRunning && served < bestServed)) {
        best = index;
        bestRunning = running;
        bestServed = served;
      }
    }
    return best;
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

  private release(worker: Worker, group: string): void {
    this.busy--;
    const held = (this.running.get(group) ?? 1) - 1;
    if (held > 0) this.running.set(group, held);
    else this.running.delete(group);
    if (this.threads.has(worker)) {
      worker.unref();
      this.idle.push(worker);
    }
    this.pump();
  }

  private dispatch(worker: Worker, pending: Pending<Job>): void {
    const { group } = pending;
    this.busy++;
    this.running.set(group, (this.running.get(group) ?? 0) + 1);
    this.lastServed.set(group, ++this.dispatches);
    let job: Job | null;
    try {
      job = pending.task.prepare();
    } catch (error) {
      this.release(worker, group);
      pending.reject(error);
      return;
    }
    if (job === null) {
      this.release(worker, group);
      pending.resolve(null);
      return;
    }
    const jobId = `${job.jobId}#${this.nextJob++}`;
    const key = pending.task.key;
    let settled = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    /** Ends the job; a lost thread (died, cancelled, over time) is ended and forgotten, so the next job gets a fresh one. */
    const finish = (outcome: { result: AuditJobResult } | { error: AuditJobFailure }, threadLost: boolean) => {
      if (settled) return;
      settled = true;
      if (timer) clearTimeout(timer);
      if (key !== undefined && this.active.get(key) === cancelThis) this.active.delete(key);
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
      if (threadLost) {
        this.forget(worker);
        void worker.terminate();
      }
      this.release(worker, group);
      if ('result' in outcome) pending.resolve(outcome.result);
      else pending.reject(outcome.error);
    };
    const cancelThis = (reason: string) => finish({ error: new AuditJobCancelled(reason) }, true);
    const onMessage = (message: AuditWorkerMessage) => {
      if (message.jobId !== jobId) return;
      if (message.type === 'progress') pending.task.onProgress?.(message.stage, message.fraction);
      else if (message.type === 'cut-list') pending.task.onCutList?.(message.cutList);
      else if (message.type === 'done') finish({ result: { resultText: message.resultText, timings: message.timings } }, false);
      else finish({ error: new AuditJobFailure(message.message) }, false);
    };
    const onError = (error: Error) => finish({ error: new AuditJobFailure(`The audit worker failed: ${error.message}`) }, true);
    const onExit = (code: number) => finish({ error: new AuditJobFailure(`The audit worker stopped unexpectedly (exit code ${code}) before the audit finished.`) }, true);
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    worker.ref();
    if (key !== undefined) this.active.set(key, cancelThis);
    if (Number.isFinite(this.maxRunMs)) {
      timer = setTimeout(() => finish({ error: new AuditJobFailure(this.overTime(this.maxRunMs)) }, true), this.maxRunMs);
    }
    pending.task.onStart?.();
    worker.postMessage({ ...job, jobId });
  }
}
