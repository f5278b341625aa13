/**
 * A table's cells column by column. A table holds its cells row by row, as a file gives them; the
 * setup guesser, the setup check and the wave builder each read whole columns. Gathering one
 * column from row arrays touches every row (a cache miss per cell on a wide table), so the first
 * request goes over the whole table once and keeps every column beside the table's rows.
 *
 * A column is kept coded: its distinct cell texts in order of first appearance, and for each
 * respondent the index of its text (a rating column holds a handful of texts, so one byte a cell).
 * Whatever is worked out from a cell text (its number, its recoding, whether it is blank) is then
 * worked out once per distinct text and looked up by code, and no column of strings is made
 * unless asked for ({@link tableColumn}).
 */
import { SINGLE_CHARACTER_CODES } from './ingest-thresholds';
import type { WaveTable } from './types';

/** One column as distinct texts and a code per cell. */
export interface CodedColumn {
  /** The distinct cell texts, exactly as in the cells (untrimmed), in order of first appearance. */
  readonly texts: readonly string[];
  /** For each cell (respondent), the index of its text in `texts`. */
  readonly codes: Uint8Array | Uint16Array | Uint32Array;
}

/** The coded columns of a table, and the string columns made from them when asked for. */
interface TableColumns {
  readonly coded: readonly CodedColumn[];
  readonly strings: (readonly string[] | undefined)[];
}

/** Columns of a table's rows, by the rows array they were made from. */
const columnsOfRows = new WeakMap<readonly (readonly string[])[], TableColumns>();

/** Rows read a block of columns at a time, so each row is read once per block from the cache. */
const TRANSPOSE_BLOCK_COLUMNS = 64;


/** One column being coded: its texts, the codes so far (widened as the texts grow past 8 and 16 bits). */
class ColumnCoder {
  readonly texts: string[] = [];
  codes: Uint8Array | Uint16Array | Uint32Array;
  private readonly single = new Int32Array(SINGLE_CHARACTER_CODES).fill(-1);
  private readonly byText = new Map<string, number>();

  constructor(length: number) {
    this.codes = new Uint8Array(length);
  }

  /** The code of a cell text, a new one for a text not seen before. */
  codeOf(cell: string): number {
    const character = cell.length === 1 ? cell.charCodeAt(0) : SINGLE_CHARACTER_CODES;
    if (character < SINGLE_CHARACTER_CODES) {
      const known = this.single[character];
      if (known >= 0) return known;
      const code = this.add(cell);
      this.single[character] = code;
      return code;
    }
    const known = this.byText.get(cell);
    if (known !== undefined) return known;
    const code = this.add(cell);
    this.byText.set(cell, code);
    return code;
  }

  private add(cell: string): number {
    const code = this.texts.length;
    this.texts.push(cell);
    if (code === 0x100) this.codes = Uint16Array.from(this.codes);
    else if (code === 0x10000) this.codes = Uint32Array.from(this.codes);
    return code;
  }
}

/**
 * Codes a table's columns while its rows are gathered (shapeTable codes each cell as it places
 * it, so the table is not read a second time), then keeps them beside the rows.
 */
export class TableColumnCoder {
  private readonly coders: ColumnCoder[];

  /**
   * @param width the table's columns.
   * @param rows the table's respondent rows.
   */
  constructor(readonly width: number, readonly rows: number) {
    this.coders = Array.from({ length: width }, () => new ColumnCoder(rows));
  }

  /**
   * Codes the cell of row `i` in column `j`.
   * @param i 0-based row.
   * @param j 0-based column.
   * @param cell the cell's text.
   */
  code(i: number, j: number, cell: string): void {
    const coder = this.coders[j];
    const code = coder.codeOf(cell);
    coder.codes[i] = code;
  }

