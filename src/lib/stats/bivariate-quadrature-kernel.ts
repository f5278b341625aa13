/**
 * The arcsine quadrature of Φ2 (branch 0 of `bivariateNormalCdfFromRule`, |ρ| < 0.925) over a
 * whole grid of limits in WebAssembly SIMD, for `bivariateNormalGrid` (bivariate-normal-cdf.ts).
 *
 * What: at each corner (h, k) of a grid the quadrature is
 *   sum = Σ_i weights[i] · exp(first[i] · hk − second[i] · (h² + k²)/2),  i = 0, 1, ..., count − 1,
 * 6, 12 or 20 exponentials per corner. `Math.exp` in that loop is the largest single cost of a
 * polychoric audit. The WebAssembly function computes the sums of two corners at a time, one per
 * f64x2 lane, with its own exp, and the density's exponential exp(−(h² − 2ρhk + k²)/(2(1 − ρ²)))
 * beside them; one call covers the whole grid (every corner of one table at one ρ), so the
 * crossing from JavaScript is paid once per grid.
 *
 * Why the results are bit for bit those of the JavaScript loop: V8 (Node 20) computes `Math.exp`
 * with fdlibm's __ieee754_exp (base::ieee754::exp, FreeBSD's variant that scales by multiplying
 * with 2^k). The kernel's exp is that algorithm, written per lane with the same IEEE-754 double
 * operations in the same order (argument reduction with ln2HI/ln2LO, the P1..P5 polynomial,
 * (r·c)/(2 − c), the 2^k scaling); scripts/make-bivariate-quadrature-wasm.mjs says step by step
 * why its one formula gives fdlibm's values in each of fdlibm's ranges. WebAssembly's f64x2
 * arithmetic is IEEE-754 per lane with no fused multiply-add, lanes are corners (never nodes),
 * and each corner's terms are added to its sum one after the other in node order, as the
 * JavaScript loop adds them. Exponents the kernel does not cover (|x| ≥ 707 or NaN: overflow,
 * underflow, results below the normal range) make it answer null, and the caller computes that
 * grid in JavaScript. The exponents themselves are computed in JavaScript, by the expressions
 * `bivariateNormalCdfFromRule` and `bivariateNormalGrid` use. The test
 * (tests/unit/bivariate-quadrature-kernel.test.ts) compares the kernel's exp with `Math.exp`, and
 * the grid's values with those of the JavaScript expressions, by `Object.is`. The equality rests
 * on `Math.exp` being fdlibm's: checked on 18 million random, edge and bit-pattern inputs with
 * Node 20.20 on x86-64 (where glibc's exp differs from it on about one argument in ten); the test
 * fails if a Node version or platform computes it otherwise, and each thread compares the kernel
 * with `Math.exp` on 1,024 arguments before its first grid and keeps to JavaScript if they differ
 * (`quadratureKernelMatches`).
 *
 * The function is assembled from a readable listing by scripts/make-bivariate-quadrature-wasm.mjs
 * (the test checks that the bytes here are its output). The module is instantiated once per
 * thread, on first use, and its memory grows when a larger grid needs it.
 *
 * References: Sun Microsystems 1993, fdlibm e_exp.c (__ieee754_exp), the algorithm; WebAssembly
 * Core Specification 2.0 (2022) (f64x2 arithmetic is IEEE-754 per lane); Genz 2004, "Numerical
 * computation of rectangular bivariate and trivariate normal and t probabilities" (Statistics and
 * Computing 14:251-260), the quadrature.
 */
import type { BivariateGridMargin, BivariateNormalRule } from './bivariate-normal-cdf';
import { wasmKernelInstance } from './wasm-kernel-instance';

