/**
 * The wave reader's front door on the calling thread: every read of a workbook, and the server's
 * whole read of an upload, runs in a wave reader thread (wave-reader-worker.ts, started through
 * src/lib/workers/start-worker.ts) with a heap limit and a time limit, so that a damaged or crafted
 * file costs at most those limits and ends in a refusal, and the caller's thread does no cell-level
 * work. One thread per job, ended after its answer; how many run at once is the caller's bound
 * (the server's: src/lib/server/waves/wave-readers.ts). docs/decisions/018-workbook-worker.md.
 */
import { runWorkerOnce, WorkerRunFailure } from '../workers/start-worker';
import { WAVE_READER_WORKER } from '../workers/worker-entries';
import type { WaveChoice } from './accept-wave';
import { detectFileKind } from './detect-file-kind';
import type { ParsedSheet } from './parse-workbook';
import { resolveReadLimits, type ReadLimits } from './read-limits';
import type { ReadWaveOptions, WaveFiles } from './read-wave';
import type { AcceptedRead, UploadRead, WaveReaderAnswer, WaveReaderFailure, WaveReaderJob } from './wave-reader-jobs';
import { WaveRefusal } from './wave-refusal';

export type { ParsedSheet };

function isWorkbook(bytes: Uint8Array, fileName: string): boolean {
  try {
    return detectFileKind(bytes, fileName) !== 'text';
  } catch {
    return false;
  }
}

/** The refusal for a reader past its heap or time limit. */
function tooDemanding(bytes: Uint8Array, fileName: string, limits: ReadLimits): WaveRefusal {
  const allowed = `${limits.maxWorkbookMemoryMb.toLocaleString('en-GB')} MiB of memory or ${limits.maxWorkbookSeconds} seconds`;
  if (isWorkbook(bytes, fileName)) {
    return new WaveRefusal(413, 'workbook-too-demanding', `Reading "${fileName}" needed more than the allowed ${allowed}, so it is too large or damaged; save the responses alone as CSV and upload that.`);
  }
  return new WaveRefusal(413, 'file-too-demanding', `Reading "${fileName}" needed more than the allowed ${allowed}; upload fewer respondents or columns at a time.`);
}

/** A failure described by the reader, as an error again. */
function failureError(failure: WaveReaderFailure, options: ReadWaveOptions): Error {
  if (failure.kind === 'refusal') return new WaveRefusal(failure.status, failure.code, failure.message);
  const error = failure.name === 'RangeError' ? new RangeError(failure.message) : failure.name === 'TypeError' ? new TypeError(failure.message) : new Error(failure.message);
  if (failure.stack) error.stack = failure.stack;
  if (failure.kind === 'read-fault' && options.unexpected) return options.unexpected(failure.fileName, error);
  return error;
}

/**
 * Runs one job in a fresh wave reader thread under the heap limit, and the time limit over its
 * SheetJS parsing (the thread says when that runs: TimedPart in wave-reader-jobs.ts).
 * @param job the job.
 * @param files the responses file (named in a too-demanding refusal).
 * @param limits `maxWorkbookMemoryMb` and `maxWorkbookSeconds` bound the thread.
 * @param options `unexpected`: what a fault of the reader on a file's bytes becomes.
 * @throws {WaveRefusal} 413 `workbook-too-demanding` (a workbook) or `file-too-demanding` (a text
 *   file) past a limit; whatever the job refuses.
 * @throws {Error} a fault of the reader (through `unexpected` when given and the fault was on a file's bytes).
 * @returns the job's value.
 */
async function runWaveReader<Value>(job: WaveReaderJob, files: { bytes: Uint8Array; fileName: string }, limits: ReadLimits, options: ReadWaveOptions = {}): Promise<Value> {
  let answer: WaveReaderAnswer;
  try {
    answer = await runWorkerOnce<WaveReaderAnswer>(WAVE_READER_WORKER, {
      name: WAVE_READER_WORKER.name,
      workerData: job,
      resourceLimits: { maxOldGenerationSizeMb: limits.maxWorkbookMemoryMb },
      timeLimitMs: limits.maxWorkbookSeconds * 1000,
    });
  } catch (error) {
    if (error instanceof WorkerRunFailure && (error.reason === 'time-limit' || error.reason === 'out-of-memory')) {
      throw tooDemanding(files.bytes, files.fileName, limits);
    }
    if (error instanceof WorkerRunFailure && options.unexpected) throw options.unexpected(files.fileName, error);
    throw error;
  }
  if (!answer.ok) throw failureError(answer.failure, options);
  return answer.value as Value;
}

