/**
 * The one reader of a wave's files: the responses (text or workbook) and the codebook, from its
 * own file or from a codebook sheet of the workbook. Uploads (at upload and again at
 * confirmation), the demo seed, the command line and the tests all read through here, so a file
 * means the same wherever it comes in (docs/decisions/007-one-way-in-for-waves.md).
 */
import { readCodebook } from './read-codebook';
import type { ReadLimits } from './read-limits';
import { readTable } from './read-table';
import type { WorkbookParser } from './read-workbook';
import type { Codebook, WaveSource, WaveTable, WaveWarning } from './types';
import { isWaveRefusal } from './wave-refusal';

/** What to read. */
export interface WaveFiles {
  readonly fileName: string;
  readonly bytes: Uint8Array;
  readonly codebookName: string | null;
  readonly codebookBytes: Uint8Array | null;
  /** Workbooks: the responses sheet, or null to let the reader choose. */
  readonly sheet: string | null;
}

/** The wave's tables as read. */
export interface ReadWave {
  readonly table: WaveTable;
  readonly codebook: Codebook | null;
  readonly source: WaveSource;
  /** Warnings of the table and the codebook, and `codebook-sheet-not-used` when a codebook file overrode a codebook sheet. */
  readonly warnings: readonly WaveWarning[];
}

/** Options of readWave. */
export interface ReadWaveOptions {
  /**
   * What to throw instead when a step fails with anything but a WaveRefusal (a defect of the
   * reader meeting untrusted bytes). The server logs it and answers 422; without this option the
   * error passes through unchanged (the command line reports it as an internal fault).
   */
  readonly unexpected?: (fileName: string, error: unknown) => Error;
  /** Workbooks: how the bytes are parsed (in a wave reader thread by default; the reader thread itself parses in place). */
  readonly parseWorkbook?: WorkbookParser;
}

async function step<T>(fileName: string, options: ReadWaveOptions, work: () => Promise<T> | T): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (isWaveRefusal(error) || !options.unexpected) throw error;
    throw options.unexpected(fileName, error);
  }
}

/**
 * Reads the responses and the codebook (its own file, or a codebook sheet of the workbook).
 * @param files the bytes and names.
 * @param limits read limits (the reader's defaults where absent).
 * @param options see ReadWaveOptions.
 * @throws {WaveRefusal} whatever the reader refuses (400, 413, 422), naming the file concerned.
 * @returns the table, the codebook, how they were read and the warnings so far.
 * References: docs/decisions/002-reading-waves.md (the reader and its refusals).
 */
export async function readWave(files: WaveFiles, limits: Partial<ReadLimits> = {}, options: ReadWaveOptions = {}): Promise<ReadWave> {
  const table = await step(files.fileName, options, () => readTable(files.bytes, files.fileName, limits, { ...(files.sheet ? { sheet: files.sheet } : {}), ...(options.parseWorkbook ? { parseWorkbook: options.parseWorkbook } : {}) }));
  const warnings: WaveWarning[] = [...table.warnings];
  let codebook: Codebook | null = null;
  let codebookFrom: WaveSource['codebookFrom'] = null;
  if (files.codebookBytes && files.codebookName) {
    const codebookName = files.codebookName;
    const codebookBytes = files.codebookBytes;
    const codebookTable = await step(codebookName, options, () => readTable(codebookBytes, codebookName, limits, options.parseWorkbook ? { parseWorkbook: options.parseWorkbook } : {}));
    codebook = await step(codebookName, options, () => readCodebook(codebookTable));
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
    codebook = await step(files.fileName, options, () => readCodebook(codebookTable));
    codebookFrom = 'sheet';
  }
  warnings.push(...(codebook?.warnings ?? []));
  const source: WaveSource = { ...table.source, codebookName: codebookFrom === 'file' ? files.codebookName : null, codebookFrom };
  return { table, codebook, source, warnings };
}
