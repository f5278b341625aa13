/**
 * The one way Paredown finds and starts a worker thread, and runs a one-off job in one with
 * resource limits. Used by the audit pool, the what-if service (server) and the wave reader
 * (ingest); it imports only Node and worker-entries.ts, so both layers may use it.
 *
 * Where a worker starts from:
 * - In the built server (dist/server/**) this module is part of Astro's bundle; the build also
 *   bundles every entry of worker-entries.ts on its own into dist/server/ (worker-build.ts). The
 *   bundled file is found by walking up from this chunk's folder.
 * - Under tsx, Vitest and `astro dev` this module is the TypeScript source itself; a long-lived
 *   worker (the audit pool's, the what-if thread) runs its entry from source, loaded through tsx's
 *   `tsImport` (tsx is a dependency of the project; Node 20 does not pass `--import` loaders on
 *   to worker threads). A one-off job's worker (runWorkerOnce: the wave reader, one thread per
 *   file) pays its start-up per job, and tsx's is several times a bundle's; so from source it is
 *   bundled once per process with the build's own step (esbuild) into `.tmp-workers/` under the
 *   project, and bundled again when one of its inputs changes.
 * docs/decisions/004-audit-jobs.md (the mechanism), 018-workbook-worker.md (one module for all).
 */
import type { Metafile } from 'esbuild';
import { existsSync, mkdirSync, rmSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker, type ResourceLimits, type TransferListItem } from 'node:worker_threads';
import type { WorkerEntry } from './worker-entries';

/** Where a worker comes from in this process. */
export type WorkerOrigin = { readonly kind: 'built'; readonly file: string } | { readonly kind: 'source'; readonly file: string };

/** How far up from this chunk the bundled worker is looked for (dist/server/chunks/ is one). */
const SEARCH_DEPTH = 6;

/** The project root when this module runs from source (src/lib/workers/ is three folders down). */
function projectRoot(): string {
  return fileURLToPath(new URL('../../../', import.meta.url));
}

/**
 * Finds a worker for this process.
 * @param entry the worker (worker-entries.ts).
 * @param moduleUrl the URL of the module asking (this module's by default): a `.ts` URL means the
 *   process runs from source; anything else is a built chunk, above which the bundle is looked for.
 * @throws {Error} in a built server whose bundled worker is missing (the build did not run the
 *   worker step: rebuild).
 * @returns the bundled file, or the TypeScript source.
 */
export function locateWorker(entry: WorkerEntry, moduleUrl: string = import.meta.url): WorkerOrigin {
  const here = fileURLToPath(moduleUrl);
  if (here.endsWith('.ts')) return { kind: 'source', file: join(projectRoot(), ...entry.source.split('/')) };
  let folder = dirname(here);
  for (let depth = 0; depth <= SEARCH_DEPTH; depth++) {
    const candidate = join(folder, entry.built);
    if (existsSync(candidate)) return { kind: 'built', file: candidate };
    const parent = dirname(folder);
    if (parent === folder) break;
    folder = parent;
  }
  throw new Error(`locateWorker: ${entry.built} was not found above ${dirname(here)}; run the build again (npm run build) so that it bundles the worker threads`);
}

/** The tsx loader API, resolved from the project (its ESM entry; `require` would pick the CommonJS one). */
function tsxApiUrl(): string {
  const require = createRequire(import.meta.url);
  const packageJson = require.resolve('tsx/package.json');
  return pathToFileURL(join(dirname(packageJson), 'dist', 'esm', 'api', 'index.mjs')).href;
}

/** What a worker is started with. */
export interface SpawnOptions {
  /** The thread's name. */
  readonly name: string;
  /** Data the worker reads from `workerData` (structured-cloned). */
  readonly workerData?: unknown;
  /** Parts of `workerData` moved rather than copied. */
  readonly transferList?: readonly TransferListItem[];
  /** Heap limits (Node's `resourceLimits`); a worker past them ends with ERR_WORKER_OUT_OF_MEMORY. */
  readonly resourceLimits?: ResourceLimits;
}

