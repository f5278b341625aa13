/**
 * The inner loop of the centred cross-products, shared by the complete-data path
 * (cross-products.ts), the masked pairwise path (masked-cross-products.ts) and the worker-thread
 * benchmark (bench/parallel/cross-products-worker.ts).
 *
 * SELF-CONTAINED ON PURPOSE: this function must not refer to anything outside its own body
 * (no imports, no module constants, no helper functions). The benchmark's worker thread is
 * started from its source text (`accumulateCenteredProducts.toString()`); the WebAssembly
 * bytes below are therefore a literal inside the function, and the instance is compiled once
 * per thread and kept on the thread's global object (a registered symbol), not per call: the
 * residual bootstrap calls this for every draw of every scale.
 *
 * Speed comes from two kinds of blocking:
 * - row tiling: `blockRows` respondents at a time are copied, centred, into a small scratch
 *   buffer (row-major, `padded` values per respondent, about 1.2 MB for 300 items), which stays
 *   in the L2 cache while every pair of items is accumulated over it;
 * - register blocking in WebAssembly SIMD: for each 4 × 4 tile of item pairs, each pass of the
 *   innermost loop reads one respondent's 4 + 4 values and updates 16 running sums held in 8
 *   two-lane (f64x2) registers. Every lane is an ordinary double sum, multiplied and added with
 *   IEEE-754 operations one at a time (no fused multiply-add), so nothing is reassociated.
 * The order is padded to a multiple of 4 with zero columns. Every pair's sum starts from 0 for a
 * tile of respondents, runs over them in order and is then added to the pair's total, tile after
 * tile, whatever the shape of the register tile: the results are bit for bit those of the plain
 * loop in the unit test (tests/unit/centered-products-kernel.test.ts), and of the JavaScript
 * 3 × 4 kernel this replaced (docs/decisions/020-speed-whole-audit.md, "Addendum: kernel").
 * The WebAssembly function is assembled from a readable listing by
 * scripts/make-cross-products-wasm.mjs (the test checks that the bytes here are its output).
 *
 * @param data Column-major values (item j of respondent i at `j * rows + i`), all finite.
 * @param rows Respondents in `data` (the column stride).
 * @param columns Items.
 * @param means Mean of each item over all respondents, subtracted before multiplying.
 * @param rowStart First respondent to include (inclusive).
 * @param rowEnd Last respondent to include (exclusive).
 * @param sums Row-major `columns × columns` array; the centred products over the rows are ADDED
 *   into its upper triangle (j <= k). The lower triangle is left untouched.
 * @param blockRows Respondents per tile (performance only; 512 suits a 2 MB L2 cache).
 * @throws {RangeError} when the scratch memory (`blockRows` respondents and a padded
 *   `columns × columns` array of doubles) would exceed the 4 GiB a WebAssembly memory can hold.
 * References: Golub & Van Loan 2013, "Matrix Computations", 4th ed., §1.5 (blocking for the
 * memory hierarchy); Chan, Golub & LeVeque 1983, "Algorithms for computing the sample
 * variance: analysis and recommendations" (centring before squaring); WebAssembly Core
 * Specification 2.0 (2022) (f64x2 arithmetic is IEEE-754 per lane).
 */
