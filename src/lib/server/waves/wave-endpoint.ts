/**
 * The endpoint wrapper of the wave routes: the foundation's `endpoint` plus the reader's
 * refusals (WaveRefusal: 400, 413, 422) answered with their status in api.md's error shape, and a
 * JSON reader with room for a large setup (thousands of columns, exclusions of many rows).
 */
import type { APIContext, APIRoute } from 'astro';
import type { z } from 'zod';
import { isWaveRefusal } from '../../ingest';
import { endpoint, readJson } from '../endpoint';
import { HttpError } from '../errors';

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
 * @throws HttpError 415 not JSON; 413 `body-too-large`; 400 `bad-json`, `invalid-body` (naming the first problem).
 * @returns the parsed body.
 */
export async function readSetupJson<Schema extends z.ZodType>(request: Request, schema: Schema): Promise<z.infer<Schema>> {
  return readJson(request, schema, maxSetupJsonBytes);
}
