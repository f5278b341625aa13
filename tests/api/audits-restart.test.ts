/**
 * Restart recovery, on a server and database of this file's own: a server is killed (SIGKILL)
 * while one audit runs and another waits in the queue (one worker thread); a new server on the
 * same database and upload folder finds SQLite's integrity check "ok", no orphan file and no
 * half-written row (tests/setup/crash-checks.ts), marks both audits failed ("interrupted by a
 * restart"), never leaves them running, and runs one again when retried.
 */
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoIds } from '../../src/lib/server/demo-seed';
import { body, Client, demoEmails, demoPassword, signInSucceeded } from '../setup/http';
import { createTestDatabase, startServerOn, type RunningServer, type TestDatabase } from '../setup/app-server';
import { consistencyProblems } from '../setup/crash-checks';

let database: TestDatabase;
const servers: RunningServer[] = [];

async function designerOn(server: RunningServer): Promise<Client> {
  const client = new Client(server.baseUrl);
  const response = await client.signIn(demoEmails.designer, demoPassword);
  if (!signInSucceeded(response)) throw new Error(`sign-in failed on ${server.baseUrl}`);
  return client;
}

async function statusOf(client: Client, id: string) {
  const response = await client.get(`/api/audits/${id}`);
  expect(response.status).toBe(200);
  return (await body(response)).audit;
}

beforeAll(async () => {
  database = await createTestDatabase({ seed: true });
});

afterAll(async () => {
  for (const server of servers) await server.stop('SIGKILL');
  database?.remove();
});

describe('an audit interrupted by a restart', () => {
  it('is marked failed by the next server and can be retried', async () => {
    const first = await startServerOn(database, { logName: 'audits-restart-server.log', appendLog: true, environment: { AUDIT_WORKERS: '1' } });
    servers.push(first);
    const designer = await designerOn(first);
    // Polychoric with 5,000 resamples runs for minutes; it is still running when the server dies.
    const long = await designer.post(`/api/waves/${demoIds.demoWave}/audits`, { settings: { method: 'polychoric', bootstrap: 5000 } });
    expect(long.status).toBe(202);
    const runningId = (await body(long)).audit.id;
    const short = await designer.post(`/api/waves/${demoIds.demoWave}/audits`, { settings: { bootstrap: 0 } });
    expect(short.status).toBe(202);
    const queuedId = (await body(short)).audit.id;

    let running = await statusOf(designer, runningId);
    for (let attempt = 0; attempt < 300 && !(running.status === 'running' && running.percent > 0); attempt++) {
      await new Promise((r) => setTimeout(r, 100));
      running = await statusOf(designer, runningId);
    }
    expect(running.status).toBe('running');
    // One worker thread: the second audit waits.
    expect((await statusOf(designer, queuedId)).status).toBe('queued');

    await first.stop('SIGKILL');
    const left = new Database(database.databasePath, { readonly: true });
    const statuses = left.prepare('select id, status from audits where id in (?, ?) order by id').all(runningId, queuedId) as { id: string; status: string }[];
    left.close();
    expect(Object.fromEntries(statuses.map((row) => [row.id, row.status]))).toEqual({ [runningId]: 'running', [queuedId]: 'queued' });

    const second = await startServerOn(database, { logName: 'audits-restart-server.log', appendLog: true, environment: { AUDIT_WORKERS: '1' } });
    servers.push(second);
    const again = await designerOn(second);
    expect(consistencyProblems(database)).toEqual([]);
    for (const id of [runningId, queuedId]) {
      const audit = await statusOf(again, id);
      expect(audit.status, id).toBe('failed');
      expect(audit.error, id).toMatch(/interrupted by a restart/);
      expect(audit.finishedAt, id).not.toBeNull();
    }
    const study = await body(await again.get(`/api/studies/${demoIds.demoStudy}`));
    expect(study.study.audits.filter((a: { status: string }) => a.status === 'running' || a.status === 'queued')).toEqual([]);

    const retried = await again.post(`/api/audits/${queuedId}/retry`);
    expect(retried.status).toBe(202);
    let audit = await statusOf(again, queuedId);
    for (let attempt = 0; attempt < 600 && audit.status !== 'done' && audit.status !== 'failed'; attempt++) {
      await new Promise((r) => setTimeout(r, 100));
      audit = await statusOf(again, queuedId);
    }
    expect(audit.status).toBe('done');
    expect(audit.error).toBeNull();
    expect(consistencyProblems(database)).toEqual([]);
  });
});
