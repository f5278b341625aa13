/**
 * The audit pool's scheduling, cancelling and time limit (src/lib/server/audit-jobs/worker-pool.ts,
 * docs/decisions/016-fair-audits.md), with fake worker threads the test finishes by hand: which
 * job starts next when two or three teams wait, the per-team limit, cancelling a waiting and a
 * running job, and a job stopped at the time limit (fake timers: no wall-clock assertion).
 * The real threads are covered by tests/unit/audit-worker-pool.test.ts and tests/api/audits*.test.ts.
 */
import { EventEmitter } from 'node:events';
import type { Worker } from 'node:worker_threads';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { AuditJobCancelled, AuditJobFailure, AuditWorkerPool, type PoolOptions } from '../../src/lib/server/audit-jobs/worker-pool';

interface FakeJob {
  readonly jobId: string;
}

/** A worker thread stand-in: records the job it was given and ends when told. */
class FakeWorker extends EventEmitter {
  readonly jobs: string[] = [];
  terminated = false;
  postMessage(job: FakeJob): void {
    this.jobs.push(job.jobId);
  }
  terminate(): Promise<number> {
    this.terminated = true;
    queueMicrotask(() => this.emit('exit', 1));
    return Promise.resolve(1);
  }
  ref(): void {}
  unref(): void {}
  /** Answers the job it holds now as done. */
  finish(): void {
    this.emit('message', { type: 'done', jobId: this.jobs[this.jobs.length - 1], resultText: '{}', timings: {} });
  }
}

/** A pool of fake workers, with every start recorded as "group:name" in order. */
function fakePool(size: number, options: PoolOptions = {}) {
  const workers: FakeWorker[] = [];
  const pool = new AuditWorkerPool<FakeJob>(
    size,
    () => {
      const worker = new FakeWorker();
      workers.push(worker);
      return worker as unknown as Worker;
    },
    options,
  );
  const started: string[] = [];
  const prepared: string[] = [];
  /** The worker holding a job now. */
  const holder = (name: string) => workers.find((worker) => !worker.terminated && worker.jobs.at(-1)?.startsWith(`${name}#`));
  const run = (group: string | undefined, name: string) =>
    pool.run({
      group,
      key: name,
      prepare: () => {
        prepared.push(name);
        return { jobId: name };
      },
      onStart: () => started.push(group === undefined ? name : `${group}:${name}`),
    });
  /** Finishes the running job `name` and lets the pool hand out the freed thread. */
  const finish = async (name: string) => {
    const worker = holder(name);
    if (!worker) throw new Error(`no worker holds ${name}`);
    worker.finish();
    await Promise.resolve();
  };
  return { pool, workers, started, prepared, run, finish, holder };
}

afterEach(() => {
  vi.useRealTimers();
});

describe('fair scheduling across teams', () => {
  it("starts another team's job before the rest of one team's queue (one thread)", async () => {
    const { started, run, finish } = fakePool(1);
    const all = [run('A', 'a1'), run('A', 'a2'), run('A', 'a3'), run('A', 'a4'), run('B', 'b1')];
    expect(started).toEqual(['A:a1']);
    await finish('a1');
    // First in, first out would start a2 here and b1 last; B has held no thread, so b1 goes next.
    expect(started).toEqual(['A:a1', 'B:b1']);
    for (const name of ['b1', 'a2', 'a3', 'a4']) await finish(name);
    expect(started).toEqual(['A:a1', 'B:b1', 'A:a2', 'A:a3', 'A:a4']);
    await expect(Promise.all(all)).resolves.toHaveLength(5);
  });

  it('takes turns among three teams, first in first out within each', async () => {
    const { started, run, finish } = fakePool(1);
    const all = [run('A', 'a1'), run('A', 'a2'), run('A', 'a3'), run('B', 'b1'), run('B', 'b2'), run('C', 'c1')];
    for (const name of ['a1', 'b1', 'c1', 'a2', 'b2', 'a3']) await finish(name);
    expect(started).toEqual(['A:a1', 'B:b1', 'C:c1', 'A:a2', 'B:b2', 'A:a3']);
    await Promise.all(all);
  });

  it('gives a freed thread to the team holding fewer threads', async () => {
    const { pool, started, run, finish } = fakePool(3);
    const all = [run('A', 'a1'), run('A', 'a2'), run('A', 'a3'), run('A', 'a4'), run('B', 'b1'), run('B', 'b2')];
    // No limit per team (perGroup defaults to the size): A alone takes every thread.
    expect(started).toEqual(['A:a1', 'A:a2', 'A:a3']);
    await finish('a1');
    expect(started.at(-1)).toBe('B:b1');
    await finish('a2');
    // A holds 1 (a3), B holds 1 (b1): a tie, and A was served longer ago than B.
    expect(started.at(-1)).toBe('A:a4');
    await finish('a3');
    expect(started.at(-1)).toBe('B:b2');
    expect(pool.state().running).toEqual({ A: 1, B: 2 });
    for (const name of ['a4', 'b1', 'b2']) await finish(name);
    await Promise.all(all);
    expect(pool.state()).toMatchObject({ busy: 0, queued: 0, running: {} });
  });

  it('keeps a thread free for another team with a per-team limit below the size', async () => {
    const { pool, started, run, finish } = fakePool(2, { perGroup: 1 });
    const all = [run('A', 'a1'), run('A', 'a2'), run('A', 'a3')];
    expect(started).toEqual(['A:a1']);
    expect(pool.state()).toMatchObject({ busy: 1, queued: 2, running: { A: 1 } });
    const b = run('B', 'b1');
    // B's job starts at once on the thread A may not take, without waiting for a1.
    expect(started).toEqual(['A:a1', 'B:b1']);
    await finish('a1');
    expect(started).toEqual(['A:a1', 'B:b1', 'A:a2']);
    for (const name of ['b1', 'a2', 'a3']) await finish(name);
    await Promise.all([...all, b]);
  });

  it('runs tasks without a group first in first out, as before', async () => {
    const { started, run, finish } = fakePool(1);
    const all = [run(undefined, 'x'), run(undefined, 'y'), run(undefined, 'z')];
    for (const name of ['x', 'y', 'z']) await finish(name);
    expect(started).toEqual(['x', 'y', 'z']);
    await Promise.all(all);
  });
});

