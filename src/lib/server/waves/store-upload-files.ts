/**
 * Keeping uploaded originals inside a transaction: the file goes to disk and its record into
 * `stored_files`; when the transaction fails, a file this attempt brought in is removed again,
 * so a failed upload leaves neither a row nor a file behind.
 */
import { existsSync, unlinkSync } from 'node:fs';
import { resolve, sep } from 'node:path';
import { eq } from 'drizzle-orm';
import type { Db } from '../../../db/client';
import { storedFiles } from '../../../db/schema';
import { storeFile, type StoredFileRecord } from '../../../db/stored-files';
import { contentHash } from '../../ingest';

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
 * The media type of a read file.
 * @param format the reader's format (csv, tsv, txt, xlsx, xls, ods).
 * @returns its media type, or null when unknown.
 */
export function mediaTypeOf(format: string): string | null {
  return mediaTypes[format] ?? null;
}

/** Files stored during one attempt, to undo on failure. */
export class UploadFiles {
  private readonly fresh: StoredFileRecord[] = [];

  /** @param uploadDir absolute folder for uploads. */
  constructor(private readonly uploadDir: string) {}

  /**
   * Stores a file inside the caller's transaction (once per content).
   * @param tx the transaction.
   * @param bytes the bytes.
   * @param name the name it was uploaded under.
   * @param mediaType its media type.
   * @param hash the bytes' contentHash, when the caller has it already.
   * @returns the record.
   */
  store(tx: Pick<Db, 'insert' | 'select'>, bytes: Uint8Array, name: string, mediaType: string | null, hash = contentHash(bytes)): StoredFileRecord {
    const existed = tx.select({ hash: storedFiles.hash }).from(storedFiles).where(eq(storedFiles.hash, hash)).get();
    const record = storeFile(tx, this.uploadDir, bytes, name, mediaType, hash);
    // A record this attempt created: a rollback takes it away, and then the file must go too.
    if (!existed && !this.fresh.some((entry) => entry.hash === record.hash)) this.fresh.push(record);
    return record;
  }

  /**
   * After a failed transaction: removes each file whose record did not survive.
   * @param db the database (outside the failed transaction).
   */
  undo(db: Pick<Db, 'select'>): void {
    const root = resolve(this.uploadDir);
    for (const record of this.fresh) {
      const row = db.select({ hash: storedFiles.hash }).from(storedFiles).where(eq(storedFiles.hash, record.hash)).get();
      if (row) continue;
      const path = resolve(root, record.storagePath);
      if (path.startsWith(root + sep) && existsSync(path)) unlinkSync(path);
    }
  }
}
