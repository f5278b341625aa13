/**
 * The full sample's residual bootstrap on worker threads (src/lib/audit/residual-bootstrap-threads.ts):
 * the evidence with its scales' critical values computed on 0, 1, 2 or 3 threads is the evidence
 * of the one-thread engine to the last bit; a bootstrap that cannot be made fails with the same
 * RangeError. The threads start here from source (bundled once for this process by src/lib/workers).
 * The data are random (our generator); the claim is the equality, not a statistic.
 */
import { describe, expect, it } from 'vitest';
import {
  deferredResidualCriticals,
  RESIDUAL_BOOTSTRAP_MAX_THREADS,
  RESIDUAL_BOOTSTRAP_THREAD_MIN_WORK,
  residualBootstrapThreadCount,
  residualCriticalsOnThreads,
  withResidualCriticals,
} from '../../src/lib/audit/residual-bootstrap-threads';
import { coreDetectors } from '../../src/lib/engine/core-detectors';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import type { EngineItem } from '../../src/lib/engine/types';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import type { ItemMatrix } from '../../src/lib/stats/types';

/** rows five-point answers to three scales of five items, one factor each (and one pair sharing more). */
function wave(rows: number): { matrix: ItemMatrix; items: EngineItem[] } {
  const random = createSeededRandom(404);
  const columns = 15;
  const data = new Float64Array(rows * columns);
  for (let i = 0; i < rows; i++) {
    const factors = [random.nextNormal(), random.nextNormal(), random.nextNormal()];
    const shared = random.nextNormal();
    for (let j = 0; j < columns; j++) {
      const latent = 0.7 * factors[Math.floor(j / 5)] + (j === 1 || j === 2 ? 0.4 * shared : 0) + 0.6 * random.nextNormal();
      data[j * rows + i] = Math.min(5, Math.max(1, Math.round(3 + latent)));
    }
  }
  const items = Array.from({ length: columns }, (_, j): EngineItem => ({ id: `Q${j}`, scale: `S${Math.floor(j / 5)}`, text: null, locked: false, min: 1, max: 5, reverse: false }) as EngineItem);
  return { matrix: { rows, columns, data }, items };
}

describe('residualCriticalsOnThreads', () => {
  it('gives the one-thread evidence to the last bit on 0, 1, 2 and 3 threads', async () => {
    const { matrix, items } = wave(300);
    const settings = { method: 'pearson', missing: 'pairwise', residualBootstrapDraws: 40, seed: 31 } as const;
    const oneThread = computeEvidence(matrix, items, settings, { localDependence: { network: false } });
    const critical = oneThread.localDependence!.scales.map((scale) => scale.critical);
    expect(critical).toHaveLength(3);
    critical.forEach((value) => expect(value).toBeGreaterThan(0)); // computed, so the comparison below can fail
    for (const threads of [0, 1, 2, 3]) {
      const deferred = deferredResidualCriticals();
      const written = computeEvidence(matrix, items, settings, { localDependence: { network: false, detectors: deferred.detectors } });
      expect(written.localDependence!.scales.map((scale) => scale.critical)).toEqual([null, null, null]);
      expect(deferred.jobs.map((job) => job.options.seed)).toEqual([31, 32, 33]); // settings.seed + the scale's position
      const values = await residualCriticalsOnThreads(deferred.jobs, threads);
      expect(values, `${threads} thread(s)`).toEqual(critical);
      expect(withResidualCriticals(written, values), `${threads} thread(s)`).toEqual(oneThread);
    }
    // Another seed gives other values.
    const other = computeEvidence(matrix, items, { ...settings, seed: 32 }, { localDependence: { network: false } });
    expect(other.localDependence!.scales.map((scale) => scale.critical)).not.toEqual(critical);
  }, 120_000);

  it('fails with the RangeError of a bootstrap that cannot be made, and refuses a bad thread count at once', async () => {
    // Ten respondents cut above 3 SD: nearly every draw has a constant item.
    const job = { loadings: [0.5, 0.5, 0.5, 0.5], sampleSize: 10, options: { draws: 20, quantile: 0.99, seed: 1, statistic: 'q3' as const, thresholds: [[3], [3], [3], [3]] } };
    let message = '';
    try {
      coreDetectors.residualCritical(job.loadings, job.sampleSize, job.options);
    } catch (error) {
      expect(error).toBeInstanceOf(RangeError);
      message = (error as Error).message;
    }
    expect(message).toMatch(/residualBootstrap: only \d+ of 20 simulated data sets/);
    for (const threads of [0, 2]) {
      const failed = residualCriticalsOnThreads([{ ...job, options: { ...job.options, thresholds: null } }, job], threads);
      await expect(failed, `${threads} thread(s)`).rejects.toThrow(RangeError);
      await expect(failed, `${threads} thread(s)`).rejects.toThrow(message);
    }
    expect(() => residualCriticalsOnThreads([job], -1)).toThrow(/threads must be a non-negative integer/);
  }, 60_000);

  it('refuses values that do not match the scales', () => {
    const { matrix, items } = wave(100);
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise', residualBootstrapDraws: 0 }, { localDependence: { network: false } });
    expect(() => withResidualCriticals(evidence, [0.1])).toThrow(/1 critical values for 3 scales/);
    expect(withResidualCriticals(evidence, [])).toBe(evidence);
  });
});

describe('residualBootstrapThreadCount', () => {
  it('keeps small or single-scale bootstraps on the calling thread and spreads large ones over the cores', () => {
    const ten = (scale: string) => Array.from({ length: 10 }, () => scale);
    const scales = [...ten('A'), ...ten('B'), null, 'C', 'C', 'C'];
    // 200 draws × 2,000 respondents × 20 items (C has three items, too few for residuals): 8e6.
    expect(200 * 2000 * 20).toBeGreaterThanOrEqual(RESIDUAL_BOOTSTRAP_THREAD_MIN_WORK);
    expect(residualBootstrapThreadCount(scales, 2000, 200, 2)).toBe(2);
    expect(residualBootstrapThreadCount(scales, 2000, 200, 1)).toBe(1);
    expect(residualBootstrapThreadCount(scales, 2000, 200, 64)).toBe(2); // at most one per scale
    expect(residualBootstrapThreadCount([...scales, ...ten('D'), ...ten('E'), ...ten('F'), ...ten('G')], 2000, 200, 64)).toBe(RESIDUAL_BOOTSTRAP_MAX_THREADS);
    // 200 × 100 × 20 = 4e5: below the threshold.
    expect(200 * 100 * 20).toBeLessThan(RESIDUAL_BOOTSTRAP_THREAD_MIN_WORK);
    expect(residualBootstrapThreadCount(scales, 100, 200, 2)).toBe(0);
    expect(residualBootstrapThreadCount(scales, 2000, 0, 2)).toBe(0); // no bootstrap
    expect(residualBootstrapThreadCount([...ten('A'), null], 100_000, 200, 2)).toBe(0); // one scale
  });
});
