import { describe, expect, it } from 'vitest';
import {
  cachedRandomCorrelationEigenvalues,
  drawMajorToPositionMajor,
  forgetRandomCorrelationEigenvalues,
  parallelAnalysis,
  randomCorrelationEigenvalueDraws,
  randomCorrelationEigenvalues,
} from '../../src/lib/stats/parallel-analysis';
import { overlapFixture } from './overlap-fixtures';

const small = overlapFixture.parallelAnalysis.small;
const bfi = overlapFixture.parallelAnalysis.bfi;

describe('parallelAnalysis', () => {
  it('puts the random 95th percentiles where R’s brute-force simulation puts them (n = 400, p = 40)', () => {
    // R 4.2.2: 4000 replications of eigen(cor(matrix(rnorm(400 * 40), 400, 40)))$values,
    // quantile(type = 7, 0.95) per position (fixtures/reference/overlap.json). Different generators,
    // same distribution: 1000 of ours agree within Monte-Carlo error (about 0.004 here).
    const observed = Array.from({ length: 40 }, (_, k) => 40 - k);
    const result = parallelAnalysis(observed, 400, { iterations: 1000, seed: 7 });
    small.random95.forEach((expected, k) => expect(Math.abs(result.random95[k] - expected), `position ${k}`).toBeLessThan(0.02));
    small.randomMean.forEach((expected, k) => expect(Math.abs(result.randomMean[k] - expected), `position ${k}`).toBeLessThan(0.01));
    // The random eigenvalues of a correlation matrix sum to p at every draw, so their means do too.
    expect(result.randomMean.reduce((sum, value) => sum + value, 0)).toBeCloseTo(40, 9);
  });

  it('suggests 5 components for the bfi items, as R’s percentiles do', () => {
    // R 4.2.2: observed eigen(cor(na.omit(bfi[, 1:25])))$values against 2000 simulated data sets of
    // 2436 × 25: 5 exceed their 95th percentile (the 6th falls short by 0.029)
    expect(bfi.suggested).toBe(5);
    const result = parallelAnalysis(bfi.observed, bfi.rows, { seed: 2026 });
    expect(result.suggested).toBe(5);
    expect(result.iterations).toBe(100);
    expect(result.percentile).toBe(95);
    bfi.random95.forEach((expected, k) => expect(Math.abs(result.random95[k] - expected)).toBeLessThan(0.03));
  });

  it('repeats exactly for the same seed and differs for another', () => {
    const observed = [3, 1.5, 1, 0.5];
    const first = parallelAnalysis(observed, 50, { seed: 11, iterations: 30 });
    const again = parallelAnalysis(observed, 50, { seed: 11, iterations: 30 });
    const other = parallelAnalysis(observed, 50, { seed: 12, iterations: 30 });
    expect(again).toEqual(first);
    expect(other.random95).not.toEqual(first.random95);
  });

  it('uses a higher percentile than the mean and counts only leading eigenvalues', () => {
    const result = parallelAnalysis([5, 0.9, 2, 0.5].sort((a, b) => b - a), 200, { seed: 3, iterations: 50 });
    result.random95.forEach((value, k) => expect(value).toBeGreaterThan(result.randomMean[k]));
    // 5 and 2 beat the random 95th percentiles (about 1.3 and 1.15 for n = 200, p = 4); 0.9 does not.
    expect(result.suggested).toBe(2);
    const median = parallelAnalysis([5, 2, 0.9, 0.5], 200, { seed: 3, iterations: 50, percentile: 50 });
    median.random95.slice(0, 2).forEach((value, k) => expect(value).toBeLessThan(result.random95[k]));
  });

  it('handles one item and refuses bad input', () => {
    expect(parallelAnalysis([1], 10).suggested).toBe(0);
    expect(() => parallelAnalysis([], 10)).toThrow(/at least one observed eigenvalue/);
    expect(() => parallelAnalysis([1, 2], 10)).toThrow(/descending/);
    expect(() => parallelAnalysis([2, 1], 1)).toThrow(/rows must be an integer of at least 2/);
    expect(() => parallelAnalysis([2, 1], 10, { iterations: 0 })).toThrow(/iterations/);
    expect(() => parallelAnalysis([2, 1], 10, { percentile: 0 })).toThrow(/percentile/);
    expect(() => parallelAnalysis([2, Number.NaN], 10)).toThrow(/not finite/);
  });
});

describe('randomCorrelationEigenvalueDraws', () => {
  it('gives any range of draws exactly as one pass gives them, whatever the split', () => {
    forgetRandomCorrelationEigenvalues();
    const [rows, items, iterations, seed] = [120, 9, 10, 31];
    const onePass = randomCorrelationEigenvalues(rows, items, iterations, seed);
    for (const cuts of [[0, 10], [0, 3, 10], [0, 1, 2, 7, 9, 10]]) {
      const drawMajor = new Float64Array(items * iterations);
      for (let part = 0; part + 1 < cuts.length; part++) drawMajor.set(randomCorrelationEigenvalueDraws(rows, items, seed, cuts[part], cuts[part + 1]), cuts[part] * items);
      // Bit for bit: toEqual on Float64Array compares every element with Object.is semantics for numbers.
      expect(drawMajorToPositionMajor(drawMajor, items, iterations), `split at ${cuts.join(', ')}`).toEqual(onePass);
    }
    // Each draw is a correlation matrix's eigenvalues: descending, summing to the number of items.
    const first = randomCorrelationEigenvalueDraws(rows, items, seed, 0, 1);
    for (let k = 1; k < items; k++) expect(first[k]).toBeLessThanOrEqual(first[k - 1]);
    expect(first.reduce((sum, value) => sum + value, 0)).toBeCloseTo(items, 10);
    expect(randomCorrelationEigenvalueDraws(rows, items, seed, 4, 4)).toHaveLength(0);
    expect(() => randomCorrelationEigenvalueDraws(rows, items, seed, 5, 4)).toThrow(/0 <= firstDraw <= endDraw/);
  });

  it('lets parallelAnalysis take draws made elsewhere, unchanged, and refuses the wrong number', () => {
    forgetRandomCorrelationEigenvalues();
    const observed = [3, 1.2, 1, 0.8, 0.5, 0.3, 0.2];
    const drawn = randomCorrelationEigenvalues(80, 7, 20, 5);
    const copy = drawn.slice(); // typed arrays cannot be frozen: a copy proves nothing was changed
    const given = parallelAnalysis(observed, 80, { seed: 5, iterations: 20, randomEigenvalues: drawn });
    expect(drawn).toEqual(copy);
    forgetRandomCorrelationEigenvalues();
    expect(given).toEqual(parallelAnalysis(observed, 80, { seed: 5, iterations: 20 }));
    expect(() => parallelAnalysis(observed, 80, { iterations: 20, randomEigenvalues: new Float64Array(7 * 19) })).toThrow(/randomEigenvalues holds 133 values, expected items × iterations = 140/);
  });

  it('answers a second call from the cache with the same values, and a cleared cache draws them again', () => {
    forgetRandomCorrelationEigenvalues();
    expect(cachedRandomCorrelationEigenvalues(60, 4, 5, 2)).toBeNull();
    const drawn = randomCorrelationEigenvalues(60, 4, 5, 2);
    expect(cachedRandomCorrelationEigenvalues(60, 4, 5, 2)).toEqual(drawn);
    forgetRandomCorrelationEigenvalues();
    expect(cachedRandomCorrelationEigenvalues(60, 4, 5, 2)).toBeNull();
  });
});
