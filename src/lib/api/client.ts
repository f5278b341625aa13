/**
 * The typed client: one fetch wrapper for every JSON call the browser makes. It answers the
 * route's response type on success, or the error shape (./errors.ts) on failure, never throws,
 * and turns a lost connection into the `network` error. Each domain file (./studies.ts, ...)
 * wraps it once per route, so an island writes `studiesApi.create({ name })` and gets
 * `ApiResult<CreateStudyResponse>`.
 */
import { errorFromAnswer, type ApiErrorBody } from './errors';

/** The outcome of an API call: the typed data, or the error in api.md's shape. */
export type ApiResult<T> = { ok: true; status: number; data: T } | { ok: false; status: number; error: ApiErrorBody };

/** The HTTP methods the API uses. */
export type ApiMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

/**
 * Reads an answer's text as JSON and makes the result.
 * @param status the HTTP status (0 when no answer came).
 * @param text the body text.
 * @returns the data, or the error in the error shape.
 */
export function resultFromAnswer<T>(status: number, text: string): ApiResult<T> {
  let data: unknown = null;
  try {
    data = text ? JSON.parse(text) : null;
  } catch {
    data = null;
  }
  if (status >= 200 && status < 300) return { ok: true, status, data: data as T };
  return { ok: false, status, error: errorFromAnswer(status, data) };
}

/**
 * Calls the API with an optional JSON body.
 * @param method HTTP method.
 * @param path path under the site, e.g. `/api/studies`.
 * @param body JSON body, if any.
 * @returns the parsed answer or the error; never throws.
 */
export async function callApi<T>(method: ApiMethod, path: string, body?: unknown): Promise<ApiResult<T>> {
  let response: Response;
  try {
    response = await fetch(path, {
      method,
      headers: body === undefined ? { Accept: 'application/json' } : { 'Content-Type': 'application/json', Accept: 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
      credentials: 'same-origin',
    });
  } catch {
    return { ok: false, status: 0, error: errorFromAnswer(0, null) };
  }
  return resultFromAnswer<T>(response.status, await response.text());
}

/**
 * A path segment made safe for a URL (ids and tokens are sent as they are, escaped).
 * @param value the id or token.
 * @returns the escaped segment.
 */
export function segment(value: string): string {
  return encodeURIComponent(value);
}
