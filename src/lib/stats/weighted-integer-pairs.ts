/**
 * The integer path of `weightedPearson` (weighted-pearson.ts): when every answer is an integer
 * (rating scales), a resample's pair sums are exact integers, so they come from blocked, packed
 * cross-products of weight × answer and answer over the distinct rows drawn, less the sums over the
 * drawn rows that miss an answer, instead of a pass per pair. Bit for bit the one-pass pair loop
 * (tests/unit/weighted-pearson.test.ts). Also the pair targets both paths write and the pair-count
 * bookkeeping they share.
 *
 * References: Efron & Tibshirani 1993, "An Introduction to the Bootstrap", ch. 6 (the resample as
 * weights on the observed rows); Chan, Golub & LeVeque 1983 (sums of exact integers in any order).
 */
import type { ItemPair } from './correlation-matrix';
import { MIN_ROWS_FOR_CORRELATION, MIN_ROWS_FOR_COVARIANCE } from './tolerances';
import { keptPerMatrix, type ItemMatrix } from './types';

/** Where the pair loops write. */
export interface PairTargets {
  readonly r: Float64Array;
  readonly rN: Float64Array;
  readonly cov: Float64Array;
  readonly covN: Float64Array;
  readonly undefinedR: ItemPair[];
  readonly undefinedCov: [number, number][];
}

/**
 * Stores a pair's (weighted) count in both count matrices (an item's own entry in the correlation
 * counts is `ownCount`: its answers with missing values, all rows without) and marks the pair
 * undefined when too few rows hold it.
 * @returns whether the pair has enough rows for a covariance.
 */
export function recordPairCount(out: PairTargets, order: number, a: number, b: number, n: number, ownCount: number): boolean {
  out.covN[a * order + b] = n;
  out.covN[b * order + a] = n;
  if (a !== b) {
    out.rN[a * order + b] = n;
    out.rN[b * order + a] = n;
  } else {
    out.rN[a * order + a] = ownCount;
  }
  if (n >= MIN_ROWS_FOR_COVARIANCE) return true;
  out.undefinedCov.push([a, b]);
  if (a !== b) out.undefinedR.push([a, b]);
  return false;
}

/** Σ w over the rows marked as answering some item. */
export function weightWithAnswer(answersAny: Uint8Array, w: Float64Array): number {
  let withAnswer = 0;
  for (let t = 0; t < answersAny.length; t++) if (answersAny[t] === 1) withAnswer += w[t];
  return withAnswer;
}

/** The integer path's per-item blocks and totals (see `fillIntegerColumns`). */
export interface IntegerColumns {
  readonly matrix: ItemMatrix;
  readonly columns: readonly number[];
  readonly drawn: Int32Array;
  readonly w: Float64Array;
  readonly lanes: 1 | 2 | 3;
  /** Weight × answer per item block (0 where missing), blocks padded to tiles of three items. */
  readonly wx: Float64Array;
  /** The answers packed `lanes` to a double. */
  readonly packed: Float64Array;
  /** Each item's totals where answered: weight, weight × answer, weight × square. */
  readonly totalWeight: Float64Array;
  readonly totalX: Float64Array;
  readonly totalXX: Float64Array;
  readonly hasMissing: boolean;
  readonly withAnswer: number;
}

/**
 * One pass over the drawn rows of each listed item, straight from the matrix: weight × answer,
 * the packed answers, the item's totals, whether any answer is missing, and which rows answer any
 * item. `wx` and `packed` are the thread's scratch (see `scratchView`), every element written.
 * @param lanes Items per double in `packed` (1 when an answer may be negative).
 */
export function fillIntegerColumns(matrix: ItemMatrix, columns: readonly number[], drawn: Int32Array, w: Float64Array, lanes: 1 | 2 | 3): IntegerColumns {
  const order = columns.length;
  const distinct = drawn.length;
  const data = matrix.data;
  const rowsPadded = Math.ceil(order / 3) * 3;
  const groups = Math.ceil(order / lanes);
  const wx = scratchView(SCRATCH_WX, rowsPadded * distinct);
  const packed = scratchView(SCRATCH_PACKED, (groups + 3) * distinct);
  wx.fill(0, order * distinct);
  packed.fill(0, groups * distinct);
  const totalWeight = new Float64Array(order);
  const totalX = new Float64Array(order);
  const totalXX = new Float64Array(order);
  const answersAny = new Uint8Array(distinct);
  let hasMissing = false;
  for (let a = 0; a < order; a++) {
    const source = columns[a] * matrix.rows;
    const offset = a * distinct;
    const lane = (Math.floor(a / lanes) * distinct) | 0;
    const shift = 2 ** ((lanes === 2 ? PACKED_PAIR_BITS : PACKED_LANE_BITS) * (a % lanes));
    let sw = 0;
    let sx = 0;
    let sxx = 0;
    // The first item of a double sets it (to 0 where missing), the others add to it.
    const first = a % lanes === 0;
    for (let t = 0; t < distinct; t++) {
      const x = data[source + drawn[t]];
      if (x !== x) {
        hasMissing = true;
        wx[offset + t] = 0;
        if (first) packed[lane + t] = 0;
        continue;
      }
      answersAny[t] = 1;
      wx[offset + t] = w[t] * x;
      if (first) packed[lane + t] = x * shift;
      else packed[lane + t] += x * shift;
      sw += w[t];
      sx += w[t] * x;
      sxx += w[t] * x * x;
    }
    totalWeight[a] = sw;
    totalX[a] = sx;
    totalXX[a] = sxx;
  }
  return {
    matrix, columns, drawn, w, lanes, wx, packed, totalWeight, totalX, totalXX, hasMissing,
    withAnswer: weightWithAnswer(answersAny, w),
  };
}

