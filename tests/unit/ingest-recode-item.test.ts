import { describe, expect, it } from 'vitest';
import { parseNumber, recodeCounts, recodeItem, reverseScore, type ItemSetup } from '../../src/lib/ingest';
import { labelKey } from '../../src/lib/ingest/value-labels';
import { MEMO_CELL_TEXTS } from '../../src/lib/ingest/ingest-thresholds';

const base: ItemSetup = Object.freeze({
  id: 'Q1', scale: null, reverse: false, min: 1, max: 5, missingCodes: Object.freeze([8, 9]), text: null,
  labels: Object.freeze([{ code: 1, label: 'Disagree' }, { code: 5, label: 'Agree' }]), missingLabels: Object.freeze(["Don't know"]),
});

describe('reverseScore', () => {
  it("flips on the item's range: x' = (min + max) − x (methods.md §1)", () => {
    expect(reverseScore(2, 1, 5)).toBe(4); // (1 + 5) − 2
    expect(reverseScore(0, 0, 10)).toBe(10); // (0 + 10) − 0
    expect(Object.is(reverseScore(1, -1, 1), -1)).toBe(true);
    expect(Object.is(reverseScore(0, -1, 1), 0)).toBe(true); // never −0
  });
});

describe('recodeItem', () => {
  const cells = Object.freeze(['3', '', '9', '7', 'agree', 'maybe', "don't know", '  2 ', '0']);

  it('keeps label and missing codes in raw and sets missing, invalid and out-of-range cells to NaN in recoded', () => {
    const read = recodeItem(cells, base, '.');
    expect(Array.from(read.raw)).toEqual([3, NaN, 9, 7, 5, NaN, NaN, 2, 0]);
    expect(Array.from(read.recoded)).toEqual([3, NaN, NaN, NaN, 5, NaN, NaN, 2, NaN]);
    expect(read.counts).toEqual({ answered: 3, blank: 1, declaredMissing: 2, outOfRange: 2, nonNumeric: 0, unmappedLabel: 1, mappedLabel: 1 });
  });

  it('reverse-scores only valid answers and counts text as non-numeric when the item has no labels', () => {
    const read = recodeItem(cells, { ...base, reverse: true, labels: [] }, '.');
    // methods.md §1: 3 → 6 − 3 = 3, 2 → 6 − 2 = 4
    expect(Array.from(read.recoded)).toEqual([3, NaN, NaN, NaN, NaN, NaN, NaN, 4, NaN]);
    expect(read.counts.nonNumeric).toBe(2);
    expect(read.counts.unmappedLabel).toBe(0);
  });

  it('reads decimal commas where the file uses them', () => {
    expect(Array.from(recodeItem(['2,5', '3.5'], { ...base, labels: [] }, ',').recoded)).toEqual([2.5, NaN]);
  });
});

/** The cell-by-cell reading recodeItem had before it read each distinct text once (methods.md §1), as a second opinion. */
function recodeCellByCell(cells: readonly string[], item: ItemSetup, decimalSeparator: '.' | ','): { raw: number[]; recoded: number[]; counts: Record<string, number> } {
  const codeOfLabel = new Map<string, number>();
  for (const label of item.labels) if (!codeOfLabel.has(labelKey(label.label))) codeOfLabel.set(labelKey(label.label), label.code);
  const missingLabel = new Set(item.missingLabels.map(labelKey));
  const counts = { answered: 0, blank: 0, declaredMissing: 0, outOfRange: 0, nonNumeric: 0, unmappedLabel: 0, mappedLabel: 0 };
  const raw: number[] = [];
  const recoded: number[] = [];
  for (const cell of cells) {
    raw.push(NaN);
    recoded.push(NaN);
    if (cell.trim() === '') { counts.blank++; continue; }
    let value = parseNumber(cell, decimalSeparator);
    if (Number.isNaN(value)) {
      const code = codeOfLabel.get(labelKey(cell));
      if (code !== undefined) { value = code; counts.mappedLabel++; }
      else if (missingLabel.has(labelKey(cell))) { counts.declaredMissing++; continue; }
      else { if (item.labels.length > 0) counts.unmappedLabel++; else counts.nonNumeric++; continue; }
    }
    raw[raw.length - 1] = value;
    if (item.missingCodes.includes(value)) { counts.declaredMissing++; continue; }
    if (value < item.min || value > item.max) { counts.outOfRange++; continue; }
    recoded[recoded.length - 1] = item.reverse ? reverseScore(value, item.min, item.max) : value;
    counts.answered++;
  }
  return { raw, recoded, counts };
}

describe('recodeItem and recodeCounts on awkward cells', () => {
  // Awkward cells: one-character codes, white space, a no-break space, decimals, decimal commas,
  // labels in other case, missing labels, a missing code that is a label's code, unmapped text, and
  // more distinct texts (ids) than the per-item memory of distinct texts keeps.
  const awkward = Object.freeze([
    '3', '3', ' 3', '3 ', '\u00a03', '3.0', '3,0', '', ' ', '\t', '9', '8', '09', '1e0', '+2', '-1', '5', 'AGREE', 'agree', ' Agree ',
    "Don't know", 'don’t know', 'x', '=1+2', '4', '4', '2', '\r', '10', '1',
    ...Array.from({ length: 3 * MEMO_CELL_TEXTS }, (_, k) => String(k % 2 === 0 ? `id${k}` : k % 6)),
  ]);
  const labelled: ItemSetup = { ...base, labels: [{ code: 1, label: 'Disagree' }, { code: 9, label: 'Agree' }] };
  const setups: readonly ItemSetup[] = [base, { ...base, reverse: true }, { ...base, labels: [], missingLabels: [] }, labelled, { ...base, min: 0, max: 10, missingCodes: [] }];

  it('gives the values and counts of the cell-by-cell reading, and recodeCounts the same counts', () => {
    for (const setup of setups) {
      for (const separator of ['.', ','] as const) {
        const read = recodeItem(awkward, setup, separator);
        const expected = recodeCellByCell(awkward, setup, separator);
        expect(Array.from(read.raw)).toEqual(expected.raw);
        expect(Array.from(read.recoded)).toEqual(expected.recoded);
        expect(read.counts).toEqual(expected.counts);
        expect(recodeCounts(awkward, setup, separator)).toEqual(read.counts);
      }
    }
  });
});
