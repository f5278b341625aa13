/**
 * Signing in and out from the browser, through Auth.js's own endpoints (auth-astro). These are
 * not Paredown's API routes (no contract of ours), so they live beside the typed client rather
 * than in it.
 */
import { safeNextPath } from '../safe-path';

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
