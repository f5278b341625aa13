/**
 * The numeric core of the graphical lasso's column solves in WebAssembly SIMD: the active-set
 * solve (formerly `solveOnSupport` in graphical-lasso.ts), the coordinate-descent pass (formerly
 * `lassoPass`), and the memory they work in.
 *
 * For column j with support A (the members k ≠ j of its block with β_jk ≠ 0), the kernel
 * factors W_AA = L Lᵀ (Cholesky), solves W_AA β_A = s_A − ρ sign(β_A) by two triangular solves,
 * and when every sign agrees writes β_A and wb = W₁₁β for every other member, then checks
 * |s_kj − wb_k| ≤ ρ off the support. It returns 0 (not taken: empty support, a pivot not > 0 or a
 * sign that flips; β and wb unchanged), 1 (taken) or 2 (taken, and the column's lasso solution).
 *
 * Bit for bit the JavaScript it replaced: every value is formed by the same IEEE-754 double
 * operations in the same order, one multiply, add, subtract, divide or square root at a time (no
 * fused multiply-add). The Cholesky factor is computed right-looking (outer product) and stored
 * column-major, which subtracts L[a, c] L[b, c] from element (a, b) in the same order
 * c = 0, 1, …, b − 1 as the row-by-row loop, so its update runs two rows at a time in f64x2
 * lanes (and two pivots per step, each element subtracting c's product and then c + 1's); the
 * forward solve is column-oriented with the same per-element order; the back solve and every
 * wb_k keep their sums in the same order (wb runs four outputs k at a time, one per lane, never
 * splitting a sum; when W is exactly symmetric and the block a run of items, each wb_k is summed
 * along rows of W instead, w_{A_a, k} x_a added for a = 0, 1, … in turn: the same products in the
 * same order). The pass updates β_jk by the soft threshold one k at a time as before and
 * wb_l += w_kl Δ for every member l, two l per f64x2 when the block is a run of consecutive items
 * (each wb_l its own running sum, in the same order). scripts/make-glasso-support-wasm.mjs
 * assembles the bytes from a readable listing that says this step by step;
 * tests/unit/glasso-support-kernel.test.ts checks the bytes and compares both functions with the
 * former JavaScript on random problems.
 *
 * S, W and β live in the kernel's memory for the length of a `graphicalLassoWarm` call
 * (copied in at its start and out at its end), so the kernel reads W in place: no W_AA is
 * gathered by JavaScript. One instance per thread, made on first use (compiled synchronously:
 * the module stays under the 4 KB that browsers compile synchronously on a page's main thread);
 * its memory grows to the largest order met and `glassoSupportMemory` hands out fresh views each
 * time (growing detaches the views handed out before).
 * References: Friedman, Hastie & Tibshirani 2008, "Sparse inverse covariance estimation with the
 * graphical lasso" (Biostatistics 9:432-441); Golub & Van Loan 2013, "Matrix Computations", 4th
 * ed., §4.2 (Cholesky orderings); WebAssembly Core Specification 2.0 (2022) (f64x2 arithmetic is
 * IEEE-754 per lane).
 */
import { wasmKernelInstance } from './wasm-kernel-instance';

/** Views of one graphical-lasso fit of order p in the kernel's memory. */
export interface GlassoSupportMemory {
  readonly order: number;
  /** S, row-major p × p. */
  readonly s: Float64Array;
  /** W, row-major p × p. */
  readonly w: Float64Array;
  /** The coefficients, row j holding column j's β. */
  readonly beta: Float64Array;
  /** wb = W₁₁β of the column being solved. */
  readonly wb: Float64Array;
  /** The items block by block (the screening writes them; a block is passed to the kernels as a subarray). */
  readonly members: Int32Array;
  /** Set to 1 by `lassoPassKernel` when a coordinate entered or left the support in its pass, else 0. */
  readonly supportChanged: Int32Array;
  /** Byte offsets of the kernel's scratch: the active set, the factor, the solution, the signs, the other members. */
  readonly scratch: { readonly active: number; readonly factor: number; readonly solution: number; readonly signs: number; readonly others: number };
}

type PassFunction = (j: number, p: number, penalty: number, size: number, members: number, s: number, w: number, beta: number, wb: number, flag: number) => number;

