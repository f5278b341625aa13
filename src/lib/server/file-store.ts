/**
 * The original-file store: every uploaded original (and the demo's files) lives here,
 * content-addressed by sha256 under UPLOAD_DIR (outside `public/`), written once and never
 * changed, with its record in `stored_files`. The one home of writing (with undo when the
 * transaction rolls back), reading, forgetting files no wave uses any more, sweeping orphans at
 * start and listing for a backup, and of the one check that a stored path stays inside the folder
 * (docs/decisions/007-one-way-in-for-waves.md).
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, unlinkSync, writeFileSync } from 'node:fs';
import { dirname, isAbsolute, join, normalize, resolve, sep } from 'node:path';
import { eq, inArray, or } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { storedFiles, waves } from '../../db/schema';
import { contentHash } from '../ingest/content-hash';
import { getConfig } from './config';
import { writingToStorage } from './storage-fault';

/** A transaction as Drizzle's better-sqlite3 driver passes it. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** What is known about a stored file. */
export interface StoredFileRecord {
  hash: string;
  size: number;
  /** Relative to the store's folder. */
  storagePath: string;
}

/** A stored file as a backup lists it. */
export interface BackupEntry extends StoredFileRecord {
  originalName: string;
  mediaType: string | null;
  /** Absolute path of the bytes. */
  path: string;
  /** Whether the bytes are on disk (a missing file is a fault to report, not to hide). */
  present: boolean;
}

/** What a sweep removed. */
export interface SweepOutcome {
  /** Records no wave referred to (their files removed too). */
  unusedRecords: number;
  /** Files on disk without a record (or left half-written), by path relative to the folder. */
  orphanFiles: string[];
}

const HASH = /^[0-9a-f]{64}$/;
const FOLDER = /^[0-9a-f]{2}$/;
const OURS = /^([0-9a-f]{64})(\.partial-\d+)?$/;

/** Media types by table format. */
const mediaTypes: Record<string, string> = {
  csv: 'text/csv',
  tsv: 'text/tab-separated-values',
  txt: 'text/plain',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  xls: 'application/vnd.ms-excel',
  ods: 'application/vnd.oasis.opendocument.spreadsheet',
};

/**
 * The media type of a file by its format or file name.
 * @param formatOrName the reader's format (csv, tsv, txt, xlsx, xls, ods) or a file name ending in one.
 * @returns its media type, or null when unknown.
 */
export function mediaTypeOf(formatOrName: string): string | null {
  const dot = formatOrName.lastIndexOf('.');
  return mediaTypes[(dot < 0 ? formatOrName : formatOrName.slice(dot + 1)).toLowerCase()] ?? null;
}

/**
 * The hashes of the files in use: those waves refer to (responses and codebooks). Waves are the
 * only rows that refer to `stored_files` today; a table that comes to refer to them must be added
 * here, or the sweep at start and study deletion would take its files.
 */
function usedHashes(tx: Pick<Db, 'select'>, among?: readonly string[]): Set<string> {
  const query = tx.select({ file: waves.fileHash, codebook: waves.codebookHash }).from(waves);
  const rows = among ? query.where(or(inArray(waves.fileHash, [...among]), inArray(waves.codebookHash, [...among]))).all() : query.all();
  return new Set(rows.flatMap((row) => [row.file, row.codebook]).filter((hash): hash is string => hash !== null));
}

/** The files one transaction writes and forgets: undone when it rolls back, removed when it commits. */
export class FileTransaction {
  /** Records this transaction created: on rollback their files go again. */
  private readonly fresh: StoredFileRecord[] = [];
  /** Files whose records this transaction deleted: removed once it has committed. */
  private readonly forgotten: { hash: string; storagePath: string }[] = [];

  /** @internal Made by FileStore.transaction. */
  constructor(private readonly store: FileStore, private readonly tx: Tx) {}