/**
 * Integer answers (rating scales): the six sums of a pair are exact integers, so they may be
 * taken in any grouping, and n·Σxy − ΣxΣy (exact) gives the centred products to one rounding.
 * With the mask M (1 where answered), X₀ (answers, 0 where missing) and the weights w, the pair
 * sums over the rows where both answered are masked cross-products: Σ w·x·y = (w∘X₀)ᵀX₀, and the
 * weight, Σ w·x and Σ w·x² of an item where its partner answered are its totals less
 * (w∘M)ᵀ(1 − M), (w∘X₀)ᵀ(1 − M) and (w∘X₀∘X₀)ᵀ(1 − M), the complement of the mask being sparse
 * (as in masked-cross-products.ts), taken over the drawn rows that miss an answer, each read
 * whole from `incompleteRows`. Exact sums make this bit for bit the one-pass pair loop, whatever
 * the number of lanes and the order of the terms.
 */
export function integerPairs(columns: IntegerColumns, total: number, out: PairTargets): void {
  const { matrix, drawn, w, lanes, wx, packed, totalWeight, totalX, totalXX, hasMissing } = columns;
  const listed = columns.columns;
  const order = totalWeight.length;
  const distinct = w.length;
  const { r, cov, undefinedR } = out;
  // Σ w·x·y over every distinct row (0 where either is missing): (w∘X₀)ᵀX₀ by the blocked kernel.
  const products = scratchView(SCRATCH_PRODUCTS, order * order);
  weightedIntegerProducts(wx, packed, order, distinct, lanes, products);
  // What item a holds in the rows where item b is missing, stored by b (row-major [b · order + a]):
  // weight where a is answered, weight × answer, weight × square. For each drawn row that misses
  // an answer, its listed answers are read from the row's copy, and added to the sums of each item
  // it misses: exact integer sums, in any order.
  const lessWeight = scratchView(SCRATCH_LESS_WEIGHT, order * order).fill(0);
  const lessX = scratchView(SCRATCH_LESS_X, order * order).fill(0);
  const lessXX = scratchView(SCRATCH_LESS_XX, order * order).fill(0);
  if (hasMissing && lanes === 3) {
    // Three lanes fit (non-negative answers, total · max² < 2^17): the three sums share one double,
    // w·(1 + 2^17·x + 2^34·x²) per answer (PACKED_LANE_BITS), one addition per item and missing
    // answer, each lane read back exactly at the end.
    const incomplete = incompleteRows(matrix);
    const row = scratchView(SCRATCH_ROW, order);
    const packedLess = scratchView(SCRATCH_PACKED_LESS, order * order).fill(0);
    const missingItems = new Int32Array(order);
    for (let t = 0; t < distinct; t++) {
      const slot = incomplete.slot[drawn[t]];
      if (slot < 0) continue;
      const base = slot * matrix.columns;
      const weight = w[t];
      let missingCount = 0;
      for (let a = 0; a < order; a++) {
        const lanesOfAnswer = incomplete.packed[base + listed[a]];
        if (lanesOfAnswer === 0) missingItems[missingCount++] = a;
        row[a] = weight * lanesOfAnswer;
      }
      for (let m = 0; m < missingCount; m++) {
        const target = missingItems[m] * order;
        for (let a = 0; a < order; a++) packedLess[target + a] += row[a];
      }
    }
    const laneScale = 2 ** PACKED_LANE_BITS;
    for (let index = 0; index < order * order; index++) {
      let rest = packedLess[index];
      const squares = Math.floor(rest / (laneScale * laneScale));
      rest -= squares * (laneScale * laneScale);
      const answers = Math.floor(rest / laneScale);
      lessXX[index] = squares;
      lessX[index] = answers;
      lessWeight[index] = rest - answers * laneScale;
    }
  } else if (hasMissing) {
    const incomplete = incompleteRows(matrix);
    const row = scratchView(SCRATCH_ROW, order);
    for (let t = 0; t < distinct; t++) {
      const slot = incomplete.slot[drawn[t]];
      if (slot < 0) continue;
      const base = slot * matrix.columns;
      for (let a = 0; a < order; a++) row[a] = incomplete.values[base + listed[a]];
      const weight = w[t];
      for (let b = 0; b < order; b++) {
        if (row[b] === row[b]) continue;
        const target = b * order;
        for (let a = 0; a < order; a++) {
          const x = row[a];
          if (x !== x) continue;
          const weightX = weight * x;
          lessWeight[target + a] += weight;
          lessX[target + a] += weightX;
          lessXX[target + a] += weightX * x;
        }
      }
    }
  }
  for (let a = 0; a < order; a++) {
    for (let b = a; b < order; b++) {
      // a's sums over the rows where b is answered, and b's over those where a is.
      const n = totalWeight[a] - lessWeight[b * order + a];
      const sx = totalX[a] - lessX[b * order + a];
      const sxx = totalXX[a] - lessXX[b * order + a];
      const sy = totalX[b] - lessX[a * order + b];
      const syy = totalXX[b] - lessXX[a * order + b];
      const sxy = products[a * order + b];
      if (!recordPairCount(out, order, a, b, n, hasMissing ? n : total)) continue;
      const centredXY = n * sxy - sx * sy;
      cov[a * order + b] = centredXY / (n * (n - 1));
      cov[b * order + a] = cov[a * order + b];
      if (a === b) continue;
      const centredXX = n * sxx - sx * sx;
      const centredYY = n * syy - sy * sy;
      if (n < MIN_ROWS_FOR_CORRELATION || centredXX === 0 || centredYY === 0) {
        undefinedR.push([a, b]);
        continue;
      }
      const value = centredXY / Math.sqrt(centredXX * centredYY);
      r[a * order + b] = value > 1 ? 1 : value < -1 ? -1 : value;
      r[b * order + a] = r[a * order + b];
    }
  }
}

