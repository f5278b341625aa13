/**
 * Every request passes these steps, in order:
 * 1. security headers on the way out;
 * 1a. once per process, on its first request of any kind: the restart recovery of audits
 *     (audits an earlier process left queued or running are marked failed) and the sweep of
 *     orphaned upload files, since Astro's standalone server has no start-up hook
 *     (docs/decisions/004-audit-jobs.md, 007-one-way-in-for-waves.md);
 * 2. the origin check (CSRF): a write carrying cookies must come from our own origin;
 * 3. who is asking (session cookie or personal API token) into `locals`; a token that is not
 *    accepted (revoked, unknown) gets 401 here, whatever the path;
 * 4. in front of Auth.js (/api/auth/*): unknown actions 404, other methods 405, bodies read
 *    through the capped reader (413), the sign-in rate limit on the credentials callback, and
 *    sign-out ending the session on the server too;
 * 5. first run (/setup while no user exists) and sign-in for pages.
 * A method an API route does not export is answered 405 with the route's methods (Allow), in
 * the API's error shape, instead of Astro's HTML not-found page.
 * Methods no route answers (anything but GET, HEAD, POST, PUT, PATCH, DELETE, OPTIONS) get 405
 * before any of this; TRACE, TRACK, CONNECT and unknown method tokens never reach here
 * (src/lib/server/node-adapter-hardening.ts).
 */
import { defineMiddleware, sequence } from 'astro:middleware';
import { eq, sql } from 'drizzle-orm';
import { users } from './db/schema';
import { startAuditJobs } from './lib/server/audit-jobs/audit-jobs';
import { getConfig } from './lib/server/config';
import { recordTokenUse, resolveCaller, tokenNotRecognisedMessage } from './lib/server/current-user';
import { getDb } from './lib/server/db';
import { errorResponse, HttpError } from './lib/server/errors';
import { serverFileStore } from './lib/server/file-store';
import { hasAnyUser } from './lib/server/first-run';
import { socketAddressSymbol } from './lib/server/node-adapter-hardening';
import { cancelQuietly, readBodyCapped } from './lib/server/read-body';
import { withSecurityHeaders } from './lib/server/security-headers';
import { TurnAdmission } from './lib/server/turn-admission';
import { recordSignIn, signInAllowance, signInClientAddress, signInEmailFromBody } from './lib/server/sign-in-limit';

const unsafeMethods = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
const credentialsCallback = '/api/auth/callback/credentials';
const signOutAction = '/api/auth/signout';
const answeredMethods = new Set(['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS']);
/** The largest body Auth.js is given to read (its forms hold an e-mail, a password, a token and an address). */
export const maxAuthBodyBytes = 64 * 1024;
/** Auth.js 0.37's actions (@auth/core/lib/utils/actions.js); those that take a provider id. */
const authActions = new Set(['providers', 'session', 'csrf', 'signin', 'signout', 'callback', 'verify-request', 'error', 'webauthn-options']);
const authActionsWithProvider = new Set(['signin', 'callback', 'webauthn-options']);
const publicPages = ['/signin', '/setup', '/invite/'];

function isAsset(pathname: string): boolean {
  return pathname.startsWith('/_astro/') || pathname === '/favicon.svg' || pathname === '/robots.txt';
}

/**
 * Requests start a few per turn of the event loop, in arrival order (src/lib/server/turn-admission.ts).
 * Health answers at once: it is how a supervisor sees that the server is alive.
 */
let requestTurns: TurnAdmission | null = null;
const takeTurns = defineMiddleware(async (context, next) => {
  if (context.url.pathname === '/api/health' || isAsset(context.url.pathname)) return next();
  requestTurns ??= new TurnAdmission(getConfig().requestsPerTurn);
  const turn = requestTurns.admit();
  if (turn) await turn;
  return next();
});

const securityHeaders = defineMiddleware(async (context, next) => {
  const response = await next();
  return withSecurityHeaders(response, isAsset(context.url.pathname), getConfig().publicUrl.startsWith('https://'));
});

/** Methods no route answers: 405 rather than whatever the router would make of them. */
const knownMethods = defineMiddleware((context, next) => {
  if (answeredMethods.has(context.request.method.toUpperCase())) return next();
  return errorResponse(405, 'method-not-allowed', `This server does not answer ${context.request.method.slice(0, 20)} requests.`, { Allow: 'GET, HEAD, POST, PUT, PATCH, DELETE' });
});

/** The API's route modules by file, loaded only to name the methods a route answers (the 405's Allow). */
const apiRouteModules = import.meta.glob<Record<string, unknown>>('./pages/api/**/*.ts');
const endpointMethods = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'];

