import { describe, expect, it } from 'vitest';
import { recodeItem, reverseScore, type ItemSetup } from '../../src/lib/ingest';

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
