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
    // A finite sum of the answers (missing ones counted as 0) rules out an infinite answer; only
    // otherwise is each value looked at.
    if (!answeredSumIsFinite(data, offset, rows)) refuseInfiniteAnswer(data.subarray(offset, offset + rows), j, caller);
  }
}

/**
 * Whether a column's values sum to a finite number: true rules out NaN and infinity at once (a
 * quick test before looking at each value; an overflowing sum of finite values answers false).
 * Four running sums instead of one, since only finiteness is read: the additions do not wait on
 * each other.
 * @param data Column-major values.
 * @param offset Index of the column's first value.
 * @param rows Values in the column.
 * @returns True when the sum is finite.
 * References: none (a screening test).
 */
export function columnSumIsFinite(data: Float64Array, offset: number, rows: number): boolean {
  const end = offset + rows;
  let first = 0;
  let second = 0;
  let third = 0;
  let fourth = 0;
  let i = offset;
  for (; i + 3 < end; i += 4) {
    first += data[i];
    second += data[i + 1];
    third += data[i + 2];
    fourth += data[i + 3];
  }
  for (; i < end; i++) first += data[i];
  const sum = first + second + third + fourth;
  return sum - sum === 0;
}

/**
 * Whether a column's answers sum to a finite number, a missing answer (NaN) counting as 0: true
 * rules out an infinite answer (an overflowing sum of finite answers answers false). Four
 * running sums, as in `columnSumIsFinite`.
 * @param data Column-major values.
 * @param offset Index of the column's first value.
 * @param rows Values in the column.
 * @returns True when the sum is finite.
 * References: none (a screening test).
 */
export function answeredSumIsFinite(data: Float64Array, offset: number, rows: number): boolean {
  const end = offset + rows;
  let first = 0;
  let second = 0;
  let third = 0;
  let fourth = 0;
  let i = offset;
  for (; i + 3 < end; i += 4) {
    const a = data[i];
    const b = data[i + 1];
    const c = data[i + 2];
    const d = data[i + 3];
    first += a === a ? a : 0;
    second += b === b ? b : 0;
    third += c === c ? c : 0;
    fourth += d === d ? d : 0;
  }
  for (; i < end; i++) if (data[i] === data[i]) first += data[i];
  const sum = first + second + third + fourth;
  return sum - sum === 0;
}

/**
 * Refuses an item whose answers hold an infinite value, naming the first (a caller that has
 * summed the column looks only when the sum is not finite).
 * @param column The item's answers (NaN for missing).
 * @param item The item's index, for the message.
 * @param caller Name of the public function, for the message.
 * @returns Nothing; returns only when no answer is infinite.
 * @throws {RangeError} naming `caller`, the item and the respondent of the first infinite answer.
 * References: none (input validation).
 */
export function refuseInfiniteAnswer(column: Float64Array, item: number, caller: string): void {
  for (let i = 0; i < column.length; i++) {
    const value = column[i];
    // x − x is NaN exactly for an infinite x (a NaN, a missing answer, is skipped).
    if (value === value && value - value !== 0) {
      throw new RangeError(`${caller}: item ${item} has an infinite value at respondent ${i}; use NaN for a missing answer`);
    }
  }
}
