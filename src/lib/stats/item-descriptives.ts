/**
 * Descriptive statistics of each item: answers, missing rate, mean, standard deviation
 * (denominator n − 1), observed range, and floor and ceiling shares: the share of the observed
 * answers at the lowest and at the highest category, flagged above FLOOR_CEILING_SHARE (15%,
 * Terwee et al. 2007). The categories are those of the item's stated valid range when one is
 * given, else its observed minimum and maximum.
 *
 * References: Terwee et al. 2007, "Quality criteria were proposed for measurement properties of
 * health status questionnaires" (J. Clin. Epidemiol. 60:34-42); Chan, Golub & LeVeque 1983,
 * "Algorithms for computing the sample variance: analysis and recommendations".
 */
import { checkItemMatrix, refuseInfiniteAnswer } from './item-matrix-input';
import { FLOOR_CEILING_SHARE } from './tolerances';
import type { ItemMatrix } from './types';

/** The valid range of an item's answers (the codebook's lowest and highest category). */
export interface ItemRange {
  readonly min: number;
  readonly max: number;
}

/** Descriptives of one item. Fields that need answers are null when there are too few. */
export interface ItemDescriptive {
  /** Observed answers. */
  readonly n: number;
  /** Missing answers. */
  readonly missing: number;
  /** missing / respondents (0 when there are no respondents). */
  readonly missingRate: number;
  /** Mean of the answers; null when n = 0. */
  readonly mean: number | null;
  /** Sample standard deviation (n − 1); null when n < 2. */
  readonly standardDeviation: number | null;
  /** Smallest and largest answers; null when n = 0. */
  readonly minimum: number | null;
  readonly maximum: number | null;
  /** The floor and ceiling categories used: the stated range, else the observed extremes. */
  readonly floorValue: number | null;
  readonly ceilingValue: number | null;
  /** Share of the answers at the floor / ceiling category; null when n = 0. */
  readonly floorShare: number | null;
  readonly ceilingShare: number | null;
  /** Share above FLOOR_CEILING_SHARE. */
  readonly floorEffect: boolean;
  readonly ceilingEffect: boolean;
  /** Answers outside the stated range (0 when none is given). */
  readonly outOfRange: number;
}

/** Options of `itemDescriptives`. */
export interface ItemDescriptivesOptions {
  /** One valid range per item (null: use the observed extremes). */
  readonly ranges?: readonly (ItemRange | null)[];
}

/**
 * Per-item descriptives of a response matrix.
 * @param matrix Respondents × items, column-major, NaN for missing.
 * @param options `ranges`: a valid range per item, or null for an item without one.
 * @throws {RangeError} when the shape is inconsistent, a value is ±Infinity, `ranges` does not
 *   have one entry per item, or a range is not finite with min < max.
 * @returns One entry per item, in item order. Never NaN.
 * References: Terwee et al. 2007, "Quality criteria were proposed for measurement properties of
 * health status questionnaires".
 */
export function itemDescriptives(matrix: ItemMatrix, options: ItemDescriptivesOptions = {}): ItemDescriptive[] {
  const caller = 'itemDescriptives';
  // Infinite answers are found in the pass below.
  checkItemMatrix(matrix, caller, false);
  const { rows, columns, data } = matrix;
  const ranges = options.ranges;
  checkItemRanges(ranges, columns, caller);
  const result: ItemDescriptive[] = [];
  for (let j = 0; j < columns; j++) {
    const values = data.subarray(j * rows, (j + 1) * rows);
    let n = 0;
    let sum = 0;
    let minimum = Infinity;
    let maximum = -Infinity;
    for (let i = 0; i < rows; i++) {
      const value = values[i];
      if (value !== value) continue;
      n++;
      sum += value;
      if (value < minimum) minimum = value;
      if (value > maximum) maximum = value;
    }
    // An infinite answer makes the sum infinite or NaN: only then is the item searched for it (a
    // test per answer in the loop above costs more than the loop).
    if (sum - sum !== 0) refuseInfiniteAnswer(values, j, caller);
    const range = ranges?.[j] ?? null;
    const missing = rows - n;
    const missingRate = rows === 0 ? 0 : missing / rows;
    if (n === 0) {
      result.push(itemDescriptiveOf({ n, missing, missingRate, range, mean: 0, squares: 0, minimum, maximum, atFloor: 0, atCeiling: 0, outOfRange: 0 }));
      continue;
    }
    const mean = sum / n;
    const floorValue = range?.min ?? minimum;
    const ceilingValue = range?.max ?? maximum;
    let squares = 0;
    let atFloor = 0;
    let atCeiling = 0;
    let outOfRange = 0;
    // Without a range nothing is out of it: the bounds that no answer passes.
    const low = range === null ? -Infinity : range.min;
    const high = range === null ? Infinity : range.max;
    for (let i = 0; i < rows; i++) {
      const value = values[i];
      if (value !== value) continue;
      squares += (value - mean) * (value - mean);
      // Counted without branches: on rating answers a branch per category mispredicts often.
      atFloor += ((value === floorValue) as unknown as number) | 0;
      atCeiling += ((value === ceilingValue) as unknown as number) | 0;
      outOfRange += (((value < low) as unknown as number) | ((value > high) as unknown as number)) | 0;
    }
    result.push(itemDescriptiveOf({ n, missing, missingRate, range, mean, squares, minimum, maximum, atFloor, atCeiling, outOfRange }));
  }
  return result;
}

