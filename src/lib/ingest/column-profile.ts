/**
 * Describes what one column holds (blank, numbers, whole numbers, distinct texts), for the
 * setup guesser and the setup form.
 */
import { parseNumber } from './parse-number';
import type { ColumnProfile, WaveTable } from './types';

/** A column's cells with their numbers, as the guesser needs them. */
export interface ColumnData {
  readonly header: string;
  readonly index: number;
  /** Every cell, one per respondent. */
  readonly cells: readonly string[];
  /** Non-blank cells, trimmed. */
  readonly filled: readonly string[];
  /** The numbers among the filled cells. */
  readonly numbers: readonly number[];
  /** Distinct filled cells that are not numbers, in order of first appearance. */
  readonly texts: readonly string[];
  readonly profile: ColumnProfile;
}

/**
 * The cells of column `j` with a profile.
 * @param table the table.
 * @param j 0-based column index.
 * @throws {RangeError} when `j` is not a column of the table.
 * @returns the column's data.
 * References: none published; descriptive counts for the setup form.
 */
export function columnData(table: WaveTable, j: number): ColumnData {
  if (!Number.isInteger(j) || j < 0 || j >= table.headers.length) throw new RangeError(`columnData: column ${j} does not exist`);
  const cells = table.rows.map((row) => row[j]);
  const filled: string[] = [];
  const numbers: number[] = [];
  const texts = new Set<string>();
  const distinct = new Set<string>();
  let wholeNumbers = 0;
  let minimum = Number.POSITIVE_INFINITY;
  let maximum = Number.NEGATIVE_INFINITY;
  for (const cell of cells) {
    const text = cell.trim();
    if (text === '') continue;
    filled.push(text);
    distinct.add(text);
    const value = parseNumber(text, table.source.decimalSeparator);
    if (Number.isNaN(value)) {
      texts.add(text);
      continue;
    }
    numbers.push(value);
    if (Number.isInteger(value)) wholeNumbers++;
    if (value < minimum) minimum = value;
    if (value > maximum) maximum = value;
  }
  const profile: ColumnProfile = {
    nonBlank: filled.length,
    blank: cells.length - filled.length,
    numeric: numbers.length,
    wholeNumbers,
    distinct: distinct.size,
    minimum: numbers.length > 0 ? minimum : null,
    maximum: numbers.length > 0 ? maximum : null,
    examples: [...distinct].slice(0, 5),
  };
  return { header: table.headers[j], index: j, cells, filled, numbers, texts: [...texts], profile };
}
