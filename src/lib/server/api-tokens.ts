/** Personal API tokens: shown once at creation, stored as sha256, revocable. */
import { and, desc, eq, isNull } from 'drizzle-orm';
import { apiTokens } from '../../db/schema';
import { logActivity } from './activity';
import { apiTokenPrefix, type CurrentUser } from './current-user';
import { getDb } from './db';
import { fail } from './errors';
import { newId, newSecretToken, sha256Hex } from './ids';
import type { ApiTokenView } from '../api/tokens';
export type { ApiTokenView } from '../api/tokens';

/** The user's tokens that are not revoked, newest first. */
export function listApiTokens(userId: string): ApiTokenView[] {
  return getDb()
    .select({ id: apiTokens.id, name: apiTokens.name, prefix: apiTokens.prefix, createdAt: apiTokens.createdAt, lastUsedAt: apiTokens.lastUsedAt })
    .from(apiTokens)
    .where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
    .orderBy(desc(apiTokens.createdAt))
    .all()
    .map((t) => ({ ...t, createdAt: t.createdAt.toISOString(), lastUsedAt: t.lastUsedAt ? t.lastUsedAt.toISOString() : null }));
}

/**
 * Creates a token.
 * @param user its owner.
 * @param name what it is for.
 * @returns the listed token and the secret (shown this once).
 */
export function createApiToken(user: CurrentUser, name: string): { token: ApiTokenView; secret: string } {
  const secret = newSecretToken(apiTokenPrefix);
  const row = getDb().transaction((tx) => {
    const inserted = tx
      .insert(apiTokens)
      .values({ id: newId(), userId: user.id, name, prefix: secret.slice(0, 10), tokenHash: sha256Hex(secret) })
      .returning()
      .get();
    logActivity(tx, { userId: user.id, action: 'token.created', detail: { tokenId: inserted.id, name } });
    return inserted;
  });
  return { token: { id: row.id, name: row.name, prefix: row.prefix, createdAt: row.createdAt.toISOString(), lastUsedAt: null }, secret };
}

/**
 * Revokes one of the user's tokens.
 * @param user the owner.
 * @param tokenId the token.
 * @throws HttpError 404 when the user has no such live token.
 */
export function revokeApiToken(user: CurrentUser, tokenId: string): void {
  getDb().transaction((tx) => {
    const result = tx
      .update(apiTokens)
      .set({ revokedAt: new Date() })
      .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, user.id), isNull(apiTokens.revokedAt)))
      .run();
    if (result.changes === 0) throw fail.notFound('No such token among yours.', 'token-not-found');
    logActivity(tx, { userId: user.id, action: 'token.revoked', detail: { tokenId } });
  });
}
