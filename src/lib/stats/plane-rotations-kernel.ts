/**
 * The eigenvector rotations of the QL iteration (tql2) in WebAssembly SIMD, for `symmetricEigen`
 * (symmetric-eigen.ts).
 *
 * tql2 spends most of its time applying each plane rotation (c, s) of a QL sweep to two rows of
 * the transposed eigenvector matrix. The rotations depend only on the tridiagonal (d, e), never
 * on the vectors, so they can be recorded as the iteration runs and applied later, as long as
 * they are applied in the same order. A batch copies the rows into a WebAssembly memory (rows
 * padded with zeros to a multiple of 8 doubles), records every sweep's (c, s), applies them when
 * the buffer is full and at the end, and copies the rows back. The WebAssembly function takes
 * eight columns at a time through all the rotations of a sweep with f64x2 arithmetic: one
 * IEEE-754 multiply, add or subtract per lane and per operation, no fused multiply-add, the
 * operands in the order of the JavaScript loop
 *   w[upper + k] = s * w[lower + k] + c * value;  w[lower + k] = c * w[lower + k] - s * value;
 * Columns never mix and each element goes through the same operations in the same order, so the
 * rows are bit for bit those of the loop (tests/unit/plane-rotations-kernel.test.ts and
 * tests/unit/symmetric-eigen.test.ts compare them by `Object.is`).
 *
 * The function is assembled from a readable listing by scripts/make-plane-rotations-wasm.mjs
 * (the test checks that the bytes here are its output). The module is instantiated once per
 * thread, on first use, and its memory grows when a larger order needs it.
 *
 * References: Bowdler, Martin, Reinsch & Wilkinson 1968, "The QR and QL algorithms for symmetric
 * matrices" (Numer. Math. 11:293-306, tql2); WebAssembly Core Specification 2.0 (2022) (f64x2
 * arithmetic is IEEE-754 per lane).
 */
import { WASM_MAX_BYTES, wasmKernelInstance } from './wasm-kernel-instance';

/** The rotate function of scripts/make-plane-rotations-wasm.mjs, importing env.memory. */
export const PLANE_ROTATIONS_WASM = Uint8Array.of(
  0, 97, 115, 109, 1, 0, 0, 0, 1, 9, 1, 96, 5, 127, 127, 127, 127, 127, 0, 2, 15, 1, 3, 101, 110, 118, 6, 109, 101, 109, 111, 114,
  121, 2, 0, 1, 3, 2, 1, 0, 7, 10, 1, 6, 114, 111, 116, 97, 116, 101, 0, 0, 10, 134, 3, 1, 131, 3, 2, 5, 127, 7, 123, 3,
  64, 32, 4, 32, 2, 40, 2, 4, 65, 4, 116, 106, 33, 5, 65, 0, 33, 6, 3, 64, 32, 0, 32, 2, 40, 2, 0, 65, 1, 106, 32, 1,
  108, 106, 32, 6, 106, 33, 7, 32, 7, 253, 0, 4, 0, 33, 10, 32, 7, 253, 0, 4, 16, 33, 11, 32, 7, 253, 0, 4, 32, 33, 12, 32,
  7, 253, 0, 4, 48, 33, 13, 32, 4, 33, 9, 3, 64, 32, 9, 253, 10, 3, 0, 33, 14, 32, 9, 253, 10, 3, 8, 33, 15, 32, 7, 32,
  1, 107, 33, 8, 32, 8, 253, 0, 4, 0, 33, 16, 32, 7, 32, 15, 32, 16, 253, 242, 1, 32, 14, 32, 10, 253, 242, 1, 253, 240, 1, 253,
  11, 4, 0, 32, 14, 32, 16, 253, 242, 1, 32, 15, 32, 10, 253, 242, 1, 253, 241, 1, 33, 10, 32, 8, 253, 0, 4, 16, 33, 16, 32, 7,
  32, 15, 32, 16, 253, 242, 1, 32, 14, 32, 11, 253, 242, 1, 253, 240, 1, 253, 11, 4, 16, 32, 14, 32, 16, 253, 242, 1, 32, 15, 32, 11,
  253, 242, 1, 253, 241, 1, 33, 11, 32, 8, 253, 0, 4, 32, 33, 16, 32, 7, 32, 15, 32, 16, 253, 242, 1, 32, 14, 32, 12, 253, 242, 1,
  253, 240, 1, 253, 11, 4, 32, 32, 14, 32, 16, 253, 242, 1, 32, 15, 32, 12, 253, 242, 1, 253, 241, 1, 33, 12, 32, 8, 253, 0, 4, 48,
  33, 16, 32, 7, 32, 15, 32, 16, 253, 242, 1, 32, 14, 32, 13, 253, 242, 1, 253, 240, 1, 253, 11, 4, 48, 32, 14, 32, 16, 253, 242, 1,
  32, 15, 32, 13, 253, 242, 1, 253, 241, 1, 33, 13, 32, 8, 33, 7, 32, 9, 65, 16, 106, 34, 9, 32, 5, 73, 13, 0, 11, 32, 7, 32,
  10, 253, 11, 4, 0, 32, 7, 32, 11, 253, 11, 4, 16, 32, 7, 32, 12, 253, 11, 4, 32, 32, 7, 32, 13, 253, 11, 4, 48, 32, 6, 65,
  192, 0, 106, 34, 6, 32, 1, 73, 13, 0, 11, 32, 5, 33, 4, 32, 2, 65, 8, 106, 34, 2, 32, 3, 73, 13, 0, 11, 11,
);

