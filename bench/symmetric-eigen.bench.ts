/**
 * symmetricEigen per call (tred2's accumulation four rows per pass, the QL rotations in
 * WebAssembly) against the listing's loops (`symmetricEigenUnblocked`: one row at a time, the
 * rotations in JavaScript), on seeded random correlation matrices of the
 * orders the audit meets (40 items; 101 for Belsley's scaled Gram matrix of case E) and small
 * ones around the cut-off `WEBASSEMBLY_ROTATIONS_MIN_ORDER`.
 *
 * Run: `npx tsx bench/symmetric-eigen.bench.ts [orders...]`. The two paths are timed in
 * alternating rounds in one process, so a ratio is measured under the same load; prints the
 * median microseconds per call of each and the ratio, with the load average. Figures only:
 * nothing here asserts on time.
 */
import { loadAverageAndCores } from './bench-helpers';
import { createSeededRandom } from '../src/lib/stats/seeded-random';
import { symmetricEigen, symmetricEigenUnblocked } from '../src/lib/stats/symmetric-eigen';
import type { SquareMatrix } from '../src/lib/stats/types';

const ROUNDS = 15;
const SAMPLES = 400;

/** Correlation matrix of `samples` seeded draws of `order` items with a common factor. */
function randomCorrelation(order: number, seed: number): SquareMatrix {
  const random = createSeededRandom(seed);
  const data = new Float64Array(SAMPLES * order);
  for (let r = 0; r < SAMPLES; r++) {
    const factor = random.nextNormal();
    for (let j = 0; j < order; j++) data[r * order + j] = 0.5 * factor + random.nextNormal();
  }
  const means = new Float64Array(order);
  for (let r = 0; r < SAMPLES; r++) for (let j = 0; j < order; j++) means[j] += data[r * order + j] / SAMPLES;
  const cov = new Float64Array(order * order);
  for (let r = 0; r < SAMPLES; r++) {
    for (let j = 0; j < order; j++) {
      const x = data[r * order + j] - means[j];
      for (let k = j; k < order; k++) cov[j * order + k] += x * (data[r * order + k] - means[k]);
    }
  }
  const out = new Float64Array(order * order);
  for (let j = 0; j < order; j++) {
    for (let k = j; k < order; k++) {
      const value = j === k ? 1 : cov[j * order + k] / Math.sqrt(cov[j * order + j] * cov[k * order + k]);
      out[j * order + k] = value;
      out[k * order + j] = value;
    }
  }
  return { order, data: out };
}

function microsecondsPerCall(decompose: (m: SquareMatrix) => unknown, matrices: SquareMatrix[], calls: number): number {
  const start = process.hrtime.bigint();
  for (let c = 0; c < calls; c++) decompose(matrices[c % matrices.length]);
  return Number(process.hrtime.bigint() - start) / 1000 / calls;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

const orders = process.argv.slice(2).map(Number).filter((n) => n > 0);
for (const order of orders.length > 0 ? orders : [4, 6, 8, 12, 16, 40, 101]) {
  const matrices = Array.from({ length: 8 }, (_, seed) => randomCorrelation(order, 1000 * order + seed));
  const calls = Math.max(20, Math.round(2e7 / (order * order * order + 2000)));
  for (let warm = 0; warm < 3; warm++) {
    microsecondsPerCall(symmetricEigen, matrices, calls);
    microsecondsPerCall(symmetricEigenUnblocked, matrices, calls);
  }
  const kernel: number[] = [];
  const loop: number[] = [];
  for (let round = 0; round < ROUNDS; round++) {
    kernel.push(microsecondsPerCall(symmetricEigen, matrices, calls));
    loop.push(microsecondsPerCall(symmetricEigenUnblocked, matrices, calls));
  }
  const [k, j] = [median(kernel), median(loop)];
  console.log(`order ${order}: unblocked ${j.toFixed(1)} µs, symmetricEigen ${k.toFixed(1)} µs per call (ratio ${(j / k).toFixed(2)}), ${calls} calls × ${ROUNDS} rounds`);
}
console.log(loadAverageAndCores());
