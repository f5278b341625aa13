import { describe, expect, it } from 'vitest';
import { itemRestCorrelations } from '../../src/lib/stats/item-rest-correlation';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { reliabilityFixture } from './reliability-cases';
import { collectNumbers } from './reliability-fixtures';

describe('itemRestCorrelations', () => {
  it.each(reliabilityFixture.cases.map((c) => [c.name, c] as const))('matches psych::alpha r.drop on %s at 1e-6', (_name, reference) => {
    const covariance = squareMatrixFromRows(reference.covariance);
    const before = Float64Array.from(covariance.data);
    const result = itemRestCorrelations(covariance);
    expect(result.correlations).toHaveLength(reference.items.length);
    result.correlations.forEach((value, i) => {
      expect(Math.abs((value as number) - reference.alpha.rDrop[i])).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::alpha(x)$item.stats$r.drop
    });
    expect(result.notices).toEqual([]);
    expect(covariance.data).toEqual(before);
  });

  it('gives the plain correlation for two items (psych::alpha r.drop)', () => {
    const reference = reliabilityFixture.twoItems;
    const result = itemRestCorrelations(squareMatrixFromRows(reference.covariance));
    expect(Math.abs((result.correlations[0] as number) - reference.rDrop[0])).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::alpha(x)$item.stats$r.drop
    expect(Math.abs((result.correlations[1] as number) - reference.rDrop[1])).toBeLessThan(1e-6);
  });

  it('equals the correlation of the item with the sum of the others computed from raw scores', () => {
    // Independent check: build the rest score explicitly from three invented items.
    const items = [
      [1, 2, 3, 4, 5, 2, 3],
      [2, 2, 4, 5, 4, 1, 3],
      [1, 3, 3, 5, 5, 2, 2],
    ];
    const n = items[0].length;
    const mean = (v: number[]) => v.reduce((s, x) => s + x, 0) / v.length;
    const cov = (a: number[], b: number[]) => {
      const ma = mean(a);
      const mb = mean(b);
      return a.reduce((s, x, i) => s + (x - ma) * (b[i] - mb), 0) / (n - 1);
    };
    const covariance = squareMatrixFromRows(items.map((a) => items.map((b) => cov(a, b))));
    const rest = items[1].map((x, i) => x + items[2][i]);
    const expected = cov(items[0], rest) / Math.sqrt(cov(items[0], items[0]) * cov(rest, rest));
    expect(itemRestCorrelations(covariance).correlations[0]).toBeCloseTo(expected, 13);
  });

  it('reports one item, a constant item and a constant rest as null with notices, never NaN', () => {
    const one = itemRestCorrelations(squareMatrixFromRows([[2]]));
    expect(one.correlations).toEqual([null]);
    expect(one.notices.map((n) => n.code)).toEqual(['too-few-items']);

    const withConstant = itemRestCorrelations(squareMatrixFromRows([[1, 0.4, 0], [0.4, 1, 0], [0, 0, 0]]));
    expect(withConstant.correlations[2]).toBeNull();
    expect(withConstant.correlations[0]).toBeCloseTo(0.4, 14); // rest = item 1 + a constant
    expect(withConstant.notices.map((n) => n.code)).toEqual(['constant-item']);

    const constantRest = itemRestCorrelations(squareMatrixFromRows([[1, 0], [0, 0]]));
    expect(constantRest.correlations).toEqual([null, null]);
    expect(constantRest.notices.map((n) => n.code)).toEqual(['constant-item', 'constant-rest']);
    expect(collectNumbers([one, withConstant, constantRest]).every(Number.isFinite)).toBe(true);
  });

  it('refuses a non-symmetric matrix', () => {
    expect(() => itemRestCorrelations(squareMatrixFromRows([[1, 0.2], [0.1, 1]]))).toThrow(/itemRestCorrelations: the matrix is not symmetric/);
  });
});
