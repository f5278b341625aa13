/**
 * Cancelling audits (POST /api/audits/{id}/cancel; api.md, docs/decisions/016-fair-audits.md)
 * against the shared built server: a queued audit leaves the queue and never starts; a running
 * one's worker thread is ended, so the team's next audit runs at once instead of after minutes
 * of bootstrap; the cancelled audit says who cancelled it, can be retried, and is queued again
 * when started with the same settings; what is not queued or running is refused with 409.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoIds } from '../../src/lib/server/demo-seed';
import { body, Client, demo, demoEmails, signedIn } from '../setup/http';

const waveId = demoIds.demoWave;
let designer: Client;
let owner: Client;
/** Audits this file started that may still be queued or running (cancelled in afterAll). */
const started = new Set<string>();

/**
 * A seed of this file's own, so that each audit is new (the same settings are reused). Fixed:
 * the test server's database is new on every run (audits.test.ts counts from 100_001, the
 * permission table from 9_000_001, the browser test uses 50_000 and 50_001).
 */
let seeds = 0;
const seed = () => 300_000 + (seeds += 1);

/** Polychoric correlations with 5,000 resamples: minutes of work on the demo wave (10 s per 200; docs/decisions/004). */
const long = () => ({ method: 'polychoric', bootstrap: 5000, seed: seed() });

async function audit(client: Client, id: string) {
  const response = await client.get(`/api/audits/${id}`);
  expect(response.status).toBe(200);
  return (await body(response)).audit;
}

async function start(settings: Record<string, unknown>) {
  const response = await designer.post(`/api/waves/${waveId}/audits`, { settings });
  expect(response.status).toBe(202);
  const { audit: summary } = await body(response);
  started.add(summary.id);
  return summary as { id: string; status: string };
}

/** Polls until the audit leaves queued and running; fails after two minutes. */
async function settle(id: string) {
  for (let attempt = 0; attempt < 1_200; attempt++) {
    const summary = await audit(designer, id);
    if (summary.status !== 'queued' && summary.status !== 'running') return summary;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`audit ${id} did not end within two minutes`);
}

beforeAll(async () => {
  designer = await signedIn(demoEmails.designer);
  owner = await signedIn(demoEmails.owner);
});

afterAll(async () => {
  for (const id of started) await owner.post(`/api/audits/${id}/cancel`);
});

describe('cancelling audits', () => {
  it('takes a queued audit from the queue and ends a running one, freeing its thread', async () => {
    // Long audits until one has to wait: the demo team's share of the pool is full then (one
    // thread fewer than the pool by default, at least one; the pool has one per core).
    const running: string[] = [];
    let queued: string | null = null;
    for (let attempt = 0; attempt < 65 && queued === null; attempt++) {
      const summary = await start(long());
      if (summary.status === 'queued') queued = summary.id;
      else running.push(summary.id);
    }
    expect(queued).not.toBeNull();
    expect(running.length).toBeGreaterThan(0);

    const cancelQueued = await designer.post(`/api/audits/${queued}/cancel`);
    expect(cancelQueued.status).toBe(200);
    const queuedAnswer = (await body(cancelQueued)).audit;
    expect(queuedAnswer).toMatchObject({ id: queued, status: 'cancelled', stage: null, startedAt: null });
    // src/lib/words/labels.ts, auditCancelledReason; the designer of the demo (demo-accounts.ts).
    expect(queuedAnswer.error).toMatch(/^Cancelled by .+ before it finished; retry it to run it again\.$/);
    expect(queuedAnswer.finishedAt).not.toBeNull();

    for (const id of running) {
      const response = await owner.post(`/api/audits/${id}/cancel`);
      expect(response.status, id).toBe(200);
      expect((await body(response)).audit.status, id).toBe('cancelled');
    }

    // The threads were freed: a quick audit of the same team starts at once and finishes, though
    // each cancelled one had minutes of resampling left.
    const quick = await start({ bootstrap: 0, seed: seed() });
    expect(quick.status).toBe('running');
    expect((await settle(quick.id)).status).toBe('done');

    // Neither the queued nor the running ones came back to life, nor stored a result.
    expect(await audit(designer, queued!)).toMatchObject({ status: 'cancelled', startedAt: null, percent: 0 });
    for (const id of running) {
      const after = await body(await designer.get(`/api/audits/${id}`));
      expect(after.audit.status, id).toBe('cancelled');
      expect(after.result, id).toBeNull();
    }
    // The study's activity says who stopped them (src/lib/words/handoff.ts, activitySentence).
    const activity = await body(await designer.get(`/api/studies/${demo.study}/activity`));
    expect(activity.entries.filter((entry: { sentence: string }) => entry.sentence.includes('stopped an audit')).length).toBeGreaterThanOrEqual(running.length + 1);
  });

  it('refuses to cancel an audit that is done or already cancelled, and lets a cancelled one be retried', async () => {
    const quick = await start({ bootstrap: 0, seed: seed() });
    expect((await settle(quick.id)).status).toBe('done');
    const done = await designer.post(`/api/audits/${quick.id}/cancel`);
    expect(done.status).toBe(409);
    expect((await body(done)).error).toMatchObject({ code: 'audit-not-active', message: 'Only a queued or running audit can be cancelled; this one is done.' });

    const settings = long();
    const first = await start(settings);
    expect((await designer.post(`/api/audits/${first.id}/cancel`)).status).toBe(200);
    const twice = await designer.post(`/api/audits/${first.id}/cancel`);
    expect(twice.status).toBe(409);
    expect((await body(twice)).error.code).toBe('audit-not-active');

    // Retry queues the cancelled audit again, in place.
    const retried = await designer.post(`/api/audits/${first.id}/retry`);
    expect(retried.status).toBe(202);
    expect((await body(retried)).audit).toMatchObject({ id: first.id, error: null });
    expect(['queued', 'running']).toContain((await audit(designer, first.id)).status);
    expect((await designer.post(`/api/audits/${first.id}/cancel`)).status).toBe(200);

    // The same settings again: the cancelled audit is queued again rather than duplicated or reused.
    const again = await designer.post(`/api/waves/${waveId}/audits`, { settings: (await audit(designer, first.id)).settings });
    expect(again.status).toBe(202);
    expect((await body(again)).audit.id).toBe(first.id);
    expect((await designer.post(`/api/audits/${first.id}/cancel`)).status).toBe(200);
  });

  it('answers 404 for an audit that does not exist, and 403 naming run:audit for a reviewer', async () => {
    const missing = await designer.post('/api/audits/no-such-audit/cancel');
    expect(missing.status).toBe(404);
    expect((await body(missing)).error.code).toBe('audit-not-found');
    const summary = await start(long());
    const reviewer = await signedIn(demoEmails.reviewer);
    const refused = await reviewer.post(`/api/audits/${summary.id}/cancel`);
    expect(refused.status).toBe(403);
    expect((await body(refused)).error.message).toContain('run:audit');
    expect(['queued', 'running']).toContain((await audit(designer, summary.id)).status);
    expect((await designer.post(`/api/audits/${summary.id}/cancel`)).status).toBe(200);
  });
});