  /**
   * Keeps a file's bytes (once per content) and records it, inside the transaction: the record
   * first, so the bytes are written only while this connection holds SQLite's write lock (which
   * is what lets the sweep at start judge every file without a record an orphan).
   * @param bytes the file's bytes.
   * @param originalName the name it was uploaded under.
   * @param mediaType its media type, when known.
   * @param hash the bytes' sha256, when the caller has it already (computed here otherwise).
   * @throws Error when `hash` is not 64 lower-case hex digits; StorageUnavailableError when the folder cannot be written.
   * @returns the hash, size and path relative to the store's folder.
   */
  write(bytes: Uint8Array, originalName: string, mediaType: string | null, hash = contentHash(bytes)): StoredFileRecord {
    if (!HASH.test(hash)) throw new Error(`FileStore: "${hash}" is not a sha256 in hex`);
    const existed = this.tx.select({ hash: storedFiles.hash }).from(storedFiles).where(eq(storedFiles.hash, hash)).get();
    const storagePath = join(hash.slice(0, 2), hash);
    const target = this.store.pathOf(storagePath);
    this.tx.insert(storedFiles).values({ hash, size: bytes.byteLength, originalName, mediaType, storagePath }).onConflictDoNothing().run();
    if (!existsSync(target)) {
      const partial = `${target}.partial-${process.pid}`;
      // An unwritable folder is the server's fault: 503 naming storage (storage-fault.ts).
      writingToStorage(partial, () => {
        mkdirSync(dirname(target), { recursive: true });
        writeFileSync(partial, bytes, { mode: 0o600 });
        renameSync(partial, target);
      });
    }
    const record = { hash, size: bytes.byteLength, storagePath };
    if (!existed && !this.fresh.some((entry) => entry.hash === hash)) this.fresh.push(record);
    return record;
  }

  /**
   * Deletes the records of files no wave refers to any more; their bytes are removed once the
   * transaction has committed (a rollback keeps both).
   * @param candidates hashes to look at (files of waves just deleted), or every record when absent.
   * @returns how many records were deleted.
   */
  forgetUnused(candidates?: readonly string[]): number {
    if (candidates && candidates.length === 0) return 0;
    const used = usedHashes(this.tx, candidates);
    const query = this.tx.select({ hash: storedFiles.hash, storagePath: storedFiles.storagePath }).from(storedFiles);
    const rows = (candidates ? query.where(inArray(storedFiles.hash, [...candidates])).all() : query.all()).filter((row) => !used.has(row.hash));
    if (rows.length === 0) return 0;
    this.tx.delete(storedFiles).where(inArray(storedFiles.hash, rows.map((row) => row.hash))).run();
    this.forgotten.push(...rows);
    return rows.length;
  }

  /** @internal The paths of the files whose records this transaction deleted. */
  forgottenPaths(): string[] {
    return this.forgotten.map((record) => record.storagePath);
  }

  /** @internal After a rollback: removes each file this transaction brought in whose record did not survive. */
  undo(db: Pick<Db, 'select'>): void {
    for (const record of this.fresh) {
      if (db.select({ hash: storedFiles.hash }).from(storedFiles).where(eq(storedFiles.hash, record.hash)).get()) continue;
      this.store.unlink(record.storagePath);
    }
  }

  /** @internal After a commit: removes the files whose records were deleted (unless written again meanwhile). */
  finish(db: Pick<Db, 'select'>): void {
    for (const record of this.forgotten) {
      if (db.select({ hash: storedFiles.hash }).from(storedFiles).where(eq(storedFiles.hash, record.hash)).get()) continue;
      this.store.unlink(record.storagePath);
    }
  }
}

/** The store over one folder. */
export class FileStore {
  /** The absolute folder. */
  readonly root: string;

  /** @param root the folder for uploads (UPLOAD_DIR); made absolute. */
  constructor(root: string) {
    this.root = resolve(root);
  }

  /**
   * THE path check: where a stored path lives on disk, refusing anything that would leave the folder.
   * @param storagePath a path relative to the folder, as `stored_files.storage_path` holds it.
   * @throws Error when the path is absolute, holds a NUL, or resolves outside the folder (`..`).
   * @returns the absolute path.
   */
  pathOf(storagePath: string): string {
    const path = resolve(this.root, storagePath);
    if (storagePath === '' || storagePath.includes('\0') || isAbsolute(storagePath) || !path.startsWith(this.root + sep)) {
      throw new Error(`FileStore: "${storagePath}" is not a path inside the upload folder`);
    }
    return path;
  }

