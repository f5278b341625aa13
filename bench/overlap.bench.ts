/**
 * Overlap benchmark: Pearson → VIF → eigenvalues → condition number → Belsley-Kuh-Welsch on a
 * seeded 100,000 × 300 complete matrix of 5-point answers (six factors plus noise).
 * Target (issue 3): the whole chain in <= 4 s with peak memory <= 1.5 GB on this 2-core machine.
 *
 * Run: `npx tsx bench/overlap.bench.ts [--no-r]` (or `npm run bench -- overlap`). Prints each stage's
 * seconds, the totals, the peak resident memory (VmHWM, read from /proc), and, when Rscript is on
 * PATH, R's time for cor(), diag(solve()), eigen() and svd() of the scaled matrix on the same
 * data (written to a temporary file with the same bytes), with the ratio. The last line is
 * machine-readable: {"bench":"overlap-100000x300","seconds":...,"peakMB":...}.
 * Figures only: nothing here asserts on time.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadAverageAndCores, withRScript } from './bench-helpers';
import { belsleyCollinearity } from '../src/lib/stats/belsley-collinearity';
import { conditionNumber } from '../src/lib/stats/condition-number';
import { centeredCrossProducts, pearsonFromCrossProducts } from '../src/lib/stats/cross-products';
import { kaiserMeyerOlkin } from '../src/lib/stats/kmo';
import { centeredCrossProductsParallel } from './parallel/cross-products-parallel';
import { createSeededRandom } from '../src/lib/stats/seeded-random';
import { symmetricEigen } from '../src/lib/stats/symmetric-eigen';
import type { ItemMatrix } from '../src/lib/stats/types';
import { varianceInflation } from '../src/lib/stats/variance-inflation';

const ROWS = 100_000;
const ITEMS = 300;
const FACTORS = 6;
const SEED = 20260301;
const WORKERS = 2;

/** Peak resident set (VmHWM) in MB, from /proc/self/status; null where /proc is absent. */
function peakResidentMB(): number | null {
  try {
    const match = /VmHWM:\s+(\d+)\s+kB/.exec(readFileSync('/proc/self/status', 'utf8'));
    return match ? Number(match[1]) / 1024 : null;
  } catch {
    return null;
  }
}

/** Resets VmHWM to the current resident set (Linux: write 5 to clear_refs); false if refused. */
function resetPeakResident(): boolean {
  try {
    writeFileSync('/proc/self/clear_refs', '5');
    return true;
  } catch {
    return false;
  }
}

function generate(): ItemMatrix {
  const random = createSeededRandom(SEED);
  const scores = Array.from({ length: FACTORS }, () => Float64Array.from({ length: ROWS }, () => random.nextNormal()));
  const data = new Float64Array(ROWS * ITEMS);
  for (let j = 0; j < ITEMS; j++) {
    const factor = scores[j % FACTORS];
    const loading = 0.4 + 0.5 * random.next();
    const offset = j * ROWS;
    for (let i = 0; i < ROWS; i++) {
      const value = 3 + 0.9 * (loading * factor[i] + random.nextNormal());
      data[offset + i] = Math.min(5, Math.max(1, Math.round(value)));
    }
  }
  return { rows: ROWS, columns: ITEMS, data };
}

/** Runs one stage, printing wall seconds and the process's CPU seconds (all threads). */
async function time<T>(label: string, work: () => T | Promise<T>, stages: Record<string, number>): Promise<T> {
  const start = performance.now();
  const cpuStart = process.cpuUsage();
  const result = await work();
  const seconds = (performance.now() - start) / 1000;
  const cpu = process.cpuUsage(cpuStart);
  stages[label] = seconds;
  console.log(`  ${label.padEnd(44)} ${seconds.toFixed(3)} s  (cpu ${((cpu.user + cpu.system) / 1e6).toFixed(3)} s)`);
  return result;
}

console.log(`overlap: ${ROWS.toLocaleString('en')} respondents × ${ITEMS} items, ${FACTORS} factors, seed ${SEED}`);
// Other work on the machine slows every figure; the load average says how busy it was.
console.log(`  load average at start: ${loadAverageAndCores()}`);
const generationStart = performance.now();
const matrix = generate();
console.log(`  generated in ${((performance.now() - generationStart) / 1000).toFixed(1)} s (not timed below); resident ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MB`);
const peakReset = resetPeakResident();

// Warm-up on a small slice so the timings below are of optimised code, as in a running server.
{
  const small: ItemMatrix = { rows: 2_000, columns: ITEMS, data: matrix.data.slice(0, 2_000 * ITEMS) };
  const cross = centeredCrossProducts(small);
  const correlation = pearsonFromCrossProducts(cross);
  const eigen = symmetricEigen(correlation);
  varianceInflation(correlation, { eigen });
  belsleyCollinearity(small, { path: 'gram', crossProducts: cross });
}

const stages: Record<string, number> = {};
const single = await time('centred cross-products, 1 thread', () => centeredCrossProducts(matrix), stages);
const cross = await time(`centred cross-products, ${WORKERS} workers`, () => centeredCrossProductsParallel(matrix, { workers: WORKERS }), stages);
const correlation = await time('Pearson from cross-products', () => pearsonFromCrossProducts(cross), stages);
const eigen = await time('eigen-decomposition (values + vectors)', () => symmetricEigen(correlation), stages);
const vif = await time('VIF, tolerance, R², exact dependencies', () => varianceInflation(correlation, { eigen }), stages);
const condition = await time('condition number', () => conditionNumber(correlation, { eigenvalues: eigen.values }), stages);
const belsley = await time('Belsley-Kuh-Welsch (Gram path, reused sums)', () => belsleyCollinearity(matrix, { crossProducts: cross }), stages);
const kmo = await time('KMO and MSA (extra, not in the target)', () => kaiserMeyerOlkin(correlation, { eigen }), stages);

