import { describe, expect, it } from 'vitest';
import { kaiserMeyerOlkin, kmoLabel } from '../../src/lib/stats/kmo';
import { symmetricEigen } from '../../src/lib/stats/symmetric-eigen';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import {
  allFinite,
  completeItemMatrix,
  dataset,
  indefiniteCorrelation,
  overlapFixture,
  pearsonOf,
  permuteSquare,
  referenceCorrelation,
  relativeError,
} from './overlap-fixtures';

describe('kaiserMeyerOlkin', () => {
  it('matches psych::KMO overall MSA and per-item MSAi to 1e-6 on every dataset', () => {
    // R 4.2.2, psych 2.2.9: psych::KMO(cor(X))$MSA and $MSAi, fixtures/reference/overlap.json
    for (const entry of overlapFixture.datasets) {
      const result = kaiserMeyerOlkin(referenceCorrelation(entry));
      expect(relativeError(result.overall!, entry.kmo.overall), entry.name).toBeLessThan(1e-6);
      entry.kmo.items.forEach((expected, j) => expect(relativeError(result.items[j].msa!, expected), `${entry.name} ${j}`).toBeLessThan(1e-6));
      expect(result.notices).toEqual([]);
    }
  });

  it('labels the values as Kaiser (1974) does', () => {
    // R 4.2.2: psych::KMO(cor(na.omit(bfi[, 1:25])))$MSA = 0.8486... → "meritorious"
    expect(kaiserMeyerOlkin(referenceCorrelation(dataset('bfi'))).label).toBe('meritorious');
    // longley: 0.5849 → miserable; mtcars: 0.7933 → middling
    expect(kaiserMeyerOlkin(referenceCorrelation(dataset('longley'))).label).toBe('miserable');
    expect(kaiserMeyerOlkin(referenceCorrelation(dataset('mtcars'))).label).toBe('middling');
    // Kaiser 1974: bounds .9/.8/.7/.6/.5
    expect([0.95, 0.9, 0.85, 0.7, 0.65, 0.5, 0.49, 0].map(kmoLabel)).toEqual([
      'marvelous', 'marvelous', 'meritorious', 'middling', 'mediocre', 'miserable', 'unacceptable', 'unacceptable',
    ]);
    expect(() => kmoLabel(Number.NaN)).toThrow(/\[0, 1\]/);
  });

  it('does not change when an item is reverse-keyed or the items are reordered', () => {
    const entry = dataset('bfi');
    // R 4.2.2: psych::KMO(cor(X))$MSA after recoding A1, C4, C5, E1, E2, O2, O5 as 7 − x
    expect(relativeError(entry.reversedKeys!.kmoOverall, entry.kmo.overall)).toBeLessThan(1e-12);
    const matrix = completeItemMatrix(entry);
    const data = Float64Array.from(matrix.data);
    for (const j of entry.reversedKeys!.items) for (let i = 0; i < matrix.rows; i++) data[j * matrix.rows + i] = 7 - data[j * matrix.rows + i];
    const reversed = kaiserMeyerOlkin(pearsonOf({ ...matrix, data }));
    expect(relativeError(reversed.overall!, entry.reversedKeys!.kmoOverall)).toBeLessThan(1e-9);
    const order = Array.from({ length: 25 }, (_, k) => (k * 7) % 25);
    const permuted = kaiserMeyerOlkin(permuteSquare(referenceCorrelation(entry), order));
    order.forEach((original, position) => expect(relativeError(permuted.items[position].msa!, entry.kmo.items[original])).toBeLessThan(1e-6));
  });

  it('gives 0.5 for every pair of two items (the partial correlation equals r)', () => {
    // Closed form: for p = 2, q12 = −S12/√(S11 S22) = r, so MSA = r²/(r² + r²)
    const result = kaiserMeyerOlkin(squareMatrixFromRows([[1, 0.4], [0.4, 1]]));
    expect(result.overall).toBeCloseTo(0.5, 14);
    expect(result.items.map((item) => item.msa)).toEqual([expect.closeTo(0.5, 14), expect.closeTo(0.5, 14)]);
    expect(result.label).toBe('miserable');
  });

  it('reports a singular matrix (exact duplicate) as null, naming the dependent items', () => {
    const result = kaiserMeyerOlkin(squareMatrixFromRows([[1, 0.5, 0.5], [0.5, 1, 1], [0.5, 1, 1]]));
    expect(result.overall).toBeNull();
    expect(result.items.every((item) => item.msa === null && item.label === null)).toBe(true);
    expect(result.notices).toHaveLength(1);
    expect(result.notices[0]).toMatchObject({ code: 'exact-dependency', items: [1, 2] });
    expect(allFinite(result)).toBe(true);
  });

  it('reports KMO as undefined for a single item or uncorrelated items, never NaN', () => {
    const single = kaiserMeyerOlkin(squareMatrixFromRows([[1]]));
    expect(single.overall).toBeNull();
    expect(single.notices[0]).toMatchObject({ code: 'kmo-undefined', items: [0] });
    const identity = kaiserMeyerOlkin(squareMatrixFromRows([[1, 0, 0], [0, 1, 0], [0, 0, 1]]));
    expect(identity.overall).toBeNull();
    expect(identity.items.every((item) => item.msa === null)).toBe(true);
    expect(allFinite(identity)).toBe(true);
  });

  it('refuses an indefinite matrix with a notice, and reuses a given decomposition', () => {
    const indefinite = kaiserMeyerOlkin(indefiniteCorrelation());
    expect(indefinite.overall).toBeNull();
    expect(indefinite.notices[0].code).toBe('indefinite-matrix');
    const R = referenceCorrelation(dataset('swiss'));
    const before = Float64Array.from(R.data);
    expect(kaiserMeyerOlkin(R, { eigen: symmetricEigen(R) })).toEqual(kaiserMeyerOlkin(R));
    expect(Array.from(R.data)).toEqual(Array.from(before));
  });
});
