/**
 * Browser helpers the islands share: JSON calls to the API (errors in api.md's shape turned into
 * one message) and signing in and out through Auth.js's endpoints.
 */
import { safeNextPath } from '../lib/safe-path';

/** The outcome of an API call. */
export type ApiResult<T> = { ok: true; status: number; data: T } | { ok: false; status: number; code: string; message: string };

/**
 * Calls the API with a JSON body.
 * @param method HTTP method.
 * @param path path under the site, e.g. `/api/studies`.
 * @param body JSON body, if any.
 * @returns the parsed answer or the error's code and message.
 */
export async function callApi<T>(method: string, path: string, body?: unknown): Promise<ApiResult<T>> {
  let response: Response;
  try {
    response = await fetch(path, {
      method,
      headers: body === undefined ? { Accept: 'application/json' } : { 'Content-Type': 'application/json', Accept: 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
      credentials: 'same-origin',
    });
  } catch {
    return { ok: false, status: 0, code: 'network', message: 'The server could not be reached. Check the connection and try again.' };
  }
  const text = await response.text();
  let data: unknown = null;
  try {
    data = text ? JSON.parse(text) : null;
  } catch {
    data = null;
  }
  if (response.ok) return { ok: true, status: response.status, data: data as T };
  const error = (data as { error?: { code?: string; message?: string } } | null)?.error;
  return { ok: false, status: response.status, code: error?.code ?? 'error', message: error?.message ?? `The server answered ${response.status}.` };
}

async function csrfToken(): Promise<string> {
  const response = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
  const body = (await response.json()) as { csrfToken: string };
  return body.csrfToken;
}

/**
 * Signs in with e-mail and password.
 * @param email the address.
 * @param password the password.
 * @param callbackUrl where to go afterwards (same site).
 * @returns ok with the address to go to, or a message that never says which part was wrong.
 */
export async function signIn(email: string, password: string, callbackUrl = '/'): Promise<{ ok: true; url: string } | { ok: false; message: string }> {
  try {
    const form = new URLSearchParams({ email, password, csrfToken: await csrfToken(), callbackUrl });
    const response = await fetch('/api/auth/callback/credentials', {
      method: 'POST',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1' },
      body: form,
      credentials: 'same-origin',
    });
    if (response.status === 429) {
      const body = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
      return { ok: false, message: body?.error?.message ?? 'Too many sign-in attempts. Wait a few minutes and try again.' };
    }
    const body = (await response.json().catch(() => null)) as { url?: string } | null;
    if (!response.ok || !body?.url || new URL(body.url, location.href).searchParams.has('error')) {
      return { ok: false, message: 'That e-mail and password do not match an account.' };
    }
    return { ok: true, url: callbackUrl };
  } catch {
    return { ok: false, message: 'The server could not be reached. Check the connection and try again.' };
  }
}

/** Signs out and returns to the sign-in page. */
export async function signOut(): Promise<void> {
  const form = new URLSearchParams({ csrfToken: await csrfToken(), callbackUrl: '/signin' });
  await fetch('/api/auth/signout', {
    method: 'POST',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1' },
    body: form,
    credentials: 'same-origin',
  });
  location.assign('/signin');
}

/** A same-site path to go to after signing in (anything else becomes `/`); src/lib/safe-path.ts. */
export const safeNext = safeNextPath;
