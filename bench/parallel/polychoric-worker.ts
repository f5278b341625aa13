/**
 * The worker thread that estimates a share of the polychoric pairs.
 *
 * The worker runs from SOURCE TEXT (`new Worker(source, { eval: true })`), for the reason given
 * in cross-products-worker.ts: a worker file would not exist at run time in Astro's server
 * bundle, and would need a TypeScript loader under tsx and Vitest. The source is the text of the
 * very functions the calling thread uses (`estimatePolychoricPairs` and what it calls), so both
 * paths run one implementation.
 *
 * Those functions live in six modules and call each other. Under Vitest and Vite's dev server
 * a call into another module reads `(0, __vi_import_2__.normalCdf)(x)` in the function's text;
 * `polychoricWorkerSource` rewrites such references to the bare name, which the source defines.
 * tsx and bundlers (Rollup, esbuild) keep cross-module calls as plain (possibly renamed, but
 * consistently renamed) identifiers, so the text runs as is. On start the worker checks itself
 * on a known value (Φ2(0, 0; ½) = 1/3) and reports failure instead of results; the caller then
 * computes on its own thread and says so.
 */
import {
  BIVARIATE_NORMAL_RULE_CONSTANTS,
  bivariateNormalCdfFromRule,
  bivariateNormalGrid,
  createBivariateNormalRule,
  prepareBivariateNormalRule,
  withinFrechetBounds,
} from '../../src/lib/stats/bivariate-normal-cdf';
import { normalCdf } from '../../src/lib/stats/normal-distribution';
import { countPolychoricTable } from '../../src/lib/stats/polychoric-coding';
import { estimatePolychoricFromTable } from '../../src/lib/stats/polychoric-correlation';
import { createPolychoricWorkspace, fitPolychoricTable, polychoricLikelihood, polychoricLogLikelihoodOfGrid } from '../../src/lib/stats/polychoric-likelihood';
import { estimatePolychoricPairs } from '../../src/lib/stats/polychoric-pairs';

/** Every function the worker needs, callees included. */
const WORKER_FUNCTIONS: readonly ((...args: never[]) => unknown)[] = [
  normalCdf,
  createBivariateNormalRule,
  prepareBivariateNormalRule,
  withinFrechetBounds,
  bivariateNormalCdfFromRule,
  bivariateNormalGrid,
  createPolychoricWorkspace,
  countPolychoricTable,
  polychoricLikelihood,
  polychoricLogLikelihoodOfGrid,
  fitPolychoricTable,
  estimatePolychoricFromTable,
  estimatePolychoricPairs,
];

/**
 * Rewrites module-namespace references that Vite's SSR transform (Vitest, `astro dev`) puts
 * into function text, `(0, __vi_import_0__.name)` and `__vite_ssr_import_1__.name`, to `name`.
 * @param text Function source text.
 * @returns The text with bare names.
 * References: Vite documentation, "Server-Side Rendering" (the SSR module transform).
 */
export function bareImportReferences(text: string): string {
  return text
    .replace(/\(\s*0\s*,\s*__vi(?:te_ssr)?_import_\d+__\.([A-Za-z_$][\w$]*)\s*\)/g, '$1')
    .replace(/__vi(?:te_ssr)?_import_\d+__\.([A-Za-z_$][\w$]*)/g, '$1');
}

/** The function's own name as written in its text (a bundler may have renamed it). */
function declaredName(fn: (...args: never[]) => unknown): string {
  const match = /^function\s*\*?\s*([A-Za-z_$][\w$]*)/.exec(fn.toString());
  if (match === null) throw new Error(`polychoricWorkerSource: ${fn.name || 'a kernel function'} is not a function declaration`);
  return match[1];
}

/**
 * Body of the worker: a self-test, then one job (a `PolychoricPairsJob` as `workerData`), whose
 * results go back as a transferred Float64Array, or `{ failed: message }`.
 * @param threads The `node:worker_threads` module, required by the generated source.
 */
function polychoricWorkerMain(
  threads: typeof import('node:worker_threads'),
  estimate: (job: unknown) => Float64Array,
  selfTest: () => boolean,
): void {
  try {
    if (!selfTest()) throw new Error('self-test gave a wrong value');
    const result = estimate(threads.workerData);
    threads.parentPort?.postMessage(result, [result.buffer as ArrayBuffer]);
  } catch (error) {
    threads.parentPort?.postMessage({ failed: String((error as Error)?.message ?? error) });
  }
}

/**
 * The JavaScript source of the polychoric worker, for `new Worker(source, { eval: true,
 * workerData: job })`.
 * @throws {Error} when a kernel function is not a plain function declaration (its text could
 *   not be defined by name in the worker).
 * @returns Self-contained CommonJS source text (it requires only `node:worker_threads`).
 * References: Node.js documentation, "Worker threads: new Worker(filename[, options])" (the
 * `eval` option).
 */
export function polychoricWorkerSource(): string {
  const names = WORKER_FUNCTIONS.map(declaredName);
  const bivariate = names[WORKER_FUNCTIONS.indexOf(prepareBivariateNormalRule)];
  const cdfFromRule = names[WORKER_FUNCTIONS.indexOf(bivariateNormalCdfFromRule)];
  const estimate = names[WORKER_FUNCTIONS.indexOf(estimatePolychoricPairs)];
  const selfTest =
    `() => Math.abs(${cdfFromRule}(0, 0, 0.5, 0.5, 0.5, 0.5, ${bivariate}(0.5)) - 1 / 3) < 1e-14`;
  return [
    '"use strict";',
    'const __name = (target) => target;',
    // Module constants the functions read (the Gauss-Legendre tables), under the names their text uses.
    ...Object.entries(BIVARIATE_NORMAL_RULE_CONSTANTS).map(([name, value]) => `const ${name} = ${JSON.stringify(value)};`),
    ...WORKER_FUNCTIONS.map((fn) => bareImportReferences(fn.toString())),
    // `require` stays inside this string: a bundler rewrites a require() call in function
    // text (esbuild's ESM output turns it into an undefined __require).
    `(${polychoricWorkerMain.toString()})(require('node:worker_threads'), ${estimate}, ${selfTest});`,
  ].join('\n');
}
