/**
 * Who is asking: a session cookie issued by Auth.js, or a personal API token
 * (`Authorization: Bearer pd_...`). Memberships and roles are read from the database on every
 * request, so a role change takes effect at once.
 */
import { getToken } from '@auth/core/jwt';
import { and, eq, isNull, lt, or, sql } from 'drizzle-orm';
import { preparedQuery } from '../../db/prepared-query';
import { apiTokens, memberships, teams, users } from '../../db/schema';
import type { Role } from '../permissions';
import { getConfig } from './config';
import { getDb } from './db';
import { sha256Hex } from './ids';

/** One team the user belongs to, with their role there. */
export interface Membership {
  teamId: string;
  teamName: string;
  role: Role;
}

/** The signed-in user, as the middleware puts it into `locals.user`. */
export interface CurrentUser {
  id: string;
  email: string;
  name: string;
  memberships: Membership[];
}

/** How the request was authenticated, and what went wrong when it was not. */
export interface Resolution {
  user: CurrentUser | null;
  via: 'session' | 'token' | null;
  /** Set when credentials were sent but not accepted (e.g. a revoked token). */
  problem: 'token-not-recognised' | null;
  /** The API token that authenticated the request, for the caller to stamp its use; null otherwise. */
  tokenId?: string | null;
}

/** The answer to a bearer token that is not accepted (the middleware's 401 and the guard's). */
export const tokenNotRecognisedMessage = 'The API token was not recognised; it may have been revoked. Create a new one on your account page.';

/** A token's last use is written at most this often (milliseconds). */
export const TOKEN_USE_STAMP_INTERVAL_MS = 60_000;

/** Prefix of personal API tokens. */
export const apiTokenPrefix = 'pd_';

/**
 * Loads a user with their memberships.
 * @param userId the user's id.
 * @returns the user, or null when there is no such user.
 */
export function loadUser(userId: string): CurrentUser | null {
  return loadUserOfEpoch(userId, null);
}

/**
 * Loads a user with their memberships, when their session epoch is the one given.
 * @param userId the user's id.
 * @param epoch the session epoch a session was issued under, or null to accept any.
 * @returns the user, or null when there is no such user or the epoch has moved on.
 */
function loadUserOfEpoch(userId: string, epoch: unknown): CurrentUser | null {
  const db = getDb();
  const row = userById(db).get({ userId });
  if (!row || (epoch !== null && row.sessionEpoch !== epoch)) return null;
  return { id: row.id, email: row.email, name: row.name, memberships: membershipsOf(db).all({ userId }) };
}

// Read on every request of a signed-in caller: built once (src/db/prepared-query.ts).
const userById = preparedQuery((db) =>
  db
    .select({ id: users.id, email: users.email, name: users.name, sessionEpoch: users.sessionEpoch })
    .from(users)
    .where(eq(users.id, sql.placeholder('userId')))
    .prepare(),
);
const membershipsOf = preparedQuery((db) =>
  db
    .select({ teamId: memberships.teamId, teamName: teams.name, role: memberships.role })
    .from(memberships)
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(memberships.userId, sql.placeholder('userId')))
    .orderBy(teams.name)
    .prepare(),
);

function userFromApiToken(token: string): { user: CurrentUser; tokenId: string } | null {
  const row = getDb()
    .select({ id: apiTokens.id, userId: apiTokens.userId })
    .from(apiTokens)
    .where(and(eq(apiTokens.tokenHash, sha256Hex(token)), isNull(apiTokens.revokedAt)))
    .get();
  const user = row ? loadUser(row.userId) : null;
  return row && user ? { user, tokenId: row.id } : null;
}

/**
 * Stamps an API token's last use (shown on the account page), at most once a minute per token.
 * The one write of identifying a caller, made by the middleware, not by `resolveCaller`.
 * @param tokenId the token that authenticated the request.
 * @param now the time of the request (milliseconds).
 */
