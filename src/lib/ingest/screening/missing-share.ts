import type { ItemMatrix } from '../../stats/types';

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
  for (let i = 0; i < rows; i++) {
    let missing = 0;
    for (let j = 0; j < columns; j++) if (Number.isNaN(data[j * rows + i])) missing++;
    result[i] = missing / columns;
  }
  return result;
}
