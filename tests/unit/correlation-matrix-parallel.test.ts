import { describe, expect, it } from 'vitest';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { correlationMatrixParallel } from '../../bench/parallel/correlation-matrix-parallel';
import { correlationDataset, datasetMatrix } from './correlation-fixtures';

describe('correlationMatrixParallel', () => {
  const matrix = datasetMatrix(correlationDataset('ordinal5'));

  it('starts worker threads under Vitest and gives exactly the single-thread result', async () => {
    const single = correlationMatrix(matrix, { method: 'polychoric', missing: 'pairwise' });
    const parallel = await correlationMatrixParallel(matrix, { method: 'polychoric', missing: 'pairwise', workers: 2, minimumWork: 0 });
    // No parallel-unavailable notice: the workers ran (their self-check passed).
    expect(parallel.notices).toEqual(single.notices);
    expect(Array.from(parallel.matrix.data)).toEqual(Array.from(single.matrix.data));
    expect(Array.from(parallel.n.data)).toEqual(Array.from(single.n.data));
    // psych 2.2.9 (correlation-datasets.json): polychoric(ordinal5, global = TRUE, correct = 0)$rho[1, 2]
    expect(parallel.matrix.data[1]).toBeCloseTo(correlationDataset('ordinal5').polychoricPairwise!.rho[0][1], 4);
  });

  it('uses three workers on an uneven share of pairs', async () => {
    const single = correlationMatrix(matrix, { method: 'polychoric', missing: 'listwise' });
    const parallel = await correlationMatrixParallel(matrix, { method: 'polychoric', missing: 'listwise', workers: 3, minimumWork: 0 });
    expect(Array.from(parallel.matrix.data)).toEqual(Array.from(single.matrix.data));
    expect(parallel.notices.map((notice) => notice.code)).not.toContain('parallel-unavailable');
  });

  it('computes Pearson, Spearman and small polychoric jobs on the calling thread with the same result', async () => {
    for (const method of ['pearson', 'spearman', 'polychoric'] as const) {
      const single = correlationMatrix(matrix, { method, missing: 'pairwise' });
      const parallel = await correlationMatrixParallel(matrix, { method, missing: 'pairwise', workers: 2 });
      expect(Array.from(parallel.matrix.data)).toEqual(Array.from(single.matrix.data));
    }
  });

  it('checks its options', async () => {
    await expect(correlationMatrixParallel(matrix, { method: 'pearson', missing: 'pairwise', workers: 0 })).rejects.toThrow(/workers must be an integer from 1 to 64/);
    await expect(correlationMatrixParallel(matrix, { method: 'pearson', missing: 'pairwise', minimumWork: -1 })).rejects.toThrow(/minimumWork must be >= 0/);
  });
});
