/**
 * The endpoint wrapper of the wave routes: the foundation's `endpoint` plus the reader's
 * refusals (WaveRefusal: 400, 413, 422) answered with their status in api.md's error shape, and a
 * JSON reader with room for a large setup (thousands of columns, exclusions of many rows).
 */
import type { APIContext, APIRoute } from 'astro';
import type { z } from 'zod';
import { isWaveRefusal } from '../../ingest';
import { endpoint, parseJsonBody } from '../endpoint';
import { HttpError } from '../errors';
import { readCappedBody } from './read-upload-form';

/** The largest setup body read (a setup of 2,000 columns with labels, and 200,000 exclusions, fit well). */
export const maxSetupJsonBytes = 16 * 1024 * 1024;

/**
 * Wraps a wave route.
 * @param handler the route's work; it may throw HttpError or WaveRefusal.
 * @returns an Astro APIRoute.
 */
export function waveEndpoint(handler: (context: APIContext) => Promise<Response> | Response): APIRoute {
  return endpoint(async (context) => {
    try {
      return await handler(context);
    } catch (error) {
      if (isWaveRefusal(error)) throw new HttpError(error.status, error.code, error.message);
      throw error;
    }
  });
}

/**
 * Reads and validates a JSON body of up to {@link maxSetupJsonBytes}.
 * @param request the request.
 * @param schema the zod schema of the body.
 * @throws HttpError 413 `body-too-large`; 400 `bad-json`, `invalid-body` (naming the first problem).
 * @returns the parsed body.
 */
export async function readSetupJson<Schema extends z.ZodType>(request: Request, schema: Schema): Promise<z.infer<Schema>> {
  let bytes: Uint8Array;
  try {
    bytes = await readCappedBody(request, maxSetupJsonBytes, maxSetupJsonBytes);
  } catch (error) {
    if (error instanceof HttpError && error.status === 413) throw new HttpError(413, 'body-too-large', 'The request body is larger than 16 MB.');
    throw error;
  }
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new HttpError(400, 'bad-json', 'The request body is not valid JSON.');
  }
  return parseJsonBody(text, schema);
}
