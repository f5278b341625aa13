import type { ItemMatrix } from '../../stats/types';
import { ROW_BLOCK } from './row-block';

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
  // Rows a block at a time, items in order within each row (Welford's updates in the same order
  // as one row after another), read down the column-major data instead of across it.
  const count = new Float64Array(ROW_BLOCK);
  const mean = new Float64Array(ROW_BLOCK);
  const sumOfSquaredDeviations = new Float64Array(ROW_BLOCK);
  for (let first = 0; first < rows; first += ROW_BLOCK) {
    const length = Math.min(ROW_BLOCK, rows - first);
    count.fill(0);
    mean.fill(0);
    sumOfSquaredDeviations.fill(0);
    for (let j = 0; j < columns; j++) {
      const offset = j * rows + first;
      for (let b = 0; b < length; b++) {
        const value = data[offset + b];
        if (Number.isNaN(value)) continue;
        const n = count[b] + 1;
        count[b] = n;
        const delta = value - mean[b];
        const updated = mean[b] + delta / n;
        mean[b] = updated;
        sumOfSquaredDeviations[b] += delta * (value - updated);
      }
    }
    for (let b = 0; b < length; b++) if (count[b] >= 2) result[first + b] = Math.sqrt(sumOfSquaredDeviations[b] / (count[b] - 1));
  }
  return result;
}
