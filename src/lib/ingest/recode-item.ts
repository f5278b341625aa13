/**
 * Reads one item's cells as numbers and recodes them (methods.md §1): value labels map to
 * codes, missing codes and labels become missing, numbers outside the valid range become
 * missing, and reverse-keyed items are flipped, `x' = (min + max) − x`.
 */
import { parseNumber } from './parse-number';
import type { ItemCounts, ItemSetup } from './types';
import { labelKey } from './value-labels';
import { columnCells } from './column-profile';
import { codeCells, type CodedColumn } from './table-columns';

/** One item read and recoded. */
export interface RecodedItem {
  /** Numbers as answered: label codes and missing codes kept; blank or unreadable cells NaN. */
  readonly raw: Float64Array;
  /** Valid answers, reverse-keyed items flipped; everything else NaN. */
  readonly recoded: Float64Array;
  readonly counts: ItemCounts;
}

/**
 * Reverses an answer on a scale from `min` to `max`.
 * @param value the answer.
 * @param min lowest valid answer.
 * @param max highest valid answer.
 * @returns `min + max − value`.
 * References: Paredown methods.md §1 (reverse-keyed items recoded with the codebook's range).
 */
export function reverseScore(value: number, min: number, max: number): number {
  const flipped = min + max - value;
  return flipped === 0 ? 0 : flipped;
}

/** Which count a cell adds to (the order of {@link ItemCounts}' first five fields, then unmapped labels). */
const ANSWERED = 0;
const BLANK = 1;
const DECLARED_MISSING = 2;
const OUT_OF_RANGE = 3;
const NON_NUMERIC = 4;
const UNMAPPED_LABEL = 5;

/** What one cell text becomes under an item's setup. */
interface CellRecode {
  readonly raw: number;
  readonly recoded: number;
  /** One of ANSWERED ... UNMAPPED_LABEL. */
  readonly tally: number;
  /** 1 when the text was read through a value label. */
  readonly mapped: number;
}

/**
 * Reads and recodes the cells of one item. Each distinct cell text is read once (an item holds a
 * handful of answer texts), which gives the same values and counts as reading every cell.
 * @param cells the column's cells, one per respondent.
 * @param item the item's setup (range, missing codes, labels, reverse).
 * @param decimalSeparator the table's decimal separator.
 * @returns raw and recoded values and what happened to the cells.
 * References: Paredown methods.md §1 "Preparing the response matrix".
 */
export function recodeItem(cells: readonly string[], item: ItemSetup, decimalSeparator: '.' | ','): RecodedItem {
  return recodeCodedItem(codeCells(cells), item, decimalSeparator);
}

/**
 * {@link recodeItem} for a coded column (`tableColumnCodes`): each distinct text is read and
 * recoded once, and the cells take their values by code.
 * @param column the column's distinct texts and each cell's code.
 * @param item the item's setup (range, missing codes, labels, reverse).
 * @param decimalSeparator the table's decimal separator.
 * @returns raw and recoded values and what happened to the cells, as recodeItem gives them.
 * References: Paredown methods.md §1 "Preparing the response matrix".
 */
export function recodeCodedItem(column: CodedColumn, item: ItemSetup, decimalSeparator: '.' | ','): RecodedItem {
  const n = column.codes.length;
  const raw = new Float64Array(n);
  const recoded = new Float64Array(n);
  const counts = readItemCells(column, item, decimalSeparator, raw, recoded);
  return { raw, recoded, counts };
}

/**
 * {@link recodeCodedItem} writing the values into the caller's arrays (a wave's matrices, one
 * column at a time), so no column is made and copied.
 * @param column the column's distinct texts and each cell's code.
 * @param item the item's setup (range, missing codes, labels, reverse).
 * @param decimalSeparator the table's decimal separator.
 * @param raw where the raw values go, one per cell (e.g. a subarray of the raw matrix).
 * @param recoded where the recoded values go, one per cell.
 * @throws {RangeError} when `raw` or `recoded` does not have one element per cell.
 * @returns the counts, as recodeCodedItem gives them.
 * References: Paredown methods.md §1 "Preparing the response matrix".
 */
export function recodeCodedItemInto(column: CodedColumn, item: ItemSetup, decimalSeparator: '.' | ',', raw: Float64Array, recoded: Float64Array): ItemCounts {
  const n = column.codes.length;
  if (raw.length !== n || recoded.length !== n) throw new RangeError(`recodeCodedItemInto: ${n} cells need arrays of ${n} values, not ${raw.length} and ${recoded.length}`);
  return readItemCells(column, item, decimalSeparator, raw, recoded);
}

