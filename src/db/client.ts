/**
 * The SQLite connection: one per process, opened on first use with WAL, foreign keys and a busy
 * timeout, keeping the statements it compiles, and migrated to the latest schema before anything
 * reads it.
 */
import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import * as schema from './schema';
import { applyMigrations } from './migrate';
import { keepPreparedStatements } from './statement-cache';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

/**
 * Opens a database file with the pragmas Paredown relies on and applies pending migrations.
 * @param path the SQLite file (created with its folder when missing), or ':memory:'.
 * @returns a Drizzle database over it.
 */
export function openDatabase(path: string): Db {
  if (path !== ':memory:') mkdirSync(dirname(path), { recursive: true });
  const sqlite = new Database(path);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  sqlite.pragma('synchronous = NORMAL');
  keepPreparedStatements(sqlite);
  const db = drizzle(sqlite, { schema }) as Db;
  applyMigrations(db);
  return db;
}