/**
 * The methods the route file of a pattern exports (HEAD with GET), e.g. `/api/studies/[id]` → GET,
 * HEAD, PATCH, DELETE; empty when no file has that pattern.
 */
async function methodsOfRoute(routePattern: string): Promise<string[]> {
  // Astro gives the pattern in lower case (`/api/teams/[id]/members/[userid]`).
  const wanted = routePattern.toLowerCase();
  const file = Object.keys(apiRouteModules).find((path) => path.replace(/^\.\/pages/, '').replace(/\.ts$/, '').replace(/\/index$/, '').toLowerCase() === wanted);
  if (!file) return [];
  const exported = Object.keys(await apiRouteModules[file]());
  const methods = endpointMethods.filter((method) => exported.includes(method));
  return methods.includes('GET') ? ['GET', 'HEAD', ...methods.slice(1)] : methods;
}

/**
 * A method an API route does not export: Astro answers an empty 404 and then renders the HTML
 * not-found page; the API answers 405 in its error shape, with the methods the route takes.
 */
const apiMethodNotAllowed = defineMiddleware(async (context, next) => {
  const response = await next();
  const { pathname } = context.url;
  if (response.status !== 404 || !pathname.startsWith('/api/') || pathname.startsWith('/api/auth/') || response.headers.has('content-type')) return response;
  const allowed = await methodsOfRoute(context.routePattern);
  if (allowed.length === 0 || allowed.includes(context.request.method.toUpperCase())) return response;
  return errorResponse(405, 'method-not-allowed', `${pathname.slice(0, 200)} does not answer ${context.request.method} requests; it answers ${allowed.join(', ')}.`, { Allow: allowed.join(', ') });
});

let startedUp = false;

/**
 * Work that belongs to the start of the server, done on its first request: starting the audits
 * service runs the restart recovery (`startAuditJobs()`, once per process; routes and pages only
 * read the service with `auditJobs()`, which writes nothing); the file store sweeps files no
 * record or wave uses (an upload cut off between writing its file and committing). Marked done
 * only when it succeeded, so a failure (an unreadable database, an invalid configuration) is met
 * again, not skipped.
 */
const startUp = defineMiddleware((_context, next) => {
  if (!startedUp) {
    startAuditJobs();
    serverFileStore().sweepOrphans(getDb());
    startedUp = true;
  }
  return next();
});

/**
 * Writes that a browser could be tricked into sending (they carry cookies) must name our origin.
 * Calls with a bearer token carry no ambient credentials and are exempt.
 */
const originCheck = defineMiddleware((context, next) => {
  const { request, url } = context;
  if (!unsafeMethods.has(request.method)) return next();
  if (/^Bearer\s/i.test(request.headers.get('authorization') ?? '')) return next();
  const origin = request.headers.get('origin');
  if (origin !== url.origin) {
    return errorResponse(403, 'cross-site-request', 'This request did not come from a Paredown page; reload the page and try again.');
  }
  return next();
});

const identify = defineMiddleware(async (context, next) => {
  if (isAsset(context.url.pathname)) return next();
  const resolution = await resolveCaller(context.request);
  context.locals.user = resolution.user;
  context.locals.authVia = resolution.via;
  context.locals.authProblem = resolution.problem;
  // A token sent but not accepted (revoked, unknown, of a deleted account) is refused on every
  // route and page, never served as if no credentials had been sent (RFC 6750 §3.1;
  // docs/decisions/015-schema-backups.md). Only bearer tokens set a problem: a stale session
  // cookie still reaches the sign-in page.
  if (resolution.problem === 'token-not-recognised') {
    return errorResponse(401, 'token-not-recognised', tokenNotRecognisedMessage, { 'WWW-Authenticate': 'Bearer error="invalid_token"' });
  }
  // Resolving the caller only reads; stamping the token's last use is this one explicit write.
  if (resolution.tokenId) recordTokenUse(resolution.tokenId);
  return next();
});

function clientAddress(request: Request): string {
  const socketAddress = Reflect.get(request, socketAddressSymbol);
  return signInClientAddress({
    forwardedFor: request.headers.get('x-forwarded-for'),
    socketAddress: typeof socketAddress === 'string' ? socketAddress : null,
    trustProxy: getConfig().trustProxy,
  });
}