type SupportFunction = (
  j: number,
  p: number,
  penalty: number,
  size: number,
  members: number,
  s: number,
  w: number,
  beta: number,
  wb: number,
  active: number,
  factor: number,
  solution: number,
  signs: number,
  others: number,
  symmetric: number,
) => number;

// The support and pass functions of scripts/make-glasso-support-wasm.mjs, importing env.memory.
const WASM = Uint8Array.of(
    0, 97, 115, 109, 1, 0, 0, 0, 1, 34, 2, 96, 15, 127, 127, 124, 127, 127, 127, 127, 127, 127, 127, 127, 127, 127, 127, 127, 1, 127, 96, 10,
    127, 127, 124, 127, 127, 127, 127, 127, 127, 127, 1, 124, 2, 15, 1, 3, 101, 110, 118, 6, 109, 101, 109, 111, 114, 121, 2, 0, 1, 3, 3, 2,
    0, 1, 7, 18, 2, 7, 115, 117, 112, 112, 111, 114, 116, 0, 0, 4, 112, 97, 115, 115, 0, 1, 10, 176, 25, 2, 143, 21, 3, 18, 127, 4,
    124, 4, 123, 32, 0, 32, 1, 108, 65, 3, 116, 32, 7, 106, 33, 15, 65, 0, 33, 18, 2, 64, 3, 64, 32, 18, 32, 3, 78, 13, 1, 32,
    4, 32, 18, 65, 2, 116, 106, 40, 2, 0, 34, 19, 32, 0, 71, 4, 64, 32, 13, 32, 17, 65, 2, 116, 106, 32, 19, 54, 2, 0, 32, 17,
    65, 1, 106, 33, 17, 32, 15, 32, 19, 65, 3, 116, 106, 43, 3, 0, 68, 0, 0, 0, 0, 0, 0, 0, 0, 98, 4, 64, 32, 9, 32, 16,
    65, 2, 116, 106, 32, 19, 54, 2, 0, 32, 16, 65, 1, 106, 33, 16, 11, 11, 32, 18, 65, 1, 106, 33, 18, 12, 0, 11, 11, 32, 16, 69,
    4, 64, 65, 0, 15, 11, 65, 0, 33, 21, 2, 64, 3, 64, 32, 21, 32, 16, 78, 13, 1, 32, 10, 32, 21, 32, 16, 108, 65, 3, 116, 106,
    33, 24, 32, 21, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 78, 13, 1, 32, 24, 32, 20, 65, 3, 116, 106, 32, 6, 32, 9, 32, 20, 65,
    2, 116, 106, 40, 2, 0, 32, 1, 108, 32, 9, 32, 21, 65, 2, 116, 106, 40, 2, 0, 106, 65, 3, 116, 106, 43, 3, 0, 57, 3, 0, 32,
    20, 65, 1, 106, 33, 20, 12, 0, 11, 11, 32, 21, 65, 1, 106, 33, 21, 12, 0, 11, 11, 65, 0, 33, 20, 2, 64, 3, 64, 32, 20, 32,
    16, 78, 13, 1, 32, 9, 32, 20, 65, 2, 116, 106, 40, 2, 0, 33, 19, 68, 0, 0, 0, 0, 0, 0, 240, 63, 68, 0, 0, 0, 0, 0,
    0, 240, 191, 32, 15, 32, 19, 65, 3, 116, 106, 43, 3, 0, 68, 0, 0, 0, 0, 0, 0, 0, 0, 100, 27, 33, 36, 32, 12, 32, 20, 65,
    3, 116, 106, 32, 36, 57, 3, 0, 32, 11, 32, 20, 65, 3, 116, 106, 32, 5, 32, 19, 32, 1, 108, 32, 0, 106, 65, 3, 116, 106, 43, 3,
    0, 32, 2, 32, 36, 162, 161, 57, 3, 0, 32, 20, 65, 1, 106, 33, 20, 12, 0, 11, 11, 65, 0, 33, 22, 2, 64, 3, 64, 32, 22, 32,
    16, 78, 13, 1, 32, 10, 32, 22, 32, 16, 108, 65, 3, 116, 106, 33, 23, 32, 23, 32, 22, 65, 3, 116, 106, 34, 25, 43, 3, 0, 34, 33,
    68, 0, 0, 0, 0, 0, 0, 0, 0, 100, 69, 4, 64, 65, 0, 15, 11, 32, 25, 32, 33, 159, 34, 33, 57, 3, 0, 32, 33, 253, 20, 33,
    37, 32, 22, 65, 1, 106, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 65, 1, 107, 78, 13, 1, 32, 23, 32, 20, 65, 3, 116, 106, 34, 25,
    32, 25, 253, 0, 3, 0, 32, 37, 253, 243, 1, 253, 11, 3, 0, 32, 20, 65, 2, 106, 33, 20, 12, 0, 11, 11, 32, 20, 32, 16, 72, 4,
    64, 32, 23, 32, 20, 65, 3, 116, 106, 34, 25, 32, 25, 43, 3, 0, 32, 33, 163, 57, 3, 0, 11, 32, 22, 65, 1, 106, 32, 16, 72, 4,
    64, 32, 23, 32, 16, 65, 3, 116, 106, 33, 24, 32, 23, 32, 22, 65, 1, 106, 65, 3, 116, 106, 43, 3, 0, 34, 33, 253, 20, 33, 37, 32,
    22, 65, 1, 106, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 65, 1, 107, 78, 13, 1, 32, 24, 32, 20, 65, 3, 116, 106, 34, 25, 32, 25,
    253, 0, 3, 0, 32, 23, 32, 20, 65, 3, 116, 106, 253, 0, 3, 0, 32, 37, 253, 242, 1, 253, 241, 1, 253, 11, 3, 0, 32, 20, 65, 2,
    106, 33, 20, 12, 0, 11, 11, 32, 20, 32, 16, 72, 4, 64, 32, 24, 32, 20, 65, 3, 116, 106, 34, 25, 32, 25, 43, 3, 0, 32, 23, 32,
    20, 65, 3, 116, 106, 43, 3, 0, 32, 33, 162, 161, 57, 3, 0, 11, 32, 24, 32, 22, 65, 1, 106, 65, 3, 116, 106, 34, 25, 43, 3, 0,
    34, 33, 68, 0, 0, 0, 0, 0, 0, 0, 0, 100, 69, 4, 64, 65, 0, 15, 11, 32, 25, 32, 33, 159, 34, 33, 57, 3, 0, 32, 33, 253,
    20, 33, 37, 32, 22, 65, 1, 106, 65, 1, 106, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 65, 1, 107, 78, 13, 1, 32, 24, 32, 20, 65,
    3, 116, 106, 34, 25, 32, 25, 253, 0, 3, 0, 32, 37, 253, 243, 1, 253, 11, 3, 0, 32, 20, 65, 2, 106, 33, 20, 12, 0, 11, 11, 32,
    20, 32, 16, 72, 4, 64, 32, 24, 32, 20, 65, 3, 116, 106, 34, 25, 32, 25, 43, 3, 0, 32, 33, 163, 57, 3, 0, 11, 32, 22, 65, 2,
    106, 33, 21, 2, 64, 3, 64, 32, 21, 32, 16, 78, 13, 1, 32, 10, 32, 21, 32, 16, 108, 65, 3, 116, 106, 33, 31, 32, 23, 32, 21, 65,
    3, 116, 106, 43, 3, 0, 34, 33, 253, 20, 33, 37, 32, 24, 32, 21, 65, 3, 116, 106, 43, 3, 0, 34, 34, 253, 20, 33, 38, 32, 21, 33,
    20, 2, 64, 3, 64, 32, 20, 32, 16, 65, 1, 107, 78, 13, 1, 32, 31, 32, 20, 65, 3, 116, 106, 34, 25, 32, 25, 253, 0, 3, 0, 32,
    23, 32, 20, 65, 3, 116, 106, 253, 0, 3, 0, 32, 37, 253, 242, 1, 253, 241, 1, 32, 24, 32, 20, 65, 3, 116, 106, 253, 0, 3, 0, 32,
    38, 253, 242, 1, 253, 241, 1, 253, 11, 3, 0, 32, 20, 65, 2, 106, 33, 20, 12, 0, 11, 11, 32, 20, 32, 16, 72, 4, 64, 32, 31, 32,
    20, 65, 3, 116, 106, 34, 25, 32, 25, 43, 3, 0, 32, 23, 32, 20, 65, 3, 116, 106, 43, 3, 0, 32, 33, 162, 161, 32, 24, 32, 20, 65,
    3, 116, 106, 43, 3, 0, 32, 34, 162, 161, 57, 3, 0, 11, 32, 21, 65, 1, 106, 33, 21, 12, 0, 11, 11, 11, 32, 22, 65, 2, 106, 33,
    22, 12, 0, 11, 11, 65, 0, 33, 22, 2, 64, 3, 64, 32, 22, 32, 16, 78, 13, 1, 32, 10, 32, 22, 32, 16, 108, 65, 3, 116, 106, 33,
    23, 32, 11, 32, 22, 65, 3, 116, 106, 34, 25, 43, 3, 0, 32, 23, 32, 22, 65, 3, 116, 106, 43, 3, 0, 163, 33, 33, 32, 25, 32, 33,
    57, 3, 0, 32, 33, 253, 20, 33, 37, 32, 22, 65, 1, 106, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 65, 1, 107, 78, 13, 1, 32, 11,
    32, 20, 65, 3, 116, 106, 34, 25, 32, 25, 253, 0, 3, 0, 32, 23, 32, 20, 65, 3, 116, 106, 253, 0, 3, 0, 32, 37, 253, 242, 1, 253,
    241, 1, 253, 11, 3, 0, 32, 20, 65, 2, 106, 33, 20, 12, 0, 11, 11, 32, 20, 32, 16, 72, 4, 64, 32, 11, 32, 20, 65, 3, 116, 106,
    34, 25, 32, 25, 43, 3, 0, 32, 23, 32, 20, 65, 3, 116, 106, 43, 3, 0, 32, 33, 162, 161, 57, 3, 0, 11, 32, 22, 65, 1, 106, 33,
    22, 12, 0, 11, 11, 32, 16, 33, 20, 2, 64, 3, 64, 32, 20, 69, 13, 1, 32, 20, 65, 1, 107, 33, 20, 32, 10, 32, 20, 32, 16, 108,
    65, 3, 116, 106, 33, 23, 32, 11, 32, 20, 65, 3, 116, 106, 43, 3, 0, 33, 35, 32, 20, 65, 1, 106, 33, 22, 2, 64, 3, 64, 32, 22,
    32, 16, 78, 13, 1, 32, 35, 32, 23, 32, 22, 65, 3, 116, 106, 43, 3, 0, 32, 11, 32, 22, 65, 3, 116, 106, 43, 3, 0, 162, 161, 33,
    35, 32, 22, 65, 1, 106, 33, 22, 12, 0, 11, 11, 32, 11, 32, 20, 65, 3, 116, 106, 32, 35, 32, 23, 32, 20, 65, 3, 116, 106, 43, 3,
    0, 163, 57, 3, 0, 12, 0, 11, 11, 65, 0, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 78, 13, 1, 32, 11, 32, 20, 65, 3, 116, 106,
    43, 3, 0, 32, 12, 32, 20, 65, 3, 116, 106, 43, 3, 0, 162, 68, 0, 0, 0, 0, 0, 0, 0, 0, 100, 69, 4, 64, 65, 0, 15, 11,
    32, 20, 65, 1, 106, 33, 20, 12, 0, 11, 11, 65, 0, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 78, 13, 1, 32, 15, 32, 9, 32, 20,
    65, 2, 116, 106, 40, 2, 0, 65, 3, 116, 106, 32, 11, 32, 20, 65, 3, 116, 106, 43, 3, 0, 57, 3, 0, 32, 20, 65, 1, 106, 33, 20,
    12, 0, 11, 11, 32, 4, 40, 2, 0, 33, 32, 32, 14, 32, 4, 32, 3, 65, 1, 107, 65, 2, 116, 106, 40, 2, 0, 32, 32, 107, 32, 3,
    65, 1, 107, 70, 113, 4, 64, 65, 0, 33, 18, 2, 64, 3, 64, 32, 18, 32, 3, 78, 13, 1, 32, 12, 32, 18, 65, 3, 116, 106, 68, 0,
    0, 0, 0, 0, 0, 0, 0, 57, 3, 0, 32, 18, 65, 1, 106, 33, 18, 12, 0, 11, 11, 65, 0, 33, 20, 2, 64, 3, 64, 32, 20, 32,
    16, 78, 13, 1, 32, 11, 32, 20, 65, 3, 116, 106, 43, 3, 0, 34, 33, 253, 20, 33, 37, 32, 6, 32, 9, 32, 20, 65, 2, 116, 106, 40,
    2, 0, 32, 1, 108, 32, 32, 106, 65, 3, 116, 106, 33, 27, 65, 0, 33, 18, 2, 64, 3, 64, 32, 18, 32, 3, 65, 1, 107, 78, 13, 1,
    32, 12, 32, 18, 65, 3, 116, 106, 34, 25, 32, 25, 253, 0, 3, 0, 32, 27, 32, 18, 65, 3, 116, 106, 253, 0, 3, 0, 32, 37, 253, 242,
    1, 253, 240, 1, 253, 11, 3, 0, 32, 18, 65, 2, 106, 33, 18, 12, 0, 11, 11, 32, 18, 32, 3, 72, 4, 64, 32, 12, 32, 18, 65, 3,
    116, 106, 34, 25, 32, 25, 43, 3, 0, 32, 27, 32, 18, 65, 3, 116, 106, 43, 3, 0, 32, 33, 162, 160, 57, 3, 0, 11, 32, 20, 65, 1,
    106, 33, 20, 12, 0, 11, 11, 65, 0, 33, 18, 2, 64, 3, 64, 32, 18, 32, 17, 78, 13, 1, 32, 13, 32, 18, 65, 2, 116, 106, 40, 2,
    0, 33, 19, 32, 8, 32, 19, 65, 3, 116, 106, 32, 12, 32, 19, 32, 32, 107, 65, 3, 116, 106, 43, 3, 0, 57, 3, 0, 32, 18, 65, 1,
    106, 33, 18, 12, 0, 11, 11, 5, 65, 0, 33, 18, 2, 64, 3, 64, 32, 18, 32, 17, 65, 3, 107, 78, 13, 1, 32, 6, 32, 13, 32, 18,
    65, 0, 106, 65, 2, 116, 106, 40, 2, 0, 32, 1, 108, 65, 3, 116, 106, 33, 27, 32, 6, 32, 13, 32, 18, 65, 1, 106, 65, 2, 116, 106,
    40, 2, 0, 32, 1, 108, 65, 3, 116, 106, 33, 28, 32, 6, 32, 13, 32, 18, 65, 2, 106, 65, 2, 116, 106, 40, 2, 0, 32, 1, 108, 65,
    3, 116, 106, 33, 29, 32, 6, 32, 13, 32, 18, 65, 3, 106, 65, 2, 116, 106, 40, 2, 0, 32, 1, 108, 65, 3, 116, 106, 33, 30, 253, 12,
    0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 39, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 33, 40, 65, 0, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 78, 13, 1, 32, 9, 32, 20, 65, 2, 116, 106, 40, 2, 0,
    65, 3, 116, 33, 25, 32, 11, 32, 20, 65, 3, 116, 106, 253, 10, 3, 0, 33, 37, 32, 39, 32, 28, 32, 25, 106, 32, 27, 32, 25, 106, 253,
    10, 3, 0, 253, 87, 3, 0, 1, 32, 37, 253, 242, 1, 253, 240, 1, 33, 39, 32, 40, 32, 30, 32, 25, 106, 32, 29, 32, 25, 106, 253, 10,
    3, 0, 253, 87, 3, 0, 1, 32, 37, 253, 242, 1, 253, 240, 1, 33, 40, 32, 20, 65, 1, 106, 33, 20, 12, 0, 11, 11, 32, 8, 32, 13,
    32, 18, 65, 0, 106, 65, 2, 116, 106, 40, 2, 0, 65, 3, 116, 106, 32, 39, 253, 33, 0, 57, 3, 0, 32, 8, 32, 13, 32, 18, 65, 1,
    106, 65, 2, 116, 106, 40, 2, 0, 65, 3, 116, 106, 32, 39, 253, 33, 1, 57, 3, 0, 32, 8, 32, 13, 32, 18, 65, 2, 106, 65, 2, 116,
    106, 40, 2, 0, 65, 3, 116, 106, 32, 40, 253, 33, 0, 57, 3, 0, 32, 8, 32, 13, 32, 18, 65, 3, 106, 65, 2, 116, 106, 40, 2, 0,
    65, 3, 116, 106, 32, 40, 253, 33, 1, 57, 3, 0, 32, 18, 65, 4, 106, 33, 18, 12, 0, 11, 11, 32, 18, 32, 17, 65, 1, 107, 72, 4,
    64, 32, 6, 32, 13, 32, 18, 65, 0, 106, 65, 2, 116, 106, 40, 2, 0, 32, 1, 108, 65, 3, 116, 106, 33, 27, 32, 6, 32, 13, 32, 18,
    65, 1, 106, 65, 2, 116, 106, 40, 2, 0, 32, 1, 108, 65, 3, 116, 106, 33, 28, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 33, 39, 65, 0, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 78, 13, 1, 32, 9, 32, 20, 65, 2, 116, 106, 40, 2,
    0, 65, 3, 116, 33, 25, 32, 11, 32, 20, 65, 3, 116, 106, 253, 10, 3, 0, 33, 37, 32, 39, 32, 28, 32, 25, 106, 32, 27, 32, 25, 106,
    253, 10, 3, 0, 253, 87, 3, 0, 1, 32, 37, 253, 242, 1, 253, 240, 1, 33, 39, 32, 20, 65, 1, 106, 33, 20, 12, 0, 11, 11, 32, 8,
    32, 13, 32, 18, 65, 0, 106, 65, 2, 116, 106, 40, 2, 0, 65, 3, 116, 106, 32, 39, 253, 33, 0, 57, 3, 0, 32, 8, 32, 13, 32, 18,
    65, 1, 106, 65, 2, 116, 106, 40, 2, 0, 65, 3, 116, 106, 32, 39, 253, 33, 1, 57, 3, 0, 32, 18, 65, 2, 106, 33, 18, 11, 32, 18,
    32, 17, 72, 4, 64, 32, 6, 32, 13, 32, 18, 65, 2, 116, 106, 40, 2, 0, 32, 1, 108, 65, 3, 116, 106, 33, 27, 68, 0, 0, 0, 0,
    0, 0, 0, 0, 33, 35, 65, 0, 33, 20, 2, 64, 3, 64, 32, 20, 32, 16, 78, 13, 1, 32, 35, 32, 27, 32, 9, 32, 20, 65, 2, 116,
    106, 40, 2, 0, 65, 3, 116, 106, 43, 3, 0, 32, 11, 32, 20, 65, 3, 116, 106, 43, 3, 0, 162, 160, 33, 35, 32, 20, 65, 1, 106, 33,
    20, 12, 0, 11, 11, 32, 8, 32, 13, 32, 18, 65, 2, 116, 106, 40, 2, 0, 65, 3, 116, 106, 32, 35, 57, 3, 0, 11, 11, 65, 2, 33,
    26, 65, 0, 33, 18, 2, 64, 3, 64, 32, 18, 32, 17, 78, 13, 1, 32, 13, 32, 18, 65, 2, 116, 106, 40, 2, 0, 33, 19, 32, 15, 32,
    19, 65, 3, 116, 106, 43, 3, 0, 68, 0, 0, 0, 0, 0, 0, 0, 0, 97, 4, 64, 32, 5, 32, 19, 32, 1, 108, 32, 0, 106, 65, 3,
    116, 106, 43, 3, 0, 32, 8, 32, 19, 65, 3, 116, 106, 43, 3, 0, 161, 153, 32, 2, 100, 4, 64, 65, 1, 33, 26, 11, 11, 32, 18, 65,
    1, 106, 33, 18, 12, 0, 11, 11, 32, 26, 11, 156, 4, 3, 10, 127, 7, 124, 1, 123, 32, 0, 32, 1, 108, 65, 3, 116, 32, 7, 106, 33,
    10, 32, 9, 65, 0, 54, 2, 0, 32, 4, 40, 2, 0, 33, 16, 32, 4, 32, 3, 65, 1, 107, 65, 2, 116, 106, 40, 2, 0, 32, 16, 107,
    32, 3, 65, 1, 107, 70, 33, 17, 65, 0, 33, 11, 2, 64, 3, 64, 32, 11, 32, 3, 78, 13, 1, 32, 4, 32, 11, 65, 2, 116, 106, 40,
    2, 0, 34, 12, 32, 0, 71, 4, 64, 32, 6, 32, 12, 32, 1, 108, 65, 3, 116, 106, 33, 13, 32, 13, 32, 12, 65, 3, 116, 106, 43, 3,
    0, 33, 20, 32, 10, 32, 12, 65, 3, 116, 106, 43, 3, 0, 33, 21, 32, 5, 32, 12, 32, 1, 108, 32, 0, 106, 65, 3, 116, 106, 43, 3,
    0, 32, 8, 32, 12, 65, 3, 116, 106, 43, 3, 0, 161, 32, 20, 32, 21, 162, 160, 34, 22, 153, 32, 2, 161, 33, 23, 68, 0, 0, 0, 0,
    0, 0, 240, 63, 68, 0, 0, 0, 0, 0, 0, 240, 191, 32, 22, 68, 0, 0, 0, 0, 0, 0, 0, 0, 100, 27, 32, 23, 162, 32, 20, 163,
    68, 0, 0, 0, 0, 0, 0, 0, 0, 32, 23, 68, 0, 0, 0, 0, 0, 0, 0, 0, 100, 27, 34, 24, 32, 21, 98, 4, 64, 32, 24, 68,
    0, 0, 0, 0, 0, 0, 0, 0, 97, 32, 21, 68, 0, 0, 0, 0, 0, 0, 0, 0, 97, 114, 4, 64, 32, 9, 65, 1, 54, 2, 0, 11,
    32, 24, 32, 21, 161, 33, 25, 32, 10, 32, 12, 65, 3, 116, 106, 32, 24, 57, 3, 0, 32, 17, 4, 64, 32, 13, 32, 16, 65, 3, 116, 106,
    33, 18, 32, 8, 32, 16, 65, 3, 116, 106, 33, 19, 32, 25, 253, 20, 33, 27, 65, 0, 33, 14, 2, 64, 3, 64, 32, 14, 32, 3, 65, 1,
    107, 78, 13, 1, 32, 19, 32, 14, 65, 3, 116, 106, 34, 15, 32, 15, 253, 0, 3, 0, 32, 18, 32, 14, 65, 3, 116, 106, 253, 0, 3, 0,
    32, 27, 253, 242, 1, 253, 240, 1, 253, 11, 3, 0, 32, 14, 65, 2, 106, 33, 14, 12, 0, 11, 11, 32, 14, 32, 3, 72, 4, 64, 32, 19,
    32, 14, 65, 3, 116, 106, 34, 15, 32, 15, 43, 3, 0, 32, 18, 32, 14, 65, 3, 116, 106, 43, 3, 0, 32, 25, 162, 160, 57, 3, 0, 11,
    5, 65, 0, 33, 14, 2, 64, 3, 64, 32, 14, 32, 3, 78, 13, 1, 32, 4, 32, 14, 65, 2, 116, 106, 40, 2, 0, 65, 3, 116, 33, 15,
    32, 8, 32, 15, 106, 34, 19, 32, 19, 43, 3, 0, 32, 13, 32, 15, 106, 43, 3, 0, 32, 25, 162, 160, 57, 3, 0, 32, 14, 65, 1, 106,
    33, 14, 12, 0, 11, 11, 11, 32, 25, 153, 32, 20, 162, 34, 25, 32, 26, 100, 4, 64, 32, 25, 33, 26, 11, 11, 11, 32, 11, 65, 1, 106,
    33, 11, 12, 0, 11, 11, 32, 26, 11,
);

