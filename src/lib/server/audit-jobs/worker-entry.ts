/**
 * The audit and what-if workers' names for the one worker mechanism (src/lib/workers/start-worker.ts):
 * where an audit worker thread starts from, and starting one. Kept so that the pool, the what-if
 * service, the benchmarks and the tests call it as before; the finding and starting live in
 * src/lib/workers/ (docs/decisions/004-audit-jobs.md, 018-workbook-worker.md).
 */
import type { Worker } from 'node:worker_threads';
import { locateWorker, spawnWorker, type WorkerOrigin } from '../../workers/start-worker';
import { AUDIT_WORKER, WHAT_IF_WORKER, type WorkerEntry } from '../../workers/worker-entries';

/** File name of the bundled audit worker in the build's server folder. */
export const BUILT_WORKER_FILE = AUDIT_WORKER.built;

/** A worker entry (src/lib/workers/worker-entries.ts). */
export type WorkerFiles = WorkerEntry;

/** The audit worker. */
export const AUDIT_WORKER_FILES: WorkerFiles = AUDIT_WORKER;

/** The what-if worker (what-if-worker.ts): same mechanism, its own thread. */
export const WHAT_IF_WORKER_FILES: WorkerFiles = WHAT_IF_WORKER;

/** Where the worker comes from in this process. */
export type AuditWorkerOrigin = WorkerOrigin;

/**
 * Finds the worker for this process (locateWorker).
 * @param moduleUrl the URL of the calling module (this module's by default).
 * @param worker the audit worker by default, or the what-if worker.
 * @throws {Error} in a built server whose bundled worker is missing (rebuild).
 * @returns the bundled file, or the TypeScript source.
 */
export function locateAuditWorker(moduleUrl: string = import.meta.url, worker: WorkerFiles = AUDIT_WORKER_FILES): AuditWorkerOrigin {
  return locateWorker(worker, moduleUrl);
}

/**
 * Starts one audit worker thread (spawnWorker, no resource limits: an audit's size is bounded by the wave's).
 * @param origin where it starts from (found with locateAuditWorker by default).
 * @param name the thread's name.
 * @throws {Error} as locateAuditWorker.
 * @returns the worker; it waits for jobs (see worker-protocol.ts).
 */
export function spawnAuditWorker(origin: AuditWorkerOrigin = locateAuditWorker(), name = AUDIT_WORKER.name): Worker {
  return spawnWorker(origin, { name });
}
