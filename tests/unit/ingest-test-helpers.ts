/**
 * Shared by the readers' tests (tests/unit/ingest-*.test.ts): catching the WaveRefusal a reader
 * is expected to throw, so that its status, code and message can be checked.
 */
import { WaveRefusal } from '../../src/lib/ingest';

/**
 * Awaits a promise that should reject with a WaveRefusal.
 * @param promise The reader's call.
 * @throws Error "expected a refusal" when the promise resolves; any other rejection unchanged.
 * @returns The refusal.
 */
export async function refusal(promise: Promise<unknown>): Promise<WaveRefusal> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof WaveRefusal) return error;
    throw error;
  }
  throw new Error('expected a refusal');
}
