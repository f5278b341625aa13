import { describe, expect, it } from 'vitest';
import { ebicGlasso } from '../../src/lib/stats/ebic-glasso';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { largestDifference, networkFixture } from './local-dependence-fixtures';

describe('ebicGlasso', () => {
  it.each(networkFixture.ebic.map((c) => [c.name, c] as const))('matches qgraph::EBICglasso(S, n, gamma = 0.5) on %s', (_name, reference) => {
    const input = squareMatrixFromRows(reference.input);
    const before = Float64Array.from(input.data);
    const result = ebicGlasso(input, reference.n);
    expect(result.converged).toBe(true);
    // R 4.2.2 qgraph 1.9.3: EBICglasso(S, n, gamma = 0.5, returnAllResults = TRUE, threshold = FALSE, thr = 1e-12, maxit = 1e5)$lambda
    reference.tight.lambda.forEach((lambda, k) => expect(Math.abs(result.penalties[k] - lambda)).toBeLessThan(1e-13));
    // ... $ebic, at every penalty of the path (relative, the path runs at EBIC_PATH_TOLERANCE)
    reference.tight.ebic.forEach((ebic, k) => expect(Math.abs(result.ebic[k] - ebic) / Math.abs(ebic)).toBeLessThan(1e-8));
    // ... which.min($ebic), 1-based in R
    expect(result.selectedIndex + 1).toBe(reference.tight.selectedIndex);
    // ... $optnet (signed partial correlations, zero diagonal)
    expect(largestDifference(result.partialCorrelations, reference.tight.network)).toBeLessThan(1e-9);
    // R 4.2.2 qgraph 1.9.3: EBICglasso(S, n, gamma = 0.5), the default call (glasso's thr = 1e-4): same penalty, network within glasso's stopping error
    expect(result.selectedIndex + 1).toBe(reference.default.selectedIndex);
    expect(Math.abs(result.penalty - reference.default.lambda)).toBeLessThan(1e-13);
    expect(largestDifference(result.partialCorrelations, reference.default.network)).toBeLessThan(5e-5);
    // Identity: the absolute network is |partial correlations|.
    result.absoluteNetwork.data.forEach((value, index) => expect(value).toBe(Math.abs(result.partialCorrelations.data[index])));
    expect(input.data).toEqual(before);
  });

  it('finds the planted doublet of the simulated wave as its strongest edge', () => {
    // scripts/reference/local-dependence-network.R plants a residual correlation of .30 between items s2 and s3.
    const reference = networkFixture.ebic.find((c) => c.name === 'simulated-12-doublet')!;
    const result = ebicGlasso(squareMatrixFromRows(reference.input), reference.n);
    const p = result.absoluteNetwork.order;
    let best = [0, 0];
    let largest = -1;
    for (let i = 0; i < p; i++) for (let j = i + 1; j < p; j++) if (result.absoluteNetwork.data[i * p + j] > largest) {
      largest = result.absoluteNetwork.data[i * p + j];
      best = [i, j];
    }
    expect(best).toEqual([1, 2]);
  });

  it('reports each penalty of its path as it is fitted, and the same network with or without a listener', () => {
    const reference = networkFixture.ebic.find((c) => c.name === 'simulated-12-doublet')!;
    const heard: [number, number][] = [];
    const listened = ebicGlasso(squareMatrixFromRows(reference.input), reference.n, { penaltyCount: 30, onPenalty: (done, total) => heard.push([done, total]) });
    expect(heard).toEqual(Array.from({ length: 30 }, (_, k) => [k + 1, 30]));
    const quiet = ebicGlasso(squareMatrixFromRows(reference.input), reference.n, { penaltyCount: 30 });
    expect(listened.partialCorrelations.data).toEqual(quiet.partialCorrelations.data);
    expect(listened.ebic).toEqual(quiet.ebic);
  });

  it('scales a covariance matrix to correlations first (cov2cor), as qgraph does', () => {
    const reference = networkFixture.ebic.find((c) => c.name === 'simulated-12-doublet')!;
    const sd = reference.input.map((_, i) => 1 + i / 4);
    const covariance = squareMatrixFromRows(reference.input.map((row, i) => row.map((r, j) => r * sd[i] * sd[j])));
    const fromCovariance = ebicGlasso(covariance, reference.n);
    const fromCorrelation = ebicGlasso(squareMatrixFromRows(reference.input), reference.n);
    expect(fromCovariance.selectedIndex).toBe(fromCorrelation.selectedIndex);
    expect(largestDifference(fromCovariance.partialCorrelations, reference.tight.network)).toBeLessThan(1e-9);
  });

  it('rejects an indefinite matrix, naming the smoothing to use, and bad options', () => {
    const indefinite = squareMatrixFromRows([
      [1, 0.9, 0.9],
      [0.9, 1, -0.9],
      [0.9, -0.9, 1],
    ]);
    expect(() => ebicGlasso(indefinite, 100)).toThrow(/not positive definite.*smooth/);
    const s = squareMatrixFromRows([
      [1, 0.5],
      [0.5, 1],
    ]);
    expect(() => ebicGlasso(s, 1)).toThrow(/sampleSize/);
    expect(() => ebicGlasso(s, 100, { gamma: -1 })).toThrow(/gamma/);
    expect(() => ebicGlasso(s, 100, { penaltyCount: 1 })).toThrow(/penaltyCount/);
    expect(() => ebicGlasso(s, 100, { minimumPenaltyRatio: 1 })).toThrow(/minimumPenaltyRatio/);
    expect(() => ebicGlasso(squareMatrixFromRows([[1]]), 100)).toThrow(/at least two items/);
  });
});
