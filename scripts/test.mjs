// `npm test`: everything. Install if needed; type-check the whole project (`tsc --noEmit`: src,
// tests, bench, scripts) and the .astro files (`astro check`), failing before any test runs when
// either finds an error; make sure Debian's Chromium is there (installing it with apt-get when we
// are root, failing with a clear message otherwise: never skipping); build; then Vitest runs the
// unit project (which includes the layering and route-inventory tests) and the app project (API
// and browser tests against the built server, see tests/setup/app-server.ts). Extra arguments go
// to Vitest. docs/decisions/008-contracts-guards-and-rails.md.
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { ensureBuilt, ensureInstalled, root, run, step } from './lib/prepare.mjs';

process.chdir(root);
process.env.ASTRO_TELEMETRY_DISABLED = '1';

function findChromium() {
  for (const candidate of ['/usr/bin/chromium', '/usr/bin/chromium-browser']) {
    if (existsSync(candidate)) return candidate;
  }
  const found = spawnSync('sh', ['-c', 'command -v chromium || command -v chromium-browser'], { encoding: 'utf8' });
  return found.status === 0 ? found.stdout.trim() : null;
}

function ensureChromium() {
  if (findChromium()) return;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot) {
    console.error(
      '\u2716 The browser tests need Debian\'s Chromium at /usr/bin/chromium, and it is not installed.\n' +
        '  Install it (as root: apt-get update && apt-get install -y chromium), or set CHROMIUM_PATH, then run npm test again.',
    );
    process.exit(1);
  }
  step('Installing Chromium for the browser tests (apt-get)');
  run('apt-get', ['update']);
  run('apt-get', ['install', '-y', '--no-install-recommends', 'chromium'], { ...process.env, DEBIAN_FRONTEND: 'noninteractive' });
  if (!findChromium()) {
    console.error('\u2716 apt-get finished but no chromium binary was found on PATH.');
    process.exit(1);
  }
}

/**
 * The memo tests read the generated PDF back with Debian's poppler-utils (pdftotext, pdffonts,
 * pdftoppm); installed with apt-get when missing and we are root, else a clear stop.
 */
function ensurePoppler() {
  if (spawnSync('sh', ['-c', 'command -v pdftotext && command -v pdftoppm && command -v pdffonts'], { encoding: 'utf8' }).status === 0) return;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot) {
    console.error('\u2716 The memo tests need Debian\'s poppler-utils (pdftotext, pdftoppm, pdffonts).\n  Install them (as root: apt-get update && apt-get install -y poppler-utils), then run npm test again.');
    process.exit(1);
  }
  step('Installing poppler-utils for the memo tests (apt-get)');
  run('apt-get', ['update']);
  run('apt-get', ['install', '-y', '--no-install-recommends', 'poppler-utils'], { ...process.env, DEBIAN_FRONTEND: 'noninteractive' });
}

/**
 * Runs one static check and stops `npm test` with a plain sentence when it fails.
 * @param title what is checked, for the step line.
 * @param args the node script and its arguments.
 * @param advice what to do when it fails.
 */
function staticCheck(title, args, advice) {
  step(title);
  const result = spawnSync(process.execPath, args, { cwd: root, stdio: 'inherit', env: process.env });
  if (result.status !== 0) {
    console.error(`\n\u2716 ${title} failed (exit ${result.status ?? result.signal}): ${advice}\n  No test was run.`);
    process.exit(result.status || 1);
  }
}

ensureInstalled();
staticCheck(
  'Type-checking (tsc --noEmit)',
  [join(root, 'node_modules', 'typescript', 'bin', 'tsc'), '--noEmit'],
  'TypeScript found type errors, listed above with file and line. Fix them (or run `npx tsc --noEmit` to see them again).',
);
staticCheck(
  'Checking the .astro files (astro check)',
  [join(root, 'node_modules', 'astro', 'astro.js'), 'check'],
  'astro check found errors in .astro files (or in what they import), listed above. Fix them (or run `npx astro check` to see them again).',
);
if (!process.env.CHROMIUM_PATH) ensureChromium();
ensurePoppler();
ensureBuilt();
step('Running the tests (vitest: unit and app projects)');
const summaryFile = join(root, 'test-results', 'vitest-summary.json');
rmSync(summaryFile, { force: true });
const result = spawnSync(
  process.execPath,
  [join(root, 'node_modules', 'vitest', 'vitest.mjs'), 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${summaryFile}`, ...process.argv.slice(2)],
  { cwd: root, stdio: 'inherit', env: process.env },
);
// One plain closing line that any CI reader understands, from Vitest's own JSON report.
if (existsSync(summaryFile)) {
  const report = JSON.parse(readFileSync(summaryFile, 'utf8'));
  const skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
  console.log(`\ntests: ${report.numPassedTests} passed, ${report.numFailedTests} failed${skipped ? `, ${skipped} skipped` : ''}`);
}
process.exit(typeof result.status === 'number' ? result.status : 1);