describe('cancelling', () => {
  it('takes a waiting job from the queue without preparing it', async () => {
    const { pool, started, prepared, run, finish } = fakePool(1);
    const a1 = run('A', 'a1');
    const a2 = run('A', 'a2');
    const a3 = run('A', 'a3');
    expect(pool.cancel('a2', 'cancelled by the test')).toBe('queued');
    await expect(a2).rejects.toBeInstanceOf(AuditJobCancelled);
    await expect(a2).rejects.toThrow('cancelled by the test');
    expect(pool.state()).toMatchObject({ busy: 1, queued: 1 });
    await finish('a1');
    await finish('a3');
    await expect(a1).resolves.not.toBeNull();
    await expect(a3).resolves.not.toBeNull();
    expect(prepared).toEqual(['a1', 'a3']);
    expect(started).toEqual(['A:a1', 'A:a3']);
  });

  it("ends a running job's thread, ignores its late answer and starts the next job on a fresh thread", async () => {
    const { pool, workers, started, run, finish } = fakePool(1);
    const a1 = run('A', 'a1');
    const a2 = run('A', 'a2');
    const first = workers[0];
    expect(pool.cancel('a1', 'stop')).toBe('running');
    await expect(a1).rejects.toBeInstanceOf(AuditJobCancelled);
    expect(first.terminated).toBe(true);
    // The next job did not wait for the ended thread: a second one was started for it.
    expect(workers).toHaveLength(2);
    expect(workers[1].jobs).toEqual([expect.stringMatching(/^a2#/)]);
    expect(started).toEqual(['A:a1', 'A:a2']);
    first.finish(); // an answer that arrives after the cancel changes nothing
    await finish('a2');
    await expect(a2).resolves.toEqual({ resultText: '{}', timings: {} });
    expect(pool.state()).toMatchObject({ threads: 1, busy: 0, queued: 0, running: {} });
  });

  it('answers null for a key it does not hold, and for a job that has ended', async () => {
    const { pool, run, finish } = fakePool(1);
    const a1 = run('A', 'a1');
    expect(pool.cancel('nobody', 'stop')).toBeNull();
    await finish('a1');
    await a1;
    expect(pool.cancel('a1', 'stop')).toBeNull();
  });
});

describe('the time limit per job', () => {
  it('ends a job that runs past maxRunMs with the overTime reason, and the next job gets a fresh thread', async () => {
    vi.useFakeTimers();
    const { pool, workers, run, finish } = fakePool(1, { maxRunMs: 5_000, overTime: (ms) => `stopped after ${ms} ms` });
    const slow = run('A', 'slow');
    const next = run('B', 'next');
    let outcome: unknown = 'pending';
    slow.catch((error) => (outcome = error));
    await vi.advanceTimersByTimeAsync(4_999);
    expect(outcome).toBe('pending');
    await vi.advanceTimersByTimeAsync(1);
    expect(outcome).toBeInstanceOf(AuditJobFailure);
    expect(outcome).not.toBeInstanceOf(AuditJobCancelled);
    expect((outcome as Error).message).toBe('stopped after 5000 ms');
    expect(workers[0].terminated).toBe(true);
    await finish('next');
    await expect(next).resolves.not.toBeNull();
    expect(workers).toHaveLength(2);
    expect(pool.state()).toMatchObject({ busy: 0, queued: 0 });
  });

  it('leaves a job that finishes in time alone, and keeps its thread', async () => {
    vi.useFakeTimers();
    const { pool, workers, run, finish } = fakePool(1, { maxRunMs: 5_000 });
    const quick = run('A', 'quick');
    await vi.advanceTimersByTimeAsync(4_000);
    await finish('quick');
    await expect(quick).resolves.not.toBeNull();
    await vi.advanceTimersByTimeAsync(10_000);
    expect(workers[0].terminated).toBe(false);
    expect(pool.state()).toMatchObject({ threads: 1, busy: 0 });
  });
});

describe('options', () => {
  it('refuses a per-team limit outside 1 to size, and a time limit that is not positive', () => {
    const spawn = () => new FakeWorker() as unknown as Worker;
    expect(() => new AuditWorkerPool(2, spawn, { perGroup: 0 })).toThrow(/perGroup must be an integer from 1 to size \(2\), got 0/);
    expect(() => new AuditWorkerPool(2, spawn, { perGroup: 3 })).toThrow(RangeError);
    expect(() => new AuditWorkerPool(2, spawn, { maxRunMs: 0 })).toThrow(/maxRunMs must be a positive number/);
    expect(() => new AuditWorkerPool(2, spawn, { maxRunMs: Number.NaN })).toThrow(RangeError);
  });
});