/**
 * Starts one worker thread.
 * @param origin where it starts from (locateWorker).
 * @param options name, worker data and resource limits.
 * @returns the worker.
 * References: Node.js 20 documentation, "worker_threads: new Worker(filename, options)" (eval, workerData, resourceLimits).
 */
export function spawnWorker(origin: WorkerOrigin, options: SpawnOptions): Worker {
  const workerOptions = {
    name: options.name,
    ...(options.workerData !== undefined ? { workerData: options.workerData } : {}),
    ...(options.transferList ? { transferList: [...options.transferList] } : {}),
    ...(options.resourceLimits ? { resourceLimits: options.resourceLimits } : {}),
  };
  if (origin.kind === 'built') return new Worker(origin.file, workerOptions);
  const api = tsxApiUrl();
  const source = [
    `import(${JSON.stringify(api)})`,
    `.then((tsx) => tsx.tsImport(${JSON.stringify(pathToFileURL(origin.file).href)}, ${JSON.stringify(api)}))`,
    `.catch((error) => { console.error(${JSON.stringify(`${options.name} could not start:`)}, error); process.exit(1); });`,
  ].join('');
  return new Worker(source, { ...workerOptions, eval: true });
}

/**
 * Finds a worker that starts quickly: the bundle when the process runs built, and from source
 * the entry bundled once per process (as runWorkerOnce does) rather than loaded through tsx,
 * whose start-up is several times a bundle's. For threads started per task (the bootstrap's
 * resample threads), where start-up counts.
 * @param entry the worker (worker-entries.ts).
 * @throws {Error} as locateWorker.
 * @returns a bundled file's origin.
 */
export function locateBundledWorker(entry: WorkerEntry): WorkerOrigin {
  const located = locateWorker(entry);
  return located.kind === 'source' ? bundledFromSource(entry, located) : located;
}

/** A one-off worker bundled from source in this process: the file and the newest change of its inputs. */
const sourceBundles = new Map<string, { file: string; inputs: string[]; newest: number }>();

function newestChange(files: readonly string[]): number {
  let newest = 0;
  for (const file of files) {
    try {
      newest = Math.max(newest, statSync(file).mtimeMs);
    } catch {
      return Number.POSITIVE_INFINITY; // an input went away: bundle again
    }
  }
  return newest;
}

/**
 * A source worker bundled for starting (esbuild, as the build does: worker-build.ts), kept for
 * this process and made again when an input changed.
 * @param entry the worker.
 * @param origin its source.
 * @returns the bundle's origin.
 */
function bundledFromSource(entry: WorkerEntry, origin: WorkerOrigin): WorkerOrigin {
  const kept = sourceBundles.get(origin.file);
  if (kept && newestChange(kept.inputs) <= kept.newest) return { kind: 'built', file: kept.file };
  const root = projectRoot();
  const folder = join(root, '.tmp-workers');
  mkdirSync(folder, { recursive: true });
  const file = join(folder, `${process.pid}-${entry.built}`);
  if (sourceBundles.size === 0) process.once('exit', () => {
    for (const bundle of sourceBundles.values()) rmSync(bundle.file, { force: true });
  });
  // Loaded here, never in a built server (which starts its bundles directly).
  const { buildSync } = createRequire(import.meta.url)('esbuild') as typeof import('esbuild');
  const result = buildSync({ ...WORKER_BUNDLE_OPTIONS, entryPoints: [origin.file], outfile: file, metafile: true, logLevel: 'silent' });
  const inputs = Object.keys((result.metafile as Metafile).inputs).map((input) => join(root, input));
  sourceBundles.set(origin.file, { file, inputs, newest: newestChange(inputs) });
  return { kind: 'built', file };
}

/** How a worker entry is bundled (the build's step, worker-build.ts, and one-off workers from source). */
export const WORKER_BUNDLE_OPTIONS = Object.freeze({
  bundle: true,
  platform: 'node' as const,
  format: 'esm' as const,
  target: 'node20',
  // Dependencies written as CommonJS call require(); give the ESM bundle one.
  banner: { js: "import { createRequire as __paredownCreateRequire } from 'node:module'; const require = __paredownCreateRequire(import.meta.url);" },
  legalComments: 'none' as const,
});