export function recordTokenUse(tokenId: string, now = Date.now()): void {
  getDb()
    .update(apiTokens)
    .set({ lastUsedAt: new Date(now) })
    .where(and(eq(apiTokens.id, tokenId), or(isNull(apiTokens.lastUsedAt), lt(apiTokens.lastUsedAt, new Date(now - TOKEN_USE_STAMP_INTERVAL_MS)))))
    .run();
}

/**
 * Resolves the caller of a request. Reads only: the token's last use is stamped by the caller
 * ({@link recordTokenUse}).
 * @param request the incoming request (its Authorization header and cookies are read).
 * @returns the resolution; `user` is null for anonymous callers.
 */
export async function resolveCaller(request: Request): Promise<Resolution> {
  const authorization = request.headers.get('authorization');
  if (authorization) {
    const match = /^Bearer\s+(\S+)\s*$/i.exec(authorization);
    const token = match?.[1] ?? '';
    if (token.startsWith(apiTokenPrefix)) {
      const found = userFromApiToken(token);
      return found ? { user: found.user, via: 'token', problem: null, tokenId: found.tokenId } : { user: null, via: null, problem: 'token-not-recognised' };
    }
    return { user: null, via: null, problem: 'token-not-recognised' };
  }
  const cookie = request.headers.get('cookie');
  if (!cookie) return { user: null, via: null, problem: null };
  const jwt = await sessionClaims(request, cookie);
  if (!jwt) return { user: null, via: null, problem: null };
  // The session epoch is compared with the user's on every request: sign-out and password change end sessions at once.
  const user = loadUserOfEpoch(jwt.sub, jwt.epoch);
  return { user, via: user ? 'session' : null, problem: null };
}

/** What a session cookie says once decrypted and checked: who, their session epoch, and until when. */
interface SessionClaims {
  sub: string;
  /** The session epoch the token was issued under (0 for tokens from before epochs). */
  epoch: unknown;
  /** Expiry, in seconds since 1970 (the JWT's `exp`). */
  exp: number;
}

/** Decrypted session cookies kept, at most this many (the oldest out first). */
export const SESSION_CLAIMS_KEPT = 1_000;
const claimsByCookie = new Map<string, SessionClaims>();

/**
 * The claims of the request's session cookie. Decrypting it (Auth.js `getToken`: a key
 * derivation and an AES decryption) was the largest part of identifying a caller, and every page
 * of a signed-in reader sends the same cookie, so a cookie header that decrypted to a valid session
 * is remembered with what it said: the same bytes decrypt to the same claims. Only successes are
 * kept, and only until the token's own expiry; the session epoch is still compared with the
 * user's on every request (resolveCaller), so a sign-out or password change ends the session at
 * once whatever is kept here (docs/decisions/023-page-cost.md).
 * @param request the request (its cookies).
 * @param cookie its Cookie header, the key.
 * @returns the claims, or null when there is no valid session cookie.
 */
async function sessionClaims(request: Request, cookie: string): Promise<SessionClaims | null> {
  const config = getConfig();
  const key = `${config.secureCookies ? 's' : 'p'}:${cookie}`;
  const kept = claimsByCookie.get(key);
  if (kept && Date.now() / 1000 < kept.exp) return kept;
  if (kept) claimsByCookie.delete(key);
  const jwt = await getToken({ req: request, secret: config.authSecret, secureCookie: config.secureCookies, logger: silentLogger });
  if (!jwt?.sub || typeof jwt.exp !== 'number') return null;
  const claims: SessionClaims = { sub: jwt.sub, epoch: jwt.epoch ?? 0, exp: jwt.exp };
  claimsByCookie.set(key, claims);
  if (claimsByCookie.size > SESSION_CLAIMS_KEPT) claimsByCookie.delete(claimsByCookie.keys().next().value as string);
  return claims;
}

const silentLogger = { error() {}, warn() {}, debug() {}, log() {}, info() {} } as unknown as Console;
