/**
 * Where an audit worker thread starts from, and starting one.
 *
 * - In the built server (dist/server/**), this module is part of Astro's bundle; the build also
 *   bundles audit-worker.ts on its own into dist/server/audit-worker.mjs (audit-worker-build.ts).
 *   The worker is found by walking up from this chunk's folder.
 * - Under tsx, Vitest and `astro dev` this module is the TypeScript source itself; the worker
 *   runs audit-worker.ts from source, loaded through tsx's `tsImport` (tsx is a dependency of
 *   the project; Node 20 does not pass `--import` loaders on to worker threads).
 * docs/decisions/004-audit-jobs.md.
 */
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';

/** File name of the bundled worker in the build's server folder. */
export const BUILT_WORKER_FILE = 'audit-worker.mjs';

/** A worker's source file (beside this module) and its bundled file (in the build's server folder). */
export interface WorkerFiles {
  readonly source: string;
  readonly built: string;
}

/** The audit worker. */
export const AUDIT_WORKER_FILES: WorkerFiles = { source: 'audit-worker.ts', built: BUILT_WORKER_FILE };

/** The what-if worker (what-if-worker.ts): same mechanism, its own thread. */
export const WHAT_IF_WORKER_FILES: WorkerFiles = { source: 'what-if-worker.ts', built: 'what-if-worker.mjs' };

/** How far up from this chunk the bundled worker is looked for (dist/server/chunks/ is one). */
const SEARCH_DEPTH = 6;

/** Where the worker comes from in this process. */
export type AuditWorkerOrigin = { readonly kind: 'built'; readonly file: string } | { readonly kind: 'source'; readonly file: string };

/**
 * Finds the worker for this process.
 * @param moduleUrl the URL of the calling module (this module's by default).
 * @throws {Error} in a built server whose bundled worker is missing (the build did not run the
 *   audit worker step: rebuild).
 * @returns the bundled file, or the TypeScript source beside this module.
 */
export function locateAuditWorker(moduleUrl: string = import.meta.url, worker: WorkerFiles = AUDIT_WORKER_FILES): AuditWorkerOrigin {
  const here = fileURLToPath(moduleUrl);
  if (here.endsWith('.ts')) return { kind: 'source', file: join(dirname(here), worker.source) };
  let folder = dirname(here);
  for (let depth = 0; depth <= SEARCH_DEPTH; depth++) {
    const candidate = join(folder, worker.built);
    if (existsSync(candidate)) return { kind: 'built', file: candidate };
    const parent = dirname(folder);
    if (parent === folder) break;
    folder = parent;
  }
  throw new Error(`locateAuditWorker: ${worker.built} was not found above ${dirname(here)}; run the build again (npm run build) so that it bundles the audit worker`);
}

/** The tsx loader API, resolved from the project (its ESM entry; `require` would pick the CommonJS one). */
function tsxApiUrl(): string {
  const require = createRequire(import.meta.url);
  const packageJson = require.resolve('tsx/package.json');
  return pathToFileURL(join(dirname(packageJson), 'dist', 'esm', 'api', 'index.mjs')).href;
}

/**
 * Starts one audit worker thread.
 * @param origin where it starts from (found with locateAuditWorker by default).
 * @throws {Error} as locateAuditWorker.
 * @returns the worker; it waits for jobs (see worker-protocol.ts).
 */
export function spawnAuditWorker(origin: AuditWorkerOrigin = locateAuditWorker(), name = 'paredown-audit'): Worker {
  const options = { name };
  if (origin.kind === 'built') return new Worker(origin.file, options);
  const api = tsxApiUrl();
  const source = [
    `import(${JSON.stringify(api)})`,
    `.then((tsx) => tsx.tsImport(${JSON.stringify(pathToFileURL(origin.file).href)}, ${JSON.stringify(api)}))`,
    '.catch((error) => { console.error("audit worker could not start:", error); process.exit(1); });',
  ].join('');
  return new Worker(source, { ...options, eval: true });
}
