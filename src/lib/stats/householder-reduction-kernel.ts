/**
 * The Householder reduction of a symmetric matrix to tridiagonal form (EISPACK tred1/tred2's
 * first part, `householderReduction` in symmetric-eigen.ts) with its two O(n²)-per-step passes in
 * WebAssembly SIMD: the product e = A·u over the stored triangle and the rank-two update
 * A −= u·pᵀ + p·uᵀ (which also takes the next step's d from column i − 1, as the JavaScript does
 * row by row). The O(n) work of each step (the scale, the norm, the last i mod 4 rows of the
 * product, e /= h and the correction by hh) stays in JavaScript, written as in symmetric-eigen.ts,
 * on views of the module's memory.
 *
 * Bit for bit: every element of d, e and w is formed by the same IEEE-754 double operations in
 * the same order as in the JavaScript loop, one operation at a time (f64x2 lanes are independent
 * IEEE-754 doubles; there is no fused multiply-add and nothing is reassociated). The SIMD lanes
 * hold only independent results: two consecutive e[k] in the product (each gets its rows' terms
 * in row order), two rows' running sums g (each still over k in increasing order), two
 * consecutive elements of a row in the update. tests/unit/householder-reduction-kernel.test.ts
 * compares d, e and w with the JavaScript loop by `Object.is` for orders 1 .. 320.
 *
 * The module is assembled from a readable listing by scripts/make-householder-wasm.mjs (the test
 * checks that the bytes here are its output). One instance per thread (per module load), cached;
 * its memory grows to the largest order seen. Layout: w (n × n doubles) at byte 0, then d, then e.
 *
 * References: Martin, Reinsch & Wilkinson 1968, "Householder's tridiagonalization of a symmetric
 * matrix" (Numer. Math. 11:181-195); WebAssembly Core Specification 2.0 (2022) (f64x2
 * arithmetic is IEEE-754 per lane).
 */
import { WASM_MAX_BYTES, wasmKernelInstance } from './wasm-kernel-instance';

/**
 * From this order up `householderReduction` runs here; below it the JavaScript loop is as fast or
 * faster (the copies in and out and the calls cost more than the SIMD saves: at order 8 the
 * kernel takes about 1.4 times the JavaScript's time, at 12-16 they are even, at 32 it takes
 * half). Measured with bench/householder-reduction.bench.ts (docs/decisions/020-speed-whole-
 * audit.md, "Addendum: the Householder reduction in WebAssembly").
 */
export const HOUSEHOLDER_WASM_MIN_ORDER = 16;