/** The sums function of scripts/make-bivariate-quadrature-wasm.mjs, importing env.memory. */
export const BIVARIATE_QUADRATURE_WASM = Uint8Array.of(
  0, 97, 115, 109, 1, 0, 0, 0, 1, 15, 1, 96, 10, 127, 127, 127, 127, 127, 127, 127, 127, 127, 127, 1, 127, 2, 15, 1, 3, 101, 110, 118,
  6, 109, 101, 109, 111, 114, 121, 2, 0, 1, 3, 2, 1, 0, 7, 8, 1, 4, 115, 117, 109, 115, 0, 0, 10, 251, 9, 1, 248, 9, 2, 2,
  127, 13, 123, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 24, 65, 0, 33, 10, 2, 64, 3, 64, 32,
  10, 32, 9, 79, 13, 1, 32, 4, 32, 10, 106, 253, 0, 4, 0, 33, 12, 32, 5, 32, 10, 106, 253, 0, 4, 0, 33, 13, 253, 12, 0, 0,
  0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 14, 65, 0, 33, 11, 3, 64, 32, 1, 32, 11, 106, 253, 10, 3, 0, 32,
  12, 253, 242, 1, 32, 2, 32, 11, 106, 253, 10, 3, 0, 32, 13, 253, 242, 1, 253, 241, 1, 33, 15, 32, 15, 253, 236, 1, 33, 16, 32, 24,
  32, 16, 253, 12, 0, 0, 0, 0, 0, 24, 134, 64, 0, 0, 0, 0, 0, 24, 134, 64, 253, 73, 253, 77, 253, 80, 33, 24, 253, 12, 254, 130,
  43, 101, 71, 21, 247, 63, 254, 130, 43, 101, 71, 21, 247, 63, 32, 15, 253, 242, 1, 32, 15, 253, 12, 0, 0, 0, 0, 0, 0, 0, 128, 0,
  0, 0, 0, 0, 0, 0, 128, 253, 78, 253, 12, 0, 0, 0, 0, 0, 0, 224, 63, 0, 0, 0, 0, 0, 0, 224, 63, 253, 80, 253, 240, 1,
  253, 122, 32, 16, 253, 12, 0, 0, 0, 0, 67, 46, 214, 63, 0, 0, 0, 0, 67, 46, 214, 63, 253, 76, 253, 78, 33, 17, 32, 15, 32, 17,
  253, 12, 0, 0, 224, 254, 66, 46, 230, 63, 0, 0, 224, 254, 66, 46, 230, 63, 253, 242, 1, 253, 241, 1, 33, 18, 32, 17, 253, 12, 118, 60,
  121, 53, 239, 57, 234, 61, 118, 60, 121, 53, 239, 57, 234, 61, 253, 242, 1, 33, 19, 32, 18, 32, 19, 253, 241, 1, 33, 20, 32, 20, 32, 20,
  253, 242, 1, 33, 21, 32, 20, 32, 21, 253, 12, 62, 85, 85, 85, 85, 85, 197, 63, 62, 85, 85, 85, 85, 85, 197, 63, 32, 21, 253, 12, 147,
  189, 190, 22, 108, 193, 102, 191, 147, 189, 190, 22, 108, 193, 102, 191, 32, 21, 253, 12, 44, 222, 37, 175, 106, 86, 17, 63, 44, 222, 37, 175, 106,
  86, 17, 63, 32, 21, 253, 12, 241, 107, 210, 197, 65, 189, 187, 190, 241, 107, 210, 197, 65, 189, 187, 190, 32, 21, 253, 12, 208, 164, 190, 114, 105,
  55, 102, 62, 208, 164, 190, 114, 105, 55, 102, 62, 253, 242, 1, 253, 240, 1, 253, 242, 1, 253, 240, 1, 253, 242, 1, 253, 240, 1, 253, 242, 1,
  253, 240, 1, 253, 242, 1, 253, 241, 1, 33, 22, 253, 12, 0, 0, 0, 0, 0, 0, 240, 63, 0, 0, 0, 0, 0, 0, 240, 63, 32, 19, 32,
  20, 32, 22, 253, 242, 1, 253, 12, 0, 0, 0, 0, 0, 0, 0, 64, 0, 0, 0, 0, 0, 0, 0, 64, 32, 22, 253, 241, 1, 253, 243, 1,
  253, 241, 1, 32, 18, 253, 241, 1, 253, 241, 1, 32, 17, 253, 12, 255, 3, 0, 0, 0, 0, 48, 67, 255, 3, 0, 0, 0, 0, 48, 67, 253,
  240, 1, 65, 52, 253, 203, 1, 253, 242, 1, 33, 23, 253, 12, 0, 0, 0, 0, 0, 0, 240, 63, 0, 0, 0, 0, 0, 0, 240, 63, 32, 15,
  253, 240, 1, 32, 23, 32, 16, 253, 12, 0, 0, 0, 0, 0, 0, 48, 62, 0, 0, 0, 0, 0, 0, 48, 62, 253, 73, 253, 82, 33, 23, 253,
  12, 105, 87, 20, 139, 10, 191, 5, 64, 105, 87, 20, 139, 10, 191, 5, 64, 32, 23, 32, 15, 253, 12, 0, 0, 0, 0, 0, 0, 240, 63, 0,
  0, 0, 0, 0, 0, 240, 63, 253, 71, 253, 82, 33, 23, 32, 14, 32, 0, 32, 11, 106, 253, 10, 3, 0, 32, 23, 253, 242, 1, 253, 240, 1,
  33, 14, 32, 11, 65, 8, 106, 34, 11, 32, 3, 73, 13, 0, 11, 32, 6, 32, 10, 106, 32, 14, 253, 11, 4, 0, 32, 7, 32, 10, 106, 253,
  0, 4, 0, 33, 15, 32, 15, 253, 236, 1, 33, 16, 32, 24, 32, 16, 253, 12, 0, 0, 0, 0, 0, 24, 134, 64, 0, 0, 0, 0, 0, 24,
  134, 64, 253, 73, 253, 77, 253, 80, 33, 24, 253, 12, 254, 130, 43, 101, 71, 21, 247, 63, 254, 130, 43, 101, 71, 21, 247, 63, 32, 15, 253, 242,
  1, 32, 15, 253, 12, 0, 0, 0, 0, 0, 0, 0, 128, 0, 0, 0, 0, 0, 0, 0, 128, 253, 78, 253, 12, 0, 0, 0, 0, 0, 0, 224,
  63, 0, 0, 0, 0, 0, 0, 224, 63, 253, 80, 253, 240, 1, 253, 122, 32, 16, 253, 12, 0, 0, 0, 0, 67, 46, 214, 63, 0, 0, 0, 0,
  67, 46, 214, 63, 253, 76, 253, 78, 33, 17, 32, 15, 32, 17, 253, 12, 0, 0, 224, 254, 66, 46, 230, 63, 0, 0, 224, 254, 66, 46, 230, 63,
  253, 242, 1, 253, 241, 1, 33, 18, 32, 17, 253, 12, 118, 60, 121, 53, 239, 57, 234, 61, 118, 60, 121, 53, 239, 57, 234, 61, 253, 242, 1, 33,
  19, 32, 18, 32, 19, 253, 241, 1, 33, 20, 32, 20, 32, 20, 253, 242, 1, 33, 21, 32, 20, 32, 21, 253, 12, 62, 85, 85, 85, 85, 85, 197,
  63, 62, 85, 85, 85, 85, 85, 197, 63, 32, 21, 253, 12, 147, 189, 190, 22, 108, 193, 102, 191, 147, 189, 190, 22, 108, 193, 102, 191, 32, 21, 253,
  12, 44, 222, 37, 175, 106, 86, 17, 63, 44, 222, 37, 175, 106, 86, 17, 63, 32, 21, 253, 12, 241, 107, 210, 197, 65, 189, 187, 190, 241, 107, 210,
  197, 65, 189, 187, 190, 32, 21, 253, 12, 208, 164, 190, 114, 105, 55, 102, 62, 208, 164, 190, 114, 105, 55, 102, 62, 253, 242, 1, 253, 240, 1, 253,
  242, 1, 253, 240, 1, 253, 242, 1, 253, 240, 1, 253, 242, 1, 253, 240, 1, 253, 242, 1, 253, 241, 1, 33, 22, 253, 12, 0, 0, 0, 0, 0,
  0, 240, 63, 0, 0, 0, 0, 0, 0, 240, 63, 32, 19, 32, 20, 32, 22, 253, 242, 1, 253, 12, 0, 0, 0, 0, 0, 0, 0, 64, 0, 0,
  0, 0, 0, 0, 0, 64, 32, 22, 253, 241, 1, 253, 243, 1, 253, 241, 1, 32, 18, 253, 241, 1, 253, 241, 1, 32, 17, 253, 12, 255, 3, 0,
  0, 0, 0, 48, 67, 255, 3, 0, 0, 0, 0, 48, 67, 253, 240, 1, 65, 52, 253, 203, 1, 253, 242, 1, 33, 23, 253, 12, 0, 0, 0, 0,
  0, 0, 240, 63, 0, 0, 0, 0, 0, 0, 240, 63, 32, 15, 253, 240, 1, 32, 23, 32, 16, 253, 12, 0, 0, 0, 0, 0, 0, 48, 62, 0,
  0, 0, 0, 0, 0, 48, 62, 253, 73, 253, 82, 33, 23, 253, 12, 105, 87, 20, 139, 10, 191, 5, 64, 105, 87, 20, 139, 10, 191, 5, 64, 32,
  23, 32, 15, 253, 12, 0, 0, 0, 0, 0, 0, 240, 63, 0, 0, 0, 0, 0, 0, 240, 63, 253, 71, 253, 82, 33, 23, 32, 8, 32, 10, 106,
  32, 23, 253, 11, 4, 0, 32, 10, 65, 16, 106, 33, 10, 12, 0, 11, 11, 32, 24, 253, 83, 11,
);