/**
 * What happens to the cells of one item when recoded, without the values: the counts of
 * {@link recodeItem} (the setup form and the proposal show them before any wave is built).
 * @param cells the column's cells, one per respondent.
 * @param item the item's setup (range, missing codes, labels, reverse).
 * @param decimalSeparator the table's decimal separator.
 * @returns the counts, equal to `recodeItem(cells, item, decimalSeparator).counts`.
 * References: Paredown methods.md §1 "Preparing the response matrix".
 */
export function recodeCounts(cells: readonly string[], item: ItemSetup, decimalSeparator: '.' | ','): ItemCounts {
  return readItemCells(codeCells(cells), item, decimalSeparator, null, null);
}

/**
 * {@link recodeCounts} for a coded column (`tableColumnCodes`).
 * @param column the column's distinct texts and each cell's code.
 * @param item the item's setup (range, missing codes, labels, reverse).
 * @param decimalSeparator the table's decimal separator.
 * @returns the counts, equal to `recodeCodedItem(column, item, decimalSeparator).counts`.
 * References: Paredown methods.md §1 "Preparing the response matrix".
 */
export function recodeCodedCounts(column: CodedColumn, item: ItemSetup, decimalSeparator: '.' | ','): ItemCounts {
  return readItemCells(column, item, decimalSeparator, null, null);
}

/** The loop of recodeItem and recodeCounts: counts, and the values into `raw` and `recoded` when given. */
function readItemCells(column: CodedColumn, item: ItemSetup, decimalSeparator: '.' | ',', raw: Float64Array | null, recoded: Float64Array | null): ItemCounts {
  const { texts, codes } = column;
  const n = codes.length;
  const codeOfLabel = new Map<string, number>();
  for (const label of item.labels) {
    const key = labelKey(label.label);
    if (!codeOfLabel.has(key)) codeOfLabel.set(key, label.code);
  }
  const missingLabel = new Set(item.missingLabels.map(labelKey));
  const missingCodes = new Set(item.missingCodes);
  const recodeCell = (cell: string): CellRecode => {
    if (cell.trim() === '') return { raw: Number.NaN, recoded: Number.NaN, tally: BLANK, mapped: 0 };
    let value = parseNumber(cell, decimalSeparator);
    let mapped = 0;
    if (Number.isNaN(value)) {
      const key = labelKey(cell);
      const code = codeOfLabel.get(key);
      if (code !== undefined) {
        value = code;
        mapped = 1;
      } else if (missingLabel.has(key)) {
        return { raw: Number.NaN, recoded: Number.NaN, tally: DECLARED_MISSING, mapped: 0 };
      } else {
        return { raw: Number.NaN, recoded: Number.NaN, tally: item.labels.length > 0 ? UNMAPPED_LABEL : NON_NUMERIC, mapped: 0 };
      }
    }
    if (missingCodes.has(value)) return { raw: value, recoded: Number.NaN, tally: DECLARED_MISSING, mapped };
    if (value < item.min || value > item.max) return { raw: value, recoded: Number.NaN, tally: OUT_OF_RANGE, mapped };
    return { raw: value, recoded: item.reverse ? reverseScore(value, item.min, item.max) : value, tally: ANSWERED, mapped };
  };
  // Each distinct text once; the cells then take their values and counts by code.
  const m = texts.length;
  const rawOf = new Float64Array(m);
  const recodedOf = new Float64Array(m);
  const results: CellRecode[] = new Array(m);
  for (let k = 0; k < m; k++) {
    const result = recodeCell(texts[k]);
    results[k] = result;
    rawOf[k] = result.raw;
    recodedOf[k] = result.recoded;
  }
  if (raw !== null && recoded !== null) {
    for (let i = 0; i < n; i++) {
      const code = codes[i];
      raw[i] = rawOf[code];
      recoded[i] = recodedOf[code];
    }
  }
  const { occurrences } = columnCells(column);
  const tallies = [0, 0, 0, 0, 0, 0];
  let mappedLabel = 0;
  for (let k = 0; k < m; k++) {
    tallies[results[k].tally] += occurrences[k];
    mappedLabel += results[k].mapped * occurrences[k];
  }
  return {
    answered: tallies[ANSWERED],
    blank: tallies[BLANK],
    declaredMissing: tallies[DECLARED_MISSING],
    outOfRange: tallies[OUT_OF_RANGE],
    nonNumeric: tallies[NON_NUMERIC],
    unmappedLabel: tallies[UNMAPPED_LABEL],
    mappedLabel,
  };
}
