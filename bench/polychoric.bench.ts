/**
 * Polychoric benchmark: the polychoric correlation matrix (two-step, pairwise) of seeded
 * ordinal data of two sizes, 1,000 × 40 seven-point items and 2,000 × 100 five-point items.
 * Targets (issue 3): <= 0.3 s and <= 1.5 s on this 2-core machine.
 *
 * Run: `npx tsx bench/polychoric.bench.ts [--no-r]` (or `npm run bench -- polychoric`). For each
 * size it prints the first call (cold: the code is not yet optimised, as in a fresh CLI
 * process), the median of three further calls on one thread, and the median with 2 worker
 * threads; and, when Rscript is on PATH, the time of psych::polychoric on the same data (written
 * to a temporary CSV) with the same options (global thresholds, no correction, no smoothing;
 * psych runs its pairs on 2 cores through parallel::mcmapply), the ratio, and the largest
 * difference between the two matrices. Last lines, machine-readable:
 * {"bench":"polychoric-1000x40","seconds":...,"rSeconds":...}.
 * Figures only: nothing here asserts on time.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadAverageAndCores, ordinalFactorData, withRScript } from './bench-helpers';
import { correlationMatrix, type CorrelationMatrixResult } from '../src/lib/stats/correlation-matrix';
import { correlationMatrixParallel } from './parallel/correlation-matrix-parallel';
import type { ItemMatrix, SquareMatrix } from '../src/lib/stats/types';

interface BenchSize {
  readonly name: string;
  readonly rows: number;
  readonly items: number;
  readonly categories: number;
  readonly targetSeconds: number;
}

const SIZES: readonly BenchSize[] = [
  { name: 'polychoric-1000x40', rows: 1_000, items: 40, categories: 7, targetSeconds: 0.3 },
  { name: 'polychoric-2000x100', rows: 2_000, items: 100, categories: 5, targetSeconds: 1.5 },
];
const SEED = 20261202;
const WORKERS = 2;

function generate(size: BenchSize, seed: number): ItemMatrix {
  return ordinalFactorData(size.rows, size.items, size.categories, seed);
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function seconds(work: () => unknown): Promise<number> {
  const start = performance.now();
  await work();
  return (performance.now() - start) / 1000;
}

/** psych::polychoric on the same values; null when Rscript is missing or --no-r is given. */
function timeR(matrix: ItemMatrix, ours: SquareMatrix): { seconds: number; largestDifference: number } | null {
  return withRScript('paredown-polychoric-', (directory) => {
    const dataFile = join(directory, 'items.csv');
    const oursFile = join(directory, 'ours.csv');
    const lines: string[] = [];
    for (let i = 0; i < matrix.rows; i++) {
      const row: number[] = [];
      for (let j = 0; j < matrix.columns; j++) row.push(matrix.data[j * matrix.rows + i]);
      lines.push(row.join(','));
    }
    writeFileSync(dataFile, lines.join('\n') + '\n');
    const oursLines: string[] = [];
    for (let i = 0; i < ours.order; i++) oursLines.push(Array.from(ours.data.subarray(i * ours.order, (i + 1) * ours.order), (v) => v.toPrecision(17)).join(','));
    writeFileSync(oursFile, oursLines.join('\n') + '\n');
    return `
      suppressPackageStartupMessages(library(psych))
      x <- as.matrix(read.csv(${JSON.stringify(dataFile)}, header = FALSE))
      ours <- as.matrix(read.csv(${JSON.stringify(oursFile)}, header = FALSE))
      elapsed <- system.time(p <- polychoric(x, smooth = FALSE, global = TRUE, correct = 0))[["elapsed"]]
      cat(sprintf("%.3f %.6g\\n", elapsed, max(abs(unname(p$rho) - ours))))
    `;
  }, (stdout) => {
    const [rSeconds, largestDifference] = stdout.trim().split(/\s+/).map(Number);
    return { seconds: rSeconds, largestDifference };
  });
}

console.log(`polychoric: two-step, pairwise, seed ${SEED}`);
console.log(`  load average at start: ${loadAverageAndCores()} (other work on the machine slows every figure)`);
const summary: Record<string, unknown>[] = [];
for (const [index, size] of SIZES.entries()) {
  const matrix = generate(size, SEED + index);
  const options = { method: 'polychoric', missing: 'pairwise' } as const;
  console.log(`\n${size.name}: ${size.rows} respondents × ${size.items} ${size.categories}-point items, ${(size.items * (size.items - 1)) / 2} pairs (target <= ${size.targetSeconds} s)`);
  const firstStart = performance.now();
  const result: CorrelationMatrixResult = correlationMatrix(matrix, options);
  const firstCall = (performance.now() - firstStart) / 1000;
  const single: number[] = [];
  for (let run = 0; run < 3; run++) single.push(await seconds(() => correlationMatrix(matrix, options)));
  const parallel: number[] = [];
  let parallelResult = result;
  for (let run = 0; run < 3; run++) {
    parallel.push(await seconds(async () => (parallelResult = await correlationMatrixParallel(matrix, { ...options, workers: WORKERS, minimumWork: 0 }))));
  }
  let workerDifference = 0;
  for (let t = 0; t < result.matrix.data.length; t++) workerDifference = Math.max(workerDifference, Math.abs(result.matrix.data[t] - parallelResult.matrix.data[t]));
  const best = Math.min(median(single), median(parallel));
  console.log(`  first call, 1 thread                 ${firstCall.toFixed(3)} s`);
  console.log(`  1 thread (median of 3)               ${median(single).toFixed(3)} s`);
  console.log(`  ${WORKERS} workers (median of 3)              ${median(parallel).toFixed(3)} s   (worker start-up included; results differ from 1 thread by ${workerDifference.toExponential(1)})`);
  console.log(`  notices: ${result.notices.map((notice) => notice.code).join(', ') || 'none'}; with workers: ${parallelResult.notices.map((notice) => notice.code).join(', ') || 'none'}; smallest eigenvalue ${result.smallestEigenvalue?.toFixed(4)}`);
  const r = timeR(matrix, result.unrepaired ?? result.matrix);
  if (r !== null) {
    console.log(`  R psych::polychoric                  ${r.seconds.toFixed(3)} s   ratio R / Paredown ${(r.seconds / best).toFixed(0)}×; largest |difference| ${r.largestDifference.toExponential(2)}`);
  }
  summary.push({
    bench: size.name,
    seconds: Number(best.toFixed(3)),
    secondsFirstCall: Number(firstCall.toFixed(3)),
    secondsSingleThread: Number(median(single).toFixed(3)),
    secondsWorkers: Number(median(parallel).toFixed(3)),
    targetSeconds: size.targetSeconds,
    rSeconds: r === null ? null : Number(r.seconds.toFixed(3)),
    ratio: r === null ? null : Number((r.seconds / best).toFixed(1)),
  });
}
console.log('');
for (const line of summary) console.log(JSON.stringify(line));