/**
 * Parses a workbook with SheetJS in a wave reader thread.
 * @param bytes the workbook's bytes (copied to the thread).
 * @param fileName the uploaded name, for messages.
 * @param limits `maxRows` bounds the rows read per sheet; `maxWorkbookMemoryMb` and
 *   `maxWorkbookSeconds` bound the thread.
 * @throws {WaveRefusal} 413 `workbook-too-demanding` when the thread passes its memory or time
 *   limit; 422 `workbook-encrypted` for a password-protected workbook; 422 `workbook-unreadable`
 *   when SheetJS cannot read it.
 * @returns every sheet's cell texts, in workbook order.
 * References: SheetJS LLC 2024, "SheetJS Community Edition documentation", Parse Options (dense, sheetRows, cellNF);
 *   Node.js 20 documentation, "worker_threads: resourceLimits".
 */
export function parseWorkbookInWorker(bytes: Uint8Array, fileName: string, limits: ReadLimits): Promise<ParsedSheet[]> {
  // One header row, the row limit, and one more row so that passing the limit is seen.
  return runWaveReader<ParsedSheet[]>({ kind: 'parse-workbook', bytes, fileName, sheetRows: limits.maxRows + 2 }, { bytes, fileName }, limits);
}

/**
 * Reads an upload in a wave reader thread: the responses and the codebook (readWave), the proposed
 * setup (proposeSetup) and the screening under it (previewProposal), so the calling thread
 * touches no cell.
 * @param files the bytes and names.
 * @param limits read limits (the reader's defaults where absent); the memory limit bounds the whole
 *   read, the time limit the SheetJS parse (the rest is linear in the cells, which the read limits bound).
 * @param options `unexpected`, as readWave's.
 * @throws {WaveRefusal} whatever readWave refuses; 413 `workbook-too-demanding` / `file-too-demanding` past the thread's limits.
 * @returns how the files were read, their warnings, the proposal and its screening preview.
 * References: docs/decisions/002-reading-waves.md, 007-one-way-in-for-waves.md, 018-workbook-worker.md.
 */
export function readUploadInWorker(files: WaveFiles, limits: Partial<ReadLimits> = {}, options: ReadWaveOptions = {}): Promise<UploadRead> {
  const resolved = resolveReadLimits(limits);
  return runWaveReader<UploadRead>({ kind: 'read-upload', files, limits: resolved }, { bytes: files.bytes, fileName: files.fileName }, resolved, options);
}

/**
 * Reads a stored upload again in a wave reader thread and accepts it under the designer's choice
 * (readWave, acceptWave), encoding the matrix there too; the matrices are moved back, not copied.
 * @param files the bytes and names.
 * @param choice the setup, exclusions and screening settings (untrusted; checked in the thread).
 * @param limits read limits (the reader's defaults where absent).
 * @param options `unexpected`, as readWave's.
 * @throws {WaveRefusal} whatever readWave or acceptWave refuses; 413 past the thread's limits.
 * @throws {RangeError} for screening settings out of range (as acceptWave).
 * @returns how the files were read, the accepted wave and its encoded matrix.
 * References: docs/decisions/007-one-way-in-for-waves.md, 018-workbook-worker.md.
 */
export function acceptUploadInWorker(files: WaveFiles, choice: WaveChoice, limits: Partial<ReadLimits> = {}, options: ReadWaveOptions = {}): Promise<AcceptedRead> {
  const resolved = resolveReadLimits(limits);
  return runWaveReader<AcceptedRead>({ kind: 'accept', files, limits: resolved, choice }, { bytes: files.bytes, fileName: files.fileName }, resolved, options);
}
