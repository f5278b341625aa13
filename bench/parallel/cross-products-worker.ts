/**
 * The worker thread that sums centred cross-products over one share of the respondents.
 *
 * How the worker is started, and why: the worker runs from SOURCE TEXT
 * (`new Worker(source, { eval: true })`), built here from two self-contained functions. A worker
 * FILE would need a path that exists at run time: under tsx a `.ts` worker needs tsx's loader,
 * under Vitest it has none, and Astro's server build (Vite, SSR) neither bundles nor copies a
 * file referenced by `new URL('./x.mjs', import.meta.url)` (Vite's worker and asset plugins
 * apply to the client build only), so the path dangles in `dist/server`. Source text travels
 * inside the bundle and works alike in all three; this was checked with tsx, Vitest and a
 * built `@astrojs/node` server.
 *
 * Rules for the two functions below: they must not refer to anything outside their own bodies
 * (no imports, no module constants), because only their text reaches the worker. tsx wraps
 * nested functions in an `__name(fn, "name")` call to keep their names; the source defines a
 * pass-through `__name` so that text runs anywhere.
 */
import { accumulateCenteredProducts } from '../../src/lib/stats/centered-products-kernel';

/** The message a cross-products worker receives as `workerData`. */
export interface CrossProductsTask {
  /** Column-major data shared with the main thread (never written by the worker). */
  readonly buffer: SharedArrayBuffer;
  /** Byte offset of the data inside `buffer`. */
  readonly byteOffset: number;
  readonly rows: number;
  readonly columns: number;
  /** Item means over all respondents (a copy). */
  readonly means: Float64Array;
  readonly rowStart: number;
  readonly rowEnd: number;
  readonly blockRows: number;
}

/**
 * Body of the worker: reads its task, runs the kernel over its rows and posts back the partial
 * sums (upper triangle filled), transferring the buffer instead of copying it.
 * @param kernel `accumulateCenteredProducts`, passed in by the generated source.
 */
function crossProductsWorkerMain(kernel: typeof accumulateCenteredProducts): void {
  const threads = require('node:worker_threads');
  const task = threads.workerData;
  const data = new Float64Array(task.buffer, task.byteOffset, task.rows * task.columns);
  const sums = new Float64Array(task.columns * task.columns);
  kernel(data, task.rows, task.columns, task.means, task.rowStart, task.rowEnd, sums, task.blockRows);
  threads.parentPort.postMessage(sums, [sums.buffer]);
}

/**
 * The JavaScript source of the cross-products worker, for `new Worker(source, { eval: true })`.
 * @returns Self-contained CommonJS source text (it requires only `node:worker_threads`).
 * References: Node.js documentation, "Worker threads: new Worker(filename[, options])" (the
 * `eval` option).
 */
export function crossProductsWorkerSource(): string {
  return [
    '"use strict";',
    'const __name = (target) => target;',
    `(${crossProductsWorkerMain.toString()})(${accumulateCenteredProducts.toString()});`,
  ].join('\n');
}
