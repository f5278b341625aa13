/**
 * A residual-bootstrap thread: the critical values of the scales in its `workerData` (a
 * ResidualCriticalThreadJob), posted back once; the thread is then ended by whoever started it
 * (residual-bootstrap-threads.ts, through src/lib/workers/start-worker.ts).
 *
 * How it starts: the build bundles this file into dist/server/residual-bootstrap-worker.mjs
 * (src/lib/workers/worker-build.ts) and the command line's into dist/cli/ (scripts/lib/cli-bundle.mjs);
 * from source it is bundled once per process. docs/decisions/020-speed-whole-audit.md.
 */
import { isMainThread, parentPort, workerData } from 'node:worker_threads';
import { runResidualCriticalJobs, type ResidualCriticalThreadJob } from './residual-bootstrap-threads';

if (isMainThread || !parentPort) {
  throw new Error('residual-bootstrap-worker: this module runs only as a worker thread started by residual-bootstrap-threads.ts');
}
parentPort.postMessage(runResidualCriticalJobs(workerData as ResidualCriticalThreadJob));
