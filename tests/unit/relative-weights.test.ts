import { describe, expect, it } from 'vitest';
import { olsRegression } from '../../src/lib/stats/ols-regression';
import { relativeWeights } from '../../src/lib/stats/relative-weights';
import { itemMatrixFromRows, squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
import { collectNumbers, readReferenceFixture, relativeError } from './reliability-fixtures';

interface RelativeWeightsCase {
  name: string;
  call: string;
  predictors: string[];
  predictorCorrelation: number[][];
  outcomeCorrelation: number[];
  rawWeights: number[];
  rescaledWeights: number[];
  rSquared: number;
}
const cases = readReferenceFixture<{ cases: RelativeWeightsCase[] }>('relative-weights.json').cases;
const lmCases = readReferenceFixture<{ cases: { name: string; rows: number[][]; aliased: string[] }[] }>('ols-lm.json').cases;

function permuted(matrix: SquareMatrix, order: number[]): SquareMatrix {
  const k = matrix.order;
  return squareMatrixFromRows(order.map((i) => order.map((j) => matrix.data[i * k + j])));
}

describe('relativeWeights', () => {
  it.each(cases.map((c) => [c.name, c] as const))('matches an independent base-R implementation on %s at 1e-9', (_name, reference) => {
    const correlation = squareMatrixFromRows(reference.predictorCorrelation);
    const before = Float64Array.from(correlation.data);
    const outcome = Object.freeze([...reference.outcomeCorrelation]);
    const result = relativeWeights(correlation, outcome);
    reference.rawWeights.forEach((expected, j) => {
      // R 4.2.2: base-R Johnson (2000) weights, scripts/reference/reliability.R (eigen, Lambda = V sqrt(D) V', solve)
      expect(relativeError((result.weights as Float64Array)[j], expected), `weight ${j}`).toBeLessThan(1e-9);
      expect(relativeError((result.shares as Float64Array)[j], reference.rescaledWeights[j]), `share ${j}`).toBeLessThan(1e-9);
    });
    // R 4.2.2: summary(lm(y ~ .))$r.squared — the weights sum to R² (Johnson 2000)
    expect(relativeError(result.rSquared as number, reference.rSquared)).toBeLessThan(1e-9);
    expect(correlation.data).toEqual(before);
  });

  it('sums to the R² of our own OLS fit on the same data', () => {
    // Identity: Σ ε_j = R² of the regression (Johnson 2000)
    const lm = lmCases.find((c) => c.name === 'swiss')!;
    const width = lm.rows[0].length;
    const fit = olsRegression(itemMatrixFromRows(lm.rows.map((row) => row.slice(0, width - 1))), lm.rows.map((row) => row[width - 1]));
    const reference = cases.find((c) => c.name === 'swiss')!;
    const result = relativeWeights(squareMatrixFromRows(reference.predictorCorrelation), reference.outcomeCorrelation);
    const sum = Array.from(result.weights as Float64Array).reduce((s, w) => s + w, 0);
    expect(relativeError(sum, fit.rSquared as number)).toBeLessThan(1e-10);
  });

  it('gives r² to each predictor when the predictors are uncorrelated', () => {
    // Identity: with R_xx = I, Λ = I and β = r_xy, so ε_j = r_j²
    const result = relativeWeights(squareMatrixFromRows([[1, 0, 0], [0, 1, 0], [0, 0, 1]]), [0.3, -0.5, 0.1]);
    expect(Array.from(result.weights as Float64Array).map((w) => Number(w.toFixed(14)))).toEqual([0.09, 0.25, 0.01]);
    expect(result.rSquared).toBeCloseTo(0.35, 14);
  });

  it('permutes its weights with the predictors', () => {
    const reference = cases.find((c) => c.name === 'attitude')!;
    const order = [5, 0, 3, 1, 4, 2];
    const correlation = squareMatrixFromRows(reference.predictorCorrelation);
    const a = relativeWeights(correlation, reference.outcomeCorrelation);
    const b = relativeWeights(permuted(correlation, order), order.map((j) => reference.outcomeCorrelation[j]));
    order.forEach((j, position) => {
      expect(relativeError((b.weights as Float64Array)[position], (a.weights as Float64Array)[j])).toBeLessThan(1e-10);
    });
  });

  it('reports a singular predictor matrix and names the dependent items', () => {
    const result = relativeWeights(squareMatrixFromRows([[1, 1, 0.2], [1, 1, 0.2], [0.2, 0.2, 1]]), [0.4, 0.4, 0.1]);
    expect(result.weights).toBeNull();
    expect(result.rSquared).toBeNull();
    expect(result.notices).toEqual([expect.objectContaining({ code: 'singular-matrix', items: [0, 1] })]);
  });

  it('reports an outcome the predictors do not explain', () => {
    const result = relativeWeights(squareMatrixFromRows([[1, 0.5], [0.5, 1]]), [0, 0]);
    expect(result.rSquared).toBe(0);
    expect(result.shares).toBeNull();
    expect(result.notices.map((n) => n.code)).toEqual(['no-explained-variance']);
    expect(collectNumbers(result).every(Number.isFinite)).toBe(true);
  });

  it('refuses invalid input', () => {
    expect(() => relativeWeights(squareMatrixFromRows([[1, 0.5], [0.5, 1]]), [0.1])).toThrow(/relativeWeights: expected 2 outcome correlations/);
    expect(() => relativeWeights(squareMatrixFromRows([[1, 0.5], [0.5, 1]]), [0.1, 1.5])).toThrow(/within \[-1, 1\]/);
    expect(() => relativeWeights(squareMatrixFromRows([[1, 0.5], [0.5, 2]]), [0.1, 0.2])).toThrow(/relativeWeights: diagonal element 1 is 2/);
  });
});
