// Shared steps of `npm start` and `npm test`: install when stale, build when stale.
// Plain Node (no TypeScript), so they run before anything is installed.
import { createHash } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync, mkdirSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The repository root. */
export const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

const installStamp = join(root, 'node_modules', '.paredown-install-stamp');
const buildStamp = join(root, 'dist', '.paredown-build-stamp');

/** Prints a step of the start-up, so a newcomer sees what is happening. */
export function step(message) {
  console.log(`\u25b8 ${message}`);
}

/**
 * Runs a command in the repository root, inheriting the terminal; exits on failure.
 * @param {string} command
 * @param {string[]} args
 * @param {NodeJS.ProcessEnv} [env]
 */
export function run(command, args, env = process.env) {
  const result = spawnSync(command, args, { cwd: root, stdio: 'inherit', env });
  if (result.status !== 0) {
    console.error(`\u2716 ${command} ${args.join(' ')} failed (exit ${result.status ?? result.signal}).`);
    process.exit(result.status ?? 1);
  }
}

function hashFile(path) {
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

/** npm ci when node_modules is missing or package-lock.json changed since the last install. */
export function ensureInstalled() {
  const lockHash = hashFile(join(root, 'package-lock.json'));
  const hiddenLock = join(root, 'node_modules', '.package-lock.json');
  let stale = !existsSync(hiddenLock);
  if (!stale && existsSync(installStamp)) {
    stale = readFileSync(installStamp, 'utf8').trim() !== lockHash;
  } else if (!stale) {
    // Installed by hand before any stamp existed: trust it unless the lock file is newer.
    stale = statSync(join(root, 'package-lock.json')).mtimeMs > statSync(hiddenLock).mtimeMs + 1000;
  }
  if (stale) {
    step('Installing dependencies (npm ci; better-sqlite3 compiles, about 3 minutes the first time)');
    run('npm', ['ci', '--no-audit', '--no-fund']);
  }
  writeFileSync(installStamp, lockHash + '\n');
}

function listFiles(directory) {
  if (!existsSync(directory)) return [];
  const out = [];
  for (const entry of readdirSync(directory, { withFileTypes: true })) {
    const path = join(directory, entry.name);
    if (entry.isDirectory()) out.push(...listFiles(path));
    else if (entry.isFile()) out.push(path);
  }
  return out;
}

/** A hash of everything the build depends on, including the host names baked into it. */
function sourceHash() {
  const hash = createHash('sha256');
  const inputs = [
    ...listFiles(join(root, 'src')),
    ...listFiles(join(root, 'public')),
    ...['astro.config.mjs', 'auth.config.ts', 'package-lock.json', 'tsconfig.json'].map((f) => join(root, f)),
  ]
    .filter((path) => existsSync(path))
    .sort();
  for (const path of inputs) {
    hash.update(relative(root, path)).update('\0').update(readFileSync(path)).update('\0');
  }
  hash.update(`PUBLIC_URL=${process.env.PUBLIC_URL ?? ''}\0ALLOWED_HOSTS=${process.env.ALLOWED_HOSTS ?? ''}`);
  return hash.digest('hex');
}

/** astro build when dist/ is missing or any source changed since the last build. */
export function ensureBuilt({ force = false } = {}) {
  const wanted = sourceHash();
  const entry = join(root, 'dist', 'server', 'entry.mjs');
  const current = existsSync(buildStamp) ? readFileSync(buildStamp, 'utf8').trim() : '';
  if (!force && existsSync(entry) && current === wanted) return;
  step('Building the application (astro build)');
  run(process.execPath, [join(root, 'node_modules', 'astro', 'astro.js'), 'build'], { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' });
  mkdirSync(dirname(buildStamp), { recursive: true });
  writeFileSync(buildStamp, wanted + '\n');
}

/** Runs a TypeScript file of the repository with tsx. */
export function runTs(file, env = process.env) {
  run(process.execPath, [join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), file], env);
}