/** The module of scripts/make-householder-wasm.mjs: multiply(w, n, i, d, e), update(w, n, i, d, e). */
export const HOUSEHOLDER_WASM_BYTES = Uint8Array.of(
  0, 97, 115, 109, 1, 0, 0, 0, 1, 9, 1, 96, 5, 127, 127, 127, 127, 127, 0, 2, 15, 1, 3, 101, 110, 118, 6, 109, 101, 109, 111, 114,
  121, 2, 0, 1, 3, 3, 2, 0, 0, 7, 21, 2, 8, 109, 117, 108, 116, 105, 112, 108, 121, 0, 0, 6, 117, 112, 100, 97, 116, 101, 0, 1,
  10, 185, 16, 2, 186, 7, 3, 11, 127, 10, 124, 14, 123, 32, 1, 65, 3, 116, 33, 5, 32, 3, 32, 2, 65, 3, 116, 106, 65, 8, 107, 33,
  11, 2, 64, 3, 64, 32, 6, 65, 4, 106, 32, 2, 75, 13, 1, 32, 3, 32, 6, 65, 3, 116, 106, 33, 7, 32, 4, 32, 6, 65, 3, 116,
  106, 33, 8, 32, 0, 32, 6, 32, 5, 108, 106, 32, 6, 65, 3, 116, 106, 33, 12, 32, 12, 32, 5, 106, 33, 13, 32, 13, 32, 5, 106, 33,
  14, 32, 14, 32, 5, 106, 33, 15, 32, 7, 43, 3, 0, 34, 16, 253, 20, 33, 26, 32, 7, 43, 3, 8, 34, 17, 253, 20, 33, 27, 32, 7,
  43, 3, 16, 34, 18, 253, 20, 33, 28, 32, 7, 43, 3, 24, 34, 19, 253, 20, 33, 29, 32, 8, 43, 3, 0, 32, 12, 43, 3, 0, 32, 16,
  162, 160, 33, 20, 32, 12, 43, 3, 8, 33, 24, 32, 20, 32, 24, 32, 7, 43, 3, 8, 162, 160, 33, 20, 32, 8, 32, 8, 43, 3, 8, 32,
  24, 32, 16, 162, 160, 57, 3, 8, 32, 12, 43, 3, 16, 33, 24, 32, 20, 32, 24, 32, 7, 43, 3, 16, 162, 160, 33, 20, 32, 8, 32, 8,
  43, 3, 16, 32, 24, 32, 16, 162, 160, 57, 3, 16, 32, 12, 43, 3, 24, 33, 24, 32, 20, 32, 24, 32, 7, 43, 3, 24, 162, 160, 33, 20,
  32, 8, 32, 8, 43, 3, 24, 32, 24, 32, 16, 162, 160, 57, 3, 24, 32, 8, 43, 3, 8, 32, 13, 43, 3, 8, 32, 17, 162, 160, 33, 21,
  32, 13, 43, 3, 16, 33, 24, 32, 21, 32, 24, 32, 7, 43, 3, 16, 162, 160, 33, 21, 32, 8, 32, 8, 43, 3, 16, 32, 24, 32, 17, 162,
  160, 57, 3, 16, 32, 13, 43, 3, 24, 33, 24, 32, 21, 32, 24, 32, 7, 43, 3, 24, 162, 160, 33, 21, 32, 8, 32, 8, 43, 3, 24, 32,
  24, 32, 17, 162, 160, 57, 3, 24, 32, 8, 43, 3, 16, 32, 14, 43, 3, 16, 32, 18, 162, 160, 33, 22, 32, 14, 43, 3, 24, 33, 24, 32,
  22, 32, 24, 32, 7, 43, 3, 24, 162, 160, 33, 22, 32, 8, 32, 8, 43, 3, 24, 32, 24, 32, 18, 162, 160, 57, 3, 24, 32, 8, 43, 3,
  24, 32, 15, 43, 3, 24, 32, 19, 162, 160, 33, 23, 32, 20, 253, 20, 32, 21, 253, 34, 1, 33, 30, 32, 22, 253, 20, 32, 23, 253, 34, 1,
  33, 31, 32, 12, 65, 32, 106, 33, 12, 32, 13, 65, 32, 106, 33, 13, 32, 14, 65, 32, 106, 33, 14, 32, 15, 65, 32, 106, 33, 15, 32, 7,
  65, 32, 106, 33, 9, 32, 8, 65, 32, 106, 33, 10, 2, 64, 3, 64, 32, 9, 32, 11, 79, 13, 1, 32, 9, 253, 0, 3, 0, 33, 36, 32,
  12, 253, 0, 3, 0, 33, 32, 32, 13, 253, 0, 3, 0, 33, 33, 32, 14, 253, 0, 3, 0, 33, 34, 32, 15, 253, 0, 3, 0, 33, 35, 32,
  10, 253, 0, 3, 0, 33, 37, 32, 37, 32, 32, 32, 26, 253, 242, 1, 253, 240, 1, 33, 37, 32, 37, 32, 33, 32, 27, 253, 242, 1, 253, 240,
  1, 33, 37, 32, 37, 32, 34, 32, 28, 253, 242, 1, 253, 240, 1, 33, 37, 32, 37, 32, 35, 32, 29, 253, 242, 1, 253, 240, 1, 33, 37, 32,
  10, 32, 37, 253, 11, 3, 0, 32, 32, 32, 36, 253, 242, 1, 33, 38, 32, 33, 32, 36, 253, 242, 1, 33, 39, 32, 30, 32, 38, 32, 39, 253,
  13, 0, 1, 2, 3, 4, 5, 6, 7, 16, 17, 18, 19, 20, 21, 22, 23, 253, 240, 1, 33, 30, 32, 30, 32, 38, 32, 39, 253, 13, 8, 9,
  10, 11, 12, 13, 14, 15, 24, 25, 26, 27, 28, 29, 30, 31, 253, 240, 1, 33, 30, 32, 34, 32, 36, 253, 242, 1, 33, 38, 32, 35, 32, 36,
  253, 242, 1, 33, 39, 32, 31, 32, 38, 32, 39, 253, 13, 0, 1, 2, 3, 4, 5, 6, 7, 16, 17, 18, 19, 20, 21, 22, 23, 253, 240, 1,
  33, 31, 32, 31, 32, 38, 32, 39, 253, 13, 8, 9, 10, 11, 12, 13, 14, 15, 24, 25, 26, 27, 28, 29, 30, 31, 253, 240, 1, 33, 31, 32,
  12, 65, 16, 106, 33, 12, 32, 13, 65, 16, 106, 33, 13, 32, 14, 65, 16, 106, 33, 14, 32, 15, 65, 16, 106, 33, 15, 32, 9, 65, 16, 106,
  33, 9, 32, 10, 65, 16, 106, 33, 10, 12, 0, 11, 11, 32, 9, 32, 11, 70, 4, 64, 32, 9, 43, 3, 0, 33, 25, 32, 10, 32, 10, 43,
  3, 0, 32, 12, 43, 3, 0, 32, 16, 162, 160, 32, 13, 43, 3, 0, 32, 17, 162, 160, 32, 14, 43, 3, 0, 32, 18, 162, 160, 32, 15, 43,
  3, 0, 32, 19, 162, 160, 57, 3, 0, 32, 30, 32, 12, 43, 3, 0, 253, 20, 32, 13, 43, 3, 0, 253, 34, 1, 32, 25, 253, 20, 253, 242,
  1, 253, 240, 1, 33, 30, 32, 31, 32, 14, 43, 3, 0, 253, 20, 32, 15, 43, 3, 0, 253, 34, 1, 32, 25, 253, 20, 253, 242, 1, 253, 240,
  1, 33, 31, 11, 32, 8, 32, 30, 253, 11, 3, 0, 32, 8, 32, 31, 253, 11, 3, 16, 32, 6, 65, 4, 106, 33, 6, 12, 0, 11, 11, 11,
  250, 8, 3, 10, 127, 8, 124, 10, 123, 32, 1, 65, 3, 116, 33, 5, 32, 3, 32, 2, 65, 3, 116, 106, 65, 8, 107, 33, 9, 32, 0, 33,
  10, 2, 64, 3, 64, 32, 6, 65, 4, 106, 32, 2, 75, 13, 1, 32, 3, 32, 6, 65, 3, 116, 106, 33, 7, 32, 4, 32, 6, 65, 3, 116,
  106, 33, 8, 32, 10, 32, 6, 65, 3, 116, 106, 33, 11, 32, 11, 32, 5, 106, 33, 12, 32, 12, 32, 5, 106, 33, 13, 32, 13, 32, 5, 106,
  33, 14, 32, 7, 43, 3, 0, 34, 15, 253, 20, 33, 23, 32, 8, 43, 3, 0, 34, 19, 253, 20, 33, 27, 32, 7, 43, 3, 8, 34, 16, 253,
  20, 33, 24, 32, 8, 43, 3, 8, 34, 20, 253, 20, 33, 28, 32, 7, 43, 3, 16, 34, 17, 253, 20, 33, 25, 32, 8, 43, 3, 16, 34, 21,
  253, 20, 33, 29, 32, 7, 43, 3, 24, 34, 18, 253, 20, 33, 26, 32, 8, 43, 3, 24, 34, 22, 253, 20, 33, 30, 32, 11, 32, 11, 43, 3,
  0, 32, 15, 32, 8, 43, 3, 0, 162, 32, 19, 32, 7, 43, 3, 0, 162, 160, 161, 57, 3, 0, 32, 11, 32, 11, 43, 3, 8, 32, 15, 32,
  8, 43, 3, 8, 162, 32, 19, 32, 7, 43, 3, 8, 162, 160, 161, 57, 3, 8, 32, 11, 32, 11, 43, 3, 16, 32, 15, 32, 8, 43, 3, 16,
  162, 32, 19, 32, 7, 43, 3, 16, 162, 160, 161, 57, 3, 16, 32, 12, 32, 12, 43, 3, 8, 32, 16, 32, 8, 43, 3, 8, 162, 32, 20, 32,
  7, 43, 3, 8, 162, 160, 161, 57, 3, 8, 32, 12, 32, 12, 43, 3, 16, 32, 16, 32, 8, 43, 3, 16, 162, 32, 20, 32, 7, 43, 3, 16,
  162, 160, 161, 57, 3, 16, 32, 13, 32, 13, 43, 3, 16, 32, 17, 32, 8, 43, 3, 16, 162, 32, 21, 32, 7, 43, 3, 16, 162, 160, 161, 57,
  3, 16, 32, 11, 65, 24, 106, 33, 11, 32, 12, 65, 24, 106, 33, 12, 32, 13, 65, 24, 106, 33, 13, 32, 14, 65, 24, 106, 33, 14, 32, 7,
  65, 24, 106, 33, 7, 32, 8, 65, 24, 106, 33, 8, 2, 64, 3, 64, 32, 7, 32, 9, 79, 13, 1, 32, 8, 253, 0, 3, 0, 33, 31, 32,
  7, 253, 0, 3, 0, 33, 32, 32, 11, 32, 11, 253, 0, 3, 0, 32, 23, 32, 31, 253, 242, 1, 32, 27, 32, 32, 253, 242, 1, 253, 240, 1,
  253, 241, 1, 253, 11, 3, 0, 32, 11, 65, 16, 106, 33, 11, 32, 12, 32, 12, 253, 0, 3, 0, 32, 24, 32, 31, 253, 242, 1, 32, 28, 32,
  32, 253, 242, 1, 253, 240, 1, 253, 241, 1, 253, 11, 3, 0, 32, 12, 65, 16, 106, 33, 12, 32, 13, 32, 13, 253, 0, 3, 0, 32, 25, 32,
  31, 253, 242, 1, 32, 29, 32, 32, 253, 242, 1, 253, 240, 1, 253, 241, 1, 253, 11, 3, 0, 32, 13, 65, 16, 106, 33, 13, 32, 14, 32, 14,
  253, 0, 3, 0, 32, 26, 32, 31, 253, 242, 1, 32, 30, 32, 32, 253, 242, 1, 253, 240, 1, 253, 241, 1, 253, 11, 3, 0, 32, 14, 65, 16,
  106, 33, 14, 32, 7, 65, 16, 106, 33, 7, 32, 8, 65, 16, 106, 33, 8, 12, 0, 11, 11, 32, 7, 32, 9, 70, 4, 64, 32, 11, 32, 11,
  43, 3, 0, 32, 15, 32, 8, 43, 3, 0, 162, 32, 19, 32, 7, 43, 3, 0, 162, 160, 161, 57, 3, 0, 32, 12, 32, 12, 43, 3, 0, 32,
  16, 32, 8, 43, 3, 0, 162, 32, 20, 32, 7, 43, 3, 0, 162, 160, 161, 57, 3, 0, 32, 13, 32, 13, 43, 3, 0, 32, 17, 32, 8, 43,
  3, 0, 162, 32, 21, 32, 7, 43, 3, 0, 162, 160, 161, 57, 3, 0, 32, 14, 32, 14, 43, 3, 0, 32, 18, 32, 8, 43, 3, 0, 162, 32,
  22, 32, 7, 43, 3, 0, 162, 160, 161, 57, 3, 0, 11, 32, 3, 32, 6, 65, 3, 116, 106, 33, 7, 32, 10, 32, 9, 106, 32, 3, 107, 33,
  11, 32, 11, 32, 5, 106, 33, 12, 32, 12, 32, 5, 106, 33, 13, 32, 13, 32, 5, 106, 33, 14, 32, 7, 32, 11, 43, 3, 0, 57, 3, 0,
  32, 11, 68, 0, 0, 0, 0, 0, 0, 0, 0, 57, 3, 8, 32, 7, 32, 12, 43, 3, 0, 57, 3, 8, 32, 12, 68, 0, 0, 0, 0, 0,
  0, 0, 0, 57, 3, 8, 32, 7, 32, 13, 43, 3, 0, 57, 3, 16, 32, 13, 68, 0, 0, 0, 0, 0, 0, 0, 0, 57, 3, 8, 32, 7,
  32, 14, 43, 3, 0, 57, 3, 24, 32, 14, 68, 0, 0, 0, 0, 0, 0, 0, 0, 57, 3, 8, 32, 10, 32, 5, 65, 4, 108, 106, 33, 10,
  32, 6, 65, 4, 106, 33, 6, 12, 0, 11, 11, 2, 64, 3, 64, 32, 6, 65, 1, 106, 32, 2, 75, 13, 1, 32, 3, 32, 6, 65, 3, 116,
  106, 33, 7, 32, 4, 32, 6, 65, 3, 116, 106, 33, 8, 32, 10, 32, 6, 65, 3, 116, 106, 33, 11, 32, 7, 43, 3, 0, 34, 15, 253, 20,
  33, 23, 32, 8, 43, 3, 0, 34, 19, 253, 20, 33, 27, 32, 11, 65, 0, 106, 33, 11, 32, 7, 65, 0, 106, 33, 7, 32, 8, 65, 0, 106,
  33, 8, 2, 64, 3, 64, 32, 7, 32, 9, 79, 13, 1, 32, 8, 253, 0, 3, 0, 33, 31, 32, 7, 253, 0, 3, 0, 33, 32, 32, 11, 32,
  11, 253, 0, 3, 0, 32, 23, 32, 31, 253, 242, 1, 32, 27, 32, 32, 253, 242, 1, 253, 240, 1, 253, 241, 1, 253, 11, 3, 0, 32, 11, 65,
  16, 106, 33, 11, 32, 7, 65, 16, 106, 33, 7, 32, 8, 65, 16, 106, 33, 8, 12, 0, 11, 11, 32, 7, 32, 9, 70, 4, 64, 32, 11, 32,
  11, 43, 3, 0, 32, 15, 32, 8, 43, 3, 0, 162, 32, 19, 32, 7, 43, 3, 0, 162, 160, 161, 57, 3, 0, 11, 32, 3, 32, 6, 65, 3,
  116, 106, 33, 7, 32, 10, 32, 9, 106, 32, 3, 107, 33, 11, 32, 7, 32, 11, 43, 3, 0, 57, 3, 0, 32, 11, 68, 0, 0, 0, 0, 0,
  0, 0, 0, 57, 3, 8, 32, 10, 32, 5, 65, 1, 108, 106, 33, 10, 32, 6, 65, 1, 106, 33, 6, 12, 0, 11, 11, 11,
);

