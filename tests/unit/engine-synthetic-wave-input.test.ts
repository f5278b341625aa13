import { describe, expect, it } from 'vitest';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import type { SyntheticWave } from '../../src/lib/synth/types';

// A hand-written wave: the expected values follow from methods.md §1 (x' = min + max − x, missing
// codes and blanks become missing).
const wave: SyntheticWave = {
  columns: [
    { name: 'respondent_id', values: [1, 2, 3] },
    { name: 'q1', values: [1, 9, 5] },
    { name: 'q2', values: [2, null, 7] },
    { name: 'overall', values: [3, 4, 5] },
  ],
  codebook: [
    { item: 'q1', scale: 'S', reverse: false, min: 1, max: 5, missing: [9], text: 'First statement' },
    { item: 'q2', scale: 'S', reverse: true, min: 1, max: 7, missing: [9], text: '' },
    { item: 'overall', scale: '', reverse: false, min: 0, max: 10, missing: [], text: 'Overall' },
  ],
  truth: { plantedPairs: [], duplicates: [], doublets: [], crossLoadings: [], ownLoadingScales: [], reverseTwins: [], constantItems: [], scales: [], straightliners: [], speeders: [], outcome: 'overall' },
};

describe('engineInputFromSyntheticWave', () => {
  it('recodes reverse-keyed items, turns missing codes and blanks into NaN, and leaves the outcome out', () => {
    const { matrix, items } = engineInputFromSyntheticWave(wave, ['q2']);
    expect(matrix.rows).toBe(3);
    expect(matrix.columns).toBe(2);
    expect(Array.from(matrix.data)).toEqual([1, Number.NaN, 5, 6, Number.NaN, 1]); // q2: 8 − x
    expect(items).toEqual([
      { id: 'q1', scale: 'S', text: 'First statement', locked: false, min: 1, max: 5 },
      { id: 'q2', scale: 'S', text: null, locked: true, min: 1, max: 7 },
    ]);
  });

  it('refuses a value outside the range and a locked id that names no item', () => {
    const bad: SyntheticWave = { ...wave, columns: wave.columns.map((column) => (column.name === 'q1' ? { ...column, values: [1, 6, 5] } : column)) };
    expect(() => engineInputFromSyntheticWave(bad)).toThrow(/item "q1" holds 6 at row 1, outside 1..5/);
    expect(() => engineInputFromSyntheticWave(wave, ['zz'])).toThrow(/locked id "zz" names no item/);
  });
});
