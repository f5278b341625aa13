/**
 * A server audit with RESAMPLE_THREADS > 0 hands its bootstrap to resample threads of its own (one
 * runner per audit), and only when there are resamples; the text is that of the audit's own thread.
 */
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it, vi } from 'vitest';

const runners = vi.hoisted(() => ({ made: [] as number[] }));
vi.mock('../../src/lib/audit/resample-threads', async (original) => {
  const actual = await original<typeof import('../../src/lib/audit/resample-threads')>();
  return {
    ...actual,
    createResampleThreadRunner: (threads: number) => {
      runners.made.push(threads);
      return actual.createResampleThreadRunner(threads);
    },
  };
});

import { acceptProposal, encodeMatrix, readWave } from '../../src/lib/ingest';
import { auditSetupOf } from '../../src/lib/audit/audit-input';
import { resolveAuditSettings } from '../../src/lib/server/audit-jobs/audit-settings';
import { executeAuditJob } from '../../src/lib/server/audit-jobs/execute-audit-job';
import type { AuditWorkerJob } from '../../src/lib/server/audit-jobs/worker-protocol';

let wave: AuditWorkerJob['wave'];

beforeAll(async () => {
  const read = acceptProposal(await readWave({
    fileName: 'library-pilot-1.csv', bytes: new Uint8Array(readFileSync('fixtures/demo/library-pilot-1.csv')),
    codebookName: 'library-codebook.csv', codebookBytes: new Uint8Array(readFileSync('fixtures/demo/library-codebook.csv')), sheet: null,
  }));
  wave = {
    matrixBlob: encodeMatrix(read.wave.matrix),
    respondents: read.wave.respondents,
    excluded: [...read.wave.excluded],
    items: read.wave.items.map((item) => ({ id: item.id, scale: item.scale, reverse: item.reverse, min: item.min, max: item.max, text: item.text })),
    outcomes: [],
    setup: auditSetupOf(read.proposal.columns, read.setup.columns, read.screening),
  };
});

const job = (bootstrap: number, resampleThreads?: number): AuditWorkerJob => ({
  jobId: `threads-${bootstrap}-${resampleThreads}`,
  wave,
  settings: resolveAuditSettings({ bootstrap, seed: 3 }, {}, { allowTestFaults: false }),
  ...(resampleThreads === undefined ? {} : { resampleThreads }),
});

describe('executeAuditJob and RESAMPLE_THREADS', () => {
  it('decides the resamples on the threads asked for, with the text of the audit thread', async () => {
    runners.made.length = 0;
    const threaded = await executeAuditJob(job(16, 2), () => {});
    expect(runners.made).toEqual([2]);
    const own = await executeAuditJob(job(16), () => {});
    expect(runners.made).toEqual([2]);
    expect(threaded.resultText).toBe(own.resultText);
  });

  it('starts no thread without resamples or with RESAMPLE_THREADS=0', async () => {
    runners.made.length = 0;
    await executeAuditJob(job(0, 2), () => {});
    await executeAuditJob(job(16, 0), () => {});
    expect(runners.made).toEqual([]);
  });
});
