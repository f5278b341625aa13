/**
 * The audit worker thread. It waits for jobs from the pool (one at a time), runs each with
 * `executeAuditJob` and posts progress (at most every PROGRESS_INTERVAL_MS, and at every change
 * of stage), the early cut list when a bootstrap starts, then the result text or the reason it
 * failed. A failure of one job never ends the
 * thread; only `settings.testFault = "crash"` (test servers) ends it on purpose, to prove that
 * the pool records a worker that dies.
 *
 * How it starts: the build bundles this file into dist/server/audit-worker.mjs
 * (src/lib/workers/worker-build.ts); under tsx, Vitest and `astro dev` it runs from source through tsx
 * (worker-entry.ts). docs/decisions/004-audit-jobs.md says why.
 */
import { isMainThread, parentPort } from 'node:worker_threads';
import { executeAuditJob } from './execute-audit-job';
import type { AuditWorkerJob, AuditWorkerMessage } from './worker-protocol';

/** Progress messages are posted no more often than this (the main thread throttles its writes again). */
const PROGRESS_INTERVAL_MS = 100;

/** Exit code of an injected crash. */
const INJECTED_CRASH_EXIT_CODE = 70;

if (isMainThread || !parentPort) {
  throw new Error('audit-worker: this module runs only as a worker thread started by the audit pool');
}
const port = parentPort;

function post(message: AuditWorkerMessage): void {
  port.postMessage(message);
}

async function run(job: AuditWorkerJob): Promise<void> {
  let lastStage = '';
  let lastPosted = 0;
  try {
    const result = await executeAuditJob(job, (stage, fraction) => {
      if (job.settings.testFault === 'crash' && stage === 'engine') process.exit(INJECTED_CRASH_EXIT_CODE);
      const now = Date.now();
      if (stage === lastStage && now - lastPosted < PROGRESS_INTERVAL_MS) return;
      lastStage = stage;
      lastPosted = now;
      post({ type: 'progress', jobId: job.jobId, stage, fraction });
    }, undefined, (cutList) => post({ type: 'cut-list', jobId: job.jobId, cutList }));
    post({ type: 'done', jobId: job.jobId, resultText: result.resultText, timings: result.timings });
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    post({ type: 'failed', jobId: job.jobId, message: message || 'The audit failed without a message.' });
  }
}

port.on('message', (job: AuditWorkerJob) => {
  void run(job);
});
