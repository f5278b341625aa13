/**
 * Parallel analysis's draws on worker threads (src/lib/audit/random-eigenvalue-threads.ts): the
 * same values to the last bit whatever the number of threads, and the same as the core's one pass.
 * The threads start here from source (bundled once for this process by src/lib/workers).
 */
import { describe, expect, it } from 'vitest';
import {
  PARALLEL_ANALYSIS_MAX_THREADS,
  PARALLEL_ANALYSIS_THREAD_MIN_WORK,
  POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS,
  parallelAnalysisThreadCount,
  polychoricParallelAnalysisThreadCount,
  randomCorrelationEigenvaluesOnThreads,
  randomPolychoricEigenvaluesOnThreads,
} from '../../src/lib/audit/random-eigenvalue-threads';
import { cachedRandomCorrelationEigenvalues, forgetRandomCorrelationEigenvalues, randomCorrelationEigenvalues } from '../../src/lib/stats/parallel-analysis';
import {
  cachedRandomPolychoricEigenvalues,
  forgetRandomPolychoricEigenvalues,
  randomPolychoricEigenvalues,
} from '../../src/lib/stats/parallel-analysis-polychoric';

/** The positions where two arrays differ by Object.is (so −0 and 0 differ, NaN equals NaN), or a length mismatch. */
function bitDifferences(actual: ArrayLike<number>, expected: ArrayLike<number>): string[] {
  if (actual.length !== expected.length) return [`length ${actual.length} instead of ${expected.length}`];
  const differences: string[] = [];
  for (let at = 0; at < expected.length; at++) if (!Object.is(actual[at], expected[at])) differences.push(`${at}: ${actual[at]} instead of ${expected[at]}`);
  return differences;
}

describe('randomCorrelationEigenvaluesOnThreads', () => {
  it('gives the same values to the last bit on 0, 1, 2 and 3 threads, and as the core one pass', async () => {
    // 7 draws over 3 threads: ranges 0-1, 2-3, 4-6, so later threads replay earlier draws' values.
    const [rows, items, iterations, seed] = [150, 24, 7, 2027];
    forgetRandomCorrelationEigenvalues();
    const onePass = randomCorrelationEigenvalues(rows, items, iterations, seed);
    for (const threads of [0, 1, 2, 3]) {
      forgetRandomCorrelationEigenvalues();
      const values = await randomCorrelationEigenvaluesOnThreads(rows, items, iterations, seed, threads);
      expect(values, `${threads} thread(s)`).toEqual(onePass);
      // The answer is kept in the calling thread's cache, under the core's key.
      expect(cachedRandomCorrelationEigenvalues(rows, items, iterations, seed), `${threads} thread(s), cached`).toEqual(onePass);
    }
    // A singular Wishart (rows − 1 < items) takes the Gram form; threads give the same values too.
    forgetRandomCorrelationEigenvalues();
    const singular = randomCorrelationEigenvalues(10, 24, 4, 3);
    forgetRandomCorrelationEigenvalues();
    expect(await randomCorrelationEigenvaluesOnThreads(10, 24, 4, 3, 2)).toEqual(singular);
    // Another seed gives other values (the comparison above can fail).
    expect(await randomCorrelationEigenvaluesOnThreads(rows, items, iterations, seed + 1, 2)).not.toEqual(onePass);
  }, 60_000);

  it('rejects when a thread fails, and refuses a bad thread count at once', async () => {
    forgetRandomCorrelationEigenvalues();
    await expect(randomCorrelationEigenvaluesOnThreads(1, 5, 4, 1, 2)).rejects.toThrow(/rows must be an integer of at least 2/);
    expect(() => randomCorrelationEigenvaluesOnThreads(100, 5, 4, 1, -1)).toThrow(/threads must be a non-negative integer/);
  }, 60_000);
});