type Sums = (
  weights: number,
  first: number,
  second: number,
  nodeBytes: number,
  products: number,
  halves: number,
  sums: number,
  exponents: number,
  exponentials: number,
  cellBytes: number,
) => number;

/** Room for each of the rule's three node arrays (doubles; the largest rule has 20 points). */
const NODE_ROOM = 20;
/** Where the corners' products start in the memory (after the three node arrays). */
const CORNERS_START = 512;
/** Corners the memory holds at least. */
const MINIMUM_CORNERS = 256;

interface QuadratureState {
  readonly sums: Sums;
  readonly buffer: ArrayBuffer;
  /** weights, first, second: NODE_ROOM doubles each, from byte 0. */
  readonly nodes: Float64Array;
  readonly products: Float64Array;
  readonly halves: Float64Array;
  readonly out: Float64Array;
  readonly exponents: Float64Array;
  readonly exponentials: Float64Array;
  /** The two result views, as the caller receives them. */
  readonly result: BivariateQuadratureGrid;
  /** Corners each corner array holds (even). */
  readonly capacity: number;
}

let state: QuadratureState | null = null;
/** Whether this thread's kernel computes exp as `Math.exp` does (null: not checked yet). */
let matchesMathExp: boolean | null = null;

/** Arguments of the check that the kernel's exp is the platform's `Math.exp` (per pair of corners, two). */
const PROBE_COUNT = 512;