/** Doubles per padded row come in multiples of this (the function's eight columns at a time). */
const COLUMNS_PER_PASS = 8;
/** Rotations the buffer holds before it is applied (at least one sweep, order − 1, always fits). */
const MINIMUM_ROTATION_CAPACITY = 4096;

type Rotate = (rows: number, stride: number, sweeps: number, sweepsEnd: number, rotations: number) => void;


/**
 * The rotations of one QL run over the rows of a square matrix, recorded and applied in
 * WebAssembly. Use: `startSweep` once per QL iteration, then `add` for each of its rotations
 * (rows top, top + 1 first, then downwards), and `finish` at the end, which leaves the rotated
 * rows in the matrix the batch was started on. Until `finish` the matrix is not updated.
 */
export class PlaneRotationBatch {
  private readonly rows: Float64Array;
  private readonly order: number;
  private readonly padded: number;
  private readonly rotate: Rotate;
  private readonly cells: Float64Array;
  private readonly rotations: Float64Array;
  private readonly sweeps: Int32Array;
  private readonly rotationsOffset: number;
  private readonly sweepsOffset: number;
  private readonly capacity: number;
  private recorded = 0;
  private sweepCount = 0;

  /**
   * Copies the rows into this thread's WebAssembly memory (growing it when needed).
   * @param rows Row-major `order × order` matrix whose rows the rotations combine; it is read
   *   now and overwritten by `finish`.
   * @param order Rows and columns of the matrix (>= 2).
   * @throws {RangeError} when the order is below 2 or the padded rows and the rotation buffer
   *   would exceed the 4 GiB a WebAssembly memory can hold.
   */
  constructor(rows: Float64Array, order: number) {
    if (!Number.isInteger(order) || order < 2 || rows.length !== order * order) {
      throw new RangeError(`PlaneRotationBatch: expected an order >= 2 and order² rows values, got order ${order} and ${rows.length} values`);
    }
    const padded = Math.ceil(order / COLUMNS_PER_PASS) * COLUMNS_PER_PASS;
    const capacity = Math.max(MINIMUM_ROTATION_CAPACITY, order);
    const rowBytes = order * padded * 8;
    const totalBytes = rowBytes + capacity * 16 + capacity * 8;
    if (totalBytes > WASM_MAX_BYTES) {
      throw new RangeError(`PlaneRotationBatch: an order of ${order} needs more than the 4 GiB of a WebAssembly memory`);
    }
    const { memory, exports } = wasmKernelInstance(PLANE_ROTATIONS_WASM, totalBytes);
    const rotate = exports.rotate as Rotate;
    this.rows = rows;
    this.order = order;
    this.padded = padded;
    this.rotate = rotate;
    this.rotationsOffset = rowBytes;
    this.sweepsOffset = rowBytes + capacity * 16;
    this.capacity = capacity;
    this.cells = new Float64Array(memory.buffer, 0, order * padded);
    this.rotations = new Float64Array(memory.buffer, this.rotationsOffset, 2 * capacity);
    this.sweeps = new Int32Array(memory.buffer, this.sweepsOffset, 2 * capacity);
    // Padding columns are zeroed: they are rotated along (never read back) and must not hold
    // subnormal leftovers of an earlier order, which would only slow the arithmetic down.
    const cells = this.cells;
    for (let i = 0; i < order; i++) {
      const source = i * order;
      const target = i * padded;
      for (let k = 0; k < order; k++) cells[target + k] = rows[source + k];
      for (let k = order; k < padded; k++) cells[target + k] = 0;
    }
  }

  /**
   * Starts a QL sweep: `count` rotations will follow, the first on rows top and top + 1, each
   * next one a row lower.
   * @param top Lower row of the first rotation (m − 1 in tql2).
   * @param count Rotations in the sweep (m − l in tql2, >= 1).
   */
  startSweep(top: number, count: number): void {
    if (this.recorded + count > this.capacity) this.apply();
    this.sweeps[2 * this.sweepCount] = top;
    this.sweeps[2 * this.sweepCount + 1] = count;
    this.sweepCount++;
  }

  /**
   * Records the next rotation of the current sweep.
   * @param cosine c of the rotation.
   * @param sine s of the rotation.
   */
  add(cosine: number, sine: number): void {
    const index = 2 * this.recorded;
    this.rotations[index] = cosine;
    this.rotations[index + 1] = sine;
    this.recorded++;
  }

  /** Applies every rotation not yet applied and copies the rotated rows back into the matrix. */
  finish(): void {
    this.apply();
    const { rows, order, padded, cells } = this;
    for (let i = 0; i < order; i++) {
      const source = i * padded;
      const target = i * order;
      for (let k = 0; k < order; k++) rows[target + k] = cells[source + k];
    }
  }

  private apply(): void {
    if (this.sweepCount > 0) {
      this.rotate(0, this.padded * 8, this.sweepsOffset, this.sweepsOffset + 8 * this.sweepCount, this.rotationsOffset);
    }
    this.recorded = 0;
    this.sweepCount = 0;
  }
}
