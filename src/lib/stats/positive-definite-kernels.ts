/**
 * Dense positive-definite kernels in WebAssembly SIMD: the upper Cholesky factor in place, the
 * inverse and a solve from the factor, the log-determinant, and the scaled element squares that
 * make the Hessian of a log-determinant in the diagonal, on matrices held in the kernels' own
 * memory. Written for loops that factor many small matrices one after another (the
 * minimum-trace smoothing's Newton steps, smooth-correlation-matrix.ts), where plain JavaScript
 * spends about 4 ns on each multiply-add.
 *
 * Bit for bit the plain loops. Every operation is one IEEE-754 double multiply, subtract, divide
 * or square root, with no fused multiply-add and no reassociation: two-lane (f64x2) arithmetic
 * only does two independent elements at once. Element by element:
 * - the factor R (A = RᵀR, so R = Lᵀ for the lower factor L) is the left-looking loop's
 *   `s = A[i][j]; for (k < j) s −= L[i][k]·L[j][k]; L[i][j] = s / L[j][j]` (and the square root
 *   of what is left on the diagonal), k ascending;
 * - the inverse is L⁻¹ by forward substitution for all columns at once, then L⁻ᵀL⁻¹ by backward
 *   substitution from the last row up, each element subtracting its products in ascending order
 *   of the row it takes them from (the order of the column-by-column substitutions);
 * - the solve is `x_i = (b_i − Σ_{k<i} L[i][k]·x_k) / L[i][i]` for i ascending, then
 *   `x_i = (x_i − Σ_{k>i} L[k][i]·x_k) / L[i][i]` for i descending, k ascending in both;
 * - the log-determinant is Σ_i 2·log R[i][i], i ascending (in JavaScript: WebAssembly has no log).
 * The WebAssembly module is assembled from a readable listing by
 * scripts/make-positive-definite-wasm.mjs, which says how each loop is laid out; a unit test
 * checks that the bytes here are its output and compares every kernel with the plain loops by
 * `Object.is` (tests/unit/positive-definite-kernels.test.ts).
 *
 * The module is compiled synchronously, so it stays under the 4 KB that Chromium allows for
 * that on a page's main thread (the unit test checks its size).
 *
 * One module instance and one memory per thread, made on first use and grown when a larger
 * workspace is asked for. A workspace's matrices and vectors are views into that memory: taking
 * a new workspace reuses the same memory, so the previous workspace stops working (its methods
 * throw) and its views must not be used any more.
 *
 * References: Golub & Van Loan 2013, "Matrix Computations", 4th ed., §4.2 (Cholesky) and §3.1
 * (triangular systems); WebAssembly Core Specification 2.0 (2022), §4.3 (f64 and f64x2
 * arithmetic is IEEE-754).
 */
import { WASM_MAX_BYTES, wasmKernelInstance } from './wasm-kernel-instance';

