/**
 * Columns every domain file of the schema shares. Not re-exported from `index.ts`: only tables,
 * enums and their types are the model's public names.
 */
import { sql } from 'drizzle-orm';
import { integer } from 'drizzle-orm/sqlite-core';

/** `created_at`, integer milliseconds, filled by SQLite when a row is inserted. */
export const createdAt = () =>
  integer('created_at', { mode: 'timestamp_ms' })
    .notNull()
    .default(sql`(cast(unixepoch('subsec') * 1000 as integer))`);
