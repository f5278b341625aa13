/**
 * Reads a cell as a number the way a survey export writes one: plain decimal notation with an
 * optional sign and exponent, a decimal comma where the file uses one. Text such as `NaN`,
 * `Infinity`, `0x1F`, `1,5` in a decimal-point file or a formula (`=1+2`) is not a number.
 */

const DECIMAL_POINT = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?(?:\d+|\d{1,3}(?:\.\d{3})+)(?:,\d+)?$/;

/** Digits read by the fast path: below 2^53 every such value and every step of it is exact. */
const PLAIN_DIGITS_MAX_LENGTH = 15;

/**
 * Whether a cell is blank (empty or only white space).
 * @param cell cell text.
 * @returns true when there is nothing to read.
 * References: Paredown methods.md §1 (blank cells are missing).
 */
export function isBlankCell(cell: string): boolean {
  return cell.trim() === '';
}

/**
 * A cell's text without surrounding white space, as `cell.trim()` gives it; a cell that begins and
 * ends with a visible ASCII character (the usual answer code) is returned as it is, without the
 * call.
 * @param cell cell text.
 * @returns the trimmed text ('' for a blank cell).
 * References: ECMA-262 (2024), "String.prototype.trim" (white space and line terminators removed).
 */
export function trimCell(cell: string): string {
  const length = cell.length;
  if (length > 0) {
    const first = cell.charCodeAt(0);
    const last = cell.charCodeAt(length - 1);
    if (first > 0x20 && first < 0x7f && last > 0x20 && last < 0x7f) return cell;
  }
  return cell.trim();
}

/**
 * The number a cell holds, or NaN when it holds none.
 * @param cell cell text (surrounding white space is ignored).
 * @param decimalSeparator `.` (thousands separators not read) or `,` (a `.` may group thousands: `1.234,5`).
 * @returns a finite number (never −0), or NaN for blank or non-numeric text.
 * References: ISO 80000-1:2022, "Quantities and units — Part 1: General" (the decimal sign is a comma or a point on the line).
 */
export function parseNumber(cell: string, decimalSeparator: '.' | ','): number {
  // Fast path for the commonest cell of a survey export, a short run of digits (`4`, `10`): read
  // without trimming, a regular expression or Number(), to the same value. Both separators read
  // plain digits alike.
  const length = cell.length;
  if (length > 0 && length <= PLAIN_DIGITS_MAX_LENGTH) {
    let value = 0;
    let index = 0;
    for (; index < length; index++) {
      const code = cell.charCodeAt(index) - 48;
      if (code < 0 || code > 9) break;
      value = value * 10 + code;
    }
    if (index === length) return value;
  }
  const text = cell.trim();
  if (text === '') return Number.NaN;
  let normalised: string;
  if (decimalSeparator === ',') {
    if (!DECIMAL_COMMA.test(text)) return Number.NaN;
    normalised = text.replace(/\./g, '').replace(',', '.');
  } else {
    if (!DECIMAL_POINT.test(text)) return Number.NaN;
    normalised = text;
  }
  const value = Number(normalised);
  if (!Number.isFinite(value)) return Number.NaN;
  return value === 0 ? 0 : value;
}

/**
 * Whether a cell looks like a spreadsheet formula (starts with `=`, `+`, `-`, `@`, tab or CR and
 * is not a plain number). Such cells are kept as text and never evaluated; anything that writes
 * them back into a spreadsheet must neutralise them (CSV injection).
 * @param cell cell text.
 * @param decimalSeparator the file's decimal separator.
 * @returns true for formula-looking text.
 * References: OWASP Foundation 2023, "CSV Injection".
 */
export function looksLikeFormula(cell: string, decimalSeparator: '.' | ','): boolean {
  if (cell.length === 0) return false;
  const first = cell[0];
  if (first !== '=' && first !== '+' && first !== '-' && first !== '@' && first !== '\t' && first !== '\r') return false;
  if (cell.trim() === '') return false;
  return Number.isNaN(parseNumber(cell, decimalSeparator));
}