// The module of scripts/make-positive-definite-wasm.mjs: cholesky(a, n) → i32, invert(r, out, n, lowerOnly),
// solve(r, b, x, n), scaledSquares(source, target, n, scale), byte offsets into the imported
// env.memory.
const POSITIVE_DEFINITE_WASM = Uint8Array.of(
  0, 97, 115, 109, 1, 0, 0, 0, 1, 45, 6, 96, 8, 127, 127, 127, 127, 127, 127, 127, 127, 0, 96, 3, 127, 127, 124, 0, 96, 2, 127, 127,
  1, 127, 96, 4, 127, 127, 127, 127, 0, 96, 4, 127, 127, 127, 127, 0, 96, 4, 127, 127, 127, 124, 0, 2, 15, 1, 3, 101, 110, 118, 6, 109,
  101, 109, 111, 114, 121, 2, 0, 1, 3, 7, 6, 0, 1, 2, 3, 4, 5, 7, 45, 4, 8, 99, 104, 111, 108, 101, 115, 107, 121, 0, 2, 6,
  105, 110, 118, 101, 114, 116, 0, 3, 5, 115, 111, 108, 118, 101, 0, 4, 13, 115, 99, 97, 108, 101, 100, 83, 113, 117, 97, 114, 101, 115, 0, 5,
  10, 247, 17, 6, 191, 11, 13, 1, 127, 1, 127, 1, 127, 1, 127, 1, 127, 1, 127, 1, 127, 1, 123, 1, 124, 1, 123, 1, 123, 1, 123, 1,
  123, 32, 3, 32, 5, 32, 4, 108, 106, 33, 12, 2, 64, 3, 64, 32, 8, 65, 8, 106, 32, 6, 75, 13, 1, 32, 0, 32, 8, 65, 3, 116,
  106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 253, 0, 3, 0, 33, 17, 32, 14, 253, 0, 3, 16, 33, 18, 32, 14, 253, 0, 3, 32,
  33, 19, 32, 14, 253, 0, 3, 48, 33, 20, 32, 3, 32, 10, 32, 4, 108, 106, 33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8, 65, 3,
  116, 106, 33, 13, 2, 64, 3, 64, 32, 11, 32, 12, 79, 13, 1, 32, 11, 253, 10, 3, 0, 33, 15, 32, 17, 32, 15, 32, 13, 253, 0, 3,
  0, 253, 242, 1, 253, 241, 1, 33, 17, 32, 18, 32, 15, 32, 13, 253, 0, 3, 16, 253, 242, 1, 253, 241, 1, 33, 18, 32, 19, 32, 15, 32,
  13, 253, 0, 3, 32, 253, 242, 1, 253, 241, 1, 33, 19, 32, 20, 32, 15, 32, 13, 253, 0, 3, 48, 253, 242, 1, 253, 241, 1, 33, 20, 32,
  11, 32, 4, 106, 33, 11, 32, 13, 32, 2, 106, 33, 13, 12, 0, 11, 11, 32, 14, 32, 17, 253, 11, 3, 0, 32, 14, 32, 18, 253, 11, 3,
  16, 32, 14, 32, 19, 253, 11, 3, 32, 32, 14, 32, 20, 253, 11, 3, 48, 32, 8, 65, 8, 106, 33, 8, 12, 0, 11, 11, 32, 6, 32, 8,
  107, 33, 9, 32, 9, 65, 1, 70, 4, 64, 32, 0, 32, 8, 65, 3, 116, 106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 43, 3, 0,
  33, 16, 32, 3, 32, 10, 32, 4, 108, 106, 33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8, 65, 3, 116, 106, 33, 13, 2, 64, 3, 64,
  32, 11, 32, 12, 79, 13, 1, 32, 16, 32, 11, 43, 3, 0, 32, 13, 43, 3, 0, 162, 161, 33, 16, 32, 11, 32, 4, 106, 33, 11, 32, 13,
  32, 2, 106, 33, 13, 12, 0, 11, 11, 32, 14, 32, 16, 57, 3, 0, 32, 8, 65, 1, 106, 33, 8, 11, 32, 9, 65, 2, 70, 4, 64, 32,
  0, 32, 8, 65, 3, 116, 106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 253, 0, 3, 0, 33, 17, 32, 3, 32, 10, 32, 4, 108, 106,
  33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8, 65, 3, 116, 106, 33, 13, 2, 64, 3, 64, 32, 11, 32, 12, 79, 13, 1, 32, 11, 253,
  10, 3, 0, 33, 15, 32, 17, 32, 15, 32, 13, 253, 0, 3, 0, 253, 242, 1, 253, 241, 1, 33, 17, 32, 11, 32, 4, 106, 33, 11, 32, 13,
  32, 2, 106, 33, 13, 12, 0, 11, 11, 32, 14, 32, 17, 253, 11, 3, 0, 32, 8, 65, 2, 106, 33, 8, 11, 32, 9, 65, 3, 70, 4, 64,
  32, 0, 32, 8, 65, 3, 116, 106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 253, 0, 3, 0, 33, 17, 32, 14, 43, 3, 16, 33, 16,
  32, 3, 32, 10, 32, 4, 108, 106, 33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8, 65, 3, 116, 106, 33, 13, 2, 64, 3, 64, 32, 11,
  32, 12, 79, 13, 1, 32, 11, 253, 10, 3, 0, 33, 15, 32, 17, 32, 15, 32, 13, 253, 0, 3, 0, 253, 242, 1, 253, 241, 1, 33, 17, 32,
  16, 32, 11, 43, 3, 0, 32, 13, 43, 3, 16, 162, 161, 33, 16, 32, 11, 32, 4, 106, 33, 11, 32, 13, 32, 2, 106, 33, 13, 12, 0, 11,
  11, 32, 14, 32, 17, 253, 11, 3, 0, 32, 14, 32, 16, 57, 3, 16, 32, 8, 65, 3, 106, 33, 8, 11, 32, 9, 65, 4, 70, 4, 64, 32,
  0, 32, 8, 65, 3, 116, 106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 253, 0, 3, 0, 33, 17, 32, 14, 253, 0, 3, 16, 33, 18,
  32, 3, 32, 10, 32, 4, 108, 106, 33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8, 65, 3, 116, 106, 33, 13, 2, 64, 3, 64, 32, 11,
  32, 12, 79, 13, 1, 32, 11, 253, 10, 3, 0, 33, 15, 32, 17, 32, 15, 32, 13, 253, 0, 3, 0, 253, 242, 1, 253, 241, 1, 33, 17, 32,
  18, 32, 15, 32, 13, 253, 0, 3, 16, 253, 242, 1, 253, 241, 1, 33, 18, 32, 11, 32, 4, 106, 33, 11, 32, 13, 32, 2, 106, 33, 13, 12,
  0, 11, 11, 32, 14, 32, 17, 253, 11, 3, 0, 32, 14, 32, 18, 253, 11, 3, 16, 32, 8, 65, 4, 106, 33, 8, 11, 32, 9, 65, 5, 70,
  4, 64, 32, 0, 32, 8, 65, 3, 116, 106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 253, 0, 3, 0, 33, 17, 32, 14, 253, 0, 3,
  16, 33, 18, 32, 14, 43, 3, 32, 33, 16, 32, 3, 32, 10, 32, 4, 108, 106, 33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8, 65, 3,
  116, 106, 33, 13, 2, 64, 3, 64, 32, 11, 32, 12, 79, 13, 1, 32, 11, 253, 10, 3, 0, 33, 15, 32, 17, 32, 15, 32, 13, 253, 0, 3,
  0, 253, 242, 1, 253, 241, 1, 33, 17, 32, 18, 32, 15, 32, 13, 253, 0, 3, 16, 253, 242, 1, 253, 241, 1, 33, 18, 32, 16, 32, 11, 43,
  3, 0, 32, 13, 43, 3, 32, 162, 161, 33, 16, 32, 11, 32, 4, 106, 33, 11, 32, 13, 32, 2, 106, 33, 13, 12, 0, 11, 11, 32, 14, 32,
  17, 253, 11, 3, 0, 32, 14, 32, 18, 253, 11, 3, 16, 32, 14, 32, 16, 57, 3, 32, 32, 8, 65, 5, 106, 33, 8, 11, 32, 9, 65, 6,
  70, 4, 64, 32, 0, 32, 8, 65, 3, 116, 106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 253, 0, 3, 0, 33, 17, 32, 14, 253, 0,
  3, 16, 33, 18, 32, 14, 253, 0, 3, 32, 33, 19, 32, 3, 32, 10, 32, 4, 108, 106, 33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8,
  65, 3, 116, 106, 33, 13, 2, 64, 3, 64, 32, 11, 32, 12, 79, 13, 1, 32, 11, 253, 10, 3, 0, 33, 15, 32, 17, 32, 15, 32, 13, 253,
  0, 3, 0, 253, 242, 1, 253, 241, 1, 33, 17, 32, 18, 32, 15, 32, 13, 253, 0, 3, 16, 253, 242, 1, 253, 241, 1, 33, 18, 32, 19, 32,
  15, 32, 13, 253, 0, 3, 32, 253, 242, 1, 253, 241, 1, 33, 19, 32, 11, 32, 4, 106, 33, 11, 32, 13, 32, 2, 106, 33, 13, 12, 0, 11,
  11, 32, 14, 32, 17, 253, 11, 3, 0, 32, 14, 32, 18, 253, 11, 3, 16, 32, 14, 32, 19, 253, 11, 3, 32, 32, 8, 65, 6, 106, 33, 8,
  11, 32, 9, 65, 7, 70, 4, 64, 32, 0, 32, 8, 65, 3, 116, 106, 33, 14, 32, 7, 32, 8, 108, 33, 10, 32, 14, 253, 0, 3, 0, 33,
  17, 32, 14, 253, 0, 3, 16, 33, 18, 32, 14, 253, 0, 3, 32, 33, 19, 32, 14, 43, 3, 48, 33, 16, 32, 3, 32, 10, 32, 4, 108, 106,
  33, 11, 32, 1, 32, 10, 32, 2, 108, 106, 32, 8, 65, 3, 116, 106, 33, 13, 2, 64, 3, 64, 32, 11, 32, 12, 79, 13, 1, 32, 11, 253,
  10, 3, 0, 33, 15, 32, 17, 32, 15, 32, 13, 253, 0, 3, 0, 253, 242, 1, 253, 241, 1, 33, 17, 32, 18, 32, 15, 32, 13, 253, 0, 3,
  16, 253, 242, 1, 253, 241, 1, 33, 18, 32, 19, 32, 15, 32, 13, 253, 0, 3, 32, 253, 242, 1, 253, 241, 1, 33, 19, 32, 16, 32, 11, 43,
  3, 0, 32, 13, 43, 3, 48, 162, 161, 33, 16, 32, 11, 32, 4, 106, 33, 11, 32, 13, 32, 2, 106, 33, 13, 12, 0, 11, 11, 32, 14, 32,
  17, 253, 11, 3, 0, 32, 14, 32, 18, 253, 11, 3, 16, 32, 14, 32, 19, 253, 11, 3, 32, 32, 14, 32, 16, 57, 3, 48, 32, 8, 65, 7,
  106, 33, 8, 11, 11, 85, 2, 1, 127, 1, 123, 32, 2, 253, 20, 33, 4, 32, 0, 32, 1, 65, 3, 116, 106, 33, 3, 2, 64, 3, 64, 32,
  0, 65, 16, 106, 32, 3, 75, 13, 1, 32, 0, 32, 0, 253, 0, 3, 0, 32, 4, 253, 243, 1, 253, 11, 3, 0, 32, 0, 65, 16, 106, 33,
  0, 12, 0, 11, 11, 32, 0, 32, 3, 73, 4, 64, 32, 0, 32, 0, 43, 3, 0, 32, 2, 163, 57, 3, 0, 11, 11, 133, 1, 5, 1, 127,
  1, 127, 1, 127, 1, 127, 1, 124, 32, 1, 65, 3, 116, 33, 2, 2, 64, 3, 64, 32, 3, 32, 1, 79, 13, 1, 32, 0, 32, 3, 65, 3,
  116, 106, 34, 5, 32, 3, 32, 2, 108, 106, 33, 4, 32, 4, 32, 5, 32, 2, 32, 5, 32, 2, 32, 3, 32, 1, 32, 3, 107, 65, 0, 16,
  0, 32, 4, 43, 3, 0, 34, 6, 68, 0, 0, 0, 0, 0, 0, 0, 0, 100, 69, 4, 64, 65, 0, 15, 11, 32, 4, 32, 6, 159, 34, 6,
  57, 3, 0, 32, 4, 65, 8, 106, 32, 1, 32, 3, 107, 65, 1, 107, 32, 6, 16, 1, 32, 3, 65, 1, 106, 33, 3, 12, 0, 11, 11, 65,
  1, 11, 147, 2, 6, 1, 127, 1, 127, 1, 127, 1, 127, 1, 127, 1, 127, 32, 2, 65, 3, 116, 33, 4, 2, 64, 3, 64, 32, 5, 32, 2,
  79, 13, 1, 32, 1, 32, 5, 32, 4, 108, 106, 34, 6, 33, 7, 32, 6, 32, 4, 106, 33, 8, 2, 64, 3, 64, 32, 7, 32, 8, 79, 13,
  1, 32, 7, 68, 0, 0, 0, 0, 0, 0, 0, 0, 57, 3, 0, 32, 7, 65, 8, 106, 33, 7, 12, 0, 11, 11, 32, 6, 32, 5, 65, 3,
  116, 106, 68, 0, 0, 0, 0, 0, 0, 240, 63, 57, 3, 0, 32, 6, 32, 1, 32, 4, 32, 0, 32, 5, 65, 3, 116, 106, 32, 4, 32, 5,
  32, 5, 65, 1, 16, 0, 32, 6, 32, 5, 65, 1, 106, 32, 0, 32, 5, 32, 4, 108, 32, 5, 65, 3, 116, 106, 106, 43, 3, 0, 16, 1,
  32, 5, 65, 1, 106, 33, 5, 12, 0, 11, 11, 2, 64, 3, 64, 32, 5, 69, 13, 1, 32, 5, 65, 1, 107, 33, 5, 32, 1, 32, 5, 32,
  4, 108, 106, 33, 6, 32, 5, 65, 1, 106, 32, 2, 32, 3, 27, 33, 9, 32, 6, 32, 6, 32, 4, 106, 32, 4, 32, 0, 32, 5, 32, 4,
  108, 106, 32, 5, 65, 1, 106, 65, 3, 116, 106, 65, 8, 32, 2, 32, 5, 107, 65, 1, 107, 32, 9, 65, 0, 16, 0, 32, 6, 32, 9, 32,
  0, 32, 5, 32, 4, 108, 32, 5, 65, 3, 116, 106, 106, 43, 3, 0, 16, 1, 12, 0, 11, 11, 11, 199, 1, 4, 1, 127, 1, 127, 1, 127,
  1, 127, 32, 3, 65, 3, 116, 33, 4, 2, 64, 3, 64, 32, 5, 32, 3, 79, 13, 1, 32, 2, 32, 5, 65, 3, 116, 106, 34, 6, 32, 1,
  32, 5, 65, 3, 116, 106, 43, 3, 0, 57, 3, 0, 32, 6, 32, 2, 65, 8, 32, 0, 32, 5, 65, 3, 116, 106, 32, 4, 32, 5, 65, 1,
  65, 0, 16, 0, 32, 0, 32, 5, 32, 4, 108, 106, 32, 5, 65, 3, 116, 106, 33, 7, 32, 6, 65, 1, 32, 7, 43, 3, 0, 16, 1, 32,
  5, 65, 1, 106, 33, 5, 12, 0, 11, 11, 2, 64, 3, 64, 32, 5, 69, 13, 1, 32, 5, 65, 1, 107, 33, 5, 32, 0, 32, 5, 32, 4,
  108, 106, 32, 5, 65, 3, 116, 106, 33, 7, 32, 2, 32, 5, 65, 3, 116, 106, 34, 6, 32, 6, 65, 8, 106, 65, 8, 32, 7, 65, 8, 106,
  65, 8, 32, 3, 32, 5, 107, 65, 1, 107, 65, 1, 65, 0, 16, 0, 32, 6, 65, 1, 32, 7, 43, 3, 0, 16, 1, 12, 0, 11, 11, 11,
  121, 6, 1, 127, 1, 127, 1, 127, 1, 127, 1, 127, 1, 124, 32, 2, 65, 3, 116, 33, 4, 2, 64, 3, 64, 32, 5, 32, 2, 79, 13, 1,
  32, 0, 32, 5, 32, 4, 108, 106, 34, 6, 32, 5, 65, 1, 106, 65, 3, 116, 106, 33, 8, 32, 1, 32, 5, 65, 3, 116, 106, 33, 7, 2,
  64, 3, 64, 32, 6, 32, 8, 79, 13, 1, 32, 7, 32, 3, 32, 6, 43, 3, 0, 34, 9, 162, 32, 9, 162, 57, 3, 0, 32, 6, 65, 8,
  106, 33, 6, 32, 7, 32, 4, 106, 33, 7, 12, 0, 11, 11, 32, 5, 65, 1, 106, 33, 5, 12, 0, 11, 11, 11,
);

