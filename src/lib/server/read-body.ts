/**
 * The one way a request body is read on the server: chunk by chunk from its stream, stopping at
 * a cap (the declared Content-Length is checked before a byte is read, and a chunked body or one
 * that lies about its length is cut off as soon as it passes the cap), so a request costs at most
 * the cap in memory. Used by readJson, the wave routes (uploads, setups) and the middleware in
 * front of Auth.js (docs/decisions/014-hardening.md).
 */
import { formatMebibytes } from '../words/formats';
import { HttpError } from './errors';

/**
 * Cancels a body stream without waiting: the cancel of one copy of a cloned request (a tee
 * branch) settles only once the other copy is cancelled too, so awaiting it could hang.
 * @param body the stream, if any.
 */
export function cancelQuietly(body: ReadableStream<Uint8Array> | null): void {
  try {
    body?.cancel().catch(() => undefined);
  } catch {
    // already locked or closed: nothing to cancel
  }
}

/**
 * The 413 of a body past its cap.
 * @param capBytes the cap.
 * @returns the error, naming the cap.
 */
export function bodyTooLarge(capBytes: number): HttpError {
  return new HttpError(413, 'body-too-large', `The request body is larger than ${formatMebibytes(capBytes)}; send less.`);
}

/**
 * Reads a request body into memory, refusing it once it passes a size.
 * @param request the request (its body is consumed).
 * @param capBytes the most bytes read.
 * @param tooLarge the error to throw past the cap (a 413 naming the cap by default).
 * @throws HttpError 413 when the declared or actual length passes the cap; 400 `bad-body` when the stream fails.
 * @returns the bytes.
 * References: Fielding, Nottingham & Reschke 2022, RFC 9110 "HTTP Semantics" §8.6 (Content-Length), §15.5.14 (413).
 */
export async function readBodyCapped(request: Request, capBytes: number, tooLarge: () => HttpError = () => bodyTooLarge(capBytes)): Promise<Uint8Array<ArrayBuffer>> {
  const declared = request.headers.get('content-length');
  if (declared !== null && Number(declared) > capBytes) {
    cancelQuietly(request.body);
    throw tooLarge();
  }
  if (!request.body) return new Uint8Array(new ArrayBuffer(0));
  let reader: ReadableStreamDefaultReader<Uint8Array>;
  try {
    reader = request.body.getReader();
  } catch {
    throw new HttpError(400, 'bad-body', 'The request body could not be read.');
  }
  const chunks: Uint8Array[] = [];
  let total = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > capBytes) {
        reader.cancel().catch(() => undefined);
        throw tooLarge();
      }
      chunks.push(value);
    }
  } catch (error) {
    if (error instanceof HttpError) throw error;
    throw new HttpError(400, 'bad-body', 'The request body was interrupted before it was complete; try again.');
  }
  const bytes = new Uint8Array(new ArrayBuffer(total));
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return bytes;
}

/**
 * Reads a body as UTF-8 text through {@link readBodyCapped}.
 * @param request the request.
 * @param capBytes the most bytes read.
 * @throws HttpError 413 past the cap; 400 `bad-body` when the stream fails or is not UTF-8.
 * @returns the text.
 */
export async function readTextCapped(request: Request, capBytes: number): Promise<string> {
  const bytes = await readBodyCapped(request, capBytes);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new HttpError(400, 'bad-body', 'The request body is not UTF-8 text.');
  }
}
