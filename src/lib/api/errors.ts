/**
 * The error shape of every API answer that is not a success (api.md): `{ "error": { "code",
 * "message" } }`. The server writes it (src/lib/server/errors.ts), the typed client reads it
 * (./client.ts), and the tests check it. Pure: no server, database or DOM code.
 */

/** What went wrong: a stable code for programs and one sentence for people. */
export interface ApiErrorBody {
  /** Stable, kebab-case: `missing-permission`, `study-not-found`, `invalid-body`, ... */
  code: string;
  /** One sentence saying what is wrong and how to fix it. */
  message: string;
}

/** The body of every error answer. */
export interface ApiErrorResponse {
  error: ApiErrorBody;
}

/** The code the typed client gives when no answer came back at all (the server was not reached). */
export const NETWORK_ERROR_CODE = 'network';

/** The code the typed client gives when an error answer did not carry the error shape. */
export const UNKNOWN_ERROR_CODE = 'error';

/**
 * Whether a parsed JSON body is an error answer.
 * @param value any parsed JSON.
 * @returns true when it holds `error.code` and `error.message` as strings.
 */
export function isApiErrorResponse(value: unknown): value is ApiErrorResponse {
  if (typeof value !== 'object' || value === null) return false;
  const error = (value as { error?: unknown }).error;
  return (
    typeof error === 'object' &&
    error !== null &&
    typeof (error as { code?: unknown }).code === 'string' &&
    typeof (error as { message?: unknown }).message === 'string'
  );
}

/**
 * The error of an answer that failed, in the error shape whatever the server sent.
 * @param status the HTTP status (0: no answer).
 * @param data the parsed body, or null when it was not JSON.
 * @returns the body's error, or one made from the status.
 */
export function errorFromAnswer(status: number, data: unknown): ApiErrorBody {
  if (isApiErrorResponse(data)) return { code: data.error.code, message: data.error.message };
  if (status === 0) return { code: NETWORK_ERROR_CODE, message: 'The server could not be reached. Check the connection and try again.' };
  return { code: UNKNOWN_ERROR_CODE, message: `The server answered ${status}.` };
}