  /**
   * The coded columns, kept for `tableColumnCodes` and `tableColumn` of a table with these rows.
   * @param tableRows the table's rows, every cell of which was coded.
   * @throws {RangeError} when the rows are not as many as the coder was made for.
   * @returns the coded columns.
   */
  finish(tableRows: readonly (readonly string[])[]): readonly CodedColumn[] {
    if (tableRows.length !== this.rows) throw new RangeError(`TableColumnCoder: ${this.rows} rows were coded, the table has ${tableRows.length}`);
    const coded = this.coders.map((coder) => ({ texts: coder.texts, codes: coder.codes }));
    if (this.width > 0) columnsOfRows.set(tableRows, { coded, strings: new Array(this.width).fill(undefined) });
    return coded;
  }
}

function codeColumns(rows: readonly (readonly string[])[], width: number): CodedColumn[] {
  const n = rows.length;
  const coded: CodedColumn[] = new Array(width);
  for (let first = 0; first < width; first += TRANSPOSE_BLOCK_COLUMNS) {
    const last = Math.min(width, first + TRANSPOSE_BLOCK_COLUMNS);
    const coders = Array.from({ length: last - first }, () => new ColumnCoder(n));
    for (let i = 0; i < n; i++) {
      const row = rows[i];
      for (let j = first; j < last; j++) {
        const coder = coders[j - first];
        const code = coder.codeOf(row[j]);
        coder.codes[i] = code;
      }
    }
    for (let j = first; j < last; j++) coded[j] = { texts: coders[j - first].texts, codes: coders[j - first].codes };
  }
  return coded;
}

/**
 * Codes one column of cell texts: its distinct texts in order of first appearance and the index
 * of each cell's text.
 * @param cells the cells, in order.
 * @returns the coded column; `texts[codes[i]] === cells[i]` for every i.
 * References: none (dictionary encoding of a column).
 */
export function codeCells(cells: readonly string[]): CodedColumn {
  const coder = new ColumnCoder(cells.length);
  for (let i = 0; i < cells.length; i++) {
    const code = coder.codeOf(cells[i]);
    coder.codes[i] = code;
  }
  return { texts: coder.texts, codes: coder.codes };
}

function columnsOf(table: Pick<WaveTable, 'headers' | 'rows'>, j: number, caller: string): TableColumns {
  const width = table.headers.length;
  if (!Number.isInteger(j) || j < 0 || j >= width) throw new RangeError(`${caller}: column ${j} does not exist`);
  let columns = columnsOfRows.get(table.rows);
  if (columns === undefined || columns.coded.length !== width || columns.coded[0].codes.length !== table.rows.length) {
    columns = { coded: codeColumns(table.rows, width), strings: new Array(width).fill(undefined) };
    columnsOfRows.set(table.rows, columns);
  }
  return columns;
}

/**
 * Column `j` coded: its distinct cell texts and the index of each respondent's text. The whole
 * table is coded at the first call (of this or {@link tableColumn}) and kept beside its rows
 * (which a table never changes: they are read-only).
 * @param table a table from `readTable` (every row `headers.length` cells long).
 * @param j 0-based column index.
 * @throws {RangeError} when `j` is not a column of the table.
 * @returns the coded column (read-only; shared by every caller).
 * References: none (storage order of a table).
 */
export function tableColumnCodes(table: Pick<WaveTable, 'headers' | 'rows'>, j: number): CodedColumn {
  return columnsOf(table, j, 'tableColumnCodes').coded[j];
}

/**
 * The cells of column `j`, one per respondent row, in row order: the same strings as
 * `table.rows.map((row) => row[j])`, made from the coded column at the first call for that column
 * and kept.
 * @param table a table from `readTable` (every row `headers.length` cells long).
 * @param j 0-based column index.
 * @throws {RangeError} when `j` is not a column of the table.
 * @returns the column's cells (read-only; shared by every caller).
 * References: none (storage order of a table).
 */
export function tableColumn(table: Pick<WaveTable, 'headers' | 'rows'>, j: number): readonly string[] {
  const columns = columnsOf(table, j, 'tableColumn');
  let cells = columns.strings[j];
  if (cells === undefined) {
    const { texts, codes } = columns.coded[j];
    const made = new Array<string>(codes.length);
    for (let i = 0; i < codes.length; i++) made[i] = texts[codes[i]];
    cells = made;
    columns.strings[j] = cells;
  }
  return cells;
}
