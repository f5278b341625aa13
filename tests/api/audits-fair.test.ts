/**
 * Fair audits across teams and the time limit per audit (issue 16, finding 7;
 * docs/decisions/016-fair-audits.md), on servers of this file's own, one after the other on one
 * database. First two worker threads (so one team may hold one: AUDIT_WORKERS - 1): the demo team
 * fills its share with long audits; the other team's short audit starts at once, ahead of the
 * team's waiting one, and finishes. Then AUDIT_MAX_SECONDS=2: a long audit is stopped at the limit
 * and fails with the sentence that says what to do.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoIds } from '../../src/lib/server/demo-seed';
import { body, Client, demo, demoEmails, demoPassword, signInSucceeded } from '../setup/http';
import { createTestDatabase, startServerOn, type RunningServer, type TestDatabase } from '../setup/app-server';
import { createStudy, demoDirectory, fixture, postWave } from './waves-http';

let database: TestDatabase;
let server: RunningServer | null = null;

async function signedInOn(email: string): Promise<Client> {
  const client = new Client(server!.baseUrl);
  const response = await client.signIn(email, demoPassword);
  if (!signInSucceeded(response)) throw new Error(`sign-in of ${email} failed on ${server!.baseUrl}`);
  return client;
}

async function audit(client: Client, id: string) {
  const response = await client.get(`/api/audits/${id}`);
  expect(response.status).toBe(200);
  return (await body(response)).audit;
}

/** Polls until the audit leaves queued and running; fails after three minutes. */
async function settle(client: Client, id: string) {
  for (let attempt = 0; attempt < 1_800; attempt++) {
    const summary = await audit(client, id);
    if (summary.status !== 'queued' && summary.status !== 'running') return summary;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`audit ${id} did not end within three minutes`);
}

/** Starts a long audit of the demo wave: polychoric with 5,000 resamples runs for minutes (10 s per 200; docs/decisions/004). */
async function startLong(designer: Client, seed: number) {
  const response = await designer.post(`/api/waves/${demoIds.demoWave}/audits`, { settings: { method: 'polychoric', bootstrap: 5000, seed } });
  expect(response.status).toBe(202);
  return (await body(response)).audit;
}

/** Stops the running server (if any) and starts one on the file's database with these variables. */
async function restartWith(environment: Record<string, string>) {
  await server?.stop('SIGKILL');
  server = await startServerOn(database, { logName: 'audits-fair-server.log', appendLog: true, environment: { DEMO_SEED: '1', ...environment } });
}

beforeAll(async () => {
  database = await createTestDatabase({ seed: true });
});

afterAll(async () => {
  await server?.stop('SIGKILL');
  database?.remove();
});

describe('audits shared fairly between teams', () => {
  it("starts another team's short audit at once while one team's long audits fill its share", async () => {
    await restartWith({ AUDIT_WORKERS: '2' });
    const designer = await signedInOn(demoEmails.designer);
    const outsider = await signedInOn(demoEmails.outsider);

    // The other team (Northgate) gets a confirmed wave of its own: the demo pilot, as uploaded.
    const studyId = await createStudy(outsider, demo.outsideTeam, 'Fairness study');
    const uploaded = await postWave(outsider, studyId, fixture(demoDirectory, 'library-pilot-1.csv'), { codebook: fixture(demoDirectory, 'library-codebook.csv') });
    expect(uploaded.status).toBe(201);
    const wave = await body(uploaded);
    const confirmed = await outsider.put(`/api/waves/${wave.wave.id}/setup`, { setup: { columns: wave.setup }, exclusions: wave.screening.proposedExclusions });
    expect(confirmed.status).toBe(200);

    const first = await startLong(designer, 1);
    const second = await startLong(designer, 2);
    expect(first.status).toBe('running');
    // Two threads, one per team at most: the demo team's second audit waits although a thread is free.
    expect(second.status).toBe('queued');

    // First in, first out would have given the free thread to `second`; the other team's audit takes it now.
    const shortResponse = await outsider.post(`/api/waves/${wave.wave.id}/audits`, { settings: { bootstrap: 0 } });
    expect(shortResponse.status).toBe(202);
    const short = (await body(shortResponse)).audit;
    expect(short.status).toBe('running');
    expect((await audit(designer, second.id)).status).toBe('queued');
    const shortEnd = await settle(outsider, short.id);
    expect(shortEnd.status, shortEnd.error).toBe('done');
    // The long ones were not disturbed: the first still runs (minutes of resampling), the second still waits.
    expect((await audit(designer, first.id)).status).toBe('running');
    expect((await audit(designer, second.id)).status).toBe('queued');
    for (const id of [second.id, first.id]) expect((await designer.post(`/api/audits/${id}/cancel`)).status, id).toBe(200);
  });
});

describe('the time limit per audit', () => {
  it('stops an audit that runs past AUDIT_MAX_SECONDS, with one sentence saying what to do', async () => {
    await restartWith({ AUDIT_WORKERS: '1', AUDIT_MAX_SECONDS: '2' });
    const designer = await signedInOn(demoEmails.designer);
    const long = await startLong(designer, 3);
    const end = await settle(designer, long.id);
    expect(end.status).toBe('failed');
    // src/lib/words/labels.ts, auditTimeLimitReason.
    expect(end.error).toBe(
      "The audit ran longer than this server's limit of 2 seconds per audit and was stopped; run it again with fewer bootstrap resamples (or ask whoever runs Paredown to raise AUDIT_MAX_SECONDS).",
    );
    expect(end.finishedAt).not.toBeNull();
    expect(end.timings.totalMs).toBeGreaterThanOrEqual(0);
    // A failed audit can be retried as any other (and is stopped again here).
    expect((await designer.post(`/api/audits/${long.id}/retry`)).status).toBe(202);
    expect((await settle(designer, long.id)).error).toMatch(/^The audit ran longer than this server's limit/);
  });
});
