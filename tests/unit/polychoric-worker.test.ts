import { Worker } from 'node:worker_threads';
import { describe, expect, it } from 'vitest';
import { codeOrdinalItem } from '../../src/lib/stats/polychoric-coding';
import { createPolychoricPairsJob, estimatePolychoricPairs } from '../../src/lib/stats/polychoric-pairs';
import { bareImportReferences, polychoricWorkerSource } from '../../bench/parallel/polychoric-worker';
import { correlationDataset, datasetColumn } from './correlation-fixtures';

describe('bareImportReferences', () => {
  it('rewrites Vite SSR namespace references to bare names', () => {
    expect(bareImportReferences('return (0, __vi_import_2__.normalCdf)(-b / a) + (0,__vite_ssr_import_0__.f)(x);')).toBe('return normalCdf(-b / a) + f(x);');
    expect(bareImportReferences('const g = __vi_import_11__.grid;')).toBe('const g = grid;');
    expect(bareImportReferences('plain(code)')).toBe('plain(code)');
  });
});

describe('polychoricWorkerSource', () => {
  it('is self-contained text that runs in a worker and reproduces the calling thread', async () => {
    const source = polychoricWorkerSource();
    expect(source).not.toMatch(/__vi(?:te_ssr)?_import_\d+__/);
    const dataset = correlationDataset('ordinal7');
    const items = Array.from({ length: dataset.columns }, (_, j) => codeOrdinalItem(datasetColumn(dataset, j)));
    const job = createPolychoricPairsJob(items, Int32Array.of(0, 1, 2, 5, 4, 3));
    const expected = estimatePolychoricPairs(job);
    const received = await new Promise<unknown>((resolve, reject) => {
      const worker = new Worker(source, { eval: true, workerData: job });
      worker.once('message', (message) => {
        void worker.terminate();
        resolve(message);
      });
      worker.once('error', reject);
    });
    expect(received).toBeInstanceOf(Float64Array);
    expect(Array.from(received as Float64Array)).toEqual(Array.from(expected));
  });

  it('reports a failure as a message rather than crashing', async () => {
    const received = await new Promise<unknown>((resolve, reject) => {
      const worker = new Worker(polychoricWorkerSource(), { eval: true, workerData: { pairs: null } });
      worker.once('message', (message) => {
        void worker.terminate();
        resolve(message);
      });
      worker.once('error', reject);
    });
    expect(received).toMatchObject({ failed: expect.any(String) });
  });
});
