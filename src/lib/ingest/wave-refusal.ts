/**
 * The one error type that anything a client's file or setup can cause ends in. The web routes
 * answer it with its status and `{ "error": { "code", "message" } }` (api.md); the command line
 * prints its message on standard error and exits with 2 (audit-json.md). Every other exception
 * escaping this module is an internal fault.
 */

/** HTTP status of a refusal: 400 bad setup or option, 413 past a configured limit, 422 unreadable file. */
export type WaveRefusalStatus = 400 | 413 | 422;

/** A refusal: what is wrong with the upload or the setup, and how to fix it, in one plain sentence. */
export class WaveRefusal extends Error {
  /** 400 bad setup or option, 413 past a configured limit, 422 a file that cannot be read as responses. */
  readonly status: WaveRefusalStatus;
  /** kebab-case machine-readable code, e.g. `not-a-workbook`. */
  readonly code: string;

  /**
   * @param status 400, 413 or 422 (see {@link WaveRefusalStatus}).
   * @param code kebab-case code naming the condition.
   * @param message one plain sentence: what is wrong and how to fix it.
   * @throws {TypeError} when the code is not kebab-case or the message is empty (a programming error).
   */
  constructor(status: WaveRefusalStatus, code: string, message: string) {
    super(message);
    if (!/^[a-z0-9]+(-[a-z0-9]+)*$/.test(code)) throw new TypeError(`WaveRefusal: code "${code}" is not kebab-case`);
    if (message.trim() === '') throw new TypeError('WaveRefusal: message is empty');
    this.name = 'WaveRefusal';
    this.status = status;
    this.code = code;
  }

  /** The error body of api.md: `{ error: { code, message } }`. */
  toJSON(): { error: { code: string; message: string } } {
    return { error: { code: this.code, message: this.message } };
  }
}

/**
 * Whether a caught value is a {@link WaveRefusal} (works across module copies by checking shape).
 * @param value anything caught.
 * @returns true when the value carries a refusal status, code and message.
 * References: Paredown api.md (error shape and statuses).
 */
export function isWaveRefusal(value: unknown): value is WaveRefusal {
  if (value instanceof WaveRefusal) return true;
  if (typeof value !== 'object' || value === null) return false;
  const candidate = value as { name?: unknown; status?: unknown; code?: unknown; message?: unknown };
  return candidate.name === 'WaveRefusal' && [400, 413, 422].includes(candidate.status as number)
    && typeof candidate.code === 'string' && typeof candidate.message === 'string';
}
