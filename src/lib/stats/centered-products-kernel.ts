/**
 * The inner loop of the centred cross-products, shared by the single-threaded path and the
 * worker threads.
 *
 * SELF-CONTAINED ON PURPOSE: this function must not refer to anything outside its own body
 * (no imports, no module constants, no helper functions). The worker thread is started from
 * its source text (`accumulateCenteredProducts.toString()`), which is the one way that works
 * alike under tsx, under Vitest and from Astro's bundled server (the bundle does not carry a
 * separate worker file; see cross-products-worker.ts).
 *
 * Speed comes from two kinds of blocking:
 * - row tiling: `blockRows` respondents at a time are copied, centred, into a small scratch
 *   buffer (column-major, about 1 MB for 300 items), which stays in the L2 cache while every
 *   pair of items is accumulated over it;
 * - register blocking: each pass of the innermost loop reads 3 + 4 item values and updates
 *   12 running sums (a 3 × 4 tile of item pairs), so each value loaded feeds several products.
 * The order is padded to a multiple of 4 with zero columns; the last strip of a tile row may hold
 * one or two items. Every pair's sum runs over the respondents of a tile in order and is then
 * added to its total, whatever the tile shape, so the sums do not depend on it.
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
 * References: Golub & Van Loan 2013, "Matrix Computations", 4th ed., §1.5 (blocking for the
 * memory hierarchy); Chan, Golub & LeVeque 1983, "Algorithms for computing the sample
 * variance: analysis and recommendations" (centring before squaring).
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
  const padded = Math.ceil(columns / 4) * 4;
  const block = new Float64Array(padded * blockRows);
  const tiles = new Float64Array(padded * padded);
  for (let first = rowStart; first < rowEnd; first += blockRows) {
    const length = Math.min(blockRows, rowEnd - first);
    for (let j = 0; j < columns; j++) {
      const source = j * rows + first;
      const target = j * blockRows;
      const mean = means[j];
      for (let i = 0; i < length; i++) block[target + i] = data[source + i] - mean;
    }
    for (let j = 0; j < padded; j += 3) {
      const a0 = j * blockRows;
      const a1 = a0 + blockRows;
      const a2 = a1 + blockRows;
      const strip = Math.min(3, padded - j);
      for (let k = j - (j % 4); k < padded; k += 4) {
        const b0 = k * blockRows;
        const b1 = b0 + blockRows;
        const b2 = b1 + blockRows;
        const b3 = b2 + blockRows;
        const t0 = j * padded + k;
        const t1 = t0 + padded;
        const t2 = t1 + padded;
        if (strip === 3) {
          let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0, s20 = 0, s21 = 0, s22 = 0, s23 = 0;
          for (let i = 0; i < length; i++) {
            const y0 = block[b0 + i];
            const y1 = block[b1 + i];
            const y2 = block[b2 + i];
            const y3 = block[b3 + i];
            const x0 = block[a0 + i];
            s00 += x0 * y0;
            s01 += x0 * y1;
            s02 += x0 * y2;
            s03 += x0 * y3;
            const x1 = block[a1 + i];
            s10 += x1 * y0;
            s11 += x1 * y1;
            s12 += x1 * y2;
            s13 += x1 * y3;
            const x2 = block[a2 + i];
            s20 += x2 * y0;
            s21 += x2 * y1;
            s22 += x2 * y2;
            s23 += x2 * y3;
          }
          tiles[t0] += s00;
          tiles[t0 + 1] += s01;
          tiles[t0 + 2] += s02;
          tiles[t0 + 3] += s03;
          tiles[t1] += s10;
          tiles[t1 + 1] += s11;
          tiles[t1 + 2] += s12;
          tiles[t1 + 3] += s13;
          tiles[t2] += s20;
          tiles[t2 + 1] += s21;
          tiles[t2 + 2] += s22;
          tiles[t2 + 3] += s23;
        } else {
          // The last strip of one or two items (the padded order is a multiple of 4, not of 3).
          for (let r = 0; r < strip; r++) {
            const a = a0 + r * blockRows;
            let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
            for (let i = 0; i < length; i++) {
              const x = block[a + i];
              s0 += x * block[b0 + i];
              s1 += x * block[b1 + i];
              s2 += x * block[b2 + i];
              s3 += x * block[b3 + i];
            }
            const t = t0 + r * padded;
            tiles[t] += s0;
            tiles[t + 1] += s1;
            tiles[t + 2] += s2;
            tiles[t + 3] += s3;
          }
        }
      }
    }
  }
  for (let j = 0; j < columns; j++) {
    for (let k = j; k < columns; k++) sums[j * columns + k] += tiles[j * padded + k];
  }
}
