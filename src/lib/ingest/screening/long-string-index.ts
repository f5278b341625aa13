import type { ItemMatrix } from '../../stats/types';
import { ROW_BLOCK } from './row-block';

/**
 * Long-string index: for each respondent, the longest run of identical consecutive answers
 * across the items in questionnaire order. Missing answers are left out, so a run continues
 * across a skipped item.
 * @param answers respondents × items, answers as given (not reverse-scored), NaN for missing.
 * @returns per respondent the longest run (0 when the respondent answered nothing).
 * References: Johnson 2005, "Ascertaining the validity of individual protocols from Web-based
 *   personality inventories", Journal of Research in Personality 39:103-129.
 */
export function longStringIndex(answers: ItemMatrix): number[] {
  const { rows, columns, data } = answers;
  const result = new Array<number>(rows).fill(0);
  // Rows a block at a time, items in order within each row: the same runs as one row after
  // another, read down the column-major data instead of across it.
  const longest = new Float64Array(ROW_BLOCK);
  const run = new Float64Array(ROW_BLOCK);
  const previous = new Float64Array(ROW_BLOCK);
  for (let first = 0; first < rows; first += ROW_BLOCK) {
    const length = Math.min(ROW_BLOCK, rows - first);
    longest.fill(0);
    run.fill(0);
    previous.fill(Number.NaN);
    for (let j = 0; j < columns; j++) {
      const offset = j * rows + first;
      for (let b = 0; b < length; b++) {
        const value = data[offset + b];
        if (Number.isNaN(value)) continue;
        // run + 1 after the same answer, else 1, without a branch (random answers mispredict it).
        const current = (((value === previous[b]) as unknown as number) | 0) * run[b] + 1;
        run[b] = current;
        previous[b] = value;
        if (current > longest[b]) longest[b] = current;
      }
    }
    for (let b = 0; b < length; b++) result[first + b] = longest[b];
  }
  return result;
}
