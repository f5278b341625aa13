/**
 * First step of the polychoric estimator (see polychoric-correlation.ts): each ordinal item
 * coded to category indices with its thresholds τ_k = Φ⁻¹(share at or below category k) from
 * all of its observed answers, and the contingency table of two coded items.
 *
 * bench/parallel/polychoric-worker.ts (a benchmark's kernel; the audit starts no such thread)
 * runs `countPolychoricTable` in a worker thread from its source text.
 *
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (Psychometrika 44:443-460); Pearson & Pearson 1922, "On polychoric
 * coefficients of correlation" (Biometrika 14:127-156).
 */
import type { BivariateGridMargin } from './bivariate-normal-cdf';
import { normalQuantile } from './normal-distribution';
import { POLYCHORIC_MAX_CATEGORIES } from './tolerances';

/** One ordinal item prepared for polychoric work: category codes and thresholds. */
export interface OrdinalItem {
  /** Distinct observed values, ascending; category c is `categories[c]`. */
  readonly categories: Float64Array;
  /** Category index of each respondent; `categories.length` marks a missing answer. */
  readonly codes: Uint8Array;
  /** Respondents in each category. */
  readonly counts: Float64Array;
  /** Respondents who answered. */
  readonly observed: number;
  /** Thresholds τ_k = Φ⁻¹(share at or below category k), k = 0 .. categories − 2. */
  readonly thresholds: BivariateGridMargin;
}

/** Widest range of whole-number answers coded through a lookup table (performance only). */
const CODE_TABLE_SPAN = 1024;

/** Whole-number answers from 0 to this (exclusive) are found distinct through a table (performance only). */
const SEEN_TABLE_SIZE = 256;

/**
 * Codes one item for polychoric work: its distinct observed values become categories
 * 0, 1, ..., and its thresholds come from all of its observed answers.
 * @param values The item's answers, NaN for missing.
 * @param maxCategories Most distinct values allowed (POLYCHORIC_MAX_CATEGORIES by default).
 * @throws {RangeError} when a value is ±Infinity, or the item has more than maxCategories
 *   distinct values (polychoric correlation is meant for ordinal items).
 * @returns The coded item. An item with one category (or none) has no thresholds.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (first step: thresholds from the marginal proportions).
 */
export function codeOrdinalItem(values: ArrayLike<number>, maxCategories: number = POLYCHORIC_MAX_CATEGORIES): OrdinalItem {
  if (!Number.isInteger(maxCategories) || maxCategories < 2 || maxCategories > 254) {
    throw new RangeError(`codeOrdinalItem: maxCategories must be an integer from 2 to 254, got ${maxCategories}`);
  }
  // The distinct values in a plain array scanned from the last one found: an ordinal item has a
  // handful, so this is faster than hashing every answer (the same categories and codes).
  // Small whole numbers (a rating item's answers) are marked in a table instead of searched for.
  const distinct: number[] = [];
  const seen = new Uint8Array(SEEN_TABLE_SIZE);
  let last = Number.NaN;
  for (let i = 0; i < values.length; i++) {
    const value = values[i];
    if (value === last) continue;
    if (value === Infinity || value === -Infinity) throw new RangeError(`codeOrdinalItem: value ${i} is infinite; use NaN for a missing answer`);
    if (value !== value) continue;
    last = value;
    if (value >= 0 && value < SEEN_TABLE_SIZE && (value | 0) === value) {
      if (seen[value] === 1) continue;
      seen[value] = 1;
    } else if (distinct.includes(value)) continue;
    distinct.push(value === 0 ? 0 : value);
    if (distinct.length > maxCategories) {
      throw new RangeError(`codeOrdinalItem: the item has more than ${maxCategories} distinct values; polychoric correlation needs ordinal items`);
    }
  }
  const categories = Float64Array.from(distinct).sort();
  const count = categories.length;
  const codes = new Uint8Array(values.length);
  const counts = new Float64Array(count);
  let observed = 0;
  // Whole-number answers in a short range (a rating item's 1-5, 0-10) are coded by a table
  // indexed by the answer instead of a search: the same codes.
  const lowest = count > 0 ? categories[0] : 0;
  const span = count > 0 ? categories[count - 1] - lowest : 0;
  if (count > 0 && categories.every((category) => Number.isInteger(category)) && span <= CODE_TABLE_SPAN) {
    const codeOf = new Uint8Array(span + 1);
    for (let c = 0; c < count; c++) codeOf[categories[c] - lowest] = c;
    for (let i = 0; i < values.length; i++) {
      const value = values[i];
      if (value !== value) {
        codes[i] = count;
      } else {
        const code = codeOf[value - lowest];
        codes[i] = code;
        counts[code]++;
        observed++;
      }
    }
  } else {
    for (let i = 0; i < values.length; i++) {
      const value = values[i];
      if (value !== value) {
        codes[i] = count;
      } else {
        // Binary search in the ascending categories; the value is one of them (−0 equals 0).
        let low = 0;
        let high = count - 1;
        while (low < high) {
          const middle = (low + high) >>> 1;
          if (categories[middle] < value) low = middle + 1;
          else high = middle;
        }
        codes[i] = low;
        counts[low]++;
        observed++;
      }
    }
  }
  const limitCount = Math.max(0, count - 1);
  const limits = new Float64Array(limitCount);
  const lower = new Float64Array(limitCount);
  const upper = new Float64Array(limitCount);
  let below = 0;
  for (let c = 0; c < limitCount; c++) {
    below += counts[c];
    // Both tails as exact ratios of counts, so Φ(τ) and Φ(−τ) carry no rounding from 1 − p.
    lower[c] = below / observed;
    upper[c] = (observed - below) / observed;
    limits[c] = lower[c] <= 0.5 ? normalQuantile(lower[c]) : -normalQuantile(upper[c]);
  }
  return { categories, codes, counts, observed, thresholds: { limits, lower, upper, count: limitCount } };
}

