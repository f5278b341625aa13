/**
 * `npm run restore -- DIR`: brings a backup back into DATABASE_PATH and UPLOAD_DIR. Everything in
 * the backup is verified first (the manifest, the database copy's sha256 and integrity check,
 * every file's sha256, the migration level against this checkout), so a bad backup writes
 * nothing. A target in use (a server holds the database open) is always refused; a target that
 * is not empty is refused unless `force`, and then its old database is kept beside it as
 * `<file>.before-restore-<time>`. Files are written first, the database last, by rename.
 */
import Database from 'better-sqlite3';
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, unlinkSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { FileStore } from '../file-store';
import {
  BACKUP_DATABASE_FILE, BACKUP_FORMAT, BACKUP_MANIFEST_FILE, BACKUP_UPLOADS_FOLDER, backupManifestSchema, fileSha256, integrityProblems, knownMigrations,
  migrationLevel, tableRowCounts, type BackupManifest,
} from './manifest';

/** A restore that cannot go ahead (exit 2: one sentence, what to do). Nothing was written. */
export class RestoreRefusal extends Error {}

export interface RestoreOptions {
  /** The backup folder (holding manifest.json). */
  from: string;
  databasePath: string;
  uploadDir: string;
  /** Replace a target that is not empty (never one in use). */
  force?: boolean;
  /** The time for the name of the kept old database (the clock by default). */
  now?: Date;
}

export interface RestoreOutcome {
  manifest: BackupManifest;
  databasePath: string;
  uploadDir: string;
  /** Where the old database went (force over a non-empty target), or null. */
  previousDatabase: string | null;
  /** Files written (those already there with the right bytes are not counted). */
  filesWritten: number;
}

const sidecars = ['-wal', '-shm', '-journal'];

/**
 * Reads and checks a backup folder without writing anywhere.
 * @param from the folder.
 * @throws RestoreRefusal naming the first thing wrong.
 * @returns its manifest.
 */
export function verifyBackup(from: string): BackupManifest {
  const folder = resolve(from);
  const manifestPath = join(folder, BACKUP_MANIFEST_FILE);
  if (!existsSync(manifestPath)) throw new RestoreRefusal(`${folder} holds no ${BACKUP_MANIFEST_FILE}; name a folder written by npm run backup.`);
  let parsed: unknown;
  try {
    parsed = JSON.parse(readFileSync(manifestPath, 'utf8'));
  } catch {
    throw new RestoreRefusal(`${manifestPath} is not valid JSON; the backup is damaged, use another one.`);
  }
  const checked = backupManifestSchema.safeParse(parsed);
  if (!checked.success) {
    const format = (parsed as { format?: unknown } | null)?.format;
    if (format !== BACKUP_FORMAT) throw new RestoreRefusal(`${manifestPath} is not a ${BACKUP_FORMAT} manifest; this version restores only backups in that format.`);
    const issue = checked.error.issues[0];
    throw new RestoreRefusal(`${manifestPath} is damaged (${issue.path.join('.')}: ${issue.message}); use another backup.`);
  }
  const manifest = checked.data;

  const known = knownMigrations();
  const level = manifest.database.migrations;
  if (level.applied > known.length || (level.latestWhen !== null && !known.some((entry) => entry.when === level.latestWhen))) {
    throw new RestoreRefusal(`The backup's schema (${level.applied} migrations, latest ${level.latest ?? 'unknown here'}) is newer than this Paredown's (${known.length}); restore it with the version that made it.`);
  }

  const databaseCopy = join(folder, BACKUP_DATABASE_FILE);
  if (!existsSync(databaseCopy)) throw new RestoreRefusal(`The backup has no ${BACKUP_DATABASE_FILE}; it is incomplete, use another one.`);
  if (statSync(databaseCopy).size !== manifest.database.size || fileSha256(databaseCopy) !== manifest.database.sha256) {
    throw new RestoreRefusal(`The backup's ${BACKUP_DATABASE_FILE} does not match the sha256 in its manifest; it was changed or damaged, use another backup.`);
  }
  const copy = new Database(databaseCopy, { readonly: true, fileMustExist: true });
  try {
    const problems = integrityProblems(copy);
    if (problems.length > 0) throw new RestoreRefusal(`The backup's database fails PRAGMA integrity_check (${problems[0]}); use another backup.`);
    const stored = new Set((copy.prepare('select hash from stored_files').all() as { hash: string }[]).map((row) => row.hash));
    const listed = new Set([...manifest.files.map((file) => file.sha256), ...manifest.problems.map((problem) => problem.sha256)]);
    if (stored.size !== listed.size || [...stored].some((hash) => !listed.has(hash))) {
      throw new RestoreRefusal('The backup\'s manifest does not list the files its database names; the backup is damaged, use another one.');
    }
    if (migrationLevel(copy).applied !== level.applied) throw new RestoreRefusal('The backup\'s manifest does not match its database\'s migrations; use another backup.');
  } finally {
    copy.close();
  }

  const uploads = new FileStore(join(folder, BACKUP_UPLOADS_FOLDER));
  for (const file of manifest.files) {
    const path = pathInside(uploads, file.storagePath);
    if (!existsSync(path)) throw new RestoreRefusal(`The backup lacks the uploaded file ${file.storagePath}; it is incomplete, use another one.`);
    if (fileSha256(path) !== file.sha256) throw new RestoreRefusal(`The backup's file ${file.storagePath} does not match its sha256; it was changed or damaged, use another backup.`);
  }
  return manifest;
}