const chain = ['Pearson from cross-products', 'eigen-decomposition (values + vectors)', 'VIF, tolerance, R², exact dependencies', 'condition number', 'Belsley-Kuh-Welsch (Gram path, reused sums)'];
const rest = chain.reduce((sum, label) => sum + stages[label], 0);
const total = stages[`centred cross-products, ${WORKERS} workers`] + rest;
const totalSingle = stages['centred cross-products, 1 thread'] + rest;
const peakMB = peakResidentMB();
let largestDifference = 0;
for (let index = 0; index < single.centered.data.length; index++) {
  largestDifference = Math.max(largestDifference, Math.abs(single.centered.data[index] - cross.centered.data[index]));
}
const maxVif = Math.max(...vif.items.map((item) => item.vif ?? 0));
const largestIndex = belsley.conditionIndices.at(-1);

console.log(`  total with ${WORKERS} workers (target <= 4 s)           ${total.toFixed(3)} s`);
console.log(`  total on 1 thread                                    ${totalSingle.toFixed(3)} s`);
console.log(`  peak resident memory${peakReset ? ' after generation' : ''} (target <= 1536 MB) ${peakMB === null ? 'n/a' : `${peakMB.toFixed(0)} MB`}`);
console.log(`  check: max VIF ${maxVif.toFixed(4)}, condition number ${condition.value?.toFixed(4)}, largest condition index ${largestIndex?.toFixed(4)}, KMO ${kmo.overall?.toFixed(4)}, eigenvalue 1 ${eigen.values[0].toFixed(4)}`);
console.log(`  check: worker and single-thread sums differ by at most ${largestDifference.toExponential(2)}`);

const rTimes = timeR(matrix);
const rSeconds = rTimes === null ? null : rTimes.total;
if (rTimes !== null) {
  const withoutBelsley = total - stages['Belsley-Kuh-Welsch (Gram path, reused sums)'];
  console.log(`  R / Paredown ratio: ${(rTimes.total / total).toFixed(1)}× overall; ${(rTimes.withoutSvd / withoutBelsley).toFixed(1)}× for correlation, VIF and eigenvalues alone`);
  console.log('  (R runs svd() on all 100,000 × 301 values; Paredown reuses the cross-products, the Gram path)');
}

console.log(JSON.stringify({
  bench: 'overlap-100000x300',
  seconds: Number(total.toFixed(3)),
  secondsSingleThread: Number(totalSingle.toFixed(3)),
  peakMB: peakMB === null ? null : Math.round(peakMB),
  rSeconds: rSeconds === null ? null : Number(rSeconds.toFixed(3)),
}));

/** Times R on the same values; null when Rscript is not available. */
function timeR(data: ItemMatrix): { total: number; withoutSvd: number } | null {
  return withRScript('paredown-overlap-', (directory) => {
    const file = join(directory, 'matrix.bin');
    writeFileSync(file, new Uint8Array(data.data.buffer, data.data.byteOffset, data.data.byteLength));
    return `
      con <- file(${JSON.stringify(file)}, "rb"); x <- readBin(con, "double", n = ${data.rows * data.columns}, endian = "little"); close(con)
      X <- matrix(x, ${data.rows}, ${data.columns}); rm(x); invisible(gc())
      t0 <- proc.time()[["elapsed"]]
      R <- cor(X); t1 <- proc.time()[["elapsed"]]
      vif <- diag(solve(R)); t2 <- proc.time()[["elapsed"]]
      ev <- eigen(R, symmetric = TRUE); t3 <- proc.time()[["elapsed"]]
      Xs <- cbind(1, X); Xs <- sweep(Xs, 2, sqrt(colSums(Xs^2)), "/"); s <- svd(Xs, nu = 0); ci <- max(s$d) / s$d
      t4 <- proc.time()[["elapsed"]]
      cat(sprintf("%.3f %.3f %.3f %.3f %.6f %.6f %.6f\\n", t1 - t0, t2 - t1, t3 - t2, t4 - t3, max(vif), sqrt(max(ev$values) / min(ev$values)), max(ci)))
    `;
  }, (stdout) => {
    const [cor, solve, eigenTime, svd, rMaxVif, rCondition, rIndex] = stdout.trim().split(/\s+/).map(Number);
    const rTotal = cor + solve + eigenTime + svd;
    console.log(`  R: cor() ${cor.toFixed(3)} s, diag(solve()) ${solve.toFixed(3)} s, eigen() ${eigenTime.toFixed(3)} s, svd(scaled [1, X]) ${svd.toFixed(3)} s: total ${rTotal.toFixed(3)} s`);
    console.log(`  R check: max VIF ${rMaxVif.toFixed(4)}, condition number ${rCondition.toFixed(4)}, largest condition index ${rIndex.toFixed(4)}`);
    return { total: rTotal, withoutSvd: cor + solve + eigenTime };
  });
}