/**
 * Counts the contingency table of two coded items in one pass over the respondents. The
 * table has row stride `columnCategories + 1`; row `rowCategories` and column
 * `columnCategories` collect respondents missing on one item and are ignored afterwards.
 * With a `tally` of room, consecutive respondents are counted into four separate integer
 * tables in turn, added up at the end: the counts are the same integers (sums of
 * integers are exact), without each count waiting for the one before it in the same cell.
 * @param rowCodes Codes of the first item (missing = its category count).
 * @param rowCategories Categories of the first item.
 * @param columnCodes Codes of the second item.
 * @param columnCategories Categories of the second item.
 * @param respondents Respondents to count (the length of the code arrays).
 * @param table Output, at least (rowCategories + 1) × (columnCategories + 1) long; overwritten.
 * @param tally Scratch (a workspace's `tally`), used when it holds four tables of that size;
 *   overwritten. Without it (or when smaller) the table is counted directly.
 * @returns The number of pair-complete respondents.
 * References: Pearson & Pearson 1922, "On polychoric coefficients of correlation" (the
 * contingency table of two ordinal items).
 */
export function countPolychoricTable(
  rowCodes: Uint8Array,
  rowCategories: number,
  columnCodes: Uint8Array,
  columnCategories: number,
  respondents: number,
  table: Float64Array,
  tally?: Int32Array,
): number {
  const stride = columnCategories + 1;
  const cells = (rowCategories + 1) * stride;
  if (tally !== undefined && tally.length >= 4 * cells) {
    tally.fill(0, 0, 4 * cells);
    const second = cells;
    const third = 2 * cells;
    const fourth = 3 * cells;
    let r = 0;
    for (; r + 3 < respondents; r += 4) {
      tally[rowCodes[r] * stride + columnCodes[r]]++;
      tally[second + rowCodes[r + 1] * stride + columnCodes[r + 1]]++;
      tally[third + rowCodes[r + 2] * stride + columnCodes[r + 2]]++;
      tally[fourth + rowCodes[r + 3] * stride + columnCodes[r + 3]]++;
    }
    for (; r < respondents; r++) tally[rowCodes[r] * stride + columnCodes[r]]++;
    for (let at = 0; at < cells; at++) table[at] = tally[at] + tally[second + at] + tally[third + at] + tally[fourth + at];
  } else {
    table.fill(0, 0, cells);
    for (let r = 0; r < respondents; r++) table[rowCodes[r] * stride + columnCodes[r]]++;
  }
  let n = 0;
  for (let i = 0; i < rowCategories; i++) {
    for (let j = 0; j < columnCategories; j++) n += table[i * stride + j];
  }
  return n;
}