function pathInside(store: FileStore, storagePath: string): string {
  try {
    return store.pathOf(storagePath);
  } catch {
    throw new RestoreRefusal(`The backup names a file outside its folder (${JSON.stringify(storagePath)}); it is not a Paredown backup, do not use it.`);
  }
}

/**
 * Whether another connection (a running server, a CLI) holds the database open: an exclusive
 * lock cannot be taken then, in WAL mode as in any other (tried without waiting).
 * @param databasePath the file.
 * @returns true when it is in use; false when free or missing.
 */
export function databaseInUse(databasePath: string): boolean {
  if (!existsSync(databasePath)) return false;
  const probe = new Database(databasePath, { fileMustExist: true, timeout: 0 });
  try {
    probe.pragma('locking_mode = EXCLUSIVE');
    probe.exec('BEGIN EXCLUSIVE');
    probe.exec('COMMIT');
    return false;
  } catch (error) {
    const code = (error as { code?: string }).code ?? '';
    if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) return true;
    // Not a database at all: nobody can be using it as one (and it is not empty: force decides).
    if (code === 'SQLITE_NOTADB') return false;
    throw error;
  } finally {
    probe.close();
  }
}

function isEmptyTarget(databasePath: string, uploadDir: string): boolean {
  const databaseThere = [databasePath, ...sidecars.map((suffix) => databasePath + suffix)].some((path) => existsSync(path) && statSync(path).size > 0);
  const uploadsThere = existsSync(uploadDir) && readdirSync(uploadDir).length > 0;
  return !databaseThere && !uploadsThere;
}

/**
 * Restores a backup (see the module comment).
 * @param options the backup folder, the target database and upload folder, force.
 * @throws RestoreRefusal when the backup fails a check or the target is in use, or not empty without force
 *   (nothing written); Error on an I/O fault (files this call wrote are removed again, the old database stays).
 * @returns what was restored.
 */
export function restoreBackup(options: RestoreOptions): RestoreOutcome {
  const from = resolve(options.from);
  const databasePath = resolve(options.databasePath);
  const uploadDir = resolve(options.uploadDir);
  const manifest = verifyBackup(from);
  if (databaseInUse(databasePath)) throw new RestoreRefusal(`The database ${databasePath} is in use (a server or another command has it open); stop it first.`);
  if (!options.force && !isEmptyTarget(databasePath, uploadDir)) {
    throw new RestoreRefusal(`The target is not empty (${databasePath} or ${uploadDir} holds data); name an empty DATABASE_PATH and UPLOAD_DIR, or add --force to replace it (the old database is kept beside it).`);
  }

  const source = new FileStore(join(from, BACKUP_UPLOADS_FOLDER));
  const target = new FileStore(uploadDir);
  const written: string[] = [];
  const staged = `${databasePath}.restoring-${process.pid}`;
  try {
    for (const file of manifest.files) {
      const path = target.pathOf(file.storagePath);
      if (existsSync(path) && fileSha256(path) === file.sha256) continue;
      mkdirSync(dirname(path), { recursive: true });
      copyFileSync(source.pathOf(file.storagePath), `${path}.partial-${process.pid}`);
      renameSync(`${path}.partial-${process.pid}`, path);
      written.push(path);
    }
    mkdirSync(dirname(databasePath), { recursive: true });
    copyFileSync(join(from, BACKUP_DATABASE_FILE), staged);
    if (fileSha256(staged) !== manifest.database.sha256) throw new Error('The database copy changed while it was written; try again.');
  } catch (error) {
    for (const path of written) rmSync(path, { force: true });
    rmSync(staged, { force: true });
    throw error;
  }

  let previousDatabase: string | null = null;
  if (existsSync(databasePath)) {
    const stamp = (options.now ?? new Date()).toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
    previousDatabase = `${databasePath}.before-restore-${stamp}`;
    renameSync(databasePath, previousDatabase);
  }
  // A -wal left beside the target belongs to the old database: applied to the restored one it would corrupt it.
  for (const suffix of sidecars) {
    if (!existsSync(databasePath + suffix)) continue;
    if (previousDatabase && suffix === '-wal') renameSync(databasePath + suffix, previousDatabase + suffix);
    else unlinkSync(databasePath + suffix);
  }
  renameSync(staged, databasePath);

  const restored = new Database(databasePath, { readonly: true, fileMustExist: true });
  try {
    const problems = integrityProblems(restored);
    if (problems.length > 0) throw new Error(`The restored database at ${basename(databasePath)} fails its integrity check: ${problems[0]}`);
    const counts = tableRowCounts(restored);
    if (JSON.stringify(counts) !== JSON.stringify(manifest.database.tables)) throw new Error('The restored database\'s row counts differ from the backup\'s manifest.');
  } finally {
    restored.close();
  }
  return { manifest, databasePath, uploadDir, previousDatabase, filesWritten: written.length };
}