function tooManyAttempts(request: Request, retryAfterSeconds: number): Response {
  const message = 'Too many sign-in attempts. Wait a few minutes and try again.';
  const wantsPage = (request.headers.get('accept') ?? '').includes('text/html') && !request.headers.has('x-auth-return-redirect');
  if (!wantsPage) return errorResponse(429, 'too-many-attempts', message, { 'Retry-After': String(retryAfterSeconds) });
  const page = `<!doctype html><html lang="en"><meta charset="utf-8"><title>Paredown</title><p>${message}</p><p><a href="/signin">Back to sign-in</a></p></html>`;
  return new Response(page, { status: 429, headers: { 'Content-Type': 'text/html; charset=utf-8', 'Retry-After': String(retryAfterSeconds) } });
}

/** Whether an Auth.js answer (a redirect, or JSON with `url` under X-Auth-Return-Redirect) went to a page without `error=`. */
async function authActionSucceeded(response: Response): Promise<boolean> {
  let target = response.headers.get('location');
  if (!target && (response.headers.get('content-type') ?? '').includes('application/json')) {
    try {
      const body = (await response.clone().json()) as { url?: string };
      target = body?.url ?? null;
    } catch {
      target = null;
    }
  }
  if (!target) return false;
  try {
    return !new URL(target, 'http://x').searchParams.has('error');
  } catch {
    return false;
  }
}

/** Whether a path names an action Auth.js has (the same parse as its parseActionAndProviderId). */
function isAuthActionPath(pathname: string): boolean {
  const parts = pathname.slice('/api/auth'.length).split('/').filter(Boolean);
  if (parts.length !== 1 && parts.length !== 2) return false;
  if (!authActions.has(parts[0])) return false;
  return parts.length === 1 || authActionsWithProvider.has(parts[0]);
}

/**
 * In front of Auth.js: its own 500s for unknown actions and methods become 404 and 405; every
 * body is read through the capped reader before Auth.js reads it whole; the credentials callback
 * is rate-limited; a sign-out also ends the session on the server.
 */
const authFront = defineMiddleware(async (context, next) => {
  const { request, url } = context;
  if (url.pathname !== '/api/auth' && !url.pathname.startsWith('/api/auth/')) return next();
  if (!isAuthActionPath(url.pathname)) return errorResponse(404, 'no-such-route', 'There is no such sign-in route.');
  if (request.method !== 'GET' && request.method !== 'POST' && request.method !== 'HEAD') {
    return errorResponse(405, 'method-not-allowed', 'The sign-in routes answer GET and POST only.', { Allow: 'GET, POST' });
  }
  if (request.method !== 'POST') return next();
  let text: string;
  try {
    const bytes = await readBodyCapped(request.clone(), maxAuthBodyBytes);
    text = new TextDecoder().decode(bytes);
  } catch (error) {
    // Neither copy of the body will be read: cancelling both lets the adapter drop the rest.
    cancelQuietly(request.body);
    if (error instanceof HttpError) return errorResponse(error.status, error.code, error.message);
    throw error;
  }
  if (url.pathname === credentialsCallback) {
    const email = signInEmailFromBody(request.headers.get('content-type'), text);
    const address = clientAddress(request);
    const allowance = signInAllowance(email, address);
    if (!allowance.allowed) return tooManyAttempts(request, allowance.retryAfterSeconds);
    const response = await next();
    recordSignIn(email, address, await authActionSucceeded(response));
    return response;
  }
  if (url.pathname === signOutAction) {
    const user = context.locals.user;
    const response = await next();
    // The cookie Auth.js clears may have been copied: every session of this user ends here
    // (current-user.ts refuses a token whose epoch is not the user's).
    if (user && context.locals.authVia === 'session' && (await authActionSucceeded(response))) {
      getDb().update(users).set({ sessionEpoch: sql`${users.sessionEpoch} + 1` }).where(eq(users.id, user.id)).run();
    }
    return response;
  }
  return next();
});

const gatePages = defineMiddleware((context, next) => {
  const { pathname, search } = context.url;
  if (pathname.startsWith('/api/') || isAsset(pathname)) return next();
  if (!hasAnyUser()) {
    return pathname === '/setup' ? next() : context.redirect('/setup', 303);
  }
  if (pathname === '/setup') return context.redirect(context.locals.user ? '/' : '/signin', 303);
  if (!context.locals.user && !publicPages.some((page) => pathname === page || (page.endsWith('/') && pathname.startsWith(page)))) {
    const nextUrl = pathname === '/' ? '' : `?next=${encodeURIComponent(pathname + search)}`;
    return context.redirect(`/signin${nextUrl}`, 303);
  }
  return next();
});

export const onRequest = sequence(takeTurns, securityHeaders, knownMethods, apiMethodNotAllowed, startUp, originCheck, identify, authFront, gatePages);
