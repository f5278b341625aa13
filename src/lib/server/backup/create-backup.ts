/**
 * `npm run backup`: a consistent copy of the database taken with SQLite's online backup
 * (better-sqlite3 `db.backup()`, which restarts the copy if another connection writes meanwhile
 * and so ends on one committed state), the uploaded files that copy names, and a manifest.
 * The file list is read from the copy, not from the live database, so the files match the rows.
 */
import Database from 'better-sqlite3';
import { drizzle } from 'drizzle-orm/better-sqlite3';
import { copyFileSync, existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import * as schema from '../../../db/schema';
import { FileStore } from '../file-store';
import {
  BACKUP_DATABASE_FILE, BACKUP_FORMAT, BACKUP_MANIFEST_FILE, BACKUP_UPLOADS_FOLDER, fileSha256, integrityProblems, migrationLevel, tableRowCounts,
  type BackupManifest,
} from './manifest';

/** A backup the caller asked for cannot be made (exit 2: one sentence, what to do). */
export class BackupRefusal extends Error {}

export interface CreateBackupOptions {
  databasePath: string;
  uploadDir: string;
  /** The folder to write; made when missing, refused when it holds anything. */
  outDir: string;
  /** The time to record (the clock by default). */
  now?: Date;
}

/** What a backup wrote. */
export interface BackupOutcome {
  outDir: string;
  manifest: BackupManifest;
}

/**
 * The default folder of a backup: `backups/paredown-<UTC time>` under the working directory.
 * @param now the time.
 * @returns a relative path such as `backups/paredown-20261202T201500Z`.
 */
export function defaultBackupFolder(now: Date): string {
  return join('backups', `paredown-${now.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z')}`);
}

/** Pages per step of the online backup: everything in one step, so a busy writer cannot keep restarting it. */
const ALL_PAGES = 0x7fffffff;

/**
 * Backs up the database and its uploaded files into a new folder.
 * @param options where the database and uploads are, and the folder to write.
 * @throws BackupRefusal when the database is missing or the folder is not empty; Error on an I/O fault
 *   (the folder is removed again when this call made it).
 * @returns the folder and its manifest (whose `problems` lists files the database names that were missing or damaged).
 */
export async function createBackup(options: CreateBackupOptions): Promise<BackupOutcome> {
  const databasePath = resolve(options.databasePath);
  const outDir = resolve(options.outDir);
  if (!existsSync(databasePath)) throw new BackupRefusal(`There is no database at ${databasePath}; set DATABASE_PATH to the server's database.`);
  if (existsSync(outDir) && readdirSync(outDir).length > 0) throw new BackupRefusal(`The backup folder ${outDir} is not empty; name a new folder with --out.`);
  const madeFolder = !existsSync(outDir);
  mkdirSync(outDir, { recursive: true });
  try {
    const manifest = await writeBackup(databasePath, new FileStore(options.uploadDir), outDir, options.now ?? new Date());
    return { outDir, manifest };
  } catch (error) {
    if (madeFolder) rmSync(outDir, { recursive: true, force: true });
    else for (const entry of readdirSync(outDir)) rmSync(join(outDir, entry), { recursive: true, force: true });
    throw error;
  }
}

async function writeBackup(databasePath: string, store: FileStore, outDir: string, now: Date): Promise<BackupManifest> {
  const copyPath = join(outDir, BACKUP_DATABASE_FILE);
  const source = new Database(databasePath, { fileMustExist: true });
  try {
    source.pragma('busy_timeout = 5000');
    await source.backup(copyPath, { progress: () => ALL_PAGES });
  } finally {
    source.close();
  }

  // The copy becomes one self-contained file (no -wal beside it), checked before anything relies on it.
  const copy = new Database(copyPath, { fileMustExist: true });
  let tables: Record<string, number>;
  let migrations: BackupManifest['database']['migrations'];
  let records: ReturnType<FileStore['list']>;
  try {
    copy.pragma('journal_mode = DELETE');
    const problems = integrityProblems(copy);
    if (problems.length > 0) throw new Error(`The copy of the database failed its integrity check: ${problems.slice(0, 3).join('; ')}`);
    tables = tableRowCounts(copy);
    migrations = migrationLevel(copy);
    records = store.list(drizzle(copy, { schema }));
  } finally {
    copy.close();
  }

  const uploads = new FileStore(join(outDir, BACKUP_UPLOADS_FOLDER));
  const files: BackupManifest['files'] = [];
  const problems: BackupManifest['problems'] = [];
  for (const record of records) {
    if (!record.present) {
      problems.push({ sha256: record.hash, storagePath: record.storagePath, problem: 'missing' });
      continue;
    }
    const target = uploads.pathOf(record.storagePath);
    mkdirSync(dirname(target), { recursive: true });
    copyFileSync(record.path, `${target}.partial`);
    const sha256 = fileSha256(`${target}.partial`);
    if (sha256 !== record.hash) {
      rmSync(`${target}.partial`);
      problems.push({ sha256: record.hash, storagePath: record.storagePath, problem: 'damaged' });
      continue;
    }
    renameSync(`${target}.partial`, target);
    files.push({ sha256, size: record.size, storagePath: record.storagePath, originalName: record.originalName });
  }

  const manifest: BackupManifest = {
    format: BACKUP_FORMAT,
    createdAt: now.toISOString(),
    database: { file: BACKUP_DATABASE_FILE, size: statSync(copyPath).size, sha256: fileSha256(copyPath), migrations, tables },
    files,
    problems,
  };
  writeFileSync(join(outDir, `${BACKUP_MANIFEST_FILE}.partial`), JSON.stringify(manifest, null, 2) + '\n');
  renameSync(join(outDir, `${BACKUP_MANIFEST_FILE}.partial`), join(outDir, BACKUP_MANIFEST_FILE));
  return manifest;
}

