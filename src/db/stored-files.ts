/**
 * Original uploads on disk: content-addressed (sha256) under UPLOAD_DIR, outside `public/`,
 * written once and never changed. Shared by the seed and, later, the upload route.
 */
import { existsSync, mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { storedFiles } from './schema';
import type { Db } from './client';
import { contentHash } from '../lib/ingest/content-hash';

/** What is known about a stored file. */
export interface StoredFileRecord {
  hash: string;
  size: number;
  storagePath: string;
}

/**
 * Keeps a file's bytes under the upload folder (once per content) and records it.
 * @param db the database (or a transaction).
 * @param uploadDir absolute folder for uploads.
 * @param bytes the file's bytes.
 * @param originalName the name it was uploaded under.
 * @param mediaType its media type, when known.
 * @param hash the bytes' contentHash, when the caller has it already (computed here otherwise).
 * @returns the hash, size and path relative to uploadDir.
 */
export function storeFile(db: Pick<Db, 'insert'>, uploadDir: string, bytes: Uint8Array, originalName: string, mediaType: string | null, hash = contentHash(bytes)): StoredFileRecord {
  const storagePath = join(hash.slice(0, 2), hash);
  const target = resolve(uploadDir, storagePath);
  if (!existsSync(target)) {
    mkdirSync(dirname(target), { recursive: true });
    const partial = `${target}.partial-${process.pid}`;
    writeFileSync(partial, bytes, { mode: 0o600 });
    renameSync(partial, target);
  }
  db.insert(storedFiles).values({ hash, size: bytes.byteLength, originalName, mediaType, storagePath }).onConflictDoNothing().run();
  return { hash, size: bytes.byteLength, storagePath };
}
