/** The server's database, opened once from the configured path. */
import { openDatabase, type Db } from '../../db/client';
import { getConfig } from './config';

let database: Db | null = null;

/** The process's database connection (opened and migrated on first call). */
export function getDb(): Db {
  database ??= openDatabase(getConfig().databasePath);
  return database;
}