/** This thread's kernel with room for `corners` corners (even). */
function quadratureState(corners: number): QuadratureState {
  if (state !== null && state.capacity >= corners && state.buffer.byteLength > 0) return state;
  const capacity = Math.max(MINIMUM_CORNERS, corners, state?.capacity ?? 0);
  const { memory, exports } = wasmKernelInstance(BIVARIATE_QUADRATURE_WASM, CORNERS_START + 40 * capacity);
  const buffer = memory.buffer;
  const out = new Float64Array(buffer, CORNERS_START + 16 * capacity, capacity);
  const exponentials = new Float64Array(buffer, CORNERS_START + 32 * capacity, capacity);
  state = {
    sums: exports.sums as Sums,
    buffer,
    nodes: new Float64Array(buffer, 0, 3 * NODE_ROOM),
    products: new Float64Array(buffer, CORNERS_START, capacity),
    halves: new Float64Array(buffer, CORNERS_START + 8 * capacity, capacity),
    out,
    exponents: new Float64Array(buffer, CORNERS_START + 24 * capacity, capacity),
    exponentials,
    result: { sums: out, exponentials },
    capacity,
  };
  return state;
}

/** What the kernel gives for a grid: views of its memory, corner (i, j) at `i * columns + j`. */
export interface BivariateQuadratureGrid {
  /** The quadrature sum of branch 0 (`sum` in `bivariateNormalCdfFromRule`). */
  readonly sums: Float64Array;
  /** exp(−(h² − 2ρhk + k²) / (2(1 − ρ²))), the density's exponential (`bivariateNormalGrid`'s). */
  readonly exponentials: Float64Array;
}

/**
 * Whether the kernel's exp gives `reference`'s values bit for bit, on 2 × 512 arguments spread
 * over [−41, 1] (the quadrature's range) and fdlibm's branch points (±0.5 ln2, ±1.5 ln2, 1,
 * 2^−28). `bivariateQuadratureGrid` checks `Math.exp` once per thread and uses the kernel only when
 * it agrees, so that a platform whose `Math.exp` is not fdlibm's (glibc's differs on about one
 * argument in ten) keeps the JavaScript values.
 * @param reference The exp to compare with; `Math.exp` by default.
 * @returns True when every value is the same (`Object.is`).
 * References: Sun Microsystems 1993, fdlibm e_exp.c.
 */