/** 2 GiB: every byte offset stays a non-negative i32. */
const MAX_BYTES = 2 ** 31;

/** This thread's kernel functions, set by `glassoSupportMemory`. */
let kernel: { support: SupportFunction; pass: PassFunction } | undefined;

/**
 * Views for a fit of order p in this thread's kernel memory (grown when needed). The views
 * handed out by an earlier call may be detached by this one: take them afresh per fit.
 * @param p The order of S, a positive integer.
 * @throws {RangeError} when the fit would need more than 2 GiB.
 * @returns The views and scratch offsets; their contents are whatever the last fit left.
 * References: none (memory layout).
 */
export function glassoSupportMemory(p: number): GlassoSupportMemory {
  const square = p * p * 8;
  const vector = p * 8;
  const offsets = {
    s: 0,
    w: square,
    beta: 2 * square,
    factor: 3 * square,
    wb: 4 * square,
    solution: 4 * square + vector,
    signs: 4 * square + 2 * vector,
    active: 4 * square + 3 * vector,
    members: 4 * square + 3 * vector + p * 4,
    others: 4 * square + 3 * vector + p * 8,
    flag: 4 * square + 3 * vector + p * 12,
  };
  if (offsets.flag + 4 > MAX_BYTES) throw new RangeError(`glassoSupportMemory: a graphical lasso of order ${p} needs more than 2 GiB of kernel memory`);
  const { memory, exports } = wasmKernelInstance(WASM, offsets.flag + 4);
  kernel = { support: exports.support as SupportFunction, pass: exports.pass as PassFunction };
  const buffer = memory.buffer;
  return {
    order: p,
    s: new Float64Array(buffer, offsets.s, p * p),
    w: new Float64Array(buffer, offsets.w, p * p),
    beta: new Float64Array(buffer, offsets.beta, p * p),
    wb: new Float64Array(buffer, offsets.wb, p),
    members: new Int32Array(buffer, offsets.members, p),
    supportChanged: new Int32Array(buffer, offsets.flag, 1),
    scratch: { active: offsets.active, factor: offsets.factor, solution: offsets.solution, signs: offsets.signs, others: offsets.others },
  };
}

