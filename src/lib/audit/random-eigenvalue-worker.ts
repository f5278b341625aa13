/**
 * A parallel-analysis thread: the random eigenvalues of one range of draws (its `workerData`, a
 * RandomEigenvalueJob of Pearson draws, or a RandomPolychoricEigenvalueJob carrying the codes of
 * its polychoric data sets), posted back once (moved, not copied); the thread is then ended by whoever
 * started it (random-eigenvalue-threads.ts, through src/lib/workers/start-worker.ts).
 *
 * How it starts: the build bundles this file into dist/server/random-eigenvalue-worker.mjs
 * (src/lib/workers/worker-build.ts) and the command line's into dist/cli/ (scripts/lib/cli-bundle.mjs);
 * from source it is bundled once per process. docs/decisions/020-speed-whole-audit.md.
 */
import { isMainThread, parentPort, workerData } from 'node:worker_threads';
import { randomCorrelationEigenvalueDraws } from '../stats/parallel-analysis';
import { polychoricCodeEigenvalues } from '../stats/parallel-analysis-polychoric';
import type { RandomEigenvalueJob, RandomPolychoricEigenvalueJob } from './random-eigenvalue-threads';

if (isMainThread || !parentPort) {
  throw new Error('random-eigenvalue-worker: this module runs only as a worker thread started by random-eigenvalue-threads.ts');
}
const job = workerData as RandomEigenvalueJob | RandomPolychoricEigenvalueJob;
const values =
  'kind' in job
    ? polychoricCodeEigenvalues(job.codes, job.rows, job.items)
    : randomCorrelationEigenvalueDraws(job.rows, job.items, job.seed, job.firstDraw, job.endDraw);
parentPort.postMessage(values, [values.buffer as ArrayBuffer]);