/** Why a one-off worker ended without its answer. */
export type WorkerRunFailureReason = 'time-limit' | 'out-of-memory' | 'error' | 'exit';

/** A one-off worker that ended without its answer: past its time or memory limit, an uncaught error, or an exit. */
export class WorkerRunFailure extends Error {
  readonly reason: WorkerRunFailureReason;
  constructor(reason: WorkerRunFailureReason, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'WorkerRunFailure';
    this.reason = reason;
  }
}

/**
 * A message a worker may post before its answer to say which of its work the time limit covers:
 * `running: false` stops the clock (what follows is bounded otherwise, e.g. by the input's size),
 * `running: true` starts it again with the whole limit. It is not the answer.
 */
export interface TimeLimitMessage {
  readonly type: 'time-limit';
  readonly running: boolean;
}

function isTimeLimitMessage(message: unknown): message is TimeLimitMessage {
  return typeof message === 'object' && message !== null && (message as { type?: unknown }).type === 'time-limit';
}

/** Options of runWorkerOnce. */
export interface RunOnceOptions extends SpawnOptions {
  /**
   * The most milliseconds the worker may take before it is ended (WorkerRunFailure `time-limit`):
   * from when the thread is online, or from each TimeLimitMessage that starts the clock again.
   */
  readonly timeLimitMs: number;
  /** Where the worker starts from (found with locateWorker by default). */
  readonly origin?: WorkerOrigin;
}

/**
 * Runs one job in a fresh worker thread: starts it with the job as its `workerData`, waits for its
 * one answer (any message but a TimeLimitMessage), and ends it. The thread is ended on every outcome, so a job costs at
 * most its heap limit, and only while it runs.
 * @param entry the worker (worker-entries.ts); it must post exactly one message.
 * @param options worker data, resource limits and the time limit.
 * @throws {WorkerRunFailure} `time-limit` past the time limit, `out-of-memory` past the heap limit,
 *   `error` for an uncaught error in the worker, `exit` when it stopped without answering.
 * @throws {Error} as locateWorker.
 * @returns the worker's message.
 * References: Node.js 20 documentation, "worker_threads: resourceLimits", "Event: 'error'", "Event: 'exit'".
 */
export function runWorkerOnce<Answer>(entry: WorkerEntry, options: RunOnceOptions): Promise<Answer> {
  const located = options.origin ?? locateWorker(entry);
  const origin = located.kind === 'source' ? bundledFromSource(entry, located) : located;
  return new Promise<Answer>((resolve, reject) => {
    const worker = spawnWorker(origin, options);
    let settled = false;
    let timer: NodeJS.Timeout | undefined;
    const finish = (outcome: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      void worker.terminate();
      outcome();
    };
    const startClock = () => {
      // A busy calling thread may handle `online` after the answer: no clock then (a timer left
      // behind would keep the process alive for the whole limit).
      if (settled) return;
      clearTimeout(timer);
      timer = setTimeout(
        () => finish(() => reject(new WorkerRunFailure('time-limit', `${entry.name}: past its time limit of ${options.timeLimitMs} ms`))),
        options.timeLimitMs,
      );
    };
    // The clock starts when the thread runs (its start-up is not the job's time).
    worker.once('online', startClock);
    worker.on('message', (message: Answer | TimeLimitMessage) => {
      if (isTimeLimitMessage(message)) {
        if (settled) return;
        if (message.running) startClock();
        else clearTimeout(timer);
        return;
      }
      finish(() => resolve(message));
    });
    worker.on('error', (error: Error & { code?: string }) => finish(() => {
      if (error.code === 'ERR_WORKER_OUT_OF_MEMORY') reject(new WorkerRunFailure('out-of-memory', `${entry.name}: past its heap limit`, { cause: error }));
      else reject(new WorkerRunFailure('error', `${entry.name} failed: ${error.message}`, { cause: error }));
    }));
    worker.on('exit', (code) => finish(() => reject(new WorkerRunFailure('exit', `${entry.name} stopped with exit code ${code} before answering`))));
  });
}
