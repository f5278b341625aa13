import type { ItemMatrix } from '../../stats/types';
import { ROW_BLOCK } from './row-block';

/**
 * Share of items each respondent left without a valid answer (blank, missing code, unreadable
 * or out of range).
 * @param answers respondents × items, NaN for missing.
 * @returns per respondent a share from 0 to 1 (1 when there are no items).
 * References: none published for the share itself; flagging respondents who skip most items is common
 *   practice (Paredown methods.md §6).
 */
export function missingShare(answers: ItemMatrix): number[] {
  const { rows, columns, data } = answers;
  const result = new Array<number>(rows).fill(1);
  if (columns === 0) return result;
  // Rows a block at a time, read down the column-major data instead of across it.
  const missing = new Float64Array(ROW_BLOCK);
  for (let first = 0; first < rows; first += ROW_BLOCK) {
    const length = Math.min(ROW_BLOCK, rows - first);
    missing.fill(0);
    for (let j = 0; j < columns; j++) {
      const offset = j * rows + first;
      for (let b = 0; b < length; b++) if (Number.isNaN(data[offset + b])) missing[b]++;
    }
    for (let b = 0; b < length; b++) result[first + b] = missing[b] / columns;
  }
  return result;
}
