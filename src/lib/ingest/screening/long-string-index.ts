import type { ItemMatrix } from '../../stats/types';

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
  for (let i = 0; i < rows; i++) {
    let longest = 0;
    let run = 0;
    let previous = Number.NaN;
    for (let j = 0; j < columns; j++) {
      const value = data[j * rows + i];
      if (Number.isNaN(value)) continue;
      run = value === previous ? run + 1 : 1;
      previous = value;
      if (run > longest) longest = run;
    }
    result[i] = longest;
  }
  return result;
}
