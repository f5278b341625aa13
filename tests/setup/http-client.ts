/**
 * A client of a Paredown server as a browser or a script talks to it: a cookie jar, the Origin
 * header browsers send on writes, sign-in through Auth.js's own endpoints, and bearer tokens. Free
 * of Vitest, so the benchmarks use it too; tests take `Client` from `http.ts`, which defaults the
 * address to the shared test server.
 */

/** Password of every demo account (api.md). */
export const demoPassword = 'paredown-demo';

/** The demo accounts by role name used in tests. */
export const demoEmails = {
  owner: 'owner@paredown.test',
  designer: 'designer@paredown.test',
  field: 'field@paredown.test',
  reviewer: 'reviewer@paredown.test',
  outsider: 'outsider@paredown.test',
} as const;

/** Options of one request. */
export interface CallOptions {
  json?: unknown;
  form?: Record<string, string>;
  /** A raw body, sent as application/json (to test broken JSON). */
  raw?: string;
  /** A multipart form (uploads), sent with the boundary fetch chooses. */
  formData?: FormData;
  headers?: Record<string, string>;
  /** Send no Origin header (as a script or another site would). */
  noOrigin?: boolean;
}

/** A client with a cookie jar (and optionally a bearer token). */
export class HttpClient {
  readonly cookies = new Map<string, string>();
  bearer: string | null = null;
  readonly base: string;

  /** @param base the server's address. */
  constructor(base: string) {
    this.base = base;
  }

  /**
   * Sends a request; redirects are not followed so tests see them.
   * @param method HTTP method.
   * @param path path on the test server.
   * @param options body and headers.
   */
  async call(method: string, path: string, options: CallOptions = {}): Promise<Response> {
    const headers: Record<string, string> = { ...options.headers };
    if (this.cookies.size > 0) headers.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    if (this.bearer) headers.authorization = `Bearer ${this.bearer}`;
    if (!options.noOrigin && method !== 'GET' && method !== 'HEAD') headers.origin = this.base;
    let body: string | FormData | undefined;
    if (options.formData !== undefined) {
      body = options.formData;
    } else if (options.json !== undefined) {
      headers['content-type'] = 'application/json';
      body = JSON.stringify(options.json);
    } else if (options.raw !== undefined) {
      headers['content-type'] = 'application/json';
      body = options.raw;
    } else if (options.form) {
      headers['content-type'] = 'application/x-www-form-urlencoded';
      body = new URLSearchParams(options.form).toString();
    }
    const response = await fetch(this.base + path, { method, headers, body, redirect: 'manual' });
    for (const cookie of response.headers.getSetCookie()) {
      const [pair, ...attributes] = cookie.split(';');
      const index = pair.indexOf('=');
      const name = pair.slice(0, index).trim();
      const value = pair.slice(index + 1).trim();
      const expired = attributes.some((a) => /^\s*max-age=0/i.test(a) || /^\s*expires=Thu, 01 Jan 1970/i.test(a));
      if (expired || value === '') this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    return response;
  }

  get(path: string, options?: CallOptions) {
    return this.call('GET', path, options);
  }
  post(path: string, json?: unknown, options?: CallOptions) {
    return this.call('POST', path, { ...options, json });
  }
  put(path: string, json?: unknown, options?: CallOptions) {
    return this.call('PUT', path, { ...options, json });
  }
  patch(path: string, json?: unknown, options?: CallOptions) {
    return this.call('PATCH', path, { ...options, json });
  }
  delete(path: string, options?: CallOptions) {
    return this.call('DELETE', path, options);
  }

  /**
   * Signs in through /api/auth/csrf and /api/auth/callback/credentials.
   * @returns the callback's response (302 on success or failure; the Location tells which).
   */
  async signIn(email: string, password: string, headers: Record<string, string> = {}): Promise<Response> {
    const csrf = await this.get('/api/auth/csrf');
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    return this.call('POST', '/api/auth/callback/credentials', {
      form: { email, password, csrfToken, callbackUrl: `${this.base}/` },
      headers,
    });
  }
}

/** Whether a credentials callback response means success (a redirect without `error=`). */
export function signInSucceeded(response: Response): boolean {
  const location = response.headers.get('location');
  return response.status === 302 && !!location && !new URL(location, 'http://x').searchParams.has('error');
}

/**
 * A client of the server at `base`, signed in as a user.
 * @throws Error when the sign-in fails.
 */
export async function signedInAt(base: string, email: string, password = demoPassword): Promise<HttpClient> {
  const client = new HttpClient(base);
  const response = await client.signIn(email, password);
  if (!signInSucceeded(response)) throw new Error(`sign-in as ${email} at ${base} failed: ${response.status} ${response.headers.get('location')}`);
  return client;
}
