/**
 * Reading a wave's files the way the upload route and the command line do (src/lib/ingest), with
 * the server's configured limits: at upload from the request, at confirmation again from the
 * stored originals, so the confirmed wave is built from exactly the bytes that were kept.
 */
import { existsSync, readFileSync } from 'node:fs';
import { resolve, sep } from 'node:path';
import { eq } from 'drizzle-orm';
import { storedFiles } from '../../../db/schema';
import { isWaveRefusal, readCodebook, readTable, WaveRefusal, type Codebook, type ReadLimits, type WaveTable, type WaveWarning } from '../../ingest';
import { getConfig, type ServerConfig } from '../config';
import { getDb } from '../db';
import type { StoredSource } from './stored-wave';

/** The wave's tables as read. */
export interface ReadWave {
  readonly table: WaveTable;
  readonly codebook: Codebook | null;
  readonly source: StoredSource;
  /** Warnings of the table, the codebook and the server's own (e.g. a codebook sheet not used). */
  readonly warnings: readonly WaveWarning[];
}

/** What to read. */
export interface WaveFiles {
  readonly fileName: string;
  readonly bytes: Uint8Array;
  readonly codebookName: string | null;
  readonly codebookBytes: Uint8Array | null;
  /** Workbooks: the responses sheet, or null to let the reader choose. */
  readonly sheet: string | null;
}

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
 * Runs a step of reading a client's file: a WaveRefusal passes through; anything else thrown
 * while reading untrusted bytes is logged and becomes a 422, never a 500.
 */
async function guarded<T>(fileName: string, step: () => Promise<T> | T): Promise<T> {
  try {
    return await step();
  } catch (error) {
    if (isWaveRefusal(error)) throw error;
    const reference = Math.random().toString(36).slice(2, 10);
    console.error(`[paredown] reading "${fileName}" failed unexpectedly (ref ${reference}):`, error);
    throw new WaveRefusal(422, 'file-unreadable', `"${fileName}" could not be read as responses (reference ${reference}); export it again as CSV or XLSX.`);
  }
}

/**
 * Reads the responses and the codebook (its own file, or a codebook sheet of the workbook).
 * @param files the bytes and names.
 * @param limits read limits (see serverReadLimits).
 * @throws {WaveRefusal} whatever the reader refuses (400, 413, 422), naming the file concerned.
 * @returns the table, the codebook, how they were read and the warnings so far.
 * References: docs/decisions/002-reading-waves.md (the reader and its refusals).
 */
export async function readWaveFiles(files: WaveFiles, limits: Partial<ReadLimits>): Promise<ReadWave> {
  const table = await guarded(files.fileName, () => readTable(files.bytes, files.fileName, limits, files.sheet ? { sheet: files.sheet } : {}));
  const warnings: WaveWarning[] = [...table.warnings];
  let codebook: Codebook | null = null;
  let codebookFrom: StoredSource['codebookFrom'] = null;
  if (files.codebookBytes && files.codebookName) {
    const codebookName = files.codebookName;
    const codebookTable = await guarded(codebookName, () => readTable(files.codebookBytes as Uint8Array, codebookName, limits));
    codebook = await guarded(codebookName, () => readCodebook(codebookTable));
    codebookFrom = 'file';
    if (table.codebookTable) {
      warnings.push({
        code: 'codebook-sheet-not-used',
        columns: [],
        message: `The workbook has a codebook sheet ("${table.codebookTable.source.sheet}"), but the codebook file "${codebookName}" was used instead.`,
      });
    }
  } else if (table.codebookTable) {
    const codebookTable = table.codebookTable;
    codebook = await guarded(files.fileName, () => readCodebook(codebookTable));
    codebookFrom = 'sheet';
  }
  warnings.push(...(codebook?.warnings ?? []));
  const source: StoredSource = { ...table.source, codebookName: codebookFrom === 'file' ? files.codebookName : null, codebookFrom };
  return { table, codebook, source, warnings };
}

/**
 * The bytes of a stored upload.
 * @param hash its sha256.
 * @throws Error when the record or the file is missing (a server fault, not the client's).
 * @returns the bytes and the name it was first stored under.
 */
export function readStoredFile(hash: string): { bytes: Uint8Array; originalName: string } {
  const record = getDb().select().from(storedFiles).where(eq(storedFiles.hash, hash)).get();
  if (!record) throw new Error(`readStoredFile: no stored file ${hash}`);
  const uploadDir = resolve(getConfig().uploadDir);
  const path = resolve(uploadDir, record.storagePath);
  if (!path.startsWith(uploadDir + sep) || !existsSync(path)) throw new Error(`readStoredFile: the file of ${hash} is missing under UPLOAD_DIR`);
  return { bytes: new Uint8Array(readFileSync(path)), originalName: record.originalName };
}
