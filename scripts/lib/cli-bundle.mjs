// The command-line audit's bundle: src/cli/audit.ts and everything it imports (the reader, the
// audit, the engine, the numerical core, zod, ml-matrix, papaparse, yauzl) in one ESM file,
// built once by esbuild (the bundler of the audit worker, src/lib/server/audit-jobs/
// audit-worker-build.ts) and rebuilt only when one of its inputs changes (an input whose size and
// modification time are as recorded is not read again; any other is hashed). Plain Node, like
// prepare.mjs. docs/decisions/020-speed-whole-audit.md. The wave reader's worker entry
// (src/lib/workers/worker-entries.ts: wave-reader-worker.mjs) is bundled beside it, where the
// one worker mechanism looks for it from the bundle's folder (docs/decisions/018); so are the
// bootstrap's resample thread (resample-worker.mjs, docs/decisions/021) and parallel analysis's
// (random-eigenvalue-worker.mjs, docs/decisions/020) and the residual bootstrap's
// (residual-bootstrap-worker.mjs, docs/decisions/020).
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { root } from './prepare.mjs';

/** The bundle, and the stamp beside it listing every input with its hash. */
export const cliBundle = join(root, 'dist', 'cli', 'audit.mjs');
const stamp = join(root, 'dist', 'cli', '.paredown-cli-stamp.json');
/** Worker entries bundled beside it (their names in src/lib/workers/worker-entries.ts, without .mjs). */
const workerBundles = ['wave-reader-worker', 'resample-worker', 'random-eigenvalue-worker', 'residual-bootstrap-worker'];
/** Files that change the bundle without being among its inputs. */
const alwaysHashed = ['package-lock.json', 'tsconfig.json', 'scripts/lib/cli-bundle.mjs'];

function hashOf(relativePath) {
  const path = join(root, relativePath);
  if (!existsSync(path)) return null;
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

/** An input's size and modification time (ms), or null when it is missing. */
function statOf(relativePath) {
  try {
    const stats = statSync(join(root, relativePath));
    return { size: stats.size, mtimeMs: stats.mtimeMs };
  } catch {
    return null;
  }
}

/**
 * True when the input is as the stamp recorded it. Its size and modification time are looked at
 * first (one stat, no read): when both are as recorded the file is taken as unchanged; when
 * either differs (a checkout, an edit, a touch), its SHA-256 decides, so touching a file without
 * changing it costs a hash but never a rebuild.
 */
function isUnchanged(relativePath, recorded) {
  const hash = typeof recorded === 'string' ? recorded : recorded?.hash;
  if (typeof recorded === 'object' && recorded !== null) {
    const stats = statOf(relativePath);
    if (stats !== null && stats.size === recorded.size && stats.mtimeMs === recorded.mtimeMs) return true;
  }
  return hashOf(relativePath) === (hash ?? null);
}

/** True when the bundle exists and no input listed in its stamp changed since it was built. */
function isCurrent() {
  if (!existsSync(cliBundle) || !workerBundles.every((name) => existsSync(join(root, 'dist', 'cli', `${name}.mjs`))) || !existsSync(stamp)) return false;
  let recorded;
  try {
    recorded = JSON.parse(readFileSync(stamp, 'utf8'));
  } catch {
    return false;
  }
  if (recorded === null || typeof recorded !== 'object' || typeof recorded.inputs !== 'object') return false;
  if (recorded.node !== process.versions.node) return false;
  return Object.entries(recorded.inputs).every(([path, entry]) => isUnchanged(path, entry));
}

/**
 * Builds dist/cli/audit.mjs when it is missing or stale; does nothing otherwise.
 * @param {{ force?: boolean, quiet?: boolean }} [options]
 * @returns {Promise<{ built: boolean, file: string }>}
 */
export async function ensureCliBundle({ force = false, quiet = false } = {}) {
  if (!force && isCurrent()) return { built: false, file: cliBundle };
  if (!quiet) process.stderr.write('Building the command-line audit (once, until its sources change)...\n');
  const { build } = await import('esbuild');
  mkdirSync(join(root, 'dist', 'cli'), { recursive: true });
  const result = await build({
    absWorkingDir: root,
    entryPoints: {
      audit: 'src/cli/audit.ts',
      'wave-reader-worker': 'src/lib/ingest/wave-reader-worker.ts',
      'resample-worker': 'src/lib/audit/resample-worker.ts',
      'random-eigenvalue-worker': 'src/lib/audit/random-eigenvalue-worker.ts',
      'residual-bootstrap-worker': 'src/lib/audit/residual-bootstrap-worker.ts',
    },
    outdir: join(root, 'dist', 'cli'),
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    // Dependencies written as CommonJS call require(); give the ESM bundle one.
    banner: { js: "import { createRequire as __paredownCreateRequire } from 'node:module'; const require = __paredownCreateRequire(import.meta.url);" },
    // Less to parse at every start; identifiers keep their names (error classes are told apart by them).
    minifyWhitespace: true,
    minifySyntax: true,
    metafile: true,
    logLevel: 'warning',
    legalComments: 'none',
  });
  const inputs = {};
  for (const path of [...Object.keys(result.metafile.inputs), ...alwaysHashed].sort()) inputs[path] = { hash: hashOf(path), ...statOf(path) };
  writeFileSync(stamp, `${JSON.stringify({ node: process.versions.node, inputs }, null, 1)}\n`);
  return { built: true, file: cliBundle };
}