  /**
   * Runs `work` in one database transaction with a FileTransaction: files it writes are removed
   * again if the transaction fails (so a failed upload leaves neither a row nor a file), files it
   * forgets are removed once the transaction has committed. The transaction begins IMMEDIATE: it
   * takes SQLite's write lock first, waiting out another process's write (the busy timeout)
   * rather than failing halfway when its first write meets that lock.
   * @param db the database.
   * @param work the transaction's work.
   * @throws whatever `work` throws, after the undo.
   * @returns what `work` returns.
   */
  transaction<T>(db: Db, work: (tx: Tx, files: FileTransaction) => T): T {
    let files: FileTransaction | null = null;
    let result: T;
    try {
      result = db.transaction((tx) => {
        files = new FileTransaction(this, tx);
        return work(tx, files);
      }, { behavior: 'immediate' });
    } catch (error) {
      (files as FileTransaction | null)?.undo(db);
      throw error;
    }
    (files as FileTransaction | null)?.finish(db);
    return result;
  }

  /**
   * The bytes of a stored file.
   * @param db the database (or a transaction).
   * @param hash its sha256.
   * @throws Error when the record or the file is missing (a server fault, not the client's).
   * @returns the bytes, the name it was first stored under and its media type.
   */
  read(db: Pick<Db, 'select'>, hash: string): { bytes: Uint8Array; originalName: string; mediaType: string | null } {
    const record = db.select().from(storedFiles).where(eq(storedFiles.hash, hash)).get();
    if (!record) throw new Error(`FileStore: no stored file ${hash}`);
    const path = this.pathOf(record.storagePath);
    if (!existsSync(path)) throw new Error(`FileStore: the file of ${hash} is missing under the upload folder`);
    return { bytes: new Uint8Array(readFileSync(path)), originalName: record.originalName, mediaType: record.mediaType };
  }

  /**
   * Every stored file, for a backup: the records with where their bytes are and whether they are there.
   * @param db the database.
   * @returns one entry per record, by hash.
   */
  list(db: Pick<Db, 'select'>): BackupEntry[] {
    return db.select().from(storedFiles).orderBy(storedFiles.hash).all().map((record) => {
      const path = this.pathOf(record.storagePath);
      return {
        hash: record.hash, size: record.size, storagePath: record.storagePath, originalName: record.originalName, mediaType: record.mediaType,
        path, present: existsSync(path),
      };
    });
  }

  /**
   * At start: forgets records no wave refers to and removes files on disk that no record names
   * (an upload cut off between writing its file and committing), and half-written `.partial-*`
   * files. Only files the store names its own way (`xx/<sha256>`) are touched. It all happens
   * holding SQLite's write lock, and bytes are only ever written holding it (FileTransaction.write
   * records first): so no other process can be between writing a file and committing its record,
   * and a file without a record is an orphan whatever its age.
   * @param db the database.
   * @returns what was removed.
   */
  sweepOrphans(db: Db): SweepOutcome {
    return this.transaction(db, (tx, files) => {
      const unusedRecords = files.forgetUnused();
      const orphanFiles: string[] = [];
      if (!existsSync(this.root)) return { unusedRecords, orphanFiles };
      const unused = new Set(files.forgottenPaths().map((path) => normalize(path)));
      const known = new Set(tx.select({ storagePath: storedFiles.storagePath }).from(storedFiles).all().map((row) => normalize(row.storagePath)));
      for (const folder of readdirSync(this.root, { withFileTypes: true })) {
        if (!folder.isDirectory() || !FOLDER.test(folder.name)) continue;
        for (const entry of readdirSync(join(this.root, folder.name), { withFileTypes: true })) {
          const match = OURS.exec(entry.name);
          if (!entry.isFile() || !match || !match[1].startsWith(folder.name)) continue;
          const relative = join(folder.name, entry.name);
          // Files of records forgotten just now go once the transaction has committed (finish).
          if (match[2] === undefined && (known.has(normalize(relative)) || unused.has(normalize(relative)))) continue;
          unlinkSync(this.pathOf(relative));
          orphanFiles.push(relative);
        }
      }
      return { unusedRecords, orphanFiles: orphanFiles.sort() };
    });
  }

  /** @internal Removes a stored file's bytes, if there (path checked). */
  unlink(storagePath: string): void {
    const path = this.pathOf(storagePath);
    if (existsSync(path)) unlinkSync(path);
  }
}

/**
 * The store of this server (UPLOAD_DIR).
 * @throws Error when the configuration is invalid (see parseConfig).
 * @returns the store.
 */
export function serverFileStore(): FileStore {
  return new FileStore(getConfig().uploadDir);
}
