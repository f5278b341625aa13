/**
 * The early cut list (docs/decisions/026-early-cut-list.md) against the shared built server: while
 * an audit's bootstrap runs, GET /api/audits/{id} carries the recommendations already made, their
 * stability still null, to every member who may read the audit; it is gone once the audit ends
 * (here: cancelled), and a finished audit's recommendations are the same lines with stability.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoIds } from '../../src/lib/server/demo-seed';
import { body, Client, demoEmails, signedIn } from '../setup/http';

const waveId = demoIds.demoWave;
let designer: Client;
let reviewer: Client;
const started = new Set<string>();

/** This file's seeds (the test server's database is new on every run; other files use other ranges). */
let seeds = 0;
const seed = () => 420_000 + (seeds += 1);

type Summary = { id: string; status: string; earlyCutList?: { resamples: number; recommendations: Record<string, unknown>[] } };

async function summaryOf(client: Client, id: string): Promise<Summary> {
  const response = await client.get(`/api/audits/${id}`);
  expect(response.status).toBe(200);
  return (await body(response)).audit;
}

async function start(settings: Record<string, unknown>): Promise<Summary> {
  const response = await designer.post(`/api/waves/${waveId}/audits`, { settings });
  expect(response.status).toBe(202);
  const { audit } = await body(response);
  started.add(audit.id);
  return audit;
}

/** Polls until `done(summary)` holds; fails after `seconds`. */
async function until(id: string, done: (summary: Summary) => boolean, seconds: number): Promise<Summary> {
  for (let attempt = 0; attempt < seconds * 10; attempt++) {
    const summary = await summaryOf(designer, id);
    if (done(summary)) return summary;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error(`audit ${id} did not reach the awaited state within ${seconds} s`);
}

beforeAll(async () => {
  designer = await signedIn(demoEmails.designer);
  reviewer = await signedIn(demoEmails.reviewer);
});

afterAll(async () => {
  for (const id of started) await designer.post(`/api/audits/${id}/cancel`);
});

describe('the early cut list of a running audit', () => {
  it('is shown while the bootstrap runs, to reviewers too, and is gone once the audit ends', async () => {
    // 5,000 polychoric resamples take minutes; the recommendations come in the first seconds.
    const audit = await start({ method: 'polychoric', bootstrap: 5000, seed: seed() });
    const running = await until(audit.id, (summary) => summary.earlyCutList !== undefined || !['queued', 'running'].includes(summary.status), 90);
    expect(running.status).toBe('running');
    const early = running.earlyCutList!;
    expect(early.resamples).toBe(5000);
    // The demo wave plants an exact copy and near-copies (demo-seed.ts): the list is not empty.
    expect(early.recommendations.length).toBeGreaterThan(0);
    for (const line of early.recommendations) {
      expect(line.stability).toBeNull();
      expect(typeof line.keep).toBe('string');
      expect(typeof line.reason).toBe('string');
      expect(Array.isArray(line.actions)).toBe(true);
    }
    expect(early.recommendations.map((line) => line.keep)).toContain('events_3');

    const seenByReviewer = await summaryOf(reviewer, audit.id);
    expect(seenByReviewer.earlyCutList?.recommendations.length).toBe(early.recommendations.length);

    const cancelled = await designer.post(`/api/audits/${audit.id}/cancel`);
    expect(cancelled.status).toBe(200);
    const after = await summaryOf(designer, audit.id);
    expect(after.status).toBe('cancelled');
    expect(after.earlyCutList).toBeUndefined();
  });

  it('lists the same lines the finished audit makes, which then carry their stability', async () => {
    const audit = await start({ method: 'pearson', bootstrap: 200, seed: seed() });
    let early: Summary['earlyCutList'];
    const finished = await until(
      audit.id,
      (summary) => {
        early ??= summary.earlyCutList;
        return !['queued', 'running'].includes(summary.status);
      },
      120,
    );
    expect(finished.status).toBe('done');
    expect(finished.earlyCutList).toBeUndefined();
    // When it came is kept among the timings (ms from the start of the run).
    const timings = (finished as unknown as { timings: Record<string, number> }).timings;
    expect(timings.cutListAtMs).toBeGreaterThan(0);
    expect(timings.cutListAtMs).toBeLessThan(timings.runMs);
    const result = (await body(await designer.get(`/api/audits/${audit.id}`))).result;
    const made = result.recommendations as Record<string, unknown>[];
    expect(made.every((line) => typeof line.stability === 'number')).toBe(true);
    // Polled every 100 ms, a Pearson bootstrap of a few seconds is caught while it runs.
    expect(early).toBeDefined();
    expect(early!.recommendations.map((line) => [line.cluster, line.keep, line.actions])).toEqual(made.map((line) => [line.cluster, line.keep, line.actions]));
  });
});
