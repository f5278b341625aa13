/**
 * A fixed number of jobs at once, and a bounded line for the rest: `run` starts a job when fewer
 * than `concurrency` are running, lets it wait when fewer than `maxWaiting` are waiting, and
 * refuses it at once (QueueFullError) otherwise. Jobs start in the order they arrived. Used for
 * the wave readers (src/lib/server/waves/wave-readers.ts), so that the memory all readers may use
 * together is bounded by `concurrency` × one reader's heap limit (docs/decisions/018-workbook-worker.md).
 */

/** A job refused because every place was taken. */
export class QueueFullError extends Error {
  readonly running: number;
  readonly waiting: number;
  constructor(running: number, waiting: number) {
    super(`BoundedQueue: ${running} running and ${waiting} waiting, the most allowed`);
    this.name = 'QueueFullError';
    this.running = running;
    this.waiting = waiting;
  }
}

/** Counts for logs and tests. */
export interface QueueState {
  readonly concurrency: number;
  readonly maxWaiting: number;
  readonly running: number;
  readonly waiting: number;
}

/** The queue. */
export class BoundedQueue {
  readonly concurrency: number;
  readonly maxWaiting: number;
  private running = 0;
  private readonly waiting: (() => void)[] = [];

  /**
   * @param concurrency jobs at once (an integer of 1 or more).
   * @param maxWaiting jobs that may wait for a place (an integer of 0 or more).
   * @throws {RangeError} when either is not such an integer.
   */
  constructor(concurrency: number, maxWaiting: number) {
    if (!Number.isInteger(concurrency) || concurrency < 1) throw new RangeError(`BoundedQueue: concurrency must be an integer of 1 or more, got ${concurrency}`);
    if (!Number.isInteger(maxWaiting) || maxWaiting < 0) throw new RangeError(`BoundedQueue: maxWaiting must be an integer of 0 or more, got ${maxWaiting}`);
    this.concurrency = concurrency;
    this.maxWaiting = maxWaiting;
  }

  /** Running and waiting jobs. */
  state(): QueueState {
    return { concurrency: this.concurrency, maxWaiting: this.maxWaiting, running: this.running, waiting: this.waiting.length };
  }

  /**
   * Runs a job when a place is free.
   * @param job the work; started only once a place is free.
   * @returns what the job returns; rejects with what it throws, or with QueueFullError (without
   *   starting it) when `concurrency` jobs run and `maxWaiting` wait.
   */
  async run<T>(job: () => Promise<T>): Promise<T> {
    if (this.running >= this.concurrency) {
      if (this.waiting.length >= this.maxWaiting) throw new QueueFullError(this.running, this.waiting.length);
      await new Promise<void>((resolve) => this.waiting.push(resolve));
    } else {
      this.running++;
    }
    try {
      return await job();
    } finally {
      const next = this.waiting.shift();
      // The place passes straight to the next job in line, so `running` never drops below what runs.
      if (next) next();
      else this.running--;
    }
  }
}