export function quadratureKernelMatches(reference: (x: number) => number = Math.exp): boolean {
  const { sums, nodes, products, halves, exponents, out, exponentials, capacity } = quadratureState(PROBE_COUNT);
  // One node: weight 1, first 1, second 0, so each corner's sum is exp(product − 0 · half).
  nodes[0] = 1;
  nodes[NODE_ROOM] = 1;
  nodes[2 * NODE_ROOM] = 0;
  const edges = [0.5 * Math.LN2, 1.5 * Math.LN2, 1, 2 ** -28];
  for (let i = 0; i < PROBE_COUNT; i++) {
    const spread = -41 + 42 * ((i * 0.6180339887498949) % 1);
    const edge = edges[i % 4] * (1 + (((i >> 2) % 16) - 8) * Number.EPSILON) * (i % 8 < 4 ? 1 : -1);
    products[i] = spread;
    halves[i] = 0;
    exponents[i] = i < 128 ? edge : spread / 3;
  }
  const start = CORNERS_START;
  const outside = sums(0, 8 * NODE_ROOM, 16 * NODE_ROOM, 8, start, start + 8 * capacity, start + 16 * capacity, start + 24 * capacity, start + 32 * capacity, 8 * PROBE_COUNT);
  if (outside !== 0) return false;
  for (let i = 0; i < PROBE_COUNT; i++) {
    if (!Object.is(out[i], reference(products[i])) || !Object.is(exponentials[i], reference(exponents[i]))) return false;
  }
  return true;
}

/**
 * The branch-0 quadrature sums of Φ2, and the density's exponentials, at every corner (h_i, k_j)
 * of a grid at the ρ of `rule`: bit for bit the `sum` of `bivariateNormalCdfFromRule` and the
 * `Math.exp(−quadratic / twiceComplement)` of `bivariateNormalGrid`.
 * @param rows Limits h_i (the first `count`).
 * @param columns Limits k_j (the first `count`).
 * @param rule A branch-0 rule (|ρ| < 0.925, ρ ≠ 0) from `prepareBivariateNormalRule`.
 * @param twiceRho 2 · ρ, as `bivariateNormalGrid` computes it.
 * @param twiceComplement 2 · (1 − ρ)(1 + ρ), as `bivariateNormalGrid` computes it.
 * @returns The sums and exponentials in views of the kernel's memory, which the next call
 *   overwrites (and may detach); or null when an exponent is outside the kernel's range (|x| ≥
 *   707, or NaN), for the caller to compute the grid in JavaScript.
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities"; Sun Microsystems 1993, fdlibm e_exp.c.
 */
export function bivariateQuadratureGrid(
  rows: BivariateGridMargin,
  columns: BivariateGridMargin,
  rule: BivariateNormalRule,
  twiceRho: number,
  twiceComplement: number,
): BivariateQuadratureGrid | null {
  const rowCount = rows.count;
  const columnCount = columns.count;
  const corners = rowCount * columnCount;
  const count = rule.count;
  if (rule.branch !== 0 || corners === 0 || !(count >= 1 && count <= NODE_ROOM)) return null;
  if (matchesMathExp === null) matchesMathExp = quadratureKernelMatches();
  if (!matchesMathExp) return null;
  const even = corners + (corners & 1);
  const current = quadratureState(even);
  const { nodes, products, halves, exponents, capacity } = current;
  const { weights, first, second } = rule;
  for (let i = 0; i < count; i++) {
    nodes[i] = weights[i];
    nodes[NODE_ROOM + i] = first[i];
    nodes[2 * NODE_ROOM + i] = second[i];
  }
  const rowLimits = rows.limits;
  const columnLimits = columns.limits;
  let at = 0;
  for (let i = 0; i < rowCount; i++) {
    const h = rowLimits[i];
    const hSquared = h * h;
    const twiceRhoH = twiceRho * h;
    for (let j = 0; j < columnCount; j++) {
      const k = columnLimits[j];
      // As bivariateNormalCdfFromRule and bivariateNormalGrid compute them.
      products[at] = h * k;
      halves[at] = (h * h + k * k) / 2;
      const quadratic = hSquared - twiceRhoH * k + k * k;
      exponents[at] = -quadratic / twiceComplement;
      at++;
    }
  }
  if (at < even) {
    // The second lane of the last pair repeats the last corner.
    products[at] = products[at - 1];
    halves[at] = halves[at - 1];
    exponents[at] = exponents[at - 1];
  }
  const start = CORNERS_START;
  const outside = current.sums(0, 8 * NODE_ROOM, 16 * NODE_ROOM, 8 * count, start, start + 8 * capacity, start + 16 * capacity, start + 24 * capacity, start + 32 * capacity, 8 * even);
  return outside === 0 ? current.result : null;
}
