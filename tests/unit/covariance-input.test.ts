import { describe, expect, it } from 'vitest';
import { checkCovarianceMatrix } from '../../src/lib/stats/covariance-input';
import { squareMatrixFromRows } from '../../src/lib/stats/types';

describe('checkCovarianceMatrix', () => {
  it('accepts a symmetric matrix with a non-negative diagonal, even an indefinite one', () => {
    expect(() => checkCovarianceMatrix(squareMatrixFromRows([[1, 2], [2, 1]]), 'caller')).not.toThrow();
    expect(() => checkCovarianceMatrix(squareMatrixFromRows([[0]]), 'caller')).not.toThrow();
  });

  it('names the caller and the failed condition', () => {
    expect(() => checkCovarianceMatrix({ order: 0, data: new Float64Array(0) }, 'scaleAlpha')).toThrow(/scaleAlpha: the covariance matrix must have order >= 1/);
    expect(() => checkCovarianceMatrix({ order: 2, data: new Float64Array(3) }, 'scaleAlpha')).toThrow(/expected 4 values for order 2/);
    expect(() => checkCovarianceMatrix(squareMatrixFromRows([[1, 0.5], [0.4, 1]]), 'scaleAlpha')).toThrow(/not symmetric at \(0, 1\)/);
    expect(() => checkCovarianceMatrix(squareMatrixFromRows([[1, 0], [0, -2]]), 'scaleAlpha')).toThrow(/variance on the diagonal at \(1, 1\) is negative/);
    expect(() => checkCovarianceMatrix(squareMatrixFromRows([[1, Infinity], [Infinity, 1]]), 'scaleAlpha')).toThrow(/\(0, 1\) is not finite/);
    expect(() => checkCovarianceMatrix(squareMatrixFromRows([[Number.NaN]]), 'scaleAlpha')).toThrow(/\(0, 0\) is not finite/);
  });
});
