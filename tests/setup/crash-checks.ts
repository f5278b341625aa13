/**
 * What a server killed with SIGKILL may have left, and the means to kill one at a chosen moment:
 * the consistency checks of a database and its upload folder (SQLite's own integrity and foreign
 * key checks, no orphan or half-written file, no half-written wave or audit row), a write lock
 * held from outside (so the server waits inside its transaction), and a kill once the server is
 * seen waiting. Used by the kill -9 tests (tests/api/kill-9.test.ts, audits-restart.test.ts).
 */
import Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import type { RunningServer } from './app-server';

/** The paths of a test database and its upload folder. */
export interface StoredState {
  databasePath: string;
  uploadDir: string;
}

function filesUnder(folder: string): string[] {
  if (!existsSync(folder)) return [];
  return readdirSync(folder, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile())
    .map((entry) => relative(folder, join(entry.parentPath, entry.name)).split(sep).join('/'))
    .sort();
}

/**
 * Everything inconsistent in a database and its upload folder, one sentence each; empty when
 * all is well. Checks: `PRAGMA integrity_check` is "ok" and `PRAGMA foreign_key_check` finds
 * nothing; every file under the folder is a stored file's (`xx/<sha256>`, no `.partial-*` left),
 * with the size and sha256 its record says; every record has its file and a wave that uses it;
 * a confirmed wave has its matrix, time of confirmation and all its items, a proposed one none of
 * them; a done audit has its result and end, a failed one its error and end.
 * @param state the database file and the upload folder.
 * @returns the problems found.
 */
export function consistencyProblems(state: StoredState): string[] {
  const problems: string[] = [];
  const db = new Database(state.databasePath, { readonly: true, fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    const integrity = db.pragma('integrity_check') as { integrity_check: string }[];
    if (integrity.length !== 1 || integrity[0].integrity_check !== 'ok') problems.push(`integrity_check: ${integrity.map((row) => row.integrity_check).join('; ')}`);
    const foreign = db.pragma('foreign_key_check') as { table: string; parent: string }[];
    for (const row of foreign) problems.push(`foreign_key_check: a row of ${row.table} points to a missing ${row.parent}`);

    const records = db.prepare('select hash, size, storage_path as path from stored_files').all() as { hash: string; size: number; path: string }[];
    const byPath = new Map(records.map((record) => [record.path.split(sep).join('/'), record]));
    for (const file of filesUnder(state.uploadDir)) {
      const record = byPath.get(file);
      if (!record) problems.push(`the upload folder holds ${file}, which no stored-file record names`);
    }
    const used = new Set((db.prepare('select file_hash as f, codebook_hash as c from waves').all() as { f: string; c: string | null }[]).flatMap((row) => [row.f, row.c]));
    for (const record of records) {
      const path = join(state.uploadDir, record.path);
      if (!existsSync(path)) {
        problems.push(`the stored file ${record.hash} has no bytes under the upload folder`);
        continue;
      }
      if (statSync(path).size !== record.size) problems.push(`the stored file ${record.hash} has ${statSync(path).size} bytes, its record says ${record.size}`);
      else if (createHash('sha256').update(readFileSync(path)).digest('hex') !== record.hash) problems.push(`the bytes of the stored file ${record.hash} do not hash to its name`);
      if (!used.has(record.hash)) problems.push(`the stored file ${record.hash} is used by no wave`);
    }

    const waves = db
      .prepare('select w.id, w.status, w.matrix is not null as hasMatrix, w.confirmed_at as confirmedAt, w.item_count as itemCount, (select count(*) from wave_items i where i.wave_id = w.id) as items from waves w')
      .all() as { id: string; status: string; hasMatrix: number; confirmedAt: number | null; itemCount: number; items: number }[];
    for (const wave of waves) {
      if (wave.status === 'confirmed' && (!wave.hasMatrix || wave.confirmedAt === null || wave.items === 0 || wave.items !== wave.itemCount)) {
        problems.push(`the confirmed wave ${wave.id} is half-written (matrix ${wave.hasMatrix ? 'present' : 'missing'}, confirmed at ${wave.confirmedAt}, ${wave.items} item rows for ${wave.itemCount} items)`);
      }
      if (wave.status === 'proposed' && (wave.hasMatrix || wave.confirmedAt !== null || wave.items > 0)) {
        problems.push(`the proposed wave ${wave.id} holds parts of a confirmation (matrix ${wave.hasMatrix ? 'present' : 'missing'}, ${wave.items} item rows)`);
      }
    }

    const audits = db.prepare('select id, status, result is not null as hasResult, error, finished_at as finishedAt from audits').all() as {
      id: string; status: string; hasResult: number; error: string | null; finishedAt: number | null;
    }[];
    for (const audit of audits) {
      if (audit.status === 'done' && (!audit.hasResult || audit.finishedAt === null)) problems.push(`the done audit ${audit.id} has no result or no end`);
      if (audit.status === 'failed' && (audit.error === null || audit.finishedAt === null)) problems.push(`the failed audit ${audit.id} has no error or no end`);
    }
  } finally {
    db.close();
  }
  return problems;
}

/** A write lock on a database held by this process. */
export interface HeldWriteLock {
  /** Rolls the (empty) transaction back and closes the connection. */
  release: () => void;
}

/**
 * Takes SQLite's write lock on a database (`BEGIN IMMEDIATE` on a connection of its own), so a
 * server's next write waits (its busy timeout, 5 s) inside its transaction.
 * @param databasePath the database file.
 * @returns the lock, to release.
 */
export function holdWriteLock(databasePath: string): HeldWriteLock {
  const db = new Database(databasePath, { fileMustExist: true });
  db.exec('BEGIN IMMEDIATE');
  return {
    release: () => {
      if (db.inTransaction) db.exec('ROLLBACK');
      db.close();
    },
  };
}

/**
 * Kills a server with SIGKILL as soon as it is seen stuck in a request: a GET /api/health that
 * gets no answer within `stallMs` (the server's one thread is waiting, e.g. on a write lock held
 * with holdWriteLock). Throws when the request ends first, so a kill that came too late is never
 * taken for a kill in the middle.
 * @param server the server.
 * @param pending the request to cut off (its promise).
 * @param options stallMs: how long health may not answer before the kill (2 s by default, well
 *   above the demo CSV's parse and well below SQLite's 5 s busy timeout); deadlineMs: how long to
 *   watch before giving up.
 * @throws Error when the request settles, or the server never stalls, before the kill.
 */
export async function killWhenStalled(server: RunningServer, pending: Promise<Response>, options: { stallMs?: number; deadlineMs?: number } = {}): Promise<void> {
  const stallMs = options.stallMs ?? 2_000;
  const deadline = Date.now() + (options.deadlineMs ?? 30_000);
  let settled: string | null = null;
  pending.then(
    (response) => (settled = `answered ${response.status}`),
    (error: unknown) => (settled = `failed (${String(error)})`),
  );
  while (Date.now() < deadline) {
    try {
      await (await fetch(`${server.baseUrl}/api/health`, { signal: AbortSignal.timeout(stallMs) })).arrayBuffer();
    } catch {
      if (settled === null) {
        await server.stop('SIGKILL');
        return;
      }
    }
    if (settled !== null) throw new Error(`the request ${settled} before the server could be killed in the middle of it`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`the server never stalled within ${options.deadlineMs ?? 30_000} ms`);
}
