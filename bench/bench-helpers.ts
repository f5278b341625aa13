/**
 * What the benchmarks that compare with R share: the machine's load when they start, and running
 * an R script on data written to a temporary folder (skipped with --no-r or when Rscript is not
 * on PATH, reported as a figure rather than thrown when R fails). Figures only: nothing asserts.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * The load averages over 1, 5 and 15 minutes and the number of cores, for the heading of a run.
 * @returns e.g. "0.52 0.40 0.31 on 2 cores".
 */
export function loadAverageAndCores(): string {
  return `${loadavg().map((value) => value.toFixed(2)).join(' ')} on ${availableParallelism()} cores`;
}

/**
 * Runs an R script with `Rscript -e` on files written to a temporary folder, removed afterwards.
 * Prints why R was skipped or failed (the last line of its error output) and then returns null.
 * @param folderPrefix prefix of the temporary folder's name.
 * @param prepare writes the data files into the folder and returns the script's text.
 * @param parse reads the figures from what the script printed.
 * @returns what `parse` returned, or null when --no-r was given, Rscript is missing or the script failed.
 */
export function withRScript<T>(folderPrefix: string, prepare: (directory: string) => string, parse: (stdout: string) => T): T | null {
  if (process.argv.includes('--no-r')) {
    console.log('  R: skipped (--no-r)');
    return null;
  }
  const probe = spawnSync('Rscript', ['--version'], { encoding: 'utf8' });
  if (probe.error !== undefined || probe.status !== 0) {
    console.log('  R: Rscript not on PATH, skipped');
    return null;
  }
  const directory = mkdtempSync(join(tmpdir(), folderPrefix));
  try {
    const script = prepare(directory);
    const run = spawnSync('Rscript', ['-e', script], { encoding: 'utf8', maxBuffer: 1 << 20 });
    if (run.status !== 0) {
      console.log(`  R: failed (${run.stderr.trim().split('\n').at(-1)})`);
      return null;
    }
    return parse(run.stdout);
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}
