import { describe, expect, it } from 'vitest';
import { belsleyCollinearity, type BelsleyCollinearityResult } from '../../src/lib/stats/belsley-collinearity';
import { centeredCrossProducts } from '../../src/lib/stats/cross-products';
import { itemMatrixFromColumns, type ItemMatrix } from '../../src/lib/stats/types';
import {
  allFinite,
  completeCases,
  correlatedData,
  dataset,
  itemMatrixOf,
  overlapFixture,
  permuteItems,
  relativeError,
  reverseItem,
  type BkwReference,
} from './overlap-fixtures';

/** Compares with R: indices relative, proportions absolute. */
function expectMatches(result: BelsleyCollinearityResult, reference: BkwReference, tolerance: number, label: string): void {
  expect(result.conditionIndices).toHaveLength(reference.conditionIndices.length);
  reference.conditionIndices.forEach((expected, k) => {
    expect(relativeError(result.conditionIndices[k]!, expected), `${label} η${k}`).toBeLessThan(tolerance);
    reference.proportions[k].forEach((proportion, j) => {
      expect(Math.abs(result.varianceProportions[k][j] - proportion), `${label} π[${k}][${j}]`).toBeLessThan(tolerance);
    });
  });
}

function expectColumnsSumToOne(result: BelsleyCollinearityResult): void {
  const width = result.varianceProportions.length;
  for (let j = 0; j < width; j++) {
    let sum = 0;
    for (let k = 0; k < width; k++) sum += result.varianceProportions[k][j];
    expect(sum).toBeCloseTo(1, 12);
  }
}

