/**
 * The check every core function that takes respondents × items makes of its input: the shape,
 * and (unless the caller finds them in a pass of its own) no infinite value, since a missing
 * answer is NaN.
 */
import type { ItemMatrix } from './types';

/**
 * Checks a respondents × items matrix.
 * @param matrix The matrix (column-major Float64Array, NaN for missing).
 * @param caller Name of the public function, for the messages.
 * @param infinities Whether to refuse infinite values here (default true); a caller that passes
 *   over the data anyway may find them there instead.
 * @returns Nothing; returns only when every check passes.
 * @throws {RangeError} naming `caller` when rows is not a non-negative integer, there is no item,
 *   the data is not a Float64Array of rows × columns values, or (with `infinities`) a value is
 *   infinite (the first in column order, by item and respondent).
 * References: none (input validation).
 */
export function checkItemMatrix(matrix: ItemMatrix, caller: string, infinities = true): void {
  const { rows, columns, data } = matrix ?? ({} as ItemMatrix);
  if (!Number.isInteger(rows) || rows < 0) throw new RangeError(`${caller}: rows must be a non-negative integer, got ${rows}`);
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError(`${caller}: at least one item is required, got ${columns}`);
  if (!(data instanceof Float64Array) || data.length !== rows * columns) {
    throw new RangeError(`${caller}: data must be a Float64Array of rows × columns = ${rows * columns} values`);
  }
  if (!infinities) return;
  for (let j = 0; j < columns; j++) {
    const offset = j * rows;
    // A finite column sum rules out NaN and infinity at once (the common, complete case); only
    // otherwise is each value looked at.
    let sum = 0;
    for (let i = 0; i < rows; i++) sum += data[offset + i];
    if (sum - sum !== 0) refuseInfiniteAnswer(data.subarray(offset, offset + rows), j, caller);
  }
}

/**
 * Refuses an item whose answers hold an infinite value, naming the first (a caller that has
 * summed the column looks only when the sum is not finite).
 * @param column The item's answers (NaN for missing).
 * @param item The item's index, for the message.
 * @param caller Name of the public function, for the message.
 * @param rows The respondents to look at, in order (default all): e.g. the distinct rows a
 *   bootstrap resample draws.
 * @returns Nothing; returns only when no answer is infinite.
 * @throws {RangeError} naming `caller`, the item and the respondent of the first infinite answer.
 * References: none (input validation).
 */
export function refuseInfiniteAnswer(column: Float64Array, item: number, caller: string, rows?: ArrayLike<number>): void {
  const count = rows === undefined ? column.length : rows.length;
  for (let k = 0; k < count; k++) {
    const i = rows === undefined ? k : rows[k];
    const value = column[i];
    // x − x is NaN exactly for an infinite x (a NaN, a missing answer, is skipped).
    if (value === value && value - value !== 0) {
      throw new RangeError(`${caller}: item ${item} has an infinite value at respondent ${i}; use NaN for a missing answer`);
    }
  }
}
