/**
 * Turns a grid of cell texts (from a text export or a sheet) into a {@link WaveTable}: finds the
 * header, drops blank rows, pads ragged rows, renames duplicate and blank headers, applies the
 * row, column and cell limits, and notes formula-looking cells.
 */
import { looksLikeFormula, parseNumber } from './parse-number';
import type { ReadLimits } from './read-limits';
import { TableColumnCoder, type CodedColumn } from './table-columns';
import type { TableSource, WaveTable, WaveWarning } from './types';
import { WaveRefusal } from './wave-refusal';

/** A grid as read, before shaping. */
export interface CellGrid {
  /** Rows of cell texts; rows may differ in length. */
  readonly rows: readonly (readonly string[])[];
  /** The 1-based line or row number in the file of each grid row. */
  readonly fileRows: readonly number[];
  /** Whether rows of a different field count than the header are worth a warning (text files). */
  readonly countRaggedRows: boolean;
}

function isBlankRow(row: readonly string[]): boolean {
  return row.every((cell) => cell.trim() === '');
}

function significantLength(row: readonly string[]): number {
  let length = row.length;
  while (length > 0 && row[length - 1].trim() === '') length--;
  return length;
}

function cleanHeader(cell: string): string {
  return cell.replace(/^\uFEFF/, '').replace(/\s+/g, ' ').trim();
}

/**
 * Makes header names unique: a blank header becomes `column_<position>`, a repeated one gets
 * `_2`, `_3`, ... (compared without regard to case). Returns the names and one warning per kind.
 * @param original trimmed headers as in the file.
 * @returns unique names and warnings `blank-header`, `duplicate-header`.
 * References: none published; renaming convention of docs/decisions/002-reading-waves.md.
 */
export function uniqueHeaders(original: readonly string[]): { headers: string[]; warnings: WaveWarning[] } {
  const taken = new Set<string>();
  const headers: string[] = [];
  const blank: string[] = [];
  const renamed: string[] = [];
  const nonBlank = new Set(original.filter((name) => name !== '').map((name) => name.toLowerCase()));
  const firstSeen = new Set<string>();
  original.forEach((name, position) => {
    let candidate: string;
    if (name === '') {
      candidate = `column_${position + 1}`;
      for (let k = 2; taken.has(candidate.toLowerCase()) || nonBlank.has(candidate.toLowerCase()); k++) candidate = `column_${position + 1}_${k}`;
      blank.push(candidate);
    } else if (!firstSeen.has(name.toLowerCase())) {
      candidate = name;
      firstSeen.add(name.toLowerCase());
    } else {
      let k = 2;
      candidate = `${name}_${k}`;
      while (taken.has(candidate.toLowerCase()) || nonBlank.has(candidate.toLowerCase())) candidate = `${name}_${++k}`;
      renamed.push(`${name} → ${candidate}`);
    }
    taken.add(candidate.toLowerCase());
    headers.push(candidate);
  });
  const warnings: WaveWarning[] = [];
  if (renamed.length > 0) {
    warnings.push({
      code: 'duplicate-header',
      columns: headers.filter((_, j) => original[j] !== '' && headers[j] !== original[j]),
      message: `${renamed.length} repeated column ${renamed.length === 1 ? 'name was' : 'names were'} renamed (${renamed.slice(0, 5).join(', ')}${renamed.length > 5 ? ', ...' : ''}); check which column is which.`,
    });
  }
  if (blank.length > 0) {
    warnings.push({
      code: 'blank-header',
      columns: blank,
      message: `${blank.length} ${blank.length === 1 ? 'column has' : 'columns have'} no name and ${blank.length === 1 ? 'was' : 'were'} named by position (${blank.slice(0, 5).join(', ')}${blank.length > 5 ? ', ...' : ''}).`,
    });
  }
  return { headers, warnings };
}

/**
 * The cells that look like a spreadsheet formula, each distinct text judged once: how many, and
 * their columns in the order a row-by-row reading meets them first.
 */
function formulaLikeCells(columns: readonly CodedColumn[], decimalSeparator: '.' | ','): { formulaCells: number; formulaColumns: number[] } {
  let formulaCells = 0;
  const firstRowOf: { column: number; row: number }[] = [];
  columns.forEach(({ texts, codes }, j) => {
    const formula = texts.map((text) => looksLikeFormula(text, decimalSeparator));
    if (!formula.includes(true)) return;
    let first = -1;
    for (let i = 0; i < codes.length; i++) {
      if (!formula[codes[i]]) continue;
      formulaCells++;
      if (first < 0) first = i;
    }
    firstRowOf.push({ column: j, row: first });
  });
  firstRowOf.sort((a, b) => a.row - b.row || a.column - b.column);
  return { formulaCells, formulaColumns: firstRowOf.map((entry) => entry.column) };
}

/**
 * Shapes a grid into a table.
 * @param grid the rows as read.
 * @param source how the file was read.
 * @param limits the limits to apply.
 * @param warnings warnings gathered while reading (encoding, sheet choice), carried into the table.
 * @param codebookTable a codebook sheet of the same workbook, or null.
 * @throws {WaveRefusal} 422 `empty-file` when no row holds anything; 413 `too-many-columns`,
 *   `too-many-rows` or `too-many-cells` past the limits.
 * @returns the table.
 * References: Shafranovich 2005, RFC 4180 "Common Format and MIME Type for CSV Files", §2 (header line, equal field counts).
 */