/**
 * The exact minimum of column j's lasso on the face of its current support and signs, in the
 * kernel (see the module comment): β and wb in `memory` updated when taken.
 * @param memory Views from the latest `glassoSupportMemory` call of this thread.
 * @param j The column.
 * @param penalty The penalty ρ.
 * @param blockMembers The members of j's block, ascending: a subarray of `memory.members`.
 * @param symmetric True only when W in `memory` is exactly symmetric (w_kl = w_lk bit for bit):
 *   wb may then be summed along rows of W, the same values with contiguous loads.
 * @returns 0 (not taken), 1 (taken) or 2 (taken and optimal).
 * References: Friedman, Hastie & Tibshirani 2008 (the column lasso).
 */
export function solveOnSupportKernel(memory: GlassoSupportMemory, j: number, penalty: number, blockMembers: Int32Array, symmetric: boolean): number {
  const { scratch } = memory;
  return (kernel as { support: SupportFunction }).support(
    j,
    memory.order,
    penalty,
    blockMembers.length,
    blockMembers.byteOffset,
    memory.s.byteOffset,
    memory.w.byteOffset,
    memory.beta.byteOffset,
    memory.wb.byteOffset,
    scratch.active,
    scratch.factor,
    scratch.solution,
    scratch.signs,
    scratch.others,
    symmetric ? 1 : 0,
  );
}

/**
 * One coordinate-descent pass of column j's lasso over the members of its block, in the kernel
 * (`lassoPass` of graphical-lasso.ts before the kernel, operation for operation): β and wb in
 * `memory` updated, `memory.supportChanged[0]` set to 1 when a coordinate entered or left the
 * support (0 otherwise).
 * @param memory Views from the latest `glassoSupportMemory` call of this thread.
 * @param j The column.
 * @param penalty The penalty ρ.
 * @param blockMembers The members of j's block, ascending: a subarray of `memory.members`.
 * @returns The largest |Δβ_k| w_kk of the pass.
 * References: Friedman, Hastie, Höfling & Tibshirani 2007, "Pathwise coordinate optimization"
 * (Annals of Applied Statistics 1:302-332), the soft-threshold update.
 */
export function lassoPassKernel(memory: GlassoSupportMemory, j: number, penalty: number, blockMembers: Int32Array): number {
  return (kernel as { pass: PassFunction }).pass(
    j,
    memory.order,
    penalty,
    blockMembers.length,
    blockMembers.byteOffset,
    memory.s.byteOffset,
    memory.w.byteOffset,
    memory.beta.byteOffset,
    memory.wb.byteOffset,
    memory.supportChanged.byteOffset,
  );
}
