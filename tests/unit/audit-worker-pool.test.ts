/**
 * The audit worker pool with real worker threads started from source (the way tsx, Vitest and
 * `astro dev` start them; the built server's bundled worker is covered by tests/api/audits*.test.ts).
 * The identity checked: an audit run in a worker thread gives exactly the text the same job gives
 * on the calling thread. Also: progress, bounded concurrency, a job that throws, a thread that dies.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { acceptProposal, encodeMatrix, readWave } from '../../src/lib/ingest';
import { auditSetupOf } from '../../src/lib/audit/audit-input';
import { resolveAuditSettings } from '../../src/lib/server/audit-jobs/audit-settings';
import { executeAuditJob } from '../../src/lib/server/audit-jobs/execute-audit-job';
import { AuditJobFailure, AuditWorkerPool } from '../../src/lib/server/audit-jobs/worker-pool';
import { locateAuditWorker, spawnAuditWorker } from '../../src/lib/server/audit-jobs/worker-entry';
import type { AuditWorkerJob } from '../../src/lib/server/audit-jobs/worker-protocol';

let baseJob: AuditWorkerJob;
const pools: AuditWorkerPool[] = [];
const folders: string[] = [];

function job(id: string, overrides: Record<string, unknown> = {}): AuditWorkerJob {
  return { ...baseJob, jobId: id, settings: resolveAuditSettings({ bootstrap: 0, outcome: 'overall_sat', ...overrides }, {}, { allowTestFaults: true }) };
}

function pool(size: number): AuditWorkerPool {
  const made = new AuditWorkerPool(size, () => spawnAuditWorker());
  pools.push(made);
  return made;
}

beforeAll(async () => {
  // The demo wave, read as the seed reads it (fixtures/demo/).
  const { wave, proposal, setup, screening } = acceptProposal(await readWave({
    fileName: 'library-pilot-1.csv', bytes: new Uint8Array(readFileSync('fixtures/demo/library-pilot-1.csv')),
    codebookName: 'library-codebook.csv', codebookBytes: new Uint8Array(readFileSync('fixtures/demo/library-codebook.csv')), sheet: null,
  }));
  baseJob = {
    jobId: 'base',
    wave: {
      matrixBlob: encodeMatrix(wave.matrix),
      respondents: wave.respondents,
      excluded: [...wave.excluded],
      items: wave.items.map((item) => ({ id: item.id, scale: item.scale, reverse: item.reverse, min: item.min, max: item.max, text: item.text })),
      outcomes: wave.outcomes.map((outcome) => ({ id: outcome.id, header: outcome.header, values: Array.from(outcome.values, (v) => (Number.isFinite(v) ? v : null)) })),
      setup: auditSetupOf(proposal.columns, setup.columns, screening),
    },
    settings: resolveAuditSettings({}, {}, { allowTestFaults: false }),
  };
});

afterAll(async () => {
  for (const made of pools) await made.close();
  for (const folder of folders) rmSync(folder, { recursive: true, force: true });
});

describe('AuditWorkerPool with source workers', () => {
  it('gives in a worker thread exactly the text of the calling thread, with progress in stage order', async () => {
    const stages: string[] = [];
    const fractions: number[] = [];
    let started = 0;
    const result = await pool(1).run({
      prepare: () => job('same'),
      onStart: () => (started += 1),
      onProgress: (stage, fraction) => {
        if (stages[stages.length - 1] !== stage) stages.push(stage);
        fractions.push(fraction);
      },
    });
    const local = await executeAuditJob(job('same'), () => {});
    expect(result).not.toBeNull();
    expect(result!.resultText).toBe(local.resultText);
    expect(JSON.parse(result!.resultText).schema).toBe('paredown.audit/1');
    expect(started).toBe(1);
    expect(stages).toEqual(['loading', 'evidence', 'structure', 'engine', 'outcome', 'saving']);
    expect(fractions).toEqual([...fractions].sort((a, b) => a - b));
    for (const key of ['loadingMs', 'evidenceMs', 'structureMs', 'engineMs', 'outcomeMs', 'savingMs', 'runMs']) expect(result!.timings[key], key).toBeGreaterThanOrEqual(0);
  });

  it('decides the bootstrap on resample threads started inside the audit thread, with exactly the text of one thread', async () => {
    // RESAMPLE_THREADS: the worker's audit hands its resamples to two threads of its own; the counts are sums, so the text is the same.
    const withThreads: AuditWorkerJob = { ...job('threads', { bootstrap: 12, seed: 5 }), resampleThreads: 2 };
    const result = await pool(1).run({ prepare: () => withThreads, onStart: () => {}, onProgress: () => {} });
    const local = await executeAuditJob(job('threads', { bootstrap: 12, seed: 5 }), () => {});
    expect(result).not.toBeNull();
    expect(result!.resultText).toBe(local.resultText);
    const audit = JSON.parse(result!.resultText) as { recommendations: { stability: number | null }[] };
    // The demo wave has recommendations, so the resamples really ran (tests/unit/execute-audit-job-threads.test.ts checks the threads are asked for).
    expect(audit.recommendations.length).toBeGreaterThan(0);
    expect(audit.recommendations.every((entry) => typeof entry.stability === 'number')).toBe(true);
  });

  it('runs no more jobs at once than its size, first in first out', async () => {
    const starts: { name: string; busy: number; lastStageOfPrevious: string | null }[] = [];
    const lastStage = new Map<string, string>();
    const one = pool(1);
    const names = ['a', 'b', 'c'];
    const task = (name: string, index: number) =>
      one.run({
        prepare: () => job(name),
        onStart: () => starts.push({ name, busy: one.state().busy, lastStageOfPrevious: index > 0 ? lastStage.get(names[index - 1]) ?? null : null }),
        onProgress: (stage) => lastStage.set(name, stage),
      });
    const waiting = names.map(task);
    expect(one.state()).toMatchObject({ size: 1, threads: 1, busy: 1, queued: 2 });
    const results = await Promise.all(waiting);
    expect(results.every((result) => result !== null)).toBe(true);
    // Each job starts alone, after the one before it reported its last stage.
    expect(starts).toEqual([
      { name: 'a', busy: 1, lastStageOfPrevious: null },
      { name: 'b', busy: 1, lastStageOfPrevious: 'saving' },
      { name: 'c', busy: 1, lastStageOfPrevious: 'saving' },
    ]);
    expect(one.state()).toMatchObject({ threads: 1, busy: 0, queued: 0 });
  });

  it('fails a job that throws with its reason and keeps the thread', async () => {
    const one = pool(1);
    await expect(one.run({ prepare: () => job('throws', { testFault: 'throw' }) })).rejects.toThrow(/injected test fault made the audit throw/);
    expect(one.state().threads).toBe(1);
    await expect(one.run({ prepare: () => job('after-throw') })).resolves.not.toBeNull();
  });

  it('fails a job whose thread dies, then starts a fresh thread for the next', async () => {
    const one = pool(1);
    const crash = one.run({ prepare: () => job('crash', { testFault: 'crash' }) });
    await expect(crash).rejects.toBeInstanceOf(AuditJobFailure);
    await expect(crash).rejects.toThrow(/exit code 70/);
    const next = await one.run({ prepare: () => job('after-crash') });
    expect(next).not.toBeNull();
    expect(one.state()).toMatchObject({ threads: 1, busy: 0 });
  });

  it('resolves null when prepare finds nothing to run, and passes on what prepare throws', async () => {
    const one = pool(1);
    await expect(one.run({ prepare: () => null })).resolves.toBeNull();
    await expect(one.run({ prepare: () => { throw new Error('gone'); } })).rejects.toThrow('gone');
    expect(one.state()).toMatchObject({ busy: 0, queued: 0 });
  });

  it('refuses a size outside 1 to 64', () => {
    expect(() => new AuditWorkerPool(0, () => spawnAuditWorker())).toThrow(/size must be an integer from 1 to 64/);
    expect(() => new AuditWorkerPool(1.5, () => spawnAuditWorker())).toThrow(RangeError);
  });
});

describe('locateAuditWorker', () => {
  it('uses the TypeScript source beside a .ts module', () => {
    const origin = locateAuditWorker(pathToFileURL(join(process.cwd(), 'src/lib/server/audit-jobs/worker-entry.ts')).href);
    expect(origin).toEqual({ kind: 'source', file: join(process.cwd(), 'src/lib/server/audit-jobs/audit-worker.ts') });
  });

  it('finds the bundled worker above a built chunk, and says so when it is missing', () => {
    const folder = mkdtempSync(join(tmpdir(), 'paredown-worker-locate-'));
    folders.push(folder);
    mkdirSync(join(folder, 'dist', 'server', 'chunks'), { recursive: true });
    const chunk = pathToFileURL(join(folder, 'dist', 'server', 'chunks', 'audit-jobs_x1.mjs')).href;
    expect(() => locateAuditWorker(chunk)).toThrow(/audit-worker\.mjs was not found.*npm run build/);
    writeFileSync(join(folder, 'dist', 'server', 'audit-worker.mjs'), '');
    expect(locateAuditWorker(chunk)).toEqual({ kind: 'built', file: join(folder, 'dist', 'server', 'audit-worker.mjs') });
  });
});