interface PositiveDefiniteInstance {
  readonly memory: WebAssembly.Memory;
  readonly cholesky: (a: number, n: number) => number;
  readonly invert: (r: number, out: number, n: number, lowerOnly: number) => void;
  readonly solve: (r: number, b: number, x: number, n: number) => void;
  readonly scaledSquares: (source: number, target: number, n: number, scale: number) => void;
}

/** Counts the workspaces handed out; only the latest one may be used. */
let generation = 0;

/** The thread's kernels, their memory grown to hold `bytes`. */
function instantiate(bytes: number): PositiveDefiniteInstance {
  const { memory, exports } = wasmKernelInstance(POSITIVE_DEFINITE_WASM, bytes);
  return {
    memory,
    cholesky: exports.cholesky as PositiveDefiniteInstance['cholesky'],
    invert: exports.invert as PositiveDefiniteInstance['invert'],
    solve: exports.solve as PositiveDefiniteInstance['solve'],
    scaledSquares: exports.scaledSquares as PositiveDefiniteInstance['scaledSquares'],
  };
}

/**
 * Scratch matrices and vectors of one order in the kernels' memory, and the kernels that work on
 * them. Matrices are row-major, `order × order`; the kernels take and return them through these
 * views only.
 */
export interface PositiveDefiniteWorkspace {
  /** The order n of every matrix (vectors have n elements). */
  readonly order: number;
  /** The scratch matrices, n² doubles each, zeroed when handed out. */
  readonly matrices: readonly Float64Array[];
  /** The scratch vectors, n doubles each, zeroed when handed out. */
  readonly vectors: readonly Float64Array[];
  /**
   * Replaces the upper triangle of a matrix by its upper Cholesky factor R (A = RᵀR). Only the
   * upper triangle (diagonal included) is read; the strict lower triangle is left as it was.
   * @param matrix One of `matrices`, holding A in its upper triangle.
   * @throws {Error} when this workspace is no longer the current one, or the array is not one of its matrices.
   * @returns false when a pivot is not positive (A is not numerically positive definite); the
   *   upper triangle then holds an incomplete factor.
   */
  factorInPlace(matrix: Float64Array): boolean;
  /**
   * A⁻¹ from the upper factor R, as a full row-major matrix (not necessarily exactly symmetric:
   * each element is what the substitutions give).
   * @param factor One of `matrices`, holding R from `factorInPlace` (upper triangle read).
   * @param inverse Another of `matrices`; receives A⁻¹.
   * @throws {Error} when this workspace is no longer the current one, an array is not one of its
   *   matrices, or the two are the same.
   * @returns Nothing; `inverse` is written.
   */
  inverseFromFactor(factor: Float64Array, inverse: Float64Array): void;
  /**
   * The lower triangle (diagonal included) of A⁻¹ from the upper factor R, bit for bit the one
   * `inverseFromFactor` gives, with a third of its backward products: row i of the lower triangle
   * needs only the lower triangles of the rows below it. The strict upper triangle is left with
   * zeros.
   * @param factor One of `matrices`, holding R from `factorInPlace` (upper triangle read).
   * @param inverse Another of `matrices`; receives the lower triangle of A⁻¹.
   * @throws {Error} when this workspace is no longer the current one, an array is not one of its
   *   matrices, or the two are the same.
   * @returns Nothing; `inverse` is written.
   */
  lowerInverseFromFactor(factor: Float64Array, inverse: Float64Array): void;
  /**
   * x = A⁻¹b from the upper factor R, by substitution with Rᵀ then R.
   * @param factor One of `matrices`, holding R from `factorInPlace`.
   * @param rightHandSide One of `vectors`, b (not modified unless it is also `solution`).
   * @param solution One of `vectors` (may be `rightHandSide`); receives x.
   * @throws {Error} when this workspace is no longer the current one or an array is not one of its.
   * @returns Nothing; `solution` is written.
   */
  solveFromFactor(factor: Float64Array, rightHandSide: Float64Array, solution: Float64Array): void;
  /**
   * log det A = Σ_i 2·log R[i][i] (i ascending) from the upper factor R.
   * @param factor One of `matrices`, holding R from a successful `factorInPlace`.
   * @throws {Error} when this workspace is no longer the current one or the array is not one of its matrices.
   * @returns The log-determinant.
   */
  logDeterminantFromFactor(factor: Float64Array): number;
  /**
   * The scaled squares of the lower triangle into the upper one: target[j][i] =
   * (scale·source[i][j])·source[i][j] for j ≤ i (in that order of the products). With source =
   * M⁻¹ this is the Hessian of −scale·log det M with respect to M's diagonal, scale·(M⁻¹ ∘ M⁻¹),
   * placed in the triangle `factorInPlace` reads. The strict lower triangle of `target` is not
   * written, so `target` may be `source`.
   * @param source One of `matrices` (lower triangle read).
   * @param target One of `matrices`; its upper triangle receives the squares.
   * @param scale The factor.
   * @throws {Error} when this workspace is no longer the current one or an array is not one of its matrices.
   * @returns Nothing; `target` is written.
   */
  scaledSquaresIntoUpper(source: Float64Array, target: Float64Array, scale: number): void;
}

