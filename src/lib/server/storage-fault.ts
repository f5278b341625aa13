/**
 * When the upload folder cannot take files: a fault of the server's storage, not of the client,
 * answered 503 `storage-unavailable` by `endpoint()` and noticed by /api/health
 * (docs/decisions/014-hardening.md).
 */
import { accessSync, constants, existsSync, mkdirSync, statSync, unlinkSync } from 'node:fs';

/** File-system errors that mean the upload folder cannot take files now. */
const storageFaultCodes = new Set(['EACCES', 'EPERM', 'EROFS', 'ENOSPC', 'EDQUOT', 'ENOTDIR', 'EEXIST', 'EIO', 'EISDIR', 'EMFILE', 'ENFILE']);

/** The upload folder could not be written. */
export class StorageUnavailableError extends Error {
  /** The file-system error code, e.g. EACCES. */
  readonly code: string;
  /**
   * @param code the file-system error code.
   * @param cause the original error.
   */
  constructor(code: string, cause: unknown) {
    super(`the upload folder cannot be written (${code})`, { cause });
    this.name = 'StorageUnavailableError';
    this.code = code;
  }
}

/**
 * Whether an error is a storage fault.
 * @param error anything thrown.
 * @returns true for a StorageUnavailableError.
 */
export function isStorageUnavailable(error: unknown): error is StorageUnavailableError {
  return error instanceof StorageUnavailableError;
}

/**
 * Runs a write into the upload folder, turning its file-system faults into StorageUnavailableError
 * and removing a partial file it left.
 * @param partial the path of the partial file the write may leave.
 * @param write the write.
 * @throws StorageUnavailableError for a fault of the folder; anything else as it was thrown.
 */
export function writingToStorage(partial: string, write: () => void): void {
  try {
    write();
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code ?? '';
    try {
      if (existsSync(partial)) unlinkSync(partial);
    } catch {
      // the folder refuses even that; nothing more to tidy
    }
    if (storageFaultCodes.has(code)) throw new StorageUnavailableError(code, error);
    throw error;
  }
}

/**
 * Checks, without writing a file, that the upload folder exists (creating it) and may be written,
 * as /api/health does on every call. (Run as root, `access` ignores permission bits: a folder
 * merely made read-only is then noticed at the first write.)
 * @param uploadDir absolute folder for uploads.
 * @returns null when it is writable, else the file-system error code.
 */
export function uploadFolderProblem(uploadDir: string): string | null {
  try {
    mkdirSync(uploadDir, { recursive: true });
    if (!statSync(uploadDir).isDirectory()) return 'ENOTDIR';
    accessSync(uploadDir, constants.W_OK);
    return null;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code ?? 'unknown';
  }
}
