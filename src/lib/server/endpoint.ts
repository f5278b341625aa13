/**
 * The wrapper every API endpoint goes through: known errors become their status, bad bodies a
 * 400, and anything unexpected a logged 500 that tells the client nothing internal.
 */
import type { APIContext, APIRoute } from 'astro';
import type { z } from 'zod';
import { HttpError, errorResponse } from './errors';

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
      const reference = Math.random().toString(36).slice(2, 10);
      console.error(`[paredown] ${context.request.method} ${context.url.pathname} failed (ref ${reference}):`, error);
      return errorResponse(500, 'internal-error', `Something went wrong on the server (reference ${reference}).`);
    }
  };
}

/** The largest JSON body an endpoint reads (uploads are multipart and have their own limit). */
export const maxJsonBytes = 1024 * 1024;

/**
 * Reads and validates a JSON body.
 * @param request the request.
 * @param schema the zod schema of the body.
 * @throws HttpError 413 `body-too-large` past maxJsonBytes; 400 `bad-json` when the body is not
 *   JSON, `invalid-body` (naming the first problem) when it does not match the schema.
 * @returns the parsed body.
 */
export async function readJson<Schema extends z.ZodType>(request: Request, schema: Schema): Promise<z.infer<Schema>> {
  const declared = Number(request.headers.get('content-length') ?? '0');
  if (declared > maxJsonBytes) throw new HttpError(413, 'body-too-large', 'The request body is larger than 1 MB.');
  let text: string;
  try {
    text = await request.text();
  } catch {
    throw new HttpError(400, 'bad-body', 'The request body could not be read.');
  }
  if (text.length > maxJsonBytes) throw new HttpError(413, 'body-too-large', 'The request body is larger than 1 MB.');
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
