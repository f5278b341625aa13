/**
 * Rate limiting of failed sign-ins, per e-mail address and per client address, over a sliding
 * window (SIGNIN_* settings). Attempts live in the sign_in_attempts table so a restart does not
 * reset them. A success clears the failures of that e-mail address.
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
 * @param email the e-mail address typed (lower-cased by the caller).
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
 * @param email the e-mail address typed (lower-cased).
 * @param address the client's network address.
 * @param succeeded whether the password was right.
 */
export function recordSignIn(email: string, address: string, succeeded: boolean): void {
  const db = getDb();
  const now = new Date();
  db.transaction((tx) => {
    if (succeeded) {
      tx.delete(signInAttempts).where(and(eq(signInAttempts.email, email), eq(signInAttempts.succeeded, false))).run();
    } else {
      tx.insert(signInAttempts).values({ email, address, succeeded, at: now }).run();
    }
    tx.delete(signInAttempts).where(lt(signInAttempts.at, new Date(now.getTime() - 24 * 3_600_000))).run();
  });
}
