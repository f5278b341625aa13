/**
 * Smoothing benchmark: `minimumTraceCommunalities` (the MTFA behind Bentler & Yuan's smoothing) on
 * the demo wave's pairwise polychoric matrix, which is indefinite (fixtures/demo/library-pilot-1.csv:
 * the columns after the first two whose answers lie in 1-7, other codes as missing), with the
 * positive-definite kernels in WebAssembly (src/lib/stats/positive-definite-kernels.ts) and with
 * the plain-JavaScript loops they replaced (tests/unit/smooth-correlation-reference.ts). Both give
 * the same bits; the benchmark checks that before timing.
 *
 * Run: `npx tsx bench/smoothing.bench.ts` (or `npm run bench -- smoothing`). Prints, for each,
 * the best and the median CPU milliseconds per call over 10 rounds (the two interleaved, after two
 * warm-up rounds), the load average, and last, machine-readable:
 * {"bench":"mtfa-demo-polychoric","order":...,"newtonSteps":...,"kernelMs":...,"plainMs":...}.
 * Figures only: nothing here asserts on time.
 */
import { readFileSync } from 'node:fs';
import Papa from 'papaparse';
import { loadAverageAndCores } from './bench-helpers';
import { correlationMatrix } from '../src/lib/stats/correlation-matrix';
import { minimumTraceCommunalities } from '../src/lib/stats/smooth-correlation-matrix';
import { symmetricEigenvalues } from '../src/lib/stats/symmetric-eigen';
import type { SquareMatrix } from '../src/lib/stats/types';
import { minimumTraceCommunalitiesPlain } from '../tests/unit/smooth-correlation-reference';

function demoPolychoric(): SquareMatrix {
  const text = readFileSync(new URL('../fixtures/demo/library-pilot-1.csv', import.meta.url), 'utf8');
  const rows = Papa.parse<string[]>(text.trim(), { skipEmptyLines: true }).data.slice(1);
  const columns: Float64Array[] = [];
  for (let j = 2; j < rows[0].length; j++) {
    const values = Float64Array.from(rows, (row) => {
      const value = row[j] === '' ? Number.NaN : Number(row[j]);
      return Number.isInteger(value) && value >= 1 && value <= 7 ? value : Number.NaN;
    });
    const distinct = new Set(Array.from(values).filter((value) => !Number.isNaN(value)));
    if (distinct.size > 1) columns.push(values);
  }
  const data = new Float64Array(rows.length * columns.length);
  columns.forEach((column, j) => data.set(column, j * rows.length));
  return correlationMatrix({ rows: rows.length, columns: columns.length, data }, { method: 'polychoric', missing: 'pairwise', repair: 'none' }).matrix;
}

const cpuMilliseconds = (): number => {
  const usage = process.cpuUsage();
  return (usage.user + usage.system) / 1000;
};
const median = (values: number[]): number => [...values].sort((a, b) => a - b)[values.length >> 1];

const matrix = demoPolychoric();
const smallest = symmetricEigenvalues(matrix)[matrix.order - 1];
const kernel = minimumTraceCommunalities(matrix, smallest);
const plain = minimumTraceCommunalitiesPlain(matrix, smallest);
const same = kernel.newtonSteps === plain.newtonSteps && kernel.communalities.every((value, i) => Object.is(value, plain.communalities[i]));
console.log(`order ${matrix.order}, smallest eigenvalue ${smallest.toPrecision(3)}, ${kernel.newtonSteps} Newton steps; kernels and plain loops give the same bits: ${same}`);
if (!same) throw new Error('smoothing bench: the kernels and the plain loops disagree');

const times = { kernel: [] as number[], plain: [] as number[] };
for (let round = 0; round < 12; round++) {
  for (const [name, run, calls] of [
    ['kernel', minimumTraceCommunalities, 50],
    ['plain', minimumTraceCommunalitiesPlain, 5],
  ] as const) {
    const start = cpuMilliseconds();
    for (let call = 0; call < calls; call++) run(matrix, smallest);
    if (round >= 2) times[name].push((cpuMilliseconds() - start) / calls);
  }
}
for (const name of ['kernel', 'plain'] as const) {
  console.log(`${name}: best ${Math.min(...times[name]).toFixed(2)} ms, median ${median(times[name]).toFixed(2)} ms of CPU per call`);
}
console.log(`plain / kernel (medians) ${(median(times.plain) / median(times.kernel)).toFixed(1)}; load average ${loadAverageAndCores()}`);
console.log(
  JSON.stringify({
    bench: 'mtfa-demo-polychoric',
    order: matrix.order,
    newtonSteps: kernel.newtonSteps,
    kernelMs: Number(median(times.kernel).toFixed(3)),
    plainMs: Number(median(times.plain).toFixed(3)),
  }),
);