export function accumulateCenteredProducts(
  data: Float64Array,
  rows: number,
  columns: number,
  means: Float64Array,
  rowStart: number,
  rowEnd: number,
  sums: Float64Array,
  blockRows: number,
): void {
  // The tile function of scripts/make-cross-products-wasm.mjs:
  // tile(blockByteOffset, respondents, padded, tilesByteOffset), importing env.memory.
  const wasm = Uint8Array.of(
    0, 97, 115, 109, 1, 0, 0, 0, 1, 8, 1, 96, 4, 127, 127, 127, 127, 0, 2, 15, 1, 3, 101, 110, 118, 6, 109, 101, 109, 111, 114, 121,
    2, 0, 1, 3, 2, 1, 0, 7, 8, 1, 4, 116, 105, 108, 101, 0, 0, 10, 216, 4, 1, 213, 4, 2, 7, 127, 11, 123, 32, 2, 65, 3,
    116, 33, 4, 3, 64, 32, 5, 33, 6, 3, 64, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 11, 253,
    12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 12, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 33, 13, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 14, 253, 12, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 15, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0,
    0, 33, 16, 253, 12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 17, 253, 12, 0, 0, 0, 0, 0, 0, 0,
    0, 0, 0, 0, 0, 0, 0, 0, 0, 33, 18, 32, 0, 32, 5, 65, 3, 116, 106, 33, 7, 32, 0, 32, 6, 65, 3, 116, 106, 34, 8, 32,
    1, 32, 4, 108, 106, 33, 9, 3, 64, 32, 8, 253, 0, 3, 0, 33, 19, 32, 8, 253, 0, 3, 16, 33, 20, 32, 7, 253, 10, 3, 0, 33,
    21, 32, 11, 32, 21, 32, 19, 253, 242, 1, 253, 240, 1, 33, 11, 32, 12, 32, 21, 32, 20, 253, 242, 1, 253, 240, 1, 33, 12, 32, 7, 253,
    10, 3, 8, 33, 21, 32, 13, 32, 21, 32, 19, 253, 242, 1, 253, 240, 1, 33, 13, 32, 14, 32, 21, 32, 20, 253, 242, 1, 253, 240, 1, 33,
    14, 32, 7, 253, 10, 3, 16, 33, 21, 32, 15, 32, 21, 32, 19, 253, 242, 1, 253, 240, 1, 33, 15, 32, 16, 32, 21, 32, 20, 253, 242, 1,
    253, 240, 1, 33, 16, 32, 7, 253, 10, 3, 24, 33, 21, 32, 17, 32, 21, 32, 19, 253, 242, 1, 253, 240, 1, 33, 17, 32, 18, 32, 21, 32,
    20, 253, 242, 1, 253, 240, 1, 33, 18, 32, 7, 32, 4, 106, 33, 7, 32, 8, 32, 4, 106, 34, 8, 32, 9, 73, 13, 0, 11, 32, 3, 32,
    5, 32, 2, 108, 32, 6, 106, 65, 3, 116, 106, 33, 10, 32, 10, 32, 10, 253, 0, 3, 0, 32, 11, 253, 240, 1, 253, 11, 3, 0, 32, 10,
    32, 10, 253, 0, 3, 16, 32, 12, 253, 240, 1, 253, 11, 3, 16, 32, 10, 32, 4, 106, 33, 10, 32, 10, 32, 10, 253, 0, 3, 0, 32, 13,
    253, 240, 1, 253, 11, 3, 0, 32, 10, 32, 10, 253, 0, 3, 16, 32, 14, 253, 240, 1, 253, 11, 3, 16, 32, 10, 32, 4, 106, 33, 10, 32,
    10, 32, 10, 253, 0, 3, 0, 32, 15, 253, 240, 1, 253, 11, 3, 0, 32, 10, 32, 10, 253, 0, 3, 16, 32, 16, 253, 240, 1, 253, 11, 3,
    16, 32, 10, 32, 4, 106, 33, 10, 32, 10, 32, 10, 253, 0, 3, 0, 32, 17, 253, 240, 1, 253, 11, 3, 0, 32, 10, 32, 10, 253, 0, 3,
    16, 32, 18, 253, 240, 1, 253, 11, 3, 16, 32, 10, 32, 4, 106, 33, 10, 32, 6, 65, 4, 106, 34, 6, 32, 2, 73, 13, 0, 11, 32, 5,
    65, 4, 106, 34, 5, 32, 2, 73, 13, 0, 11, 11,
  );
  const padded = Math.ceil(columns / 4) * 4;
  const blockBytes = padded * blockRows * 8;
  const pages = Math.ceil((blockBytes + padded * padded * 8) / 65536);
  if (pages > 65536) {
    throw new RangeError(`accumulateCenteredProducts: ${columns} items and ${blockRows} respondents per tile need more than the 4 GiB of a WebAssembly memory`);
  }
  // One instance per thread, kept on the thread's global object under a registered symbol (the
  // function may refer to nothing outside itself), its memory grown when a call needs more.
  const holder = globalThis as unknown as Record<symbol, { memory: WebAssembly.Memory; tile: (block: number, respondents: number, padded: number, tiles: number) => void } | undefined>;
  const key = Symbol.for('paredown.centeredProductsKernel');
  let kernel = holder[key];
  if (kernel === undefined) {
    const memory = new WebAssembly.Memory({ initial: pages });
    const instance = new WebAssembly.Instance(new WebAssembly.Module(wasm), { env: { memory } });
    kernel = { memory, tile: instance.exports.tile as (block: number, respondents: number, padded: number, tiles: number) => void };
    holder[key] = kernel;
  }
  const present = kernel.memory.buffer.byteLength / 65536;
  if (pages > present) kernel.memory.grow(pages - present);
  const tile = kernel.tile;
  const block = new Float64Array(kernel.memory.buffer, 0, padded * blockRows);
  const tiles = new Float64Array(kernel.memory.buffer, blockBytes, padded * padded);
  // An earlier call may have left values behind: the padding columns must be 0 and the tile sums start at 0.
  block.fill(0);
  tiles.fill(0);
  for (let first = rowStart; first < rowEnd; first += blockRows) {
    const length = Math.min(blockRows, rowEnd - first);
    for (let j = 0; j < columns; j++) {
      const source = j * rows + first;
      const mean = means[j];
      for (let i = 0; i < length; i++) block[i * padded + j] = data[source + i] - mean;
    }
    tile(0, length, padded, blockBytes);
  }
  for (let j = 0; j < columns; j++) {
    for (let k = j; k < columns; k++) sums[j * columns + k] += tiles[j * padded + k];
  }
}
