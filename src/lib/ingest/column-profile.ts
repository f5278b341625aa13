/**
 * Describes what one column holds (blank, numbers, whole numbers, distinct texts), for the
 * setup guesser and the setup form.
 */
import { MEMO_CELL_TEXTS, SINGLE_CHARACTER_CODES } from './ingest-thresholds';
import { parseNumber } from './parse-number';
import { samplePositions } from './personal-data';
import { tableColumn } from './table-columns';
import type { ColumnProfile, WaveTable } from './types';

/** A column's cells with their numbers, as the guesser needs them. */
export interface ColumnData {
  readonly header: string;
  readonly index: number;
  /** Every cell, one per respondent. */
  readonly cells: readonly string[];
  /** Non-blank cells, trimmed (made afresh from `cells` at each reading: a large column is not kept twice). */
  readonly filled: readonly string[];
  /** The numbers among the filled cells (made afresh from `cells` at each reading). */
  readonly numbers: readonly number[];
  /** The distinct values of `numbers`, in order of first appearance. */
  readonly distinctNumbers: readonly number[];
  /** `sampleCells(filled)`: at most SAMPLE_CELLS filled cells, evenly spaced, in order. */
  readonly filledSample: readonly string[];
  /** Distinct filled cells that are not numbers, in order of first appearance. */
  readonly texts: readonly string[];
  readonly profile: ColumnProfile;
}

/** What one cell text reads as: its trimmed text ('' when blank), its number (NaN when none), and how many cells read so. */
interface CellReading {
  readonly text: string;
  readonly value: number;
  count: number;
}

/**
 * Reads cell texts, each distinct text once (a rating column holds a handful): `readingOf(cell)`
 * gives the cell's reading, the same object for every cell of the same text (up to
 * MEMO_CELL_TEXTS texts; past them each cell gets its own), and `order` lists the readings in the
 * order they were first made.
 */
class CellReader {
  readonly order: CellReading[] = [];
  private readonly single: (CellReading | undefined)[] = new Array(SINGLE_CHARACTER_CODES).fill(undefined);
  private readonly readings = new Map<string, CellReading>();

  constructor(private readonly decimalSeparator: '.' | ',') {}

  readingOf(cell: string): CellReading {
    const code = cell.length === 1 ? cell.charCodeAt(0) : SINGLE_CHARACTER_CODES;
    const known = code < SINGLE_CHARACTER_CODES ? this.single[code] : this.readings.get(cell);
    if (known !== undefined) return known;
    const text = cell.trim();
    const reading: CellReading = { text, value: text === '' ? Number.NaN : parseNumber(text, this.decimalSeparator), count: 0 };
    if (code < SINGLE_CHARACTER_CODES) this.single[code] = reading;
    else if (this.readings.size < MEMO_CELL_TEXTS) this.readings.set(cell, reading);
    this.order.push(reading);
    return reading;
  }
}

/** The trimmed non-blank cells and their numbers, in order. */
function filledAndNumbers(cells: readonly string[], decimalSeparator: '.' | ','): { filled: string[]; numbers: number[] } {
  const reader = new CellReader(decimalSeparator);
  const filled: string[] = [];
  const numbers: number[] = [];
  for (const cell of cells) {
    const { text, value } = reader.readingOf(cell);
    if (text === '') continue;
    filled.push(text);
    if (!Number.isNaN(value)) numbers.push(value);
  }
  return { filled, numbers };
}

/**
 * The cells of column `j` with a profile. Each distinct cell text is trimmed and read as a number
 * once and its cells counted (a rating column holds a handful of texts); the counts and the
 * distinct texts in order of first appearance give the same profile as reading every cell. The
 * filled cells and the numbers are made again when asked for instead of being kept.
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
  const reader = new CellReader(decimalSeparator);
  for (let i = 0; i < cells.length; i++) reader.readingOf(cells[i]).count++;
  const texts = new Set<string>();
  const distinct = new Set<string>();
  const distinctNumbers = new Set<number>();
  let nonBlank = 0;
  let numeric = 0;
  let wholeNumbers = 0;
  let minimum = Number.POSITIVE_INFINITY;
  let maximum = Number.NEGATIVE_INFINITY;
  for (const { text, value, count } of reader.order) {
    if (text === '') continue;
    nonBlank += count;
    distinct.add(text);
    if (Number.isNaN(value)) {
      texts.add(text);
      continue;
    }
    distinctNumbers.add(value);
    numeric += count;
    if (Number.isInteger(value)) wholeNumbers += count;
    if (value < minimum) minimum = value;
    if (value > maximum) maximum = value;
  }
  // The sample of the filled cells, found by counting them again (no copy of the column).
  const positions = samplePositions(nonBlank);
  const filledSample: string[] = [];
  let position = 0;
  for (let i = 0; i < cells.length && filledSample.length < positions.length; i++) {
    const text = reader.readingOf(cells[i]).text;
    if (text === '') continue;
    if (position === positions[filledSample.length]) filledSample.push(text);
    position++;
  }
  const profile: ColumnProfile = {
    nonBlank,
    blank: cells.length - nonBlank,
    numeric,
    wholeNumbers,
    distinct: distinct.size,
    minimum: numeric > 0 ? minimum : null,
    maximum: numeric > 0 ? maximum : null,
    examples: [...distinct].slice(0, 5),
  };
  return {
    header: table.headers[j],
    index: j,
    cells,
    get filled() {
      return filledAndNumbers(cells, decimalSeparator).filled;
    },
    get numbers() {
      return filledAndNumbers(cells, decimalSeparator).numbers;
    },
    distinctNumbers: [...distinctNumbers],
    filledSample,
    texts: [...texts],
    profile,
  };
}
