import { describe, expect, it } from 'vitest';
import { minresOneFactor } from '../../src/lib/stats/minres-factor';
import { squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
import { reliabilityFixture } from './reliability-cases';
import { collectNumbers } from './reliability-fixtures';

function oneFactorMatrix(loadings: number[]): SquareMatrix {
  return squareMatrixFromRows(loadings.map((a, i) => loadings.map((b, j) => (i === j ? 1 : a * b))));
}

describe('minresOneFactor', () => {
  it.each(reliabilityFixture.cases.map((c) => [c.name, c] as const))(
    'matches psych::fa(fm = "minres") one-factor loadings on %s at 0.005',
    (_name, reference) => {
      const correlation = squareMatrixFromRows(reference.correlation);
      const before = Float64Array.from(correlation.data);
      const result = minresOneFactor(correlation);
      expect(result.converged).toBe(true);
      expect(result.notices).toEqual([]);
      reference.minres.loadings.forEach((expected, i) => {
        expect(Math.abs((result.loadings as Float64Array)[i] - expected)).toBeLessThan(0.005); // R 4.2.2 psych 2.2.9: psych::fa(cor(x), nfactors = 1, fm = "minres")$loadings, sum made positive
      });
      expect(correlation.data).toEqual(before);
    },
  );

  it('reaches a stationary point of the off-diagonal residual sum of squares (the ULS / iterated principal-axis fixed point)', () => {
    // Identity: Σ_{j≠i} (r_ij − λ_i λ_j) λ_j = 0 for every i, i.e. (R − I + diag(λ²)) λ = (λᵀλ) λ
    const correlation = squareMatrixFromRows(reliabilityFixture.cases.find((c) => c.name === 'bfi-all25')!.correlation);
    const result = minresOneFactor(correlation);
    const loadings = result.loadings as Float64Array;
    const k = correlation.order;
    for (let i = 0; i < k; i++) {
      let gradient = 0;
      for (let j = 0; j < k; j++) if (j !== i) gradient += (correlation.data[i * k + j] - loadings[i] * loadings[j]) * loadings[j];
      expect(Math.abs(gradient)).toBeLessThan(1e-8);
    }
    // And a nudge away from the solution does not lower the objective.
    const objective = (l: ArrayLike<number>) => {
      let sum = 0;
      for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) if (i !== j) sum += (correlation.data[i * k + j] - l[i] * l[j]) ** 2;
      return sum;
    };
    expect(objective(loadings)).toBeCloseTo(result.residualSumOfSquares as number, 12);
    const nudged = Float64Array.from(loadings, (value, i) => value + (i % 2 === 0 ? 1e-3 : -1e-3));
    expect(objective(nudged)).toBeGreaterThan(objective(loadings));
  });

  it('recovers the loadings of an exact one-factor structure', () => {
    // Constructed: R = λλᵀ off the diagonal, so the residuals can be zero
    const truth = [0.8, 0.7, 0.6, 0.5, 0.4];
    const result = minresOneFactor(oneFactorMatrix(truth));
    truth.forEach((value, i) => expect((result.loadings as Float64Array)[i]).toBeCloseTo(value, 8));
    expect(result.residualSumOfSquares).toBeLessThan(1e-15);
    expect((result.uniquenesses as Float64Array)[0]).toBeCloseTo(0.36, 8);
  });

  it('makes the sum of loadings positive, and flipping an item flips only its sign', () => {
    const truth = [0.8, -0.7, 0.6, 0.5];
    const result = minresOneFactor(oneFactorMatrix(truth));
    truth.forEach((value, i) => expect((result.loadings as Float64Array)[i]).toBeCloseTo(value, 8));
    const allNegative = minresOneFactor(oneFactorMatrix([-0.8, -0.7, -0.6, -0.5]));
    // The matrix equals that of [0.8, 0.7, 0.6, 0.5]; the sign rule picks the positive sum.
    expect((allNegative.loadings as Float64Array)[0]).toBeCloseTo(0.8, 8);
  });

  it('reports a Heywood case as a result', () => {
    // Three items are just identified: λ₁² = r₁₂ r₁₃ / r₂₃ = 0.81 / 0.5 = 1.62 (hand-computed)
    const result = minresOneFactor(squareMatrixFromRows([[1, 0.9, 0.9], [0.9, 1, 0.5], [0.9, 0.5, 1]]));
    expect((result.communalities as Float64Array)[0]).toBeCloseTo(1.62, 6);
    expect(result.heywoodItems).toEqual([0]);
    expect(result.notices.map((n) => n.code)).toEqual(['heywood-case']);
    expect((result.uniquenesses as Float64Array)[0]).toBeLessThan(0);
  });

  it('handles one item, two items and unrelated items without NaN', () => {
    const one = minresOneFactor(squareMatrixFromRows([[1]]));
    expect(one.loadings).toBeNull();
    expect(one.notices.map((n) => n.code)).toEqual(['too-few-items']);

    const two = minresOneFactor(squareMatrixFromRows([[1, -0.49], [-0.49, 1]]));
    expect(Array.from(two.loadings as Float64Array)).toEqual([0.7, -0.7]);
    expect(two.notices.map((n) => n.code)).toEqual(['underidentified']);

    const unrelated = minresOneFactor(squareMatrixFromRows([[1, 0, 0], [0, 1, 0], [0, 0, 1]]));
    expect(Array.from(unrelated.loadings as Float64Array).every((value) => Math.abs(value) < 1e-12)).toBe(true);
    expect(unrelated.notices.map((n) => n.code)).toEqual(['no-common-factor']);
    expect(collectNumbers([one, two, unrelated]).every(Number.isFinite)).toBe(true);
  });

  it('refuses a matrix without a unit diagonal', () => {
    expect(() => minresOneFactor(squareMatrixFromRows([[2, 0.5], [0.5, 1]]))).toThrow(/minresOneFactor: diagonal element 0 is 2/);
  });
});