type Pass = (w: number, n: number, i: number, d: number, e: number) => void;

interface Kernel {
  readonly memory: WebAssembly.Memory;
  readonly multiply: Pass;
  readonly update: Pass;
}

/** The thread's instance, its memory grown to hold `bytes`. */
function kernelWithMemory(bytes: number): Kernel {
  const { memory, exports } = wasmKernelInstance(HOUSEHOLDER_WASM_BYTES, bytes);
  return { memory, multiply: exports.multiply as Pass, update: exports.update as Pass };
}

/**
 * The Householder reduction of `householderReduction` (symmetric-eigen.ts), bit for bit, with the
 * product e = A·u and the rank-two update of each step in WebAssembly SIMD.
 * @param w Row-major n × n working matrix (the matrix, stored transposed as symmetric-eigen.ts
 *   keeps it); on return the stored Householder vectors with the reduced diagonal on its diagonal.
 * @param n Order (at least 1).
 * @param d Length n; on return d[i] is the h of step i.
 * @param e Length n; on return e[1 .. n − 1] holds the subdiagonal.
 * @throws {RangeError} when 8·(n² + 2n) bytes exceed the 4 GiB of a WebAssembly memory.
 * @returns Nothing; w, d and e are written.
 * References: Martin, Reinsch & Wilkinson 1968 (tred1/tred2), Numerische Mathematik 11.
 */
