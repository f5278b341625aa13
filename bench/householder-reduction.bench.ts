/**
 * Householder reduction benchmark: the JavaScript loop (`householderReductionScript`) against the
 * WebAssembly SIMD kernel (`householderReductionWasm`) per call, at orders around the cut-off
 * HOUSEHOLDER_WASM_MIN_ORDER and at the orders of the audit's matrices (100, 300), on seeded
 * random correlation matrices; then `symmetricEigenvalues` per call at orders 100 and 300 (which
 * takes the kernel from the cut-off up). The two reductions alternate in rounds, so that load from
 * other processes falls on both alike.
 *
 * Run: `npx tsx bench/householder-reduction.bench.ts` (or `npm run bench -- householder`).
 * The last line is machine-readable:
 * {"bench":"householder-reduction","order300ScriptMs":...,"order300WasmMs":...,"eigenvalues300Ms":...}.
 * Figures only: nothing here asserts on time.
 */
import { loadAverageAndCores } from './bench-helpers';
import { HOUSEHOLDER_WASM_MIN_ORDER, householderReductionWasm } from '../src/lib/stats/householder-reduction-kernel';
import { createSeededRandom } from '../src/lib/stats/seeded-random';
import { householderReductionScript, symmetricEigenvalues } from '../src/lib/stats/symmetric-eigen';

type Reduction = (w: Float64Array, n: number, d: Float64Array, e: Float64Array) => void;

/** A correlation matrix of `rows` seeded standard normal rows (as parallel analysis draws them). */
function randomCorrelation(n: number, seed: number): Float64Array {
  const rows = n + 50;
  const random = createSeededRandom(seed);
  const x = new Float64Array(rows * n);
  for (let index = 0; index < x.length; index++) x[index] = random.nextNormal();
  const c = new Float64Array(n * n);
  for (let a = 0; a < n; a++) {
    for (let b = a; b < n; b++) {
      let sum = 0;
      for (let r = 0; r < rows; r++) sum += x[r * n + a] * x[r * n + b];
      c[a * n + b] = sum;
      c[b * n + a] = sum;
    }
  }
  const scale = Float64Array.from({ length: n }, (_, a) => Math.sqrt(c[a * n + a]));
  for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) c[a * n + b] /= scale[a] * scale[b];
  for (let a = 0; a < n; a++) c[a * n + a] = 1;
  return c;
}

/** Milliseconds per call of `reduce` over `calls` calls (fresh copies of the matrices). */
function timeReduction(reduce: Reduction, matrices: Float64Array[], n: number, calls: number): number {
  const w = new Float64Array(n * n);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  const start = process.hrtime.bigint();
  for (let call = 0; call < calls; call++) {
    w.set(matrices[call % matrices.length]);
    d.fill(0);
    e.fill(0);
    reduce(w, n, d, e);
  }
  return Number(process.hrtime.bigint() - start) / 1e6 / calls;
}

const ORDERS = [4, 8, 12, 16, 20, 24, 32, 48, 64, 100, 300];
const ROUNDS = 5;
console.log(`Householder reduction, ms per call (best of ${ROUNDS} alternating rounds); cut-off ${HOUSEHOLDER_WASM_MIN_ORDER}; ${loadAverageAndCores()}`);
const results = new Map<number, { script: number; wasm: number }>();
for (const n of ORDERS) {
  const matrices = Array.from({ length: 4 }, (_, index) => randomCorrelation(n, 1000 * n + index));
  const calls = Math.max(4, Math.round(2e7 / (n * n * n)));
  // Warm-up of both paths (the JIT, the instance and its memory).
  timeReduction(householderReductionScript, matrices, n, calls);
  timeReduction(householderReductionWasm, matrices, n, calls);
  let script = Infinity;
  let wasm = Infinity;
  for (let round = 0; round < ROUNDS; round++) {
    script = Math.min(script, timeReduction(householderReductionScript, matrices, n, calls));
    wasm = Math.min(wasm, timeReduction(householderReductionWasm, matrices, n, calls));
  }
  results.set(n, { script, wasm });
  console.log(`  order ${String(n).padStart(3)}: JavaScript ${script.toFixed(4)} ms, WebAssembly ${wasm.toFixed(4)} ms, ratio ${(script / wasm).toFixed(2)}`);
}

const eigenvalues = new Map<number, number>();
for (const n of [100, 300]) {
  const matrices = Array.from({ length: 4 }, (_, index) => ({ order: n, data: randomCorrelation(n, 7000 * n + index) }));
  const calls = n === 300 ? 20 : 200;
  for (let call = 0; call < 4; call++) symmetricEigenvalues(matrices[call % 4]);
  let best = Infinity;
  for (let round = 0; round < ROUNDS; round++) {
    const start = process.hrtime.bigint();
    for (let call = 0; call < calls; call++) symmetricEigenvalues(matrices[call % 4]);
    best = Math.min(best, Number(process.hrtime.bigint() - start) / 1e6 / calls);
  }
  eigenvalues.set(n, best);
  console.log(`  symmetricEigenvalues, order ${n}: ${best.toFixed(3)} ms per call`);
}
console.log(`(${loadAverageAndCores()})`);
console.log(
  JSON.stringify({
    bench: 'householder-reduction',
    order300ScriptMs: Number(results.get(300)?.script.toFixed(3)),
    order300WasmMs: Number(results.get(300)?.wasm.toFixed(3)),
    eigenvalues100Ms: Number(eigenvalues.get(100)?.toFixed(3)),
    eigenvalues300Ms: Number(eigenvalues.get(300)?.toFixed(3)),
  }),
);
