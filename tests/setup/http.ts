/**
 * Talking to the test server like a browser or a script would: a cookie jar, the Origin header
 * browsers send on writes, sign-in through Auth.js's own endpoints, and bearer tokens.
 */
import { inject } from 'vitest';

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

/** Fixed ids of the seeded demo (src/lib/server/demo-seed.ts). */
export const demo = {
  team: 'team-riverbend',
  outsideTeam: 'team-northgate',
  study: 'study-riverbend-members-2027',
  outsideStudy: 'study-northgate-transport',
} as const;

export function baseUrl(): string {
  return inject('baseUrl');
}

/** Options of one request. */
export interface CallOptions {
  json?: unknown;
  form?: Record<string, string>;
  /** A raw body, sent as application/json (to test broken JSON). */
  raw?: string;
  headers?: Record<string, string>;
  /** Send no Origin header (as a script or another site would). */
  noOrigin?: boolean;
}

/** A client with a cookie jar (and optionally a bearer token). */
export class Client {
  readonly cookies = new Map<string, string>();
  bearer: string | null = null;
  readonly base: string;

  /** @param base the server's address (the shared test server by default). */
  constructor(base?: string) {
    this.base = base ?? baseUrl();
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
    let body: string | undefined;
    if (options.json !== undefined) {
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
 * A client signed in as a user.
 * @throws Error when the sign-in fails.
 */
export async function signedIn(email: string, password = demoPassword): Promise<Client> {
  const client = new Client();
  const response = await client.signIn(email, password);
  if (!signInSucceeded(response)) throw new Error(`sign-in as ${email} failed: ${response.status} ${response.headers.get('location')}`);
  return client;
}

/** Reads a JSON body. */
export async function body<T = any>(response: Response): Promise<T> {
  return (await response.json()) as T;
}

let counter = 0;
/** A unique e-mail address for a test. */
export function uniqueEmail(label: string): string {
  counter += 1;
  return `${label}-${Date.now().toString(36)}-${counter}@example.org`;
}

/**
 * Invites an address into a team as the given owner client and returns the token from the link
 * in the outbox e-mail.
 */
export async function inviteAndReadToken(owner: Client, teamId: string, email: string, role: string): Promise<string> {
  const created = await owner.post(`/api/teams/${teamId}/invitations`, { email, role });
  if (created.status !== 201) throw new Error(`invitation failed: ${created.status} ${await created.text()}`);
  const outbox = await body<{ mails: { to: string; text: string }[] }>(await owner.get('/api/outbox'));
  const mail = outbox.mails.find((m) => m.to === email.toLowerCase());
  if (!mail) throw new Error(`no invitation e-mail to ${email} in the outbox`);
  const match = /\/invite\/([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!match) throw new Error('the invitation e-mail has no link');
  return match[1];
}

/**
 * Creates a new member of a team through the real invitation flow.
 * @returns the new user's id and a signed-in client.
 */
export async function createMember(owner: Client, teamId: string, role: string): Promise<{ userId: string; email: string; client: Client }> {
  const email = uniqueEmail(role);
  const token = await inviteAndReadToken(owner, teamId, email, role);
  const anonymous = new Client();
  const accepted = await anonymous.post(`/api/invitations/${token}/accept`, { name: `Test ${role}`, password: 'a-long-test-password' });
  if (accepted.status !== 201) throw new Error(`accepting failed: ${accepted.status} ${await accepted.text()}`);
  const { userId } = await body<{ userId: string }>(accepted);
  return { userId, email, client: await signedIn(email, 'a-long-test-password') };
}
