/**
 * The server's use of the one reader (src/lib/ingest/read-wave.ts): its configured limits, and a
 * reader fault on a client's bytes logged and answered 422 instead of 500. Uploads and
 * confirmations read in a wave reader thread with these limits and this fault handling
 * (wave-readers.ts); readWaveFiles itself serves the demo seed, once, at the first start.
 */
import { readWave, WaveRefusal, type ReadLimits, type ReadWave, type WaveFiles } from '../../ingest';
import { getConfig, type ServerConfig } from '../config';

export type { ReadWave, WaveFiles };

/**
 * The read limits of this server: UPLOAD_MAX_BYTES, UPLOAD_MAX_ROWS, UPLOAD_MAX_COLUMNS,
 * UPLOAD_MAX_WORKBOOK_MEMORY_MB and UPLOAD_MAX_WORKBOOK_SECONDS (all validated in config.ts); the
 * others keep the reader's defaults.
 * @param config the server's configuration (this process's by default).
 * @throws Error when the configuration is invalid (see parseConfig).
 * @returns partial limits for readTable.
 * References: docs/decisions/005-storing-waves.md (the server's upload limits).
 */
export function serverReadLimits(config: ServerConfig = getConfig()): Partial<ReadLimits> {
  const { limits } = config;
  return {
    maxBytes: limits.uploadBytes,
    maxRows: limits.rows,
    maxColumns: limits.columns,
    maxWorkbookMemoryMb: limits.workbookMemoryMb,
    maxWorkbookSeconds: limits.workbookSeconds,
  };
}

/**
 * Anything but a refusal thrown while reading a client's bytes: logged, and a 422 for the client.
 * @param fileName the file being read.
 * @param error what was thrown.
 * @returns the 422 `file-unreadable` refusal, with the reference the log line carries.
 */
export function readerFault(fileName: string, error: unknown): Error {
  const reference = Math.random().toString(36).slice(2, 10);
  console.error(`[paredown] reading "${fileName}" failed unexpectedly (ref ${reference}):`, error);
  return new WaveRefusal(422, 'file-unreadable', `"${fileName}" could not be read as responses (reference ${reference}); export it again as CSV or XLSX.`);
}

/**
 * Reads the responses and the codebook with readWave, as the server does.
 * @param files the bytes and names.
 * @param limits read limits (this server's by default; the demo seed passes the reader's defaults, `{}`).
 * @throws {WaveRefusal} whatever the reader refuses (400, 413, 422), naming the file concerned;
 *   422 `file-unreadable` for a fault of the reader.
 * @returns the table, the codebook, how they were read and the warnings so far.
 * References: docs/decisions/002-reading-waves.md; docs/decisions/007-one-way-in-for-waves.md.
 */
export function readWaveFiles(files: WaveFiles, limits: Partial<ReadLimits> = serverReadLimits()): Promise<ReadWave> {
  return readWave(files, limits, { unexpected: readerFault });
}