describe('parallelAnalysisThreadCount', () => {
  it('keeps small draws on the calling thread and spreads large ones over the cores', () => {
    // 100 draws of 40 items: 6.4e6, far below the threshold; 100 of 300: 2.7e9.
    expect(parallelAnalysisThreadCount(40, 100, 2)).toBe(0);
    expect(parallelAnalysisThreadCount(300, 100, 2)).toBe(2);
    expect(parallelAnalysisThreadCount(300, 100, 1)).toBe(1);
    expect(parallelAnalysisThreadCount(300, 100, 64)).toBe(PARALLEL_ANALYSIS_MAX_THREADS);
    expect(parallelAnalysisThreadCount(500, 1, 2)).toBe(1); // 1.25e8 of work in one draw: one thread, not two
    // At the threshold exactly: threads.
    expect(parallelAnalysisThreadCount(100, PARALLEL_ANALYSIS_THREAD_MIN_WORK / 1e6, 2)).toBe(2);
    expect(parallelAnalysisThreadCount(100, PARALLEL_ANALYSIS_THREAD_MIN_WORK / 1e6 - 1, 2)).toBe(0);
  });
});

describe('randomPolychoricEigenvaluesOnThreads', () => {
  // Seven items with two to five categories (thresholds as a polychoric fit finds them).
  const thresholds = [[-0.8, 0.1, 0.9], [0.2], [-1.2, -0.3, 0.4, 1.1], [-0.5, 0.5], [0.9], [-0.1, 0.7], [-1.5, -0.6, 0.2, 1.3]];

  it('gives the core one-thread values to the last bit on 0, 1, 2 and 3 threads, and keeps them in its cache', async () => {
    // 5 data sets over 3 threads: ranges 0, 1-2, 3-4 of the codes drawn on the calling thread.
    const [rows, iterations, seed] = [120, 5, 2031];
    forgetRandomPolychoricEigenvalues();
    const onePass = randomPolychoricEigenvalues(rows, thresholds, iterations, seed);
    expect(onePass).toHaveLength(thresholds.length * iterations);
    for (const threads of [0, 1, 2, 3]) {
      forgetRandomPolychoricEigenvalues();
      const values = await randomPolychoricEigenvaluesOnThreads(rows, thresholds, iterations, seed, threads);
      expect(bitDifferences(values, onePass), `${threads} thread(s)`).toEqual([]);
      // The answer is kept in the calling thread's cache, under the core's key.
      expect(bitDifferences(cachedRandomPolychoricEigenvalues(rows, thresholds, iterations, seed) ?? [], onePass), `${threads} thread(s), cached`).toEqual([]);
    }
    // Another seed gives other values (the comparison above can fail).
    expect(bitDifferences(await randomPolychoricEigenvaluesOnThreads(rows, thresholds, iterations, seed + 1, 2), onePass)).not.toEqual([]);
  }, 60_000);

  it('answers from the cache without a thread, and refuses a bad thread count or size at once', async () => {
    forgetRandomPolychoricEigenvalues();
    const values = randomPolychoricEigenvalues(40, thresholds, 2, 5);
    // A cached answer is handed out as a copy; a thread count that would fail is never used.
    const again = await randomPolychoricEigenvaluesOnThreads(40, thresholds, 2, 5, 2);
    expect(bitDifferences(again, values)).toEqual([]);
    expect(again).not.toBe(values);
    expect(() => randomPolychoricEigenvaluesOnThreads(40, thresholds, 2, 5, 1.5)).toThrow(/threads must be a non-negative integer/);
    expect(() => randomPolychoricEigenvaluesOnThreads(0, thresholds, 2, 6, 2)).toThrow(/rows must be a positive integer/);
  }, 60_000);
});

describe('polychoricParallelAnalysisThreadCount', () => {
  it('keeps few pair fits on the calling thread and spreads many over the cores', () => {
    // 20 data sets of 40 items (case A): 15,600 pair fits; of 150 items: 223,500.
    expect(polychoricParallelAnalysisThreadCount(40, 20, 2)).toBe(0);
    expect(polychoricParallelAnalysisThreadCount(150, 20, 2)).toBe(2);
    expect(polychoricParallelAnalysisThreadCount(150, 20, 1)).toBe(1);
    expect(polychoricParallelAnalysisThreadCount(150, 20, 64)).toBe(PARALLEL_ANALYSIS_MAX_THREADS);
    expect(polychoricParallelAnalysisThreadCount(700, 1, 2)).toBe(1); // 244,650 fits in one data set: one thread
    // At the threshold exactly (5 items: 10 pairs per data set): threads.
    expect(polychoricParallelAnalysisThreadCount(5, POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS / 10, 2)).toBe(2);
    expect(polychoricParallelAnalysisThreadCount(5, POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS / 10 - 1, 2)).toBe(0);
  });
});
