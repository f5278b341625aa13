/**
 * The wave reader thread: one job per thread (its `workerData`), one answer, then the thread is
 * ended by whoever started it (workbook-worker.ts, through src/lib/workers/start-worker.ts). Its
 * heap and time are bounded there, so a damaged or crafted file costs at most those limits.
 *
 * How it starts: the build bundles this file into dist/server/wave-reader-worker.mjs
 * (src/lib/workers/worker-build.ts); under tsx, Vitest and `astro dev` it runs from source through
 * tsx. docs/decisions/018-workbook-worker.md.
 */
import { isMainThread, parentPort, workerData } from 'node:worker_threads';
import { runWaveReaderJob, type WaveReaderJob } from './wave-reader-jobs';

if (isMainThread || !parentPort) {
  throw new Error('wave-reader-worker: this module runs only as a worker thread started by the wave reader');
}
const port = parentPort;

// The time limit covers SheetJS only (wave-reader-jobs.ts, TimedPart); see TimeLimitMessage.
const { answer, transfer } = await runWaveReaderJob(workerData as WaveReaderJob, (running) => port.postMessage({ type: 'time-limit', running }));
port.postMessage(answer, transfer);
