/**
 * The one worker mechanism (src/lib/workers/): finding an entry built or from source, a one-off
 * job under a time limit, the bounded queue of the wave readers, and the build step bundling every
 * entry. The behaviour of the workers themselves is tested beside their users
 * (audit-worker-pool.test.ts, wave-reader.test.ts).
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { BoundedQueue, QueueFullError } from '../../src/lib/workers/bounded-queue';
import { locateWorker, runWorkerOnce, WorkerRunFailure } from '../../src/lib/workers/start-worker';
import { AUDIT_WORKER, RANDOM_EIGENVALUE_WORKER, RESAMPLE_WORKER, RESIDUAL_BOOTSTRAP_WORKER, WAVE_READER_WORKER, WHAT_IF_WORKER, WORKER_ENTRIES } from '../../src/lib/workers/worker-entries';

const folders: string[] = [];
afterAll(() => {
  for (const folder of folders) rmSync(folder, { recursive: true, force: true });
});

/** A promise with its resolve function outside. */
function gate(): { promise: Promise<void>; open: () => void } {
  let open!: () => void;
  const promise = new Promise<void>((resolve) => { open = resolve; });
  return { promise, open };
}

describe('BoundedQueue', () => {
  it('runs at most `concurrency` jobs, lets `maxWaiting` wait, and refuses the next at once', async () => {
    const queue = new BoundedQueue(2, 1);
    const gates = [gate(), gate(), gate()];
    const started: number[] = [];
    const runs = gates.map((g, i) => queue.run(async () => { started.push(i); await g.promise; return i; }));
    await Promise.resolve();
    expect(started).toEqual([0, 1]);
    expect(queue.state()).toEqual({ concurrency: 2, maxWaiting: 1, running: 2, waiting: 1 });
    let refusedStarted = false;
    await expect(queue.run(async () => { refusedStarted = true; })).rejects.toBeInstanceOf(QueueFullError);
    expect(refusedStarted).toBe(false);
    gates[1].open();
    expect(await runs[1]).toBe(1);
    await Promise.resolve();
    // The waiting job took the freed place: still two running, none waiting.
    expect(started).toEqual([0, 1, 2]);
    expect(queue.state()).toMatchObject({ running: 2, waiting: 0 });
    gates[0].open();
    gates[2].open();
    expect(await Promise.all(runs)).toEqual([0, 1, 2]);
    expect(queue.state()).toMatchObject({ running: 0, waiting: 0 });
  });

  it('frees the place of a job that throws, and refuses without a line when maxWaiting is 0', async () => {
    const queue = new BoundedQueue(1, 0);
    const g = gate();
    const first = queue.run(async () => { await g.promise; throw new Error('broken'); });
    await expect(queue.run(async () => 1)).rejects.toBeInstanceOf(QueueFullError);
    g.open();
    await expect(first).rejects.toThrow('broken');
    await expect(queue.run(async () => 2)).resolves.toBe(2);
  });

  it('refuses a concurrency below 1 or a negative line', () => {
    expect(() => new BoundedQueue(0, 1)).toThrow(RangeError);
    expect(() => new BoundedQueue(1, -1)).toThrow(RangeError);
    expect(() => new BoundedQueue(1.5, 1)).toThrow(RangeError);
  });
});

describe('locateWorker', () => {
  it('lists every worker once, each with its source and bundle', () => {
    expect(WORKER_ENTRIES).toEqual([AUDIT_WORKER, WHAT_IF_WORKER, WAVE_READER_WORKER, RESAMPLE_WORKER, RANDOM_EIGENVALUE_WORKER, RESIDUAL_BOOTSTRAP_WORKER]);
    expect(new Set(WORKER_ENTRIES.map((entry) => entry.built)).size).toBe(WORKER_ENTRIES.length);
  });

  it('uses the TypeScript source when the asking module is TypeScript', () => {
    const here = pathToFileURL(join(process.cwd(), 'src/lib/ingest/workbook-worker.ts')).href;
    expect(locateWorker(WAVE_READER_WORKER, here)).toEqual({ kind: 'source', file: join(process.cwd(), 'src', 'lib', 'ingest', 'wave-reader-worker.ts') });
  });

  it('finds the bundle above a built chunk, and says to rebuild when it is missing', () => {
    const folder = mkdtempSync(join(tmpdir(), 'paredown-locate-'));
    folders.push(folder);
    mkdirSync(join(folder, 'dist', 'server', 'chunks'), { recursive: true });
    const chunk = pathToFileURL(join(folder, 'dist', 'server', 'chunks', 'workbook-worker_x1.mjs')).href;
    expect(() => locateWorker(WAVE_READER_WORKER, chunk)).toThrow(/wave-reader-worker\.mjs was not found.*npm run build/);
    writeFileSync(join(folder, 'dist', 'server', 'wave-reader-worker.mjs'), '');
    expect(locateWorker(WAVE_READER_WORKER, chunk)).toEqual({ kind: 'built', file: join(folder, 'dist', 'server', 'wave-reader-worker.mjs') });
  });
});

