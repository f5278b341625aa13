/** Accounts: the first owner on an empty database, and password changes. */
import { and, eq, isNull, sql } from 'drizzle-orm';
import { apiTokens, memberships, teams, users } from '../../db/schema';
import { logActivity } from './activity';
import type { CurrentUser } from './current-user';
import { getDb } from './db';
import { fail } from './errors';
import { newId } from './ids';
import { hashPassword, verifyPassword } from './passwords';

/**
 * Creates the first owner and their team; only while no user exists.
 * @param input team name, the owner's name, e-mail and password.
 * @throws HttpError 409 when any user exists already.
 * @returns the new user and team ids.
 */
export async function createFirstOwner(input: { teamName: string; name: string; email: string; password: string }) {
  const passwordHash = await hashPassword(input.password);
  const db = getDb();
  return db.transaction((tx) => {
    const someone = tx.select({ id: users.id }).from(users).limit(1).get();
    if (someone) throw fail.conflict('Paredown is set up already; sign in instead.', 'already-set-up');
    const userId = newId();
    const teamId = newId();
    tx.insert(users).values({ id: userId, email: input.email.trim().toLowerCase(), name: input.name.trim(), passwordHash }).run();
    tx.insert(teams).values({ id: teamId, name: input.teamName.trim() }).run();
    tx.insert(memberships).values({ teamId, userId, role: 'owner' }).run();
    logActivity(tx, { teamId, userId, action: 'setup.completed', detail: { team: input.teamName.trim() } });
    return { userId, teamId };
  });
}

/**
 * Changes the user's password; every session issued before stops working (the session epoch
 * goes up, src/lib/server/current-user.ts), and the personal API tokens too when asked.
 * @param user the signed-in user.
 * @param currentPassword their present password.
 * @param newPassword the new one (policy checked by the caller's schema).
 * @param options revokeTokens: also revoke every personal API token of the user.
 * @throws HttpError 400 when the present password is wrong.
 * @returns how many API tokens were revoked.
 */
export async function changePassword(user: CurrentUser, currentPassword: string, newPassword: string, options: { revokeTokens?: boolean } = {}): Promise<{ tokensRevoked: number }> {
  const db = getDb();
  const row = db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, user.id)).get();
  if (!row || !(await verifyPassword(currentPassword, row.passwordHash))) {
    throw fail.badRequest('The present password is not right.', 'wrong-password');
  }
  const passwordHash = await hashPassword(newPassword);
  return db.transaction((tx) => {
    tx.update(users).set({ passwordHash, sessionEpoch: sql`${users.sessionEpoch} + 1` }).where(eq(users.id, user.id)).run();
    const tokensRevoked = options.revokeTokens
      ? tx.update(apiTokens).set({ revokedAt: new Date() }).where(and(eq(apiTokens.userId, user.id), isNull(apiTokens.revokedAt))).run().changes
      : 0;
    logActivity(tx, { userId: user.id, action: 'account.password-changed', detail: { tokensRevoked } });
    return { tokensRevoked };
  });
}
