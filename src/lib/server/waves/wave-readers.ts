/**
 * The server's wave readers: every upload and every confirmation reads its file in a wave reader
 * thread (src/lib/ingest/workbook-worker.ts), at most UPLOAD_READERS at once, with at most
 * UPLOAD_READER_QUEUE more waiting in arrival order. Past that an upload or a confirmation is
 * refused at once with 503 `readers-busy` and `Retry-After`, so the heap all readers use together
 * stays below UPLOAD_READERS × UPLOAD_MAX_WORKBOOK_MEMORY_MB, and waiting requests hold at most
 * their bodies. docs/decisions/018-workbook-worker.md (why 503 and not 429).
 */
import {
  acceptUploadInWorker, readUploadInWorker, type AcceptedRead, type ReadLimits, type UploadRead, type WaveChoice, type WaveFiles,
} from '../../ingest';
import { BoundedQueue, QueueFullError } from '../../workers/bounded-queue';
import { getConfig, type ServerConfig } from '../config';
import { HttpError } from '../errors';
import { readerFault, serverReadLimits } from './read-wave-files';

/** Seconds a refused client is asked to wait before trying again. */
export const READERS_BUSY_RETRY_SECONDS = 5;

/** The refusal when every reader is busy and the line is full. */
export function readersBusy(): HttpError {
  return new HttpError(
    503,
    'readers-busy',
    'The server is reading as many uploads as it can right now, and more are waiting; nothing was stored, so send it again in a few seconds.',
    { 'Retry-After': String(READERS_BUSY_RETRY_SECONDS) },
  );
}

/** The readers of one process. */
export class WaveReaders {
  private readonly queue: BoundedQueue;
  private readonly limits: Partial<ReadLimits>;

  /**
   * @param concurrency readers at once.
   * @param maxWaiting requests that may wait.
   * @param limits the read limits (the server's).
   * @throws {RangeError} as BoundedQueue.
   */
  constructor(concurrency: number, maxWaiting: number, limits: Partial<ReadLimits>) {
    this.queue = new BoundedQueue(concurrency, maxWaiting);
    this.limits = limits;
  }

  /** Running and waiting reads. */
  state() {
    return this.queue.state();
  }

  /** Whether a request would be taken now (checked before reading an upload's body, so a full server does not read it). */
  hasRoom(): boolean {
    const { running, waiting, concurrency, maxWaiting } = this.queue.state();
    return running < concurrency || waiting < maxWaiting;
  }

  /**
   * Throws the 503 when a request would not be taken now.
   * @throws {HttpError} 503 `readers-busy`.
   */
  checkRoom(): void {
    if (!this.hasRoom()) throw readersBusy();
  }

  /**
   * Reads an upload and proposes its setup in a reader thread (readUploadInWorker).
   * @param files the bytes and names.
   * @throws {HttpError} 503 `readers-busy`.
   * @throws {WaveRefusal} whatever the reader refuses; 422 `file-unreadable` for a fault of the reader.
   * @returns the read, the proposal and the screening preview.
   */
  readUpload(files: WaveFiles): Promise<UploadRead> {
    return this.run(() => readUploadInWorker(files, this.limits, { unexpected: readerFault }));
  }

  /**
   * Reads a stored upload again and accepts it under the designer's choice in a reader thread (acceptUploadInWorker).
   * @param files the bytes and names.
   * @param choice setup, exclusions, screening settings (untrusted).
   * @throws {HttpError} 503 `readers-busy`.
   * @throws {WaveRefusal} whatever the reader or acceptWave refuses.
   * @throws {RangeError} for screening settings out of range.
   * @returns the read, the accepted wave and its encoded matrix.
   */
  accept(files: WaveFiles, choice: WaveChoice): Promise<AcceptedRead> {
    return this.run(() => acceptUploadInWorker(files, choice, this.limits, { unexpected: readerFault }));
  }

  private async run<T>(job: () => Promise<T>): Promise<T> {
    try {
      return await this.queue.run(job);
    } catch (error) {
      if (error instanceof QueueFullError) throw readersBusy();
      throw error;
    }
  }
}

const INSTANCE = Symbol.for('paredown.waveReaders');

/**
 * The readers of this process, made on first use from the configuration.
 * @param config the configuration (this process's by default).
 * @throws {Error} when the configuration is invalid.
 * @returns the readers.
 */
export function waveReaders(config: ServerConfig = getConfig()): WaveReaders {
  const holder = globalThis as unknown as Record<symbol, WaveReaders | undefined>;
  let instance = holder[INSTANCE];
  if (!instance) {
    instance = new WaveReaders(config.limits.readers, config.limits.readerQueue, serverReadLimits(config));
    holder[INSTANCE] = instance;
  }
  return instance;
}
