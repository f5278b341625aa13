import type { ItemMatrix } from '../../stats/types';

/**
 * Within-person standard deviation (intra-individual response variability): for each
 * respondent, the sample standard deviation (n − 1) of their answers across the items. A value
 * of 0 means one answer throughout.
 * @param answers respondents × items, answers as given (not reverse-scored), NaN for missing.
 * @returns per respondent the SD, or null when fewer than two items were answered.
 * References: Dunn, Heggestad, Shanock & Theilgard 2018, "Intra-individual response variability as an
 *   indicator of insufficient effort responding", Journal of Business and Psychology 33:105-121.
 */
export function withinPersonSd(answers: ItemMatrix): (number | null)[] {
  const { rows, columns, data } = answers;
  const result = new Array<number | null>(rows).fill(null);
  for (let i = 0; i < rows; i++) {
    let count = 0;
    let mean = 0;
    let sumOfSquaredDeviations = 0;
    for (let j = 0; j < columns; j++) {
      const value = data[j * rows + i];
      if (Number.isNaN(value)) continue;
      count++;
      const delta = value - mean;
      mean += delta / count;
      sumOfSquaredDeviations += delta * (value - mean);
    }
    if (count >= 2) result[i] = Math.sqrt(sumOfSquaredDeviations / (count - 1));
  }
  return result;
}
