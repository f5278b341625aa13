/** The server's database, opened once from the configured path. */
import { AsyncLocalStorage } from 'node:async_hooks';
import { openDatabase, type Db } from '../../db/client';
import { getConfig } from './config';

let database: Db | null = null;

/** A database handed to `withDatabase`, for the work it runs. */
const scoped = new AsyncLocalStorage<Db>();

/** The process's database connection (opened and migrated on first call), or the one `withDatabase` runs with. */
export function getDb(): Db {
  const handed = scoped.getStore();
  if (handed !== undefined) return handed;
  database ??= openDatabase(getConfig().databasePath);
  return database;
}

/**
 * Runs work whose services read `getDb()` against a database handed in instead of the configured
 * one: the demo seed, which is given the database it fills (the test harness seeds a temporary
 * one), takes its second study through the same services as the routes. While it runs, e-mail
 * goes to that database's outbox whatever the transport (mail.ts, `isDatabaseHandedIn`).
 * @param db the database.
 * @param work what to run.
 * @returns what the work returns.
 */
export function withDatabase<T>(db: Db, work: () => Promise<T>): Promise<T> {
  return scoped.run(db, work);
}

/** Whether the running work was handed its database by `withDatabase`. */
export function isDatabaseHandedIn(): boolean {
  return scoped.getStore() !== undefined;
}
