/**
 * Describes what one column holds (blank, numbers, whole numbers, distinct texts), for the
 * setup guesser and the setup form.
 */
import { parseNumber } from './parse-number';
import { tableColumn } from './table-columns';
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
  /** The distinct values of `numbers`, in order of first appearance. */
  readonly distinctNumbers: readonly number[];
  /** Distinct filled cells that are not numbers, in order of first appearance. */
  readonly texts: readonly string[];
  readonly profile: ColumnProfile;
}

/** Distinct cell texts remembered per column; a column with more (ids, free text) reads the rest afresh. */
const MEMO_CELL_TEXTS = 4096;

/** One-character cells below this character code are remembered by their code (ASCII). */
const SINGLE_CHARACTER_CODES = 128;

/** What one cell text reads as: its trimmed text ('' when blank) and its number (NaN when none). */
interface CellReading {
  readonly text: string;
  readonly value: number;
}

/**
 * The cells of column `j` with a profile. Each distinct cell text is trimmed and read as a number
 * once (a rating column holds a handful of texts), which gives the same results as reading every
 * cell.
 * @param table the table.
 * @param j 0-based column index.
 * @throws {RangeError} when `j` is not a column of the table.
 * @returns the column's data.
 * References: none published; descriptive counts for the setup form.
 */
export function columnData(table: WaveTable, j: number): ColumnData {
  if (!Number.isInteger(j) || j < 0 || j >= table.headers.length) throw new RangeError(`columnData: column ${j} does not exist`);
  const cells = tableColumn(table, j);
  const decimalSeparator = table.source.decimalSeparator;
  const filled: string[] = [];
  const numbers: number[] = [];
  const texts = new Set<string>();
  const distinct = new Set<string>();
  const distinctNumbers = new Set<number>();
  // One-character cells (answer codes 0-9) by their character code, longer ones by their text.
  const single: (CellReading | undefined)[] = new Array(SINGLE_CHARACTER_CODES).fill(undefined);
  const readings = new Map<string, CellReading>();
  let wholeNumbers = 0;
  let minimum = Number.POSITIVE_INFINITY;
  let maximum = Number.NEGATIVE_INFINITY;
  for (const cell of cells) {
    const code = cell.length === 1 ? cell.charCodeAt(0) : SINGLE_CHARACTER_CODES;
    let reading = code < SINGLE_CHARACTER_CODES ? single[code] : readings.get(cell);
    if (reading === undefined) {
      const text = cell.trim();
      reading = { text, value: text === '' ? Number.NaN : parseNumber(text, decimalSeparator) };
      if (text !== '') {
        distinct.add(text);
        if (Number.isNaN(reading.value)) texts.add(text);
        else distinctNumbers.add(reading.value);
      }
      if (code < SINGLE_CHARACTER_CODES) single[code] = reading;
      else if (readings.size < MEMO_CELL_TEXTS) readings.set(cell, reading);
    }
    const { text, value } = reading;
    if (text === '') continue;
    filled.push(text);
    if (Number.isNaN(value)) continue;
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
  return { header: table.headers[j], index: j, cells, filled, numbers, distinctNumbers: [...distinctNumbers], texts: [...texts], profile };
}
