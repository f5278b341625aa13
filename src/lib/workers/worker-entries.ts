/**
 * Every worker-thread entry of Paredown, in one list: where its TypeScript source is (relative to
 * the project root) and the file the build bundles it into (in the server output folder, beside
 * `entry.mjs`). The build step (worker-build.ts) bundles each of them; start-worker.ts finds and
 * starts them. Only names and paths live here: this module imports nothing, so the ingest, the
 * server and the build may all read it (docs/decisions/018-workbook-worker.md).
 */

/** One worker entry. */
export interface WorkerEntry {
  /** The thread's name (shown in inspectors and heap snapshots). */
  readonly name: string;
  /** The TypeScript source, relative to the project root, with forward slashes. */
  readonly source: string;
  /** The bundled file's name in the server output folder (dist/server/). */
  readonly built: string;
}

/** The audit worker (docs/decisions/004-audit-jobs.md). */
export const AUDIT_WORKER: WorkerEntry = Object.freeze({
  name: 'paredown-audit',
  source: 'src/lib/server/audit-jobs/audit-worker.ts',
  built: 'audit-worker.mjs',
});

/** The what-if worker (docs/decisions/011-decisions-and-what-if.md). */
export const WHAT_IF_WORKER: WorkerEntry = Object.freeze({
  name: 'paredown-what-if',
  source: 'src/lib/server/audit-jobs/what-if-worker.ts',
  built: 'what-if-worker.mjs',
});

/** The wave reader: SheetJS and the cell-level work of reading an upload (src/lib/ingest/wave-reader-worker.ts). */
export const WAVE_READER_WORKER: WorkerEntry = Object.freeze({
  name: 'paredown-wave-reader',
  source: 'src/lib/ingest/wave-reader-worker.ts',
  built: 'wave-reader-worker.mjs',
});

/** A bootstrap resample thread: decides resamples of one audit (src/lib/audit/resample-threads.ts; docs/decisions/021). */
export const RESAMPLE_WORKER: WorkerEntry = Object.freeze({
  name: 'paredown-resample',
  source: 'src/lib/audit/resample-worker.ts',
  built: 'resample-worker.mjs',
});

/** Parallel analysis's random draws, a share of them per thread (src/lib/audit/random-eigenvalue-threads.ts). */
export const RANDOM_EIGENVALUE_WORKER: WorkerEntry = Object.freeze({
  name: 'paredown-random-eigenvalues',
  source: 'src/lib/audit/random-eigenvalue-worker.ts',
  built: 'random-eigenvalue-worker.mjs',
});

/** The local-dependence residual bootstrap of the full sample, some scales per thread (src/lib/audit/residual-bootstrap-threads.ts). */
export const RESIDUAL_BOOTSTRAP_WORKER: WorkerEntry = Object.freeze({
  name: 'paredown-residual-bootstrap',
  source: 'src/lib/audit/residual-bootstrap-worker.ts',
  built: 'residual-bootstrap-worker.mjs',
});

/** Every entry the build bundles. */
export const WORKER_ENTRIES: readonly WorkerEntry[] = Object.freeze([AUDIT_WORKER, WHAT_IF_WORKER, WAVE_READER_WORKER, RESAMPLE_WORKER, RANDOM_EIGENVALUE_WORKER, RESIDUAL_BOOTSTRAP_WORKER]);