export function householderReductionWasm(w: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  const bytes = 8 * (n * n + 2 * n);
  if (bytes > WASM_MAX_BYTES) {
    throw new RangeError(`householderReductionWasm: an order of ${n} needs more than the 4 GiB of a WebAssembly memory`);
  }
  const { memory, multiply, update } = kernelWithMemory(bytes);
  const wOffset = 0;
  const dOffset = 8 * n * n;
  const eOffset = dOffset + 8 * n;
  const a = new Float64Array(memory.buffer, wOffset, n * n);
  const u = new Float64Array(memory.buffer, dOffset, n);
  const p = new Float64Array(memory.buffer, eOffset, n);
  a.set(w);
  u.set(d);
  p.set(e);
  // As householderReduction, with a, u and p for w, d and e.
  for (let j = 0; j < n; j++) u[j] = a[j * n + n - 1];
  for (let i = n - 1; i > 0; i--) {
    let scale = 0;
    let h = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(u[k]);
    if (scale === 0) {
      p[i] = u[i - 1];
      for (let j = 0; j < i; j++) {
        u[j] = a[j * n + i - 1];
        a[j * n + i] = 0;
        a[i * n + j] = 0;
      }
    } else {
      for (let k = 0; k < i; k++) {
        u[k] /= scale;
        h += u[k] * u[k];
      }
      let f = u[i - 1];
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      p[i] = scale * g;
      h -= f * g;
      u[i - 1] = f - g;
      for (let j = 0; j < i; j++) p[j] = 0;
      for (let j = 0; j < i; j++) a[i * n + j] = u[j];
      // e = A·u: whole blocks of four rows in WebAssembly, the last i mod 4 rows here.
      multiply(wOffset, n, i, dOffset, eOffset);
      for (let j = i - (i % 4); j < i; j++) {
        f = u[j];
        const column = j * n;
        g = p[j] + a[column + j] * f;
        for (let k = j + 1; k <= i - 1; k++) {
          const value = a[column + k];
          g += value * u[k];
          p[k] += value * f;
        }
        p[j] = g;
      }
      f = 0;
      for (let m = 0; m < i; m++) {
        p[m] /= h;
        f += p[m] * u[m];
      }
      const hh = f / (h + h);
      for (let m = 0; m < i; m++) p[m] -= hh * u[m];
      // The rank-two update, with u[j] = a[j][i − 1] and a[j][i] = 0 after each group of rows.
      update(wOffset, n, i, dOffset, eOffset);
    }
    u[i] = h;
  }
  w.set(a);
  d.set(u);
  e.set(p);
}
