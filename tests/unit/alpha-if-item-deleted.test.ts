import { describe, expect, it } from 'vitest';
import { alphaIfItemDeleted } from '../../src/lib/stats/alpha-if-item-deleted';
import { cronbachAlpha } from '../../src/lib/stats/cronbach-alpha';
import { squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
import { reliabilityFixture } from './reliability-cases';
import { collectNumbers } from './reliability-fixtures';

function without(matrix: SquareMatrix, left: number): SquareMatrix {
  const k = matrix.order;
  const keep = Array.from({ length: k }, (_, i) => i).filter((i) => i !== left);
  return squareMatrixFromRows(keep.map((i) => keep.map((j) => matrix.data[i * k + j])));
}

describe('alphaIfItemDeleted', () => {
  it.each(reliabilityFixture.cases.map((c) => [c.name, c] as const))(
    'matches psych::alpha alpha.drop on %s at 1e-6',
    (_name, reference) => {
      const covariance = squareMatrixFromRows(reference.covariance);
      const before = Float64Array.from(covariance.data);
      const result = alphaIfItemDeleted(covariance);
      reference.alpha.alphaDropRaw.forEach((expected, i) => {
        expect(Math.abs((result.alpha[i] as number) - expected)).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::alpha(x)$alpha.drop$raw_alpha
      });
      reference.alpha.alphaDropStd.forEach((expected, i) => {
        expect(Math.abs((result.alphaStandardized[i] as number) - expected)).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::alpha(x)$alpha.drop$std.alpha
      });
      expect(covariance.data).toEqual(before);
    },
  );

  it('equals cronbachAlpha of the matrix with the item removed', () => {
    // Identity: the closed-form sums against a direct recomputation
    const covariance = squareMatrixFromRows(reliabilityFixture.cases.find((c) => c.name === 'attitude')!.covariance);
    const result = alphaIfItemDeleted(covariance);
    for (let i = 0; i < covariance.order; i++) {
      const direct = cronbachAlpha(without(covariance, i));
      expect(result.alpha[i]).toBeCloseTo(direct.alpha as number, 13);
      expect(result.alphaStandardized[i]).toBeCloseTo(direct.alphaStandardized as number, 13);
    }
  });

  it('is undefined for scales of one or two items (one item would remain)', () => {
    const two = alphaIfItemDeleted(squareMatrixFromRows(reliabilityFixture.twoItems.covariance));
    expect(two.alpha).toEqual([null, null]);
    expect(two.alphaStandardized).toEqual([null, null]);
    expect(two.notices.map((n) => n.code)).toEqual(['too-few-items']);
    expect(alphaIfItemDeleted(squareMatrixFromRows([[1]])).alpha).toEqual([null]);
  });

  it('handles a constant item: standardized alpha only where it is the item deleted', () => {
    const covariance = squareMatrixFromRows([
      [1, 0.5, 0.4, 0],
      [0.5, 1, 0.3, 0],
      [0.4, 0.3, 1, 0],
      [0, 0, 0, 0],
    ]);
    const result = alphaIfItemDeleted(covariance);
    expect(result.alphaStandardized.slice(0, 3)).toEqual([null, null, null]);
    expect(result.alphaStandardized[3]).toBeCloseTo(cronbachAlpha(without(covariance, 3)).alphaStandardized as number, 14);
    expect(result.alpha[0]).toBeCloseTo(cronbachAlpha(without(covariance, 0)).alpha as number, 14);
    expect(result.notices.map((n) => n.code)).toEqual(['constant-item']);
    expect(collectNumbers(result).every(Number.isFinite)).toBe(true);
  });

  it('reports a remaining scale without variance', () => {
    // Items 1 and 2 cancel: deleting item 0 leaves a sum score with zero variance.
    const result = alphaIfItemDeleted(squareMatrixFromRows([[1, 0.2, -0.2], [0.2, 1, -1], [-0.2, -1, 1]]));
    expect(result.alpha[0]).toBeNull();
    expect(result.alphaStandardized[0]).toBeNull();
    expect(result.notices[0]).toEqual(expect.objectContaining({ code: 'zero-total-variance', items: [0] }));
  });
});
