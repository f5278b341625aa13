/**
 * What the wave reader thread does (wave-reader-worker.ts), as plain functions of a job: parse a
 * workbook; read an upload and propose its setup with a screening preview; or read a stored
 * upload and accept it under a confirmed setup. Every cell of the file is touched here, in the
 * reader's thread, and only the results travel back (the matrices moved, not copied), so the
 * server's thread never does cell-level work (docs/decisions/018-workbook-worker.md).
 *
 * Answers are plain data: a failure is described (a refusal with its status and code, or a fault
 * with its name and message) and made an error again on the other side (workbook-worker.ts).
 */
import type { TransferListItem } from 'node:worker_threads';
import { acceptWave, type AcceptedWave, type WaveChoice } from './accept-wave';
import { encodeMatrix } from './matrix-blob';
import { parseWorkbook, type ParsedSheet } from './parse-workbook';
import { proposeSetup } from './propose-setup';
import type { ReadLimits } from './read-limits';
import { readWave, type WaveFiles } from './read-wave';
import type { ScreeningResult } from './screening/screen-respondents';
import type { ProposedSetup, WaveSource, WaveTable, WaveWarning } from './types';
import { isWaveRefusal, type WaveRefusalStatus } from './wave-refusal';

/** A job for the wave reader. */
export type WaveReaderJob =
  | { readonly kind: 'parse-workbook'; readonly bytes: Uint8Array; readonly fileName: string; readonly sheetRows: number }
  | { readonly kind: 'read-upload'; readonly files: WaveFiles; readonly limits: ReadLimits }
  | { readonly kind: 'accept'; readonly files: WaveFiles; readonly limits: ReadLimits; readonly choice: WaveChoice };

/** The screening of a proposal before anything is confirmed, or why there is none yet. */
export interface ProposalPreview {
  readonly screening: ScreeningResult | null;
  readonly respondentIds: readonly string[] | null;
  readonly warnings: readonly WaveWarning[];
  /** Why there is no screening (the proposal cannot be built yet), or null. */
  readonly note: string | null;
}

/** An upload as read: how, its warnings, the proposed setup and the screening under it. */
export interface UploadRead {
  readonly source: WaveSource;
  /** Warnings of the table and the codebook (as ReadWave's). */
  readonly warnings: readonly WaveWarning[];
  readonly proposal: ProposedSetup;
  readonly preview: ProposalPreview;
}

/** A stored upload read again and accepted under the confirmed setup. */
export interface AcceptedRead {
  readonly source: WaveSource;
  readonly accepted: AcceptedWave;
  /** `encodeMatrix(accepted.wave.matrix)`, made in the reader's thread. */
  readonly matrixBlob: Uint8Array;
}

/** Why a job failed, as data. */
export type WaveReaderFailure =
  | { readonly kind: 'refusal'; readonly status: WaveRefusalStatus; readonly code: string; readonly message: string }
  /** A fault while reading a file's bytes (the server logs it and answers 422), with the file's name. */
  | { readonly kind: 'read-fault'; readonly fileName: string; readonly name: string; readonly message: string; readonly stack: string | null }
  | { readonly kind: 'fault'; readonly name: string; readonly message: string; readonly stack: string | null };

/** The reader's one message. */
export type WaveReaderAnswer =
  | { readonly ok: true; readonly value: ParsedSheet[] | UploadRead | AcceptedRead }
  | { readonly ok: false; readonly failure: WaveReaderFailure };

/** A fault of the reader on a file's bytes, carried to the answer with the file's name. */
class ReadFault extends Error {
  readonly fileName: string;
  constructor(fileName: string, cause: unknown) {
    super(cause instanceof Error ? cause.message : String(cause), { cause });
    this.name = 'ReadFault';
    this.fileName = fileName;
  }
}

/**
 * Screens the wave a proposal describes, before the designer confirms anything.
 * @param table the table as read.
 * @param proposal its proposed setup.
 * @throws whatever acceptWave throws other than a WaveRefusal.
 * @returns the screening and the build warnings, or a note saying why there is none yet.
 * References: Paredown methods.md §6 (screening); docs/decisions/005-storing-waves.md.
 */
export function previewProposal(table: WaveTable, proposal: ProposedSetup): ProposalPreview {
  try {
    const { wave, screening } = acceptWave(table, { setup: proposal });
    return { screening, respondentIds: wave.respondentIds, warnings: wave.warnings, note: null };
  } catch (error) {
    if (!isWaveRefusal(error)) throw error;
    return { screening: null, respondentIds: null, warnings: [], note: `No screening yet: ${error.message}` };
  }
}

/**
 * Says which work the time limit covers: only SheetJS (`true` before a parse, `false` after it).
 * Everything else the reader does is linear in the cells, which the read limits bound.
 */
export type TimedPart = (running: boolean) => void;

async function readInThisThread(files: WaveFiles, limits: ReadLimits, timed: TimedPart) {
  const parseTimed = (bytes: Uint8Array, fileName: string, sheetRows: number) => {
    timed(true);
    try {
      return parseWorkbook(bytes, fileName, sheetRows);
    } finally {
      timed(false);
    }
  };
  return readWave(files, limits, { parseWorkbook: parseTimed, unexpected: (fileName, error) => new ReadFault(fileName, error) });
}

/**
 * Does one job in this thread (the reader thread calls it; tests may call it directly).
 * @param job the job.
 * @param timed told when the time-limited part (a SheetJS parse) starts and ends; the whole of a
 *   `parse-workbook` job is that part.
 * @returns the answer, and the buffers to move with it rather than copy.
 */
export async function runWaveReaderJob(job: WaveReaderJob, timed: TimedPart = () => {}): Promise<{ answer: WaveReaderAnswer; transfer: TransferListItem[] }> {
  try {
    if (job.kind === 'parse-workbook') {
      return { answer: { ok: true, value: parseWorkbook(job.bytes, job.fileName, job.sheetRows) }, transfer: [] };
    }
    timed(false);
    const read = await readInThisThread(job.files, job.limits, timed);
    if (job.kind === 'read-upload') {
      const proposal = proposeSetup(read.table, read.codebook);
      const value: UploadRead = { source: read.source, warnings: read.warnings, proposal, preview: previewProposal(read.table, proposal) };
      return { answer: { ok: true, value }, transfer: [] };
    }
    const accepted = acceptWave(read.table, job.choice);
    const matrixBlob = encodeMatrix(accepted.wave.matrix);
    const value: AcceptedRead = { source: read.source, accepted, matrixBlob };
    return { answer: { ok: true, value }, transfer: [accepted.wave.matrix.data.buffer as ArrayBuffer, accepted.wave.raw.data.buffer as ArrayBuffer, matrixBlob.buffer as ArrayBuffer] };
  } catch (error) {
    return { answer: { ok: false, failure: describeFailure(error) }, transfer: [] };
  }
}

/**
 * A thrown value as data.
 * @param error anything thrown.
 * @returns the refusal, the read fault or the fault it describes.
 */
export function describeFailure(error: unknown): WaveReaderFailure {
  if (isWaveRefusal(error)) return { kind: 'refusal', status: error.status, code: error.code, message: error.message };
  if (error instanceof ReadFault) {
    const cause = error.cause instanceof Error ? error.cause : null;
    return { kind: 'read-fault', fileName: error.fileName, name: cause?.name ?? 'Error', message: error.message, stack: cause?.stack ?? null };
  }
  const fault = error instanceof Error ? error : new Error(String(error));
  return { kind: 'fault', name: fault.name, message: fault.message, stack: fault.stack ?? null };
}
