import { describe, expect, it } from 'vitest';
import { alphaFromVarianceSums, constantItemIndices, cronbachAlpha } from '../../src/lib/stats/cronbach-alpha';
import { spearmanBrown } from '../../src/lib/stats/spearman-brown';
import { squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
import { reliabilityFixture } from './reliability-cases';
import { collectNumbers } from './reliability-fixtures';

function permuted(matrix: SquareMatrix, order: number[]): SquareMatrix {
  const k = matrix.order;
  return squareMatrixFromRows(order.map((i) => order.map((j) => matrix.data[i * k + j])));
}

function compoundSymmetric(k: number, r: number, variance = 1): SquareMatrix {
  return squareMatrixFromRows(Array.from({ length: k }, (_, i) => Array.from({ length: k }, (_, j) => (i === j ? variance : r * variance))));
}

describe('cronbachAlpha', () => {
  it.each(reliabilityFixture.cases.map((c) => [c.name, c] as const))(
    'matches psych::alpha raw and standardized alpha on %s at 1e-6',
    (_name, reference) => {
      const covariance = squareMatrixFromRows(reference.covariance);
      const before = Float64Array.from(covariance.data);
      const result = cronbachAlpha(covariance);
      expect(result.alpha).not.toBeNull();
      expect(Math.abs((result.alpha as number) - reference.alpha.rawAlpha)).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::alpha(x)$total$raw_alpha
      expect(Math.abs((result.alphaStandardized as number) - reference.alpha.stdAlpha)).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::alpha(x)$total$std.alpha
      expect(result.items).toBe(reference.items.length);
      expect(result.notices).toEqual([]);
      expect(covariance.data).toEqual(before); // input not mutated
    },
  );

  it('matches psych::alpha on a two-item scale', () => {
    const reference = reliabilityFixture.twoItems;
    const result = cronbachAlpha(squareMatrixFromRows(reference.covariance));
    expect(Math.abs((result.alpha as number) - reference.rawAlpha)).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::alpha(bfi[c("A2","A3")] complete)$total$raw_alpha
    expect(Math.abs((result.alphaStandardized as number) - reference.stdAlpha)).toBeLessThan(1e-6); // same call, $total$std.alpha
  });

  it('gives the Spearman-Brown step-up of r̄ as standardized alpha for parallel items', () => {
    // Identity: for k items with equal correlations r, standardized alpha = k r / (1 + (k − 1) r)
    const result = cronbachAlpha(compoundSymmetric(6, 0.35, 2.5));
    expect(result.alphaStandardized).toBeCloseTo(spearmanBrown(0.35, 6), 14);
    expect(result.averageCorrelation).toBeCloseTo(0.35, 14);
    // Equal variances: raw alpha equals standardized alpha (Cronbach 1951)
    expect(result.alpha).toBeCloseTo(result.alphaStandardized as number, 14);
  });

  it('is invariant to the order of the items', () => {
    const covariance = squareMatrixFromRows(reliabilityFixture.cases[0].covariance);
    const shuffled = permuted(covariance, [3, 0, 4, 2, 1]);
    expect(cronbachAlpha(shuffled).alpha).toBeCloseTo(cronbachAlpha(covariance).alpha as number, 14);
    expect(cronbachAlpha(shuffled).alphaStandardized).toBeCloseTo(cronbachAlpha(covariance).alphaStandardized as number, 14);
  });

  it('reports a one-item scale as undefined, not NaN', () => {
    const result = cronbachAlpha(squareMatrixFromRows([[1.7]]));
    expect(result.alpha).toBeNull();
    expect(result.alphaStandardized).toBeNull();
    expect(result.notices.map((n) => n.code)).toEqual(['too-few-items']);
  });

  it('reports zero total variance (two items that cancel out, or all constant) as undefined', () => {
    const cancelling = cronbachAlpha(squareMatrixFromRows([[1, -1], [-1, 1]]));
    expect(cancelling.alpha).toBeNull();
    expect(cancelling.alphaStandardized).toBeNull();
    expect(cancelling.notices.map((n) => n.code)).toContain('zero-total-variance');
    const constant = cronbachAlpha(squareMatrixFromRows([[0, 0], [0, 0]]));
    expect(constant.alpha).toBeNull();
    expect(constant.notices.map((n) => n.code)).toEqual(['zero-total-variance', 'constant-item']);
    expect(collectNumbers([cancelling, constant]).every(Number.isFinite)).toBe(true);
  });

  it('keeps raw alpha but not standardized alpha when one item is constant', () => {
    const result = cronbachAlpha(squareMatrixFromRows([[1, 0.5, 0], [0.5, 1, 0], [0, 0, 0]]));
    // Hand-computed: k = 3, Σ var = 2, total = 3 → 3/2 · (1 − 2/3) = 0.5
    expect(result.alpha).toBeCloseTo(0.5, 15);
    expect(result.alphaStandardized).toBeNull();
    expect(result.notices).toEqual([expect.objectContaining({ code: 'constant-item', items: [2] })]);
  });

  it('computes alpha of a singular covariance matrix (an exact duplicate) without NaN', () => {
    const base = reliabilityFixture.cases.find((c) => c.name === 'attitude')!.covariance;
    const withDuplicate = base.map((row) => [...row, row[0]]);
    withDuplicate.push([...base[0], base[0][0]]);
    const result = cronbachAlpha(squareMatrixFromRows(withDuplicate));
    expect(result.alpha).toBeGreaterThan(0.8);
    expect(collectNumbers(result).every(Number.isFinite)).toBe(true);
  });

  it('refuses a matrix that is not a covariance matrix', () => {
    expect(() => cronbachAlpha(squareMatrixFromRows([[1, 0.2], [0.3, 1]]))).toThrow(/cronbachAlpha: the matrix is not symmetric/);
    expect(() => cronbachAlpha(squareMatrixFromRows([[-1, 0], [0, 1]]))).toThrow(/cronbachAlpha: the variance on the diagonal at \(0, 0\) is negative/);
    expect(() => cronbachAlpha(squareMatrixFromRows([[1, Number.NaN], [Number.NaN, 1]]))).toThrow(/not finite/);
    expect(() => cronbachAlpha({ order: 0, data: new Float64Array(0) })).toThrow(/order >= 1/);
  });
});

describe('alphaFromVarianceSums and constantItemIndices', () => {
  it('computes k/(k − 1)(1 − Σvar/total) and refuses bad counts', () => {
    // Hand-computed: 4/3 · (1 − 4/10) = 0.8
    expect(alphaFromVarianceSums(4, 4, 10, 1)).toBeCloseTo(0.8, 15);
    expect(alphaFromVarianceSums(1, 1, 1, 1)).toBeNull();
    expect(() => alphaFromVarianceSums(0, 1, 1, 1)).toThrow(/itemCount must be a positive integer/);
    expect(() => alphaFromVarianceSums(3, Number.NaN, 1, 1)).toThrow(/finite/);
  });

  it('finds items with zero variance', () => {
    expect(constantItemIndices(squareMatrixFromRows([[2, 0, 0], [0, 0, 0], [0, 0, 1e-20]]))).toEqual([1, 2]);
  });
});
