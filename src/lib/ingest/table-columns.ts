/**
 * A table's cells column by column. A table holds its cells row by row, as a file gives them; the
 * setup guesser, the setup check and the wave builder each read whole columns. Gathering one
 * column from row arrays touches every row (a cache miss per cell on a wide table), so the first
 * request transposes the whole table once and later requests of any column are free. The columns
 * are kept for as long as the table's rows live, and hold the same strings as the rows (no cell
 * is copied).
 */
import type { WaveTable } from './types';

/** Column-major copies of a table's rows, by the rows array they were made from. */
const columnsOfRows = new WeakMap<readonly (readonly string[])[], readonly (readonly string[])[]>();

/** Rows transposed a block of columns at a time, so each row is read once per block from the cache. */
const TRANSPOSE_BLOCK_COLUMNS = 64;

function transpose(rows: readonly (readonly string[])[], width: number): string[][] {
  const n = rows.length;
  // Each column is made at its full length and filled by position (about three times faster here
  // than appending, and no slower to read).
  const columns: string[][] = Array.from({ length: width }, () => new Array<string>(n));
  for (let first = 0; first < width; first += TRANSPOSE_BLOCK_COLUMNS) {
    const last = Math.min(width, first + TRANSPOSE_BLOCK_COLUMNS);
    for (let i = 0; i < n; i++) {
      const row = rows[i];
      for (let j = first; j < last; j++) columns[j][i] = row[j];
    }
  }
  return columns;
}

/**
 * The cells of column `j`, one per respondent row, in row order: the same strings as
 * `table.rows.map((row) => row[j])`. The whole table is transposed at the first call and kept
 * beside its rows (which a table never changes: they are read-only).
 * @param table a table from `readTable` (every row `headers.length` cells long).
 * @param j 0-based column index.
 * @throws {RangeError} when `j` is not a column of the table.
 * @returns the column's cells (read-only; shared by every caller).
 * References: none (storage order of a table).
 */
export function tableColumn(table: Pick<WaveTable, 'headers' | 'rows'>, j: number): readonly string[] {
  const width = table.headers.length;
  if (!Number.isInteger(j) || j < 0 || j >= width) throw new RangeError(`tableColumn: column ${j} does not exist`);
  let columns = columnsOfRows.get(table.rows);
  if (columns === undefined || columns.length !== width || columns[0].length !== table.rows.length) {
    columns = transpose(table.rows, width);
    columnsOfRows.set(table.rows, columns);
  }
  return columns[j];
}
