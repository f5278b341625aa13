/**
 * Parallel analysis's draws on worker threads (src/lib/audit/random-eigenvalue-threads.ts): the
 * same values to the last bit whatever the number of threads, and the same as the core's one pass.
 * The threads start here from source (bundled once for this process by src/lib/workers).
 */
import { describe, expect, it } from 'vitest';
import {
  PARALLEL_ANALYSIS_MAX_THREADS,
  PARALLEL_ANALYSIS_THREAD_MIN_WORK,
  parallelAnalysisThreadCount,
  randomCorrelationEigenvaluesOnThreads,
} from '../../src/lib/audit/random-eigenvalue-threads';
import { cachedRandomCorrelationEigenvalues, forgetRandomCorrelationEigenvalues, randomCorrelationEigenvalues } from '../../src/lib/stats/parallel-analysis';

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
