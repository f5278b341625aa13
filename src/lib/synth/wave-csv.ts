import type { CodebookRow, SyntheticWave } from './types';

/** One CSV field, quoted when it holds a comma, quote, CR or LF (RFC 4180, quotes doubled). */
function csvField(value: number | string | null): string {
  if (value === null) return '';
  const text = String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function csvLines(rows: readonly (readonly (number | string | null)[])[]): string {
  return rows.map((row) => row.map(csvField).join(',')).join('\r\n') + '\r\n';
}

/**
 * Writes a wave's responses as CSV: a header of column names, one line per respondent, blanks
 * as empty fields, CRLF line ends.
 * @param wave A wave from `generateWave`.
 * @throws {RangeError} when the columns differ in length.
 * @returns The CSV text.
 * References: Shafranovich 2005, RFC 4180 "Common Format and MIME Type for CSV Files".
 */
export function toCsv(wave: Pick<SyntheticWave, 'columns'>): string {
  const rows = wave.columns.length === 0 ? 0 : wave.columns[0].values.length;
  for (const column of wave.columns) {
    if (column.values.length !== rows) throw new RangeError(`toCsv: column "${column.name}" has ${column.values.length} values, expected ${rows}`);
  }
  const lines: (number | string | null)[][] = [wave.columns.map((column) => column.name)];
  for (let i = 0; i < rows; i++) lines.push(wave.columns.map((column) => column.values[i]));
  return csvLines(lines);
}

/**
 * The codebook as a header row plus one row of plain cells per item (reverse as yes/no, missing
 * codes separated by spaces), for the CSV writer and spreadsheet sheets.
 * @param codebook Rows from `generateWave`.
 * @returns Header and rows, in the product's codebook columns.
 * References: Paredown audit-json.md, codebook columns (the product's own format).
 */
export function codebookCells(codebook: readonly CodebookRow[]): (number | string)[][] {
  return [
    ['item', 'scale', 'reverse', 'min', 'max', 'missing', 'text'],
    ...codebook.map((row) => [row.item, row.scale, row.reverse ? 'yes' : 'no', row.min, row.max, row.missing.join(' '), row.text]),
  ];
}

/**
 * Writes a codebook as CSV with the columns item, scale, reverse (yes/no), min, max, missing
 * (codes separated by spaces) and text.
 * @param codebook Rows from `generateWave`.
 * @returns The CSV text.
 * References: Shafranovich 2005, RFC 4180 "Common Format and MIME Type for CSV Files".
 */
export function codebookToCsv(codebook: readonly CodebookRow[]): string {
  return csvLines(codebookCells(codebook));
}
