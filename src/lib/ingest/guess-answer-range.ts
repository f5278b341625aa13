/**
 * Guesses a rating item's valid range and missing codes from the whole numbers it holds:
 * common missing codes (8, 9, 99, −9, ...) that lie beyond the answers, separated from them by
 * more unused values than separate any two answers, are taken as missing codes; the rest span
 * the range.
 */
import { MISSING_CODE_CANDIDATES } from './ingest-thresholds';

/** A guessed range and missing codes. */
export interface AnswerRangeGuess {
  readonly min: number;
  readonly max: number;
  readonly missingCodes: readonly number[];
}

const CANDIDATES = new Set(MISSING_CODE_CANDIDATES);

/**
 * Guesses range and missing codes. A candidate code next to the answers (8 after 1..7), or no
 * further from them than the widest gap between two observed answers, is taken as an answer,
 * not a missing code: the designer confirms.
 * @param values the distinct whole numbers of a column (any order).
 * @returns the range and the missing codes, or null when there are no values.
 * References: none published; common practice in survey data files (8/9, 98/99, −9 for "don't know" and
 *   "refused"), recorded in docs/decisions/002-reading-waves.md.
 */
export function guessAnswerRange(values: readonly number[]): AnswerRangeGuess | null {
  if (values.length === 0) return null;
  const sorted = [...new Set(values)].sort((a, b) => a - b);
  const ordinary = sorted.filter((value) => !CANDIDATES.has(value));
  const core = ordinary.length > 0 ? ordinary : sorted;
  let min = core[0];
  let max = core[core.length - 1];
  // With few respondents the answers themselves leave gaps (2, 4, 6): a code must lie further
  // from the answers than any two neighbouring answers lie from each other.
  let widestGap = 1;
  for (let i = 1; i < core.length; i++) widestGap = Math.max(widestGap, core[i] - core[i - 1]);
  const missingCodes: number[] = [];
  for (const value of sorted) {
    if (value <= max || !CANDIDATES.has(value)) continue;
    if (value - max <= widestGap) max = value;
    else missingCodes.push(value);
  }
  for (const value of [...sorted].reverse()) {
    if (value >= min || !CANDIDATES.has(value)) continue;
    if (min - value <= widestGap) min = value;
    else missingCodes.push(value);
  }
  return { min, max, missingCodes: missingCodes.sort((a, b) => a - b) };
}
