/**
 * Rate limiting of failed sign-ins, per e-mail address and per client address, over a sliding
 * window (SIGNIN_* settings). Attempts live in the sign_in_attempts table so a restart does not
 * reset them. A success clears the failures of that e-mail address only.
 *
 * The e-mail counted is read from the body exactly as Auth.js reads it (JSON or form, the last of
 * repeated fields) and normalised as the credentials provider does ({@link normaliseSignInEmail});
 * the client address is the socket's, or the forwarded one only behind a trusted proxy
 * ({@link signInClientAddress}); docs/decisions/014-hardening.md.
 */
import { and, count, eq, gte, lt } from 'drizzle-orm';
import { signInAttempts } from '../../db/schema';
import { getConfig } from './config';
import { getDb } from './db';

/** Whether another attempt may go ahead now. */
export interface SignInAllowance {
  allowed: boolean;
  /** Seconds until the oldest counted failure leaves the window (when not allowed). */
  retryAfterSeconds: number;
}

/** The longest e-mail address kept (RFC 5321's 64 + 1 + 255, rounded). */
export const maxSignInEmailLength = 320;

/**
 * The e-mail address of a sign-in as the credentials provider compares it.
 * @param value the `email` field as Auth.js passes it on (a string from a form, anything from JSON).
 * @returns the trimmed, lower-cased text.
 */
export function normaliseSignInEmail(value: unknown): string {
  return String(value ?? '').trim().toLowerCase();
}

/**
 * The e-mail address of a credentials callback body, read the way Auth.js 0.37 reads the body
 * (`getBody` in @auth/core/lib/utils/web.js): JSON when the content type mentions
 * application/json, a form (`Object.fromEntries`, so the last of repeated fields) when it
 * mentions application/x-www-form-urlencoded, nothing otherwise.
 * @param contentType the request's Content-Type header.
 * @param text the body's text.
 * @returns the normalised address (at most {@link maxSignInEmailLength} characters), or '' when none.
 */
export function signInEmailFromBody(contentType: string | null, text: string): string {
  let fields: Record<string, unknown> | undefined;
  if (contentType?.includes('application/json')) {
    try {
      const parsed: unknown = JSON.parse(text);
      fields = parsed !== null && typeof parsed === 'object' ? (parsed as Record<string, unknown>) : undefined;
    } catch {
      fields = undefined;
    }
  } else if (contentType?.includes('application/x-www-form-urlencoded')) {
    fields = Object.fromEntries(new URLSearchParams(text));
  }
  return normaliseSignInEmail(fields?.email).slice(0, maxSignInEmailLength);
}

/**
 * The client address a sign-in counts against.
 * @param input forwardedFor: the X-Forwarded-For header; socketAddress: the connection's remote
 *   address; trustProxy: TRUST_PROXY (the server sits behind one proxy that sets the header).
 * @returns behind a trusted proxy, the right-most forwarded address (the one that proxy saw;
 *   addresses to its left are whatever the client sent); otherwise the socket's address.
 */
export function signInClientAddress(input: { forwardedFor: string | null; socketAddress: string | null; trustProxy: boolean }): string {
  if (input.trustProxy) {
    const forwarded = (input.forwardedFor ?? '').split(',').map((part) => part.trim()).filter(Boolean);
    const last = forwarded.at(-1);
    if (last) return last.slice(0, 100);
  }
  return input.socketAddress || 'unknown';
}

function failuresSince(column: typeof signInAttempts.email | typeof signInAttempts.address, value: string, since: Date) {
  const rows = getDb()
    .select({ n: count() })
    .from(signInAttempts)
    .where(and(eq(column, value), eq(signInAttempts.succeeded, false), gte(signInAttempts.at, since)))
    .get();
  return rows?.n ?? 0;
}

/**
 * Checks whether a sign-in attempt may proceed.
 * @param email the e-mail address typed (normalised by the caller).
 * @param address the client's network address.
 * @returns the allowance.
 */
export function signInAllowance(email: string, address: string): SignInAllowance {
  const { maxFailuresPerEmail, maxFailuresPerAddress, windowMinutes } = getConfig().signIn;
  const windowMs = windowMinutes * 60_000;
  const since = new Date(Date.now() - windowMs);
  const byEmail = email ? failuresSince(signInAttempts.email, email, since) : 0;
  const byAddress = failuresSince(signInAttempts.address, address, since);
  if (byEmail < maxFailuresPerEmail && byAddress < maxFailuresPerAddress) return { allowed: true, retryAfterSeconds: 0 };
  return { allowed: false, retryAfterSeconds: Math.ceil(windowMs / 1000) };
}

/**
 * Records the outcome of an attempt.
 * @param email the e-mail address typed (normalised).
 * @param address the client's network address.
 * @param succeeded whether the password was right.
 */
export function recordSignIn(email: string, address: string, succeeded: boolean): void {
  const db = getDb();
  const now = new Date();
  db.transaction((tx) => {
    if (succeeded) {
      // Only this address's failures: never those recorded without an e-mail, nor anyone else's.
      if (email) tx.delete(signInAttempts).where(and(eq(signInAttempts.email, email), eq(signInAttempts.succeeded, false))).run();
    } else {
      tx.insert(signInAttempts).values({ email, address, succeeded, at: now }).run();
    }
    tx.delete(signInAttempts).where(lt(signInAttempts.at, new Date(now.getTime() - 24 * 3_600_000))).run();
  });
}