/** What one item's pass over its answers counted, for {@link itemDescriptiveOf}. */
export interface ItemAnswerCounts {
  /** Answers given (a resample counts a drawn row as often as it was drawn). */
  readonly n: number;
  readonly missing: number;
  readonly missingRate: number;
  /** The item's stated range, or null (then the floor and ceiling are the answers' minimum and maximum). */
  readonly range: ItemRange | null;
  /** Mean of the answers (read only when n > 0). */
  readonly mean: number;
  /** Sum of squared deviations from the mean (read only when n > 1). */
  readonly squares: number;
  readonly minimum: number;
  readonly maximum: number;
  /** Answers at the floor and at the ceiling. */
  readonly atFloor: number;
  readonly atCeiling: number;
  readonly outOfRange: number;
}

/**
 * One item's descriptive from its counts: the shares at floor and ceiling, the SD, the effects;
 * an item nobody answered gets nulls. Shared by `itemDescriptives` and
 * `weightedItemDescriptives` (weighted-item-descriptives.ts), so both say the same of the same counts.
 * @param counts what the pass over the item's answers counted.
 * @returns the item's descriptive.
 * References: Terwee et al. 2007 (floor and ceiling effects above 15%).
 */
export function itemDescriptiveOf(counts: ItemAnswerCounts): ItemDescriptive {
  const { n, missing, missingRate, range, mean, squares, minimum, maximum, atFloor, atCeiling, outOfRange } = counts;
  if (n === 0) {
    return {
      n, missing, missingRate, mean: null, standardDeviation: null, minimum: null, maximum: null,
      floorValue: range?.min ?? null, ceilingValue: range?.max ?? null,
      floorShare: null, ceilingShare: null, floorEffect: false, ceilingEffect: false, outOfRange: 0,
    };
  }
  const floorShare = atFloor / n;
  const ceilingShare = atCeiling / n;
  return {
    n,
    missing,
    missingRate,
    mean,
    standardDeviation: n < 2 ? null : Math.sqrt(squares / (n - 1)),
    minimum,
    maximum,
    floorValue: range?.min ?? minimum,
    ceilingValue: range?.max ?? maximum,
    floorShare,
    ceilingShare,
    floorEffect: floorShare > FLOOR_CEILING_SHARE,
    ceilingEffect: ceilingShare > FLOOR_CEILING_SHARE,
    outOfRange,
  };
}

/**
 * Checks the stated ranges of the items: one entry per item, each null or finite with min < max.
 * @param ranges the ranges, or undefined (no ranges).
 * @param columns the items.
 * @param caller the public function, for the message.
 * @throws {RangeError} naming `caller` and the item whose range is wrong.
 * References: none (input validation).
 */
export function checkItemRanges(ranges: readonly (ItemRange | null)[] | undefined, columns: number, caller: string): void {
  if (ranges !== undefined && ranges.length !== columns) {
    throw new RangeError(`${caller}: ranges must have one entry per item (${columns}), got ${ranges.length}`);
  }
  ranges?.forEach((range, j) => {
    if (range !== null && !(Number.isFinite(range.min) && Number.isFinite(range.max) && range.min < range.max)) {
      throw new RangeError(`${caller}: the range of item ${j} must be finite with min < max, got ${range.min} to ${range.max}`);
    }
  });
}
