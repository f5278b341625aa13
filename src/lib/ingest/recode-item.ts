/**
 * Reads one item's cells as numbers and recodes them (methods.md §1): value labels map to
 * codes, missing codes and labels become missing, numbers outside the valid range become
 * missing, and reverse-keyed items are flipped, `x' = (min + max) − x`.
 */
import { parseNumber } from './parse-number';
import type { ItemCounts, ItemSetup } from './types';
import { labelKey } from './value-labels';

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

/**
 * Reads and recodes the cells of one item.
 * @param cells the column's cells, one per respondent.
 * @param item the item's setup (range, missing codes, labels, reverse).
 * @param decimalSeparator the table's decimal separator.
 * @returns raw and recoded values and what happened to the cells.
 * References: Paredown methods.md §1 "Preparing the response matrix".
 */
export function recodeItem(cells: readonly string[], item: ItemSetup, decimalSeparator: '.' | ','): RecodedItem {
  const n = cells.length;
  const raw = new Float64Array(n);
  const recoded = new Float64Array(n);
  const codeOfLabel = new Map<string, number>();
  for (const label of item.labels) {
    const key = labelKey(label.label);
    if (!codeOfLabel.has(key)) codeOfLabel.set(key, label.code);
  }
  const missingLabel = new Set(item.missingLabels.map(labelKey));
  const missingCodes = new Set(item.missingCodes);
  let answered = 0;
  let blank = 0;
  let declaredMissing = 0;
  let outOfRange = 0;
  let nonNumeric = 0;
  let unmappedLabel = 0;
  let mappedLabel = 0;
  for (let i = 0; i < n; i++) {
    const cell = cells[i];
    raw[i] = Number.NaN;
    recoded[i] = Number.NaN;
    if (cell.trim() === '') {
      blank++;
      continue;
    }
    let value = parseNumber(cell, decimalSeparator);
    if (Number.isNaN(value)) {
      const key = labelKey(cell);
      const code = codeOfLabel.get(key);
      if (code !== undefined) {
        value = code;
        mappedLabel++;
      } else if (missingLabel.has(key)) {
        declaredMissing++;
        continue;
      } else {
        if (item.labels.length > 0) unmappedLabel++;
        else nonNumeric++;
        continue;
      }
    }
    raw[i] = value;
    if (missingCodes.has(value)) {
      declaredMissing++;
      continue;
    }
    if (value < item.min || value > item.max) {
      outOfRange++;
      continue;
    }
    recoded[i] = item.reverse ? reverseScore(value, item.min, item.max) : value;
    answered++;
  }
  return { raw, recoded, counts: { answered, blank, declaredMissing, outOfRange, nonNumeric, unmappedLabel, mappedLabel } };
}
