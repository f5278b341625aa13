/**
 * Describes what one column holds (blank, numbers, whole numbers, distinct texts), for the
 * setup guesser and the setup form.
 */
import { parseNumber } from './parse-number';
import { findPersonalData, samplePositions, type PersonalDataFinding } from './personal-data';
import { tableColumn, tableColumnCodes, type CodedColumn } from './table-columns';
import type { ColumnProfile, WaveTable } from './types';

/** A column's cells with their numbers, as the guesser needs them. */
export interface ColumnData {
  readonly header: string;
  readonly index: number;
  /** Every cell, one per respondent (made from `column` when first asked for). */
  readonly cells: readonly string[];
  /** The column coded: its distinct cell texts and each cell's index into them. */
  readonly column: CodedColumn;
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

/** What a coded column's cells are, apart from any number: the same for every reader, so worked out once per column. */
export interface ColumnCells {
  /** Each distinct text trimmed ('' when blank), by code. */
  readonly trimmed: readonly string[];
  /** How many cells hold each distinct text, by code. */
  readonly occurrences: Uint32Array;
  /** Cells that are not blank. */
  readonly nonBlank: number;
  /** `sampleCells(filled)`: at most SAMPLE_CELLS trimmed non-blank cells, evenly spaced, in order. */
  readonly filledSample: readonly string[];
}

const cellsOfColumn = new WeakMap<CodedColumn, ColumnCells>();

/**
 * The trimmed texts, their occurrences, the non-blank count and the sample of the filled cells of
 * a coded column: made at the first call for a column (the proposal's profile) and kept beside it,
 * so the setup check and the wave builder do not count the cells again.
 * @param column a coded column (`tableColumnCodes`).
 * @returns the column's cells as counted (read-only; shared by every caller).
 * References: none published; descriptive counts for the setup form.
 */
export function columnCells(column: CodedColumn): ColumnCells {
  const known = cellsOfColumn.get(column);
  if (known !== undefined) return known;
  const { texts, codes } = column;
  const trimmed = texts.map((text) => text.trim());
  const occurrences = new Uint32Array(texts.length);
  for (let i = 0; i < codes.length; i++) occurrences[codes[i]]++;
  let nonBlank = 0;
  for (let k = 0; k < texts.length; k++) if (trimmed[k] !== '') nonBlank += occurrences[k];
  // The sample of the filled cells: taken by position when no cell is blank, else found by
  // counting the filled cells again (no copy of the column either way).
  const positions = samplePositions(nonBlank);
  const filledSample: string[] = [];
  if (nonBlank === codes.length) {
    for (const position of positions) filledSample.push(trimmed[codes[position]]);
  } else {
    let position = 0;
    for (let i = 0; i < codes.length && filledSample.length < positions.length; i++) {
      const text = trimmed[codes[i]];
      if (text === '') continue;
      if (position === positions[filledSample.length]) filledSample.push(text);
      position++;
    }
  }
  const cells: ColumnCells = { trimmed, occurrences, nonBlank, filledSample };
  cellsOfColumn.set(column, cells);
  return cells;
}

const personalDataOfColumn = new WeakMap<CodedColumn, Map<string, PersonalDataFinding | null>>();

/**
 * `findPersonalData` of a coded column's filled cells (it reads their sample only), worked out
 * once per column, header and decimal separator: the proposal and the setup check both ask.
 * @param header the column header.
 * @param column a coded column (`tableColumnCodes`).
 * @param decimalSeparator the table's decimal separator.
 * @returns what findPersonalData finds, or null.
 * References: Regulation (EU) 2016/679 (GDPR), Art. 4(1) "personal data" (any information relating to an identifiable person).
 */
export function columnPersonalData(header: string, column: CodedColumn, decimalSeparator: '.' | ','): PersonalDataFinding | null {
  let known = personalDataOfColumn.get(column);
  if (known === undefined) {
    known = new Map();
    personalDataOfColumn.set(column, known);
  }
  const key = `${decimalSeparator}${header}`;
  if (known.has(key)) return known.get(key) ?? null;
  const finding = findPersonalData(header, columnCells(column).filledSample, decimalSeparator);
  known.set(key, finding);
  return finding;
}

/** What each distinct text of a coded column reads as: trimmed ('' when blank) and as a number (NaN when none). */
function readTexts(texts: readonly string[], decimalSeparator: '.' | ','): { trimmed: string[]; values: Float64Array } {
  const trimmed = new Array<string>(texts.length);
  const values = new Float64Array(texts.length);
  for (let k = 0; k < texts.length; k++) {
    const text = texts[k].trim();
    trimmed[k] = text;
    values[k] = text === '' ? Number.NaN : parseNumber(text, decimalSeparator);
  }
  return { trimmed, values };
}

/** The trimmed non-blank cells and their numbers, in order. */
function filledAndNumbers(column: CodedColumn, decimalSeparator: '.' | ','): { filled: string[]; numbers: number[] } {
  const { trimmed, values } = readTexts(column.texts, decimalSeparator);
  const filled: string[] = [];
  const numbers: number[] = [];
  for (const code of column.codes) {
    const text = trimmed[code];
    if (text === '') continue;
    filled.push(text);
    const value = values[code];
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
  const column = tableColumnCodes(table, j);
  const { texts: cellTexts, codes } = column;
  const decimalSeparator = table.source.decimalSeparator;
  const { trimmed, occurrences, nonBlank, filledSample } = columnCells(column);
  const values = new Float64Array(cellTexts.length);
  for (let k = 0; k < cellTexts.length; k++) values[k] = trimmed[k] === '' ? Number.NaN : parseNumber(trimmed[k], decimalSeparator);
  const texts = new Set<string>();
  const distinct = new Set<string>();
  const distinctNumbers = new Set<number>();
  let numeric = 0;
  let wholeNumbers = 0;
  let minimum = Number.POSITIVE_INFINITY;
  let maximum = Number.NEGATIVE_INFINITY;
  // The distinct cell texts in order of first appearance give the trimmed texts and the numbers
  // in order of first appearance too.
  for (let k = 0; k < cellTexts.length; k++) {
    const text = trimmed[k];
    const value = values[k];
    const count = occurrences[k];
    if (text === '') continue;
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
  const profile: ColumnProfile = {
    nonBlank,
    blank: codes.length - nonBlank,
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
    column,
    get cells() {
      return tableColumn(table, j);
    },
    get filled() {
      return filledAndNumbers(column, decimalSeparator).filled;
    },
    get numbers() {
      return filledAndNumbers(column, decimalSeparator).numbers;
    },
    distinctNumbers: [...distinctNumbers],
    filledSample,
    texts: [...texts],
    profile,
  };
}
