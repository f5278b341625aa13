/**
 * The what-if worker thread: the same mechanism as the audit worker (bundled by the build into
 * dist/server/what-if-worker.mjs, run from source through tsx otherwise; worker-entry.ts), its
 * own single thread so a what-if never waits behind a running audit. It keeps the evidence of the
 * last few audits (what-if-compute.ts) and answers each job with the audit worker's protocol:
 * `done` with the what-if as JSON text, or `failed` with the reason. docs/decisions/011.
 */
import { isMainThread, parentPort } from 'node:worker_threads';
import { computeWhatIf, WhatIfCache, type WhatIfJob } from './what-if-compute';
import type { AuditWorkerMessage } from './worker-protocol';

if (isMainThread || !parentPort) {
  throw new Error('what-if-worker: this module runs only as a worker thread started by the what-if service');
}
const port = parentPort;
const cache = new WhatIfCache();

port.on('message', (job: WhatIfJob) => {
  let message: AuditWorkerMessage;
  try {
    const started = performance.now();
    const result = computeWhatIf(job, cache);
    message = { type: 'done', jobId: job.jobId, resultText: JSON.stringify(result), timings: { whatIfMs: Math.round(performance.now() - started) } };
  } catch (error) {
    message = { type: 'failed', jobId: job.jobId, message: error instanceof Error ? error.message : String(error) };
  }
  port.postMessage(message);
});
