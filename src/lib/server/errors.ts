/**
 * One shape for every error the API answers: `{ "error": { "code", "message" } }` (api.md).
 */

/** An error the client caused or may be told about, with its HTTP status. */
export class HttpError extends Error {
  readonly status: number;
  readonly code: string;
  readonly headers: Record<string, string>;

  /**
   * @param status HTTP status (400-499, or 503 for a known temporary fault).
   * @param code kebab-case code, stable for scripts.
   * @param message one plain sentence for people.
   * @param headers extra response headers (Retry-After on 429).
   */
  constructor(status: number, code: string, message: string, headers: Record<string, string> = {}) {
    super(message);
    this.name = 'HttpError';
    this.status = status;
    this.code = code;
    this.headers = headers;
  }
}

const noStore = { 'Cache-Control': 'no-store' };

/**
 * A JSON response.
 * @param body anything JSON can hold.
 * @param status HTTP status (200 by default).
 * @param headers extra headers.
 * @returns the response.
 */
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json; charset=utf-8', ...noStore, ...headers },
  });
}

/**
 * The error response of api.md.
 * @param status HTTP status.
 * @param code kebab-case code.
 * @param message one plain sentence.
 * @param headers extra headers.
 * @returns the response.
 */
export function errorResponse(status: number, code: string, message: string, headers: Record<string, string> = {}): Response {
  return json({ error: { code, message } }, status, headers);
}

/** Shortcuts for the common errors. */
export const fail = {
  badRequest: (message: string, code = 'bad-request') => new HttpError(400, code, message),
  unauthenticated: (message = 'Sign in first, or send a personal API token.') =>
    new HttpError(401, 'not-signed-in', message),
  forbidden: (message: string, code = 'forbidden') => new HttpError(403, code, message),
  notFound: (message = 'Not found.', code = 'not-found') => new HttpError(404, code, message),
  conflict: (message: string, code = 'conflict') => new HttpError(409, code, message),
  tooMany: (message: string, retryAfterSeconds: number) =>
    new HttpError(429, 'too-many-attempts', message, { 'Retry-After': String(retryAfterSeconds) }),
};
