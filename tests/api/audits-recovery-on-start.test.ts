/**
 * Restart recovery runs when the server starts (its first request of any kind, src/middleware.ts;
 * docs/decisions/004-audit-jobs.md), not only when audits are first read: audits an earlier
 * process left `queued` or `running` are already marked failed after a request that never touches
 * audits (/api/health), and a finished audit is left as it was.
 */
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoIds } from '../../src/lib/server/demo-seed';
import { INTERRUPTED_REASON } from '../../src/lib/server/audit-jobs/audit-jobs';
import { createTestDatabase, startServerOn, type RunningServer, type TestDatabase } from '../setup/app-server';

let database: TestDatabase;
let server: RunningServer | null = null;

interface AuditRecord {
  id: string;
  status: string;
  error: string | null;
  finished_at: number | null;
  result: string | null;
}

function auditRecords(): Record<string, AuditRecord> {
  const db = new Database(database.databasePath, { readonly: true, fileMustExist: true });
  try {
    const rows = db.prepare('select id, status, error, finished_at, result from audits order by id').all() as AuditRecord[];
    return Object.fromEntries(rows.map((row) => [row.id, row]));
  } finally {
    db.close();
  }
}

beforeAll(async () => {
  database = await createTestDatabase({ seed: true });
  // What a killed server leaves behind: one audit waiting, one running, one done.
  const db = new Database(database.databasePath);
  try {
    const insert = db.prepare(
      'insert into audits (id, wave_id, settings, settings_hash, status, stage, progress, result, created_at, started_at, finished_at) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    );
    const now = Date.now();
    insert.run('audit-left-queued', demoIds.demoWave, '{}', 'hash-queued', 'queued', null, 0, null, now, null, null);
    insert.run('audit-left-running', demoIds.demoWave, '{}', 'hash-running', 'running', 'engine', 40, null, now, now, null);
    insert.run('audit-left-done', demoIds.demoWave, '{}', 'hash-done', 'done', null, 100, '{"kept":true}', now, now, now);
  } finally {
    db.close();
  }
});

afterAll(async () => {
  await server?.stop('SIGKILL');
  database?.remove();
});

describe('restart recovery', () => {
  it('has marked unfinished audits failed once the started server answered /api/health', async () => {
    expect(auditRecords()['audit-left-running'].status).toBe('running');
    // startServerOn waits until GET /api/health answers: the only requests the server has seen.
    server = await startServerOn(database, { logName: 'audits-recovery-on-start.log' });
    expect((await fetch(`${server.baseUrl}/api/health`)).status).toBe(200);
    const after = auditRecords();
    for (const id of ['audit-left-queued', 'audit-left-running']) {
      expect(after[id].status, id).toBe('failed');
      expect(after[id].error, id).toBe(INTERRUPTED_REASON);
      expect(after[id].finished_at, id).not.toBeNull();
    }
    expect(after['audit-left-done']).toMatchObject({ status: 'done', error: null, result: '{"kept":true}' });
  });
});
