/**
 * Faults: the server killed with SIGKILL in the middle of an upload and in the middle of a
 * confirmation, then started again on the same database and upload folder. To kill it inside the
 * work rather than before or after it, the test holds SQLite's write lock from outside, so the
 * server's transaction waits (busy timeout) after it has read and checked everything, and kills
 * it once /api/health stops answering. Afterwards SQLite's integrity check is "ok", no file is left
 * in UPLOAD_DIR without its record, no row is half-written, and the same work succeeds on the new
 * server. (The kill during an audit, and its retry, is tests/api/audits-restart.test.ts.)
 */
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoIds } from '../../src/lib/server/demo-seed';
import { createTestDatabase, startServerOn, type RunningServer, type TestDatabase } from '../setup/app-server';
import { consistencyProblems, holdWriteLock, killWhenStalled } from '../setup/crash-checks';
import { body, Client, demoEmails, demoPassword, signInSucceeded } from '../setup/http';
import { createStudy, postWave, textFile, type FilePart } from './waves-http';

let database: TestDatabase;
const servers: RunningServer[] = [];

async function startServer(): Promise<{ server: RunningServer; designer: Client }> {
  const server = await startServerOn(database, { logName: 'kill-9-server.log', appendLog: true });
  servers.push(server);
  const designer = new Client(server.baseUrl);
  if (!signInSucceeded(await designer.signIn(demoEmails.designer, demoPassword))) throw new Error(`sign-in failed on ${server.baseUrl}`);
  return { server, designer };
}

/** A CSV no earlier upload holds (so its bytes are written afresh): 40 respondents, 6 five-point items. */
function freshCsv(tag: string): FilePart {
  const rows = ['respondent_id,Q1,Q2,Q3,Q4,Q5,Q6'];
  for (let i = 0; i < 40; i++) rows.push([`${tag}-${i}`, ...[1, 2, 3, 4, 5, 6].map((q) => ((i * q + (i % 3)) % 5) + 1)].join(','));
  return textFile(`${tag}.csv`, rows.join('\n') + '\n');
}

function waveRow(id: string): { status: string; hasMatrix: number; items: number } | undefined {
  const db = new Database(database.databasePath, { readonly: true, fileMustExist: true });
  try {
    return db.prepare('select status, matrix is not null as hasMatrix, (select count(*) from wave_items where wave_id = waves.id) as items from waves where id = ?').get(id) as
      | { status: string; hasMatrix: number; items: number }
      | undefined;
  } finally {
    db.close();
  }
}

function wavesOfStudy(studyId: string): number {
  const db = new Database(database.databasePath, { readonly: true, fileMustExist: true });
  try {
    return (db.prepare('select count(*) as n from waves where study_id = ?').get(studyId) as { n: number }).n;
  } finally {
    db.close();
  }
}

/** Kills the server in the middle of `send` (holding the write lock meanwhile). */
async function killDuring(server: RunningServer, send: () => Promise<Response>): Promise<void> {
  const lock = holdWriteLock(database.databasePath);
  try {
    await killWhenStalled(server, send());
  } finally {
    lock.release();
  }
}

beforeAll(async () => {
  database = await createTestDatabase({ seed: true });
});

afterAll(async () => {
  for (const server of servers) await server.stop('SIGKILL');
  database?.remove();
});

describe('kill -9 and a restart on the same database and upload folder', () => {
  it('during an upload: no file, no wave, an intact database; the upload then succeeds', async () => {
    const { server, designer } = await startServer();
    const studyId = await createStudy(designer, demoIds.demoTeam, 'Killed upload');
    const file = freshCsv('killed-upload');
    await killDuring(server, () => postWave(designer, studyId, file));
    expect(server.child.signalCode).toBe('SIGKILL');

    const again = await startServer();
    expect(consistencyProblems(database)).toEqual([]);
    expect(wavesOfStudy(studyId)).toBe(0);
    const uploaded = await postWave(again.designer, studyId, file);
    expect(uploaded.status).toBe(201);
    expect(wavesOfStudy(studyId)).toBe(1);
    expect(consistencyProblems(database)).toEqual([]);
  });

  it('during a confirmation: the wave stays proposed with nothing of the confirmation; confirming then succeeds', async () => {
    const { server, designer } = await startServer();
    const studyId = await createStudy(designer, demoIds.demoTeam, 'Killed confirmation');
    const uploaded = await postWave(designer, studyId, freshCsv('killed-confirmation'));
    expect(uploaded.status).toBe(201);
    const proposal = await body(uploaded);
    const waveId: string = proposal.wave.id;
    const request = { setup: { columns: proposal.setup }, exclusions: [] };
    await killDuring(server, () => designer.put(`/api/waves/${waveId}/setup`, request));
    expect(server.child.signalCode).toBe('SIGKILL');

    const again = await startServer();
    expect(consistencyProblems(database)).toEqual([]);
    expect(waveRow(waveId)).toEqual({ status: 'proposed', hasMatrix: 0, items: 0 });
    const confirmed = await again.designer.put(`/api/waves/${waveId}/setup`, request);
    expect(confirmed.status).toBe(200);
    expect(waveRow(waveId)).toEqual({ status: 'confirmed', hasMatrix: 1, items: 6 });
    expect(consistencyProblems(database)).toEqual([]);
  });
});
