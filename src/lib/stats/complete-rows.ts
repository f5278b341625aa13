/**
 * Which respondents answered every item, and how many answered any: the row sets behind
 * listwise deletion, the Belsley-Kuh-Welsch data matrix and the respondents counted for
 * pairwise statistics. One place, so every statistic counts rows the same way.
 */
import type { ItemMatrix } from './types';

/**
 * The respondents with every item observed (no NaN), in order.
 * A column whose sum is finite holds no NaN and is skipped without a per-value check, which keeps
 * this cheap on large complete matrices.
 * @param matrix Respondents × items, NaN for missing.
 * @param caller When given, an infinite value is refused with a RangeError naming this caller;
 *   without it, infinities count as observed.
 * @throws {RangeError} when `caller` is given and a value is infinite.
 * @returns 0-based row indices of the complete respondents, ascending.
 * References: none (listwise deletion, e.g. Little & Rubin 2002, "Statistical Analysis with
 * Missing Data", ch. 3).
 */
export function completeRows(matrix: ItemMatrix, caller?: string): number[] {
  const { rows, columns, data } = matrix;
  const missing = new Uint8Array(rows);
  for (let j = 0; j < columns; j++) {
    const offset = j * rows;
    let sum = 0;
    for (let i = 0; i < rows; i++) sum += data[offset + i];
    if (Number.isFinite(sum)) continue;
    for (let i = 0; i < rows; i++) {
      const value = data[offset + i];
      if (value !== value) missing[i] = 1;
      else if (caller !== undefined && (value === Infinity || value === -Infinity)) {
        throw new RangeError(`${caller}: item ${j} has an infinite value at respondent ${i}`);
      }
    }
  }
  const kept: number[] = [];
  for (let i = 0; i < rows; i++) if (missing[i] === 0) kept.push(i);
  return kept;
}

/**
 * How many respondents answered at least one item.
 * @param matrix Respondents × items, NaN for missing.
 * @returns The count of rows with at least one observed value.
 * References: none (a count).
 */
export function rowsWithAnyAnswer(matrix: ItemMatrix): number {
  const { rows, columns, data } = matrix;
  const any = new Uint8Array(rows);
  for (let j = 0; j < columns; j++) {
    const offset = j * rows;
    for (let i = 0; i < rows; i++) if (data[offset + i] === data[offset + i]) any[i] = 1;
  }
  let count = 0;
  for (let i = 0; i < rows; i++) count += any[i];
  return count;
}