export function shapeTable(
  grid: CellGrid,
  source: TableSource,
  limits: ReadLimits,
  warnings: readonly WaveWarning[],
  codebookTable: WaveTable | null,
): WaveTable {
  const what = source.sheet === null ? `"${source.fileName}"` : `Sheet "${source.sheet}" of "${source.fileName}"`;
  const kept: number[] = [];
  grid.rows.forEach((row, index) => {
    if (!isBlankRow(row)) kept.push(index);
  });
  if (kept.length === 0) throw new WaveRefusal(422, 'empty-file', `${what} holds no rows; upload the export that contains the responses.`);
  // Blank rows before the header or after the last row are export artefacts; only those between rows are reported.
  const interiorBlank = kept[kept.length - 1] - kept[0] + 1 - kept.length;

  const headerRow = grid.rows[kept[0]];
  const dataIndices = kept.slice(1);
  let width = significantLength(headerRow);
  for (const index of dataIndices) width = Math.max(width, significantLength(grid.rows[index]));
  if (width > limits.maxColumns) {
    throw new WaveRefusal(413, 'too-many-columns', `${what} has ${width} columns, more than the limit of ${limits.maxColumns}; upload only the columns needed (items, id, duration, outcome).`);
  }
  if (dataIndices.length > limits.maxRows) {
    throw new WaveRefusal(413, 'too-many-rows', `${what} has more than ${limits.maxRows} respondent rows, the limit; upload a sample or split the file.`);
  }
  if (dataIndices.length * width > limits.maxCells) {
    throw new WaveRefusal(413, 'too-many-cells', `${what} has ${dataIndices.length} rows by ${width} columns, more than the limit of ${limits.maxCells} cells; upload only the columns needed or a sample of rows.`);
  }

  const originalHeaders = Array.from({ length: width }, (_, j) => cleanHeader(headerRow[j] ?? ''));
  const named = uniqueHeaders(originalHeaders);
  const tableWarnings: WaveWarning[] = [...warnings, ...named.warnings];

  if (width >= 2 && originalHeaders.every((name) => name === '' || !Number.isNaN(parseNumber(name, source.decimalSeparator)))
    && originalHeaders.some((name) => name !== '')) {
    tableWarnings.push({
      code: 'header-looks-like-data',
      columns: [],
      message: 'The first row holds only numbers, so it may be answers rather than column names; add a header row if it is missing.',
    });
  }

  let shortRows = 0;
  let longRows = 0;
  const rows: string[][] = [];
  const fileRows: number[] = [];
  // The columns are coded as the cells are placed (tableColumnCodes then finds them).
  const coder = new TableColumnCoder(width, dataIndices.length);
  for (let r = 0; r < dataIndices.length; r++) {
    const index = dataIndices[r];
    const row = grid.rows[index];
    if (grid.countRaggedRows) {
      if (row.length < headerRow.length) shortRows++;
      else if (row.length > headerRow.length && significantLength(row) > headerRow.length) longRows++;
    }
    // A row of exactly the table's width with every cell present is kept as it is (the table's
    // rows are read-only, and the grid is the reader's own); any other is padded or cut into a
    // new array, so a large file is not held twice.
    let cells: string[] | null = row.length === width ? null : new Array<string>(width);
    for (let j = 0; j < width; j++) {
      const given = row[j];
      const cell = given ?? '';
      if (cells === null && (given === undefined || given === null)) cells = row.slice(0, width);
      if (cells !== null) cells[j] = cell;
      coder.code(r, j, cell);
    }
    rows.push(cells ?? (row as string[]));
    fileRows.push(grid.fileRows[index]);
  }
  const { formulaCells, formulaColumns } = formulaLikeCells(coder.finish(rows), source.decimalSeparator);
  if (shortRows + longRows > 0) {
    const parts = [shortRows > 0 ? `${shortRows} with fewer fields (padded with blanks)` : '', longRows > 0 ? `${longRows} with more fields (extra columns added)` : ''].filter(Boolean);
    tableWarnings.push({
      code: 'ragged-rows',
      columns: [],
      message: `${shortRows + longRows} rows do not have as many fields as the header: ${parts.join(' and ')}; check the export.`,
    });
  }
  if (interiorBlank > 0) {
    tableWarnings.push({ code: 'blank-rows-skipped', columns: [], message: `${interiorBlank} blank ${interiorBlank === 1 ? 'row was' : 'rows were'} skipped.` });
  }
  if (formulaCells > 0) {
    tableWarnings.push({
      code: 'formula-like-cells',
      columns: formulaColumns.map((j) => named.headers[j]),
      message: `${formulaCells} ${formulaCells === 1 ? 'cell starts' : 'cells start'} with =, +, - or @ like a spreadsheet formula; ${formulaCells === 1 ? 'it is' : 'they are'} kept as text, never evaluated, and counted as non-numeric.`,
    });
  }
  return {
    source,
    headers: named.headers,
    originalHeaders,
    rows,
    fileRows,
    warnings: tableWarnings,
    codebookTable,
  };
}