describe('runWorkerOnce', () => {
  it('ends a worker that passes its time limit and says why', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'paredown-run-once-'));
    folders.push(folder);
    const file = join(folder, 'spin.mjs');
    writeFileSync(file, 'for (;;) {}\n');
    const started = performance.now();
    const failure = await runWorkerOnce({ name: 'spin', source: 'unused', built: 'spin.mjs' }, { name: 'spin', origin: { kind: 'built', file }, timeLimitMs: 300 }).catch((error: unknown) => error);
    expect(failure).toBeInstanceOf(WorkerRunFailure);
    expect((failure as WorkerRunFailure).reason).toBe('time-limit');
    // It was ended, not waited for (the loop never ends on its own).
    expect(performance.now() - started).toBeLessThan(60_000);
  });

  it('times only what the worker says is timed (time-limit messages), and ends it when that part runs over', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'paredown-run-once-'));
    folders.push(folder);
    const untimed = join(folder, 'untimed.mjs');
    // Stops the clock, works for 4 s (four times the limit), then answers.
    writeFileSync(untimed, "import { parentPort } from 'node:worker_threads'; parentPort.postMessage({ type: 'time-limit', running: false }); const end = Date.now() + 4000; while (Date.now() < end) {} parentPort.postMessage('done');\n");
    await expect(runWorkerOnce({ name: 'untimed', source: 'unused', built: 'untimed.mjs' }, { name: 'untimed', origin: { kind: 'built', file: untimed }, timeLimitMs: 1000 })).resolves.toBe('done');
    const timed = join(folder, 'timed.mjs');
    // Stops the clock, starts it again, then never answers.
    writeFileSync(timed, "import { parentPort } from 'node:worker_threads'; parentPort.postMessage({ type: 'time-limit', running: false }); parentPort.postMessage({ type: 'time-limit', running: true }); for (;;) {}\n");
    const failure = await runWorkerOnce({ name: 'timed', source: 'unused', built: 'timed.mjs' }, { name: 'timed', origin: { kind: 'built', file: timed }, timeLimitMs: 300 }).catch((error: unknown) => error);
    expect((failure as WorkerRunFailure).reason).toBe('time-limit');
  });

  it('reports a worker past its heap limit as out-of-memory', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'paredown-run-once-'));
    folders.push(folder);
    const file = join(folder, 'grow.mjs');
    writeFileSync(file, 'const kept = []; for (;;) kept.push(new Array(100000).fill({ a: kept.length }));\n');
    const failure = await runWorkerOnce({ name: 'grow', source: 'unused', built: 'grow.mjs' }, { name: 'grow', origin: { kind: 'built', file }, timeLimitMs: 120_000, resourceLimits: { maxOldGenerationSizeMb: 32 } }).catch((error: unknown) => error);
    expect((failure as WorkerRunFailure).reason).toBe('out-of-memory');
  });

  it('answers with the worker\'s one message', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'paredown-run-once-'));
    folders.push(folder);
    const file = join(folder, 'echo.mjs');
    writeFileSync(file, "import { parentPort, workerData } from 'node:worker_threads'; parentPort.postMessage({ twice: workerData * 2 });\n");
    await expect(runWorkerOnce({ name: 'echo', source: 'unused', built: 'echo.mjs' }, { name: 'echo', origin: { kind: 'built', file }, workerData: 21, timeLimitMs: 60_000 })).resolves.toEqual({ twice: 42 });
  });
});

/**
 * runWorkerOnce when the calling thread is busy: the worker's answer and its `online` event then
 * wait in the same turn of the event loop, in either order. An `online` handled after the answer
 * must not start the time-limit clock again: a timer left behind keeps the process alive for the
 * whole limit (a command-line audit stayed open 30 minutes after writing its JSON).
 */
const timers = (): number => process.getActiveResourcesInfo().filter((kind) => kind === 'Timeout').length;

describe('runWorkerOnce with a busy calling thread', () => {
  it('leaves no timer behind once it has answered', async () => {
    // Warm-up: the first run bundles the worker from source.
    await runWorkerOnce(RANDOM_EIGENVALUE_WORKER, { name: 'warm-up', workerData: { rows: 50, items: 3, seed: 1, firstDraw: 0, endDraw: 1 }, timeLimitMs: 600_000 });
    await new Promise((resolve) => setTimeout(resolve, 50));
    const before = timers();
    const answer = runWorkerOnce<Float64Array>(RANDOM_EIGENVALUE_WORKER, {
      name: 'busy-caller', workerData: { rows: 50, items: 3, seed: 1, firstDraw: 0, endDraw: 1 }, timeLimitMs: 600_000,
    });
    // Block this thread well past the worker's start and answer, as a long computation does.
    const until = Date.now() + 1500;
    while (Date.now() < until) {
      // busy
    }
    expect(await answer).toHaveLength(3);
    await new Promise((resolve) => setImmediate(resolve));
    await new Promise((resolve) => setTimeout(resolve, 50));
    expect(timers()).toBe(before);
  }, 60_000);
});
