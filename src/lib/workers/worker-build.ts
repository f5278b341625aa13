/**
 * The build step of the worker threads: an Astro integration that, when `astro build` has written
 * the server, bundles every entry of worker-entries.ts (the audit worker, the what-if worker, the
 * wave reader) with everything it imports (the audit, the engine, the core, ml-matrix; the
 * ingest and SheetJS) into one file each in dist/server/, which the built server starts its
 * worker threads from (start-worker.ts).
 *
 * Why separate bundles: Vite's server build does not emit a worker file referenced with
 * `new URL(..., import.meta.url)`, and the workers are too large to ship as source text. esbuild
 * is the bundler Astro itself depends on. docs/decisions/004-audit-jobs.md, 018-workbook-worker.md.
 */
import type { AstroIntegration } from 'astro';
import { build } from 'esbuild';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { WORKER_BUNDLE_OPTIONS } from './start-worker';
import { WORKER_ENTRIES, type WorkerEntry } from './worker-entries';

/**
 * Bundles worker entries into a folder.
 * @param root the project root (a file URL or path).
 * @param outDir the server output folder (dist/server).
 * @param entries the entries (every one of worker-entries.ts by default).
 * @throws {Error} when esbuild reports an error (the build then fails).
 * @returns the paths of the written files, in entry order.
 * References: esbuild documentation, "Build API" (bundle, platform node, format esm).
 */
export async function bundleWorkers(root: string | URL, outDir: string | URL, entries: readonly WorkerEntry[] = WORKER_ENTRIES): Promise<string[]> {
  const rootPath = typeof root === 'string' ? root : fileURLToPath(root);
  const outPath = typeof outDir === 'string' ? outDir : fileURLToPath(outDir);
  const written: string[] = [];
  for (const entry of entries) {
    const outfile = join(outPath, entry.built);
    await bundleOne(join(rootPath, ...entry.source.split('/')), outfile);
    written.push(outfile);
  }
  return written;
}

/** Bundles one worker entry into one ESM file for Node 20. */
async function bundleOne(entry: string, outfile: string): Promise<void> {
  await build({ ...WORKER_BUNDLE_OPTIONS, entryPoints: [entry], outfile, logLevel: 'warning' });
}

/**
 * The Astro integration that runs bundleWorkers after every server build.
 * @returns the integration (add it to `integrations` in astro.config.mjs).
 */
export function workerBuildIntegration(): AstroIntegration {
  let root: URL | null = null;
  let serverDir: URL | null = null;
  return {
    name: 'paredown-worker-threads',
    hooks: {
      'astro:config:done': ({ config }) => {
        root = config.root;
        serverDir = config.build.server;
      },
      'astro:build:done': async ({ logger }) => {
        if (!root || !serverDir) throw new Error('workerBuildIntegration: the configuration was not seen before the build ended');
        const files = await bundleWorkers(root, serverDir);
        logger.info(`worker threads bundled: ${files.join(', ')}`);
      },
    },
  };
}
