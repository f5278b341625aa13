/**
 * The manifest of a backup folder (`manifest.json`): when it was taken, the schema's migration
 * level, the database copy's size and sha256, its row count per table, and every uploaded file
 * with its sha256. Written last, so a folder without one is not a finished backup
 * (docs/decisions/015-schema-backups.md).
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type Database from 'better-sqlite3';
import { z } from 'zod';
import { migrationsFolder } from '../../../db/migrate';

/** The backup folder's layout. */
export const BACKUP_DATABASE_FILE = 'paredown.sqlite';
export const BACKUP_UPLOADS_FOLDER = 'uploads';
export const BACKUP_MANIFEST_FILE = 'manifest.json';
export const BACKUP_FORMAT = 'paredown-backup/1';

const sha256 = z.string().regex(/^[0-9a-f]{64}$/, 'must be a sha256 in hex');

/** Where a database stands among the committed migrations. */
const migrationLevelSchema = z.object({
  /** Migrations applied (rows of Drizzle's `__drizzle_migrations`). */
  applied: z.number().int().min(0),
  /** The tag of the latest applied migration (`0002_comment-threads`), null when unknown here or none. */
  latest: z.string().nullable(),
  /** Its `created_at` in Drizzle's table (the journal's `when`), null when none. */
  latestWhen: z.number().int().nullable(),
});
export type MigrationLevel = z.infer<typeof migrationLevelSchema>;

const fileSchema = z.object({
  /** sha256 of the bytes: the stored file's name and its `stored_files.hash`. */
  sha256,
  size: z.number().int().min(0),
  /** Relative to UPLOAD_DIR and to the backup's `uploads/` folder. */
  storagePath: z.string().min(1),
  originalName: z.string(),
});

export const backupManifestSchema = z.strictObject({
  format: z.literal(BACKUP_FORMAT),
  createdAt: z.iso.datetime(),
  database: z.strictObject({
    file: z.literal(BACKUP_DATABASE_FILE),
    size: z.number().int().positive(),
    sha256,
    migrations: migrationLevelSchema,
    /** Rows per table of the copy (Drizzle's own table included). */
    tables: z.record(z.string(), z.number().int().min(0)),
  }),
  files: z.array(fileSchema),
  /** Files the database names that were missing or damaged under UPLOAD_DIR when the backup ran. */
  problems: z.array(z.object({ sha256, storagePath: z.string(), problem: z.enum(['missing', 'damaged']) })),
});
export type BackupManifest = z.infer<typeof backupManifestSchema>;

/**
 * sha256 of a file's bytes (FIPS 180-4 through node:crypto).
 * @param path the file.
 * @returns 64 hex characters.
 */
export function fileSha256(path: string): string {
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

/** The committed migrations this checkout knows (drizzle/meta/_journal.json), oldest first. */
export function knownMigrations(): { tag: string; when: number }[] {
  const journal = JSON.parse(readFileSync(join(migrationsFolder(), 'meta', '_journal.json'), 'utf8')) as { entries: { tag: string; when: number }[] };
  return journal.entries.map((entry) => ({ tag: entry.tag, when: entry.when }));
}

/**
 * Where a database stands among the migrations: Drizzle's migrator records each applied one with
 * the journal's `when` as `created_at`.
 * @param sqlite an open database.
 * @returns the level (0 applied for a database never migrated).
 */
export function migrationLevel(sqlite: Database.Database): MigrationLevel {
  const hasTable = sqlite.prepare("select 1 from sqlite_master where type = 'table' and name = '__drizzle_migrations'").get();
  if (!hasTable) return { applied: 0, latest: null, latestWhen: null };
  const row = sqlite.prepare('select count(*) as applied, max(created_at) as latestWhen from __drizzle_migrations').get() as { applied: number; latestWhen: number | null };
  const latest = row.latestWhen === null ? null : (knownMigrations().find((entry) => entry.when === row.latestWhen)?.tag ?? null);
  return { applied: row.applied, latest, latestWhen: row.latestWhen === null ? null : Number(row.latestWhen) };
}

/**
 * Rows per table, every table of the file (SQLite's own excepted).
 * @param sqlite an open database.
 * @returns table name → row count, by name.
 */
export function tableRowCounts(sqlite: Database.Database): Record<string, number> {
  const names = (sqlite.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").all() as { name: string }[]).map((row) => row.name);
  return Object.fromEntries(names.map((name) => [name, (sqlite.prepare(`select count(*) as n from "${name.replaceAll('"', '""')}"`).get() as { n: number }).n]));
}

/**
 * `PRAGMA integrity_check` and `PRAGMA foreign_key_check` of a database.
 * @param sqlite an open database.
 * @returns the problems SQLite reports (empty when it answers "ok" and no foreign key dangles).
 */
export function integrityProblems(sqlite: Database.Database): string[] {
  const integrity = (sqlite.pragma('integrity_check') as { integrity_check: string }[]).map((row) => row.integrity_check).filter((text) => text !== 'ok');
  const keys = (sqlite.pragma('foreign_key_check') as { table: string; rowid: number; parent: string }[]).map((row) => `${row.table} row ${row.rowid} names a missing ${row.parent}`);
  return [...integrity, ...keys];
}
