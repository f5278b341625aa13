/**
 * Cells that leave Paredown as CSV or spreadsheet files: text a spreadsheet would run as a formula
 * (a cell beginning with =, +, -, @, a tab or a carriage return) gets a leading apostrophe, so it
 * shows as typed and never runs; CSV quoting follows RFC 4180 (fields with commas, quotes or line
 * breaks in double quotes, quotes doubled), so wording with markup or commas round-trips intact.
 */

const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * A cell's text made inert for spreadsheets.
 * @param value the cell's value.
 * @returns the text, with a leading apostrophe when it would otherwise start a formula.
 * References: OWASP, CSV Injection (common practice for exported cells).
 */
export function neutraliseCell(value: string | number | boolean | null | undefined): string {
  if (value === null || value === undefined) return '';
  const text = String(value);
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/**
 * Rows as CSV text (RFC 4180), every cell neutralised, lines ended by CRLF, with a byte-order mark
 * so spreadsheet programs read UTF-8.
 * @param rows the header row first, then the data rows.
 * @returns the CSV text.
 * References: Shafranovich (2005), RFC 4180, Common Format and MIME Type for CSV Files.
 */
export function toCsv(rows: readonly (readonly (string | number | boolean | null | undefined)[])[]): string {
  const line = (row: readonly (string | number | boolean | null | undefined)[]) =>
    row
      .map((cell) => {
        const text = neutraliseCell(cell);
        return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
      })
      .join(',');
  return `\uFEFF${rows.map(line).join('\r\n')}\r\n`;
}
