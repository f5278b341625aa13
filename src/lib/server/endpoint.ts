/**
 * The wrapper every API endpoint goes through: known errors become their status, bad bodies a
 * 400, an unwritable upload folder a 503 naming storage, and anything unexpected a logged 500 that tells the client nothing internal.
 */
import type { APIContext, APIRoute } from 'astro';
import type { z } from 'zod';
import { isStorageUnavailable } from './storage-fault';
import { HttpError, errorResponse } from './errors';
import { readBodyCapped } from './read-body';

/**
 * Wraps an endpoint handler.
 * @param handler the route's work; it may throw HttpError.
 * @returns an Astro APIRoute.
 */
export function endpoint(handler: (context: APIContext) => Promise<Response> | Response): APIRoute {
  return async (context) => {
    try {
      return await handler(context);
    } catch (error) {
      if (error instanceof HttpError) {
        return errorResponse(error.status, error.code, error.message, error.headers);
      }
      if (isStorageUnavailable(error)) {
        console.error(`[paredown] ${context.request.method} ${context.url.pathname}: ${error.message}`);
        return errorResponse(503, 'storage-unavailable', 'The server cannot store files right now (its upload storage is not writable); nothing was saved. Try again later, or tell whoever runs Paredown.', { 'Retry-After': '60' });
      }
      const reference = Math.random().toString(36).slice(2, 10);
      console.error(`[paredown] ${context.request.method} ${context.url.pathname} failed (ref ${reference}):`, error);
      return errorResponse(500, 'internal-error', `Something went wrong on the server (reference ${reference}).`);
    }
  };
}

/** The largest JSON body an endpoint reads (uploads are multipart and have their own limit). */
export const maxJsonBytes = 1024 * 1024;

/**
 * Whether a Content-Type names JSON (`application/json` or a `+json` type, any parameters).
 * @param contentType the header, or null.
 * @returns true for JSON.
 */
export function isJsonContentType(contentType: string | null): boolean {
  const type = (contentType ?? '').split(';')[0].trim().toLowerCase();
  return type === 'application/json' || /^application\/[a-z0-9.+-]+\+json$/.test(type);
}

/**
 * Reads and validates a JSON body, through the capped stream reader.
 * @param request the request.
 * @param schema the zod schema of the body.
 * @param capBytes the largest body read ({@link maxJsonBytes} by default).
 * @throws HttpError 415 `unsupported-media-type` when a body is sent with another content type;
 *   413 `body-too-large` past the cap (declared or streamed, chunked or not); 400 `bad-json` when
 *   the body is not JSON, `invalid-body` (naming the first problem) when it does not match the schema.
 * @returns the parsed body (an empty body, with or without a content type, is `{}`).
 */
export async function readJson<Schema extends z.ZodType>(request: Request, schema: Schema, capBytes = maxJsonBytes): Promise<z.infer<Schema>> {
  const contentType = request.headers.get('content-type');
  const bytes = await readBodyCapped(request, capBytes);
  if (bytes.byteLength > 0 && !isJsonContentType(contentType)) {
    throw new HttpError(415, 'unsupported-media-type', 'Send the body as JSON, with the header Content-Type: application/json.');
  }
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new HttpError(400, 'bad-json', 'The request body is not valid JSON.');
  }
  return parseJsonBody(text, schema);
}

/**
 * Parses a request body's text as JSON (an empty body is `{}`) and validates it.
 * @param text the body's text.
 * @param schema the zod schema of the body.
 * @throws HttpError 400 `bad-json` when the text is not JSON, `invalid-body` (naming the first
 *   problem) when it does not match the schema.
 * @returns the parsed body.
 */
export function parseJsonBody<Schema extends z.ZodType>(text: string, schema: Schema): z.infer<Schema> {
  let body: unknown;
  try {
    body = text.trim() === '' ? {} : JSON.parse(text);
  } catch {
    throw new HttpError(400, 'bad-json', 'The request body is not valid JSON.');
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const where = issue.path.length > 0 ? `${issue.path.join('.')}: ` : '';
    throw new HttpError(400, 'invalid-body', `${where}${issue.message}`);
  }
  return parsed.data;
}