describe('belsleyCollinearity', () => {
  it('matches base R svd() of the scaled [1, X] to 1e-6 on every dataset (QR path)', () => {
    // R 4.2.2: s <- svd(sweep(cbind(1, X), 2, sqrt(colSums(cbind(1, X)^2)), '/')); max(s$d)/s$d and
    // t(phi / rowSums(phi)), phi = sweep(s$v^2, 2, s$d^2, '/'); fixtures/reference/overlap.json
    for (const entry of overlapFixture.datasets) {
      const result = belsleyCollinearity(completeCases(itemMatrixOf(entry)));
      expect(result.path, entry.name).toBe('qr');
      expectMatches(result, entry.bkw, 1e-6, entry.name);
      expect(result.conditionIndices[0]).toBe(1);
      expectColumnsSumToOne(result);
    }
  });

  it('keeps Longley (condition index 43,275) accurate to 1e-9 on the QR path', () => {
    // R 4.2.2: svd() of the scaled longley predictors with intercept, as above
    const entry = dataset('longley');
    expectMatches(belsleyCollinearity(completeCases(itemMatrixOf(entry))), entry.bkw, 1e-9, 'longley');
  });

  it('gives the same figures on the Gram path to 1e-6, Longley (η = 43,275) included', () => {
    // R 4.2.2: same svd() reference. The Gram path squares the singular values, so its error
    // grows with η² (measured: 2e-8 on longley, below 1e-12 on the others).
    for (const entry of overlapFixture.datasets) {
      const matrix = completeCases(itemMatrixOf(entry));
      const result = belsleyCollinearity(matrix, { path: 'gram' });
      expect(result.path).toBe('gram');
      expectMatches(result, entry.bkw, 1e-6, entry.name);
      expectColumnsSumToOne(result);
      // The cross-products computed for the Pearson matrix can be handed over (no second pass).
      const reused = belsleyCollinearity(matrix, { path: 'gram', crossProducts: centeredCrossProducts(matrix) });
      expect(reused).toEqual(result);
    }
  });

  it('drops incomplete rows itself (psych::bfi: 2800 rows, 2436 complete)', () => {
    // R 4.2.2: svd() on na.omit(psych::bfi[, 1:25]) scaled with intercept
    const entry = dataset('bfi');
    const raw = itemMatrixOf(entry);
    expect(raw.rows).toBe(2800);
    const result = belsleyCollinearity(raw);
    expect(result.rowsUsed).toBe(2436);
    expect(result.rowsExcluded).toBe(364);
    expectMatches(result, entry.bkw, 1e-6, 'bfi raw');
  });

  it('changes when an item is reverse-keyed (the data are not centred), as R does', () => {
    // R 4.2.2: the same svd() after X[, c('A1','C4','C5','E1','E2','O2','O5')] <- 7 - X[, ...]
    const entry = dataset('bfi');
    let matrix = completeCases(itemMatrixOf(entry));
    for (const j of entry.reversedKeys!.items) matrix = reverseItem(matrix, j, 1, 6);
    const reversed = belsleyCollinearity(matrix);
    expectMatches(reversed, entry.reversedKeys!.bkw, 1e-6, 'bfi reversed');
    const original = belsleyCollinearity(completeCases(itemMatrixOf(entry)));
    expect(Math.abs(reversed.conditionIndices[25]! - original.conditionIndices[25]!)).toBeGreaterThan(0.1);
  });

  it('is invariant to the order of the items (permute, then un-permute the proportions)', () => {
    const matrix = completeCases(itemMatrixOf(dataset('mtcars')));
    const order = [7, 2, 9, 0, 4, 1, 8, 3, 6, 5];
    const base = belsleyCollinearity(matrix);
    const permuted = belsleyCollinearity(permuteItems(matrix, order));
    base.conditionIndices.forEach((index, k) => expect(relativeError(permuted.conditionIndices[k]!, index!)).toBeLessThan(1e-10));
    for (let k = 0; k < 11; k++) {
      expect(Math.abs(permuted.varianceProportions[k][0] - base.varianceProportions[k][0])).toBeLessThan(1e-9);
      order.forEach((original, position) => {
        expect(Math.abs(permuted.varianceProportions[k][position + 1] - base.varianceProportions[k][original + 1])).toBeLessThan(1e-9);
      });
    }
  });

  it('names near-dependencies: dimensions with η >= 10 carrying >= 0.5 of two or more variances', () => {
    // Belsley, Kuh & Welsch 1980: strong from 30, moderate from 10, proportions >= 0.5
    const entry = dataset('longley');
    const result = belsleyCollinearity(completeCases(itemMatrixOf(entry)));
    expect(result.nearDependencies.length).toBeGreaterThan(0);
    const strongest = result.nearDependencies[0];
    expect(strongest.dimension).toBe(6);
    expect(strongest.strength).toBe('strong');
    // R 4.2.2: the columns whose proportion on the last dimension is >= 0.5 (intercept,
    // GNP, Unemployed and Year: columns 0, 2, 3, 6 of [1, X])
    expect(strongest.columns).toEqual([0, 2, 3, 6]);
    const expected = entry.bkw.proportions[6].flatMap((proportion, j) => (proportion >= 0.5 ? [j] : []));
    expect(strongest.columns).toEqual(expected);
  });

  it('reports a constant item as exactly dependent on the intercept, with null index and no NaN', () => {
    const base = correlatedData(60, 3, 5, 1, true);
    const columns = [0, 1, 2].map((j) => base.data.subarray(j * 60, (j + 1) * 60));
    const withConstant: ItemMatrix = itemMatrixFromColumns([columns[0], new Float64Array(60).fill(4), columns[1], columns[2]]);
    for (const path of ['qr', 'gram'] as const) {
      const result = belsleyCollinearity(withConstant, { path });
      expect(result.conditionIndices[4], path).toBeNull();
      expect(result.notices.find((notice) => notice.code === 'exact-dependency')?.items).toEqual([1]);
      expect(result.varianceProportions[4][0]).toBeCloseTo(1, 9);
      expect(result.varianceProportions[4][2]).toBeCloseTo(1, 9);
      expect(result.nearDependencies[0]).toMatchObject({ dimension: 4, strength: 'exact', conditionIndex: null, columns: [0, 2] });
      expectColumnsSumToOne(result);
      expect(allFinite(result)).toBe(true);
    }
  });

  it('handles an exact duplicate, an all-zero item and more items than respondents without NaN', () => {
    const base = correlatedData(40, 3, 6, 1, true);
    const c = (j: number) => base.data.subarray(j * 40, (j + 1) * 40);
    const duplicate = belsleyCollinearity(itemMatrixFromColumns([c(0), c(1), c(0), c(2)]));
    expect(duplicate.notices.find((notice) => notice.code === 'exact-dependency')?.items).toEqual([0, 2]);
    expect(allFinite(duplicate)).toBe(true);
    const zero = belsleyCollinearity(itemMatrixFromColumns([c(0), new Float64Array(40), c(1)]));
    expect(zero.notices.map((notice) => notice.code)).toEqual(['zero-column', 'exact-dependency']);
    expect(allFinite(zero)).toBe(true);
    const wide = correlatedData(4, 7, 3);
    for (const path of ['qr', 'gram'] as const) {
      const result = belsleyCollinearity(wide, { path });
      expect(result.conditionIndices.filter((index) => index === null)).toHaveLength(4);
      expectColumnsSumToOne(result);
      expect(allFinite(result)).toBe(true);
    }
  });

  it('reports no complete rows instead of failing, and refuses infinite values', () => {
    const empty = belsleyCollinearity(itemMatrixFromColumns([[1, Number.NaN], [Number.NaN, 2]]));
    expect(empty.rowsUsed).toBe(0);
    expect(empty.notices[0].code).toBe('no-complete-rows');
    expect(() => belsleyCollinearity(itemMatrixFromColumns([[1, Number.POSITIVE_INFINITY, 3]]))).toThrow(/item 0 has an infinite value at respondent 1/);
    const matrix = correlatedData(30, 3, 1);
    expect(() => belsleyCollinearity(matrix, { path: 'gram', crossProducts: centeredCrossProducts(correlatedData(31, 3, 1)) })).toThrow(/cover 31 rows/);
  });

  it('leaves its input untouched', () => {
    const matrix = completeCases(itemMatrixOf(dataset('swiss')));
    const before = Float64Array.from(matrix.data);
    belsleyCollinearity(matrix);
    belsleyCollinearity(matrix, { path: 'gram' });
    expect(Array.from(matrix.data)).toEqual(Array.from(before));
  });
});
