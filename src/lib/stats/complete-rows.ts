/**
 * Which respondents answered every item, and how many answered any: the row sets behind
 * listwise deletion, the Belsley-Kuh-Welsch data matrix and the respondents counted for
 * pairwise statistics. One place, so every statistic counts rows the same way.
 */
import { keptPerMatrix, type ItemMatrix } from './types';

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

/** The rows each item misses (ascending), found once per matrix (a bootstrap's resamples share one). */
const missingRowsOfItems = keptPerMatrix(({ rows, columns, data }): readonly Int32Array[] => {
  const lists: Int32Array[] = [];
  for (let j = 0; j < columns; j++) {
    const offset = j * rows;
    let count = 0;
    for (let i = 0; i < rows; i++) if (data[offset + i] !== data[offset + i]) count++;
    const list = new Int32Array(count);
    for (let i = 0, m = 0; i < rows; i++) if (data[offset + i] !== data[offset + i]) list[m++] = i;
    lists.push(list);
  }
  return lists;
});

/**
 * The complete respondents of a resample without building it: the positions k (ascending) in
 * `draws` whose row `draws[k]` of `matrix` has every listed item observed, which is
 * `completeRows(selectItems(selectRespondents(matrix, draws), items))`. The rows each item
 * misses are found once per matrix (a bootstrap's resamples share one), so a resample costs a
 * pass over its draws and the missing answers of the listed items.
 * @param matrix The original respondents × items, NaN for missing; not modified, and not to be
 *   modified between calls either (its missing rows are kept by its data array).
 * @param draws The resample: row indices into `matrix`, one per draw (repeats allowed).
 * @param items The items that must be observed (0-based).
 * @throws {RangeError} when a draw or an item is out of range.
 * @returns 0-based positions in `draws` of the complete respondents, ascending. Infinities count
 *   as observed, as in `completeRows` without a caller.
 * References: none (listwise deletion, e.g. Little & Rubin 2002, ch. 3).
 */
export function completeDraws(matrix: ItemMatrix, draws: ArrayLike<number>, items: readonly number[]): number[] {
  for (const j of items) if (!Number.isInteger(j) || j < 0 || j >= matrix.columns) throw new RangeError(`completeDraws: item ${j} is outside 0..${matrix.columns - 1}`);
  const missingRows = missingRowsOfItems(matrix);
  const missing = new Uint8Array(matrix.rows);
  for (const j of items) {
    const list = missingRows[j];
    for (let m = 0; m < list.length; m++) missing[list[m]] = 1;
  }
  const kept: number[] = [];
  for (let k = 0; k < draws.length; k++) {
    const row = draws[k];
    if (!(Number.isInteger(row) && row >= 0 && row < matrix.rows)) throw new RangeError(`completeDraws: draw ${k} is row ${row}, outside 0..${matrix.rows - 1}`);
    if (missing[row] === 0) kept.push(k);
  }
  return kept;
}