/** The rows of a matrix that miss an answer (see `incompleteRows`). */
interface IncompleteRows {
  /** Each row's place among them, or −1 for a complete row. */
  readonly slot: Int32Array;
  /** Their answers, row by row (`slot · columns + item`), NaN where missing. */
  readonly values: Float64Array;
  /**
   * The same, 1 + 2^17·x + 2^34·x² where answered (exact for non-negative integers x below 2^8:
   * the three-lane packing of `integerPairs`), 0 where missing.
   */
  readonly packed: Float64Array;
}

/** The rows of the matrix that miss an answer, copied row by row, found once per matrix (a bootstrap's resamples share one). */
const incompleteRows = keptPerMatrix(({ rows, columns, data }): IncompleteRows => {
  const slot = new Int32Array(rows).fill(-1);
  let count = 0;
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < columns; j++) {
      const x = data[j * rows + i];
      if (x !== x) {
        slot[i] = count++;
        break;
      }
    }
  }
  const values = new Float64Array(count * columns);
  for (let i = 0; i < rows; i++) {
    if (slot[i] < 0) continue;
    for (let j = 0; j < columns; j++) values[slot[i] * columns + j] = data[j * rows + i];
  }
  const packed = new Float64Array(values.length);
  const laneScale = 2 ** PACKED_LANE_BITS;
  for (let index = 0; index < values.length; index++) {
    const x = values[index];
    packed[index] = x === x ? 1 + laneScale * x + laneScale * laneScale * (x * x) : 0;
  }
  return { slot, values, packed };
});

/** The thread's scratch arrays of the integer path, by use (each call overwrites what it reads). */
const SCRATCH_WX = 0;
const SCRATCH_PACKED = 1;
const SCRATCH_PRODUCTS = 2;
const SCRATCH_LESS_WEIGHT = 3;
const SCRATCH_LESS_X = 4;
const SCRATCH_LESS_XX = 5;
const SCRATCH_ROW = 6;
const SCRATCH_SUMS = 7;
const SCRATCH_PACKED_LESS = 8;
const scratch: Float64Array[] = [];

/**
 * A view of `length` doubles of the thread's scratch array `which`, grown when too short (its
 * contents are left over from the previous call: the caller writes before it reads). The
 * resamples of a bootstrap share these instead of allocating the same large arrays each time.
 */
function scratchView(which: number, length: number): Float64Array {
  let buffer = scratch[which];
  if (buffer === undefined || buffer.length < length) {
    buffer = new Float64Array(length);
    scratch[which] = buffer;
  }
  return buffer.subarray(0, length);
}

