/**
 * The build step of the audit worker: an Astro integration that, when `astro build` has written
 * the server, bundles src/lib/server/audit-jobs/audit-worker.ts with everything it imports (the
 * audit, the engine, the numerical core, ml-matrix) into one file, dist/server/audit-worker.mjs,
 * which the built server starts its worker threads from (worker-entry.ts).
 *
 * Why a separate bundle: Vite's server build does not emit a worker file referenced with
 * `new URL(..., import.meta.url)`, and the audit is too large to ship as source text the way the
 * small polychoric kernel is (bench/parallel/). esbuild is the bundler Astro itself
 * depends on. docs/decisions/004-audit-jobs.md.
 */
import type { AstroIntegration } from 'astro';
import { build } from 'esbuild';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { BUILT_WORKER_FILE, WHAT_IF_WORKER_FILES } from './worker-entry';

/** The worker's source, relative to the project root. */
export const AUDIT_WORKER_SOURCE = 'src/lib/server/audit-jobs/audit-worker.ts';

/** The what-if worker's source (docs/decisions/011), bundled the same way beside it. */
export const WHAT_IF_WORKER_SOURCE = `src/lib/server/audit-jobs/${WHAT_IF_WORKER_FILES.source}`;

/**
 * Bundles the audit worker (and the what-if worker beside it) into a folder.
 * @param root the project root (a file URL or path).
 * @param outDir the server output folder (dist/server).
 * @throws {Error} when esbuild reports an error (the build then fails).
 * @returns the path of the written file.
 * References: esbuild documentation, "Build API" (bundle, platform node, format esm).
 */
export async function bundleAuditWorker(root: string | URL, outDir: string | URL): Promise<string> {
  const rootPath = typeof root === 'string' ? root : fileURLToPath(root);
  const outPath = typeof outDir === 'string' ? outDir : fileURLToPath(outDir);
  const outfile = join(outPath, BUILT_WORKER_FILE);
  await bundleOne(join(rootPath, AUDIT_WORKER_SOURCE), outfile);
  await bundleOne(join(rootPath, WHAT_IF_WORKER_SOURCE), join(outPath, WHAT_IF_WORKER_FILES.built));
  return outfile;
}

/** Bundles one worker entry into one ESM file for Node 20. */
async function bundleOne(entry: string, outfile: string): Promise<void> {
  await build({
    entryPoints: [entry],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    // Dependencies written as CommonJS call require(); give the ESM bundle one.
    banner: { js: "import { createRequire as __paredownCreateRequire } from 'node:module'; const require = __paredownCreateRequire(import.meta.url);" },
    logLevel: 'warning',
    legalComments: 'none',
  });
}

/**
 * The Astro integration that runs bundleAuditWorker after every server build.
 * @returns the integration (add it to `integrations` in astro.config.mjs).
 */
export function auditWorkerIntegration(): AstroIntegration {
  let root: URL | null = null;
  let serverDir: URL | null = null;
  return {
    name: 'paredown-audit-worker',
    hooks: {
      'astro:config:done': ({ config }) => {
        root = config.root;
        serverDir = config.build.server;
      },
      'astro:build:done': async ({ logger }) => {
        if (!root || !serverDir) throw new Error('auditWorkerIntegration: the configuration was not seen before the build ended');
        const file = await bundleAuditWorker(root, serverDir);
        logger.info(`audit worker bundled into ${file}`);
      },
    },
  };
}