/**
 * Hands out a workspace of `matrixCount` matrices and `vectorCount` vectors of order `order` in
 * the thread's kernel memory, growing it when needed. The previous workspace of the thread stops
 * working.
 * @param order The order n (≥ 1).
 * @param matrixCount How many n × n matrices.
 * @param vectorCount How many n-vectors.
 * @throws {RangeError} when the order or a count is not a non-negative integer (order ≥ 1), or
 *   the workspace would exceed the 4 GiB a WebAssembly memory can hold.
 * @returns The workspace.
 * References: WebAssembly Core Specification 2.0 (2022), §4.2.8 (memory instances and growth).
 */
export function positiveDefiniteWorkspace(order: number, matrixCount: number, vectorCount: number): PositiveDefiniteWorkspace {
  if (!(Number.isInteger(order) && order >= 1)) throw new RangeError(`positiveDefiniteWorkspace: order must be a positive integer, got ${order}`);
  if (!(Number.isInteger(matrixCount) && matrixCount >= 0 && Number.isInteger(vectorCount) && vectorCount >= 0)) {
    throw new RangeError(`positiveDefiniteWorkspace: the counts must be non-negative integers, got ${matrixCount} and ${vectorCount}`);
  }
  const matrixBytes = order * order * 8;
  const vectorBytes = order * 8;
  const bytes = matrixCount * matrixBytes + vectorCount * vectorBytes;
  if (bytes > WASM_MAX_BYTES) {
    throw new RangeError(`positiveDefiniteWorkspace: ${matrixCount} matrices and ${vectorCount} vectors of order ${order} need more than the 4 GiB of a WebAssembly memory`);
  }
  const kernels = instantiate(bytes);
  const { memory } = kernels;
  const buffer = memory.buffer;
  new Uint8Array(buffer, 0, bytes).fill(0);
  const matrices: Float64Array[] = [];
  const vectors: Float64Array[] = [];
  for (let index = 0; index < matrixCount; index++) matrices.push(new Float64Array(buffer, index * matrixBytes, order * order));
  for (let index = 0; index < vectorCount; index++) vectors.push(new Float64Array(buffer, matrixCount * matrixBytes + index * vectorBytes, order));
  generation++;
  const mine = generation;

  const check = (arrays: readonly Float64Array[], array: Float64Array, what: string): number => {
    if (mine !== generation) throw new Error('positiveDefiniteWorkspace: this workspace was replaced by a later one; its views are no longer valid');
    if (!arrays.includes(array)) throw new Error(`positiveDefiniteWorkspace: the ${what} is not one of this workspace's arrays`);
    return array.byteOffset;
  };

  return {
    order,
    matrices,
    vectors,
    factorInPlace(matrix) {
      return kernels.cholesky(check(matrices, matrix, 'matrix'), order) === 1;
    },
    inverseFromFactor(factor, inverse) {
      if (factor === inverse) throw new Error('positiveDefiniteWorkspace: the inverse cannot overwrite its factor');
      kernels.invert(check(matrices, factor, 'factor'), check(matrices, inverse, 'inverse'), order, 0);
    },
    lowerInverseFromFactor(factor, inverse) {
      if (factor === inverse) throw new Error('positiveDefiniteWorkspace: the inverse cannot overwrite its factor');
      kernels.invert(check(matrices, factor, 'factor'), check(matrices, inverse, 'inverse'), order, 1);
    },
    solveFromFactor(factor, rightHandSide, solution) {
      kernels.solve(check(matrices, factor, 'factor'), check(vectors, rightHandSide, 'right-hand side'), check(vectors, solution, 'solution'), order);
    },
    scaledSquaresIntoUpper(source, target, scale) {
      kernels.scaledSquares(check(matrices, source, 'source'), check(matrices, target, 'target'), order, scale);
    },
    logDeterminantFromFactor(factor) {
      check(matrices, factor, 'factor');
      let sum = 0;
      for (let i = 0; i < order; i++) sum += 2 * Math.log(factor[i * order + i]);
      return sum;
    },
  };
}