/**
 * Bits per lane when several items share one double in the weighted products: a pair's Σ w·x·y
 * of non-negative integer answers is at most n · max², so with n · max² < 2^17 three items
 * packed as x₀ + 2^17·x₁ + 2^34·x₂ give, in one product with w·x, three sums that stay apart and
 * whose total stays below 2^51 (every partial sum an exact integer). With n · max² < 2^26, two.
 */
const PACKED_LANE_BITS = 17;
const PACKED_PAIR_BITS = 26;

/** Items per double in the weighted products: 3, 2 or 1 (see PACKED_LANE_BITS). */
export function packedLanes(largestSum: number): 1 | 2 | 3 {
  if (largestSum < 2 ** PACKED_LANE_BITS) return 3;
  if (largestSum < 2 ** PACKED_PAIR_BITS) return 2;
  return 1;
}

/** Rows per tile of the weighted products (a tile of every item's rows stays in the L2 cache). */
const PRODUCT_BLOCK_ROWS = 256;

/**
 * `products[a · order + b] = Σ_t wx[a, t] · x[b, t]` for every a ≤ b < order: the complete-data
 * kernel's blocking (centered-products-kernel.ts) for a product of two different matrices. Rows
 * are taken PRODUCT_BLOCK_ROWS at a time, and each pass of the innermost loop reads three items of
 * `wx` and four doubles of `packed` for twelve running sums. `packed` holds `lanes` items per
 * double (item b in lane b mod lanes of double ⌊b / lanes⌋, scaled by 2^(17·lane), at most 26 bits
 * per lane with two), zero beyond the last item. The sums are exact integers (integer answers and
 * weights below the bounds of PACKED_LANE_BITS), so the grouping does not change a bit and each
 * lane is read back exactly.
 */
function weightedIntegerProducts(wx: Float64Array, packed: Float64Array, order: number, distinct: number, lanes: 1 | 2 | 3, products: Float64Array): void {
  const groups = Math.ceil(order / lanes);
  const sums = scratchView(SCRATCH_SUMS, Math.ceil(order / 3) * 3 * (groups + 3)).fill(0);
  const stride = groups + 3;
  for (let first = 0; first < distinct; first += PRODUCT_BLOCK_ROWS) {
    const last = Math.min(distinct, first + PRODUCT_BLOCK_ROWS);
    for (let j = 0; j < order; j += 3) {
      const a0 = j * distinct;
      const a1 = a0 + distinct;
      const a2 = a1 + distinct;
      const t0 = j * stride;
      const t1 = t0 + stride;
      const t2 = t1 + stride;
      for (let g = Math.floor(j / lanes); g < groups; g += 4) {
        const b0 = g * distinct;
        const b1 = b0 + distinct;
        const b2 = b1 + distinct;
        const b3 = b2 + distinct;
        let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0, s20 = 0, s21 = 0, s22 = 0, s23 = 0;
        for (let t = first; t < last; t++) {
          const y0 = packed[b0 + t];
          const y1 = packed[b1 + t];
          const y2 = packed[b2 + t];
          const y3 = packed[b3 + t];
          const v0 = wx[a0 + t];
          s00 += v0 * y0;
          s01 += v0 * y1;
          s02 += v0 * y2;
          s03 += v0 * y3;
          const v1 = wx[a1 + t];
          s10 += v1 * y0;
          s11 += v1 * y1;
          s12 += v1 * y2;
          s13 += v1 * y3;
          const v2 = wx[a2 + t];
          s20 += v2 * y0;
          s21 += v2 * y1;
          s22 += v2 * y2;
          s23 += v2 * y3;
        }
        sums[t0 + g] += s00;
        sums[t0 + g + 1] += s01;
        sums[t0 + g + 2] += s02;
        sums[t0 + g + 3] += s03;
        sums[t1 + g] += s10;
        sums[t1 + g + 1] += s11;
        sums[t1 + g + 2] += s12;
        sums[t1 + g + 3] += s13;
        sums[t2 + g] += s20;
        sums[t2 + g + 1] += s21;
        sums[t2 + g + 2] += s22;
        sums[t2 + g + 3] += s23;
      }
    }
  }
  // Each lane back out of its double (exact: integers below 2^53).
  const laneScale = lanes === 2 ? 2 ** PACKED_PAIR_BITS : 2 ** PACKED_LANE_BITS;
  for (let a = 0; a < order; a++) {
    for (let g = Math.floor(a / lanes); g < groups; g++) {
      let rest = sums[a * stride + g];
      for (let lane = lanes - 1; lane >= 0; lane--) {
        const scale = laneScale ** lane;
        const part = Math.floor(rest / scale);
        rest -= part * scale;
        const b = g * lanes + lane;
        if (b >= a && b < order) products[a * order + b] = part;
      }
    }
  }
}
