/**
 * Every request passes these steps, in order:
 * 1. security headers on the way out;
 * 1a. once per process, on its first request of any kind: the restart recovery of audits
 *     (audits an earlier process left queued or running are marked failed) and the sweep of
 *     orphaned upload files, since Astro's standalone server has no start-up hook
 *     (docs/decisions/004-audit-jobs.md, 007-one-way-in-for-waves.md);
 * 2. the origin check (CSRF): a write carrying cookies must come from our own origin;
 * 3. who is asking (session cookie or personal API token) into `locals`;
 * 4. the sign-in rate limit, in front of Auth.js's credentials callback;
 * 5. first run (/setup while no user exists) and sign-in for pages.
 */
import { defineMiddleware, sequence } from 'astro:middleware';
import { startAuditJobs } from './lib/server/audit-jobs/audit-jobs';
import { getConfig } from './lib/server/config';
import { recordTokenUse, resolveCaller } from './lib/server/current-user';
import { getDb } from './lib/server/db';
import { errorResponse } from './lib/server/errors';
import { serverFileStore } from './lib/server/file-store';
import { hasAnyUser } from './lib/server/first-run';
import { withSecurityHeaders } from './lib/server/security-headers';
import { recordSignIn, signInAllowance } from './lib/server/sign-in-limit';

const unsafeMethods = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
const credentialsCallback = '/api/auth/callback/credentials';
const publicPages = ['/signin', '/setup', '/invite/'];

function isAsset(pathname: string): boolean {
  return pathname.startsWith('/_astro/') || pathname === '/favicon.svg' || pathname === '/robots.txt';
}

const securityHeaders = defineMiddleware(async (context, next) => {
  const response = await next();
  return withSecurityHeaders(response, isAsset(context.url.pathname));
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
  // Resolving the caller only reads; stamping the token's last use is this one explicit write.
  if (resolution.tokenId) recordTokenUse(resolution.tokenId);
  return next();
});

function clientAddress(request: Request, fallback: () => string): string {
  if (getConfig().trustProxy) {
    const forwarded = request.headers.get('x-forwarded-for')?.split(',')[0]?.trim();
    if (forwarded) return forwarded;
  }
  try {
    return fallback();
  } catch {
    return 'unknown';
  }
}

function tooManyAttempts(request: Request, retryAfterSeconds: number): Response {
  const message = 'Too many sign-in attempts. Wait a few minutes and try again.';
  const wantsPage = (request.headers.get('accept') ?? '').includes('text/html') && !request.headers.has('x-auth-return-redirect');
  if (!wantsPage) return errorResponse(429, 'too-many-attempts', message, { 'Retry-After': String(retryAfterSeconds) });
  const page = `<!doctype html><html lang="en"><meta charset="utf-8"><title>Paredown</title><p>${message}</p><p><a href="/signin">Back to sign-in</a></p></html>`;
  return new Response(page, { status: 429, headers: { 'Content-Type': 'text/html; charset=utf-8', 'Retry-After': String(retryAfterSeconds) } });
}

async function signInSucceeded(response: Response): Promise<boolean> {
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
  return !new URL(target, 'http://x').searchParams.has('error');
}

const signInLimit = defineMiddleware(async (context, next) => {
  const { request, url } = context;
  if (request.method !== 'POST' || url.pathname !== credentialsCallback) return next();
  let email = '';
  try {
    const form = await request.clone().formData();
    email = String(form.get('email') ?? '').trim().toLowerCase().slice(0, 320);
  } catch {
    email = '';
  }
  const address = clientAddress(request, () => context.clientAddress);
  const allowance = signInAllowance(email, address);
  if (!allowance.allowed) return tooManyAttempts(request, allowance.retryAfterSeconds);
  const response = await next();
  recordSignIn(email, address, await signInSucceeded(response));
  return response;
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

export const onRequest = sequence(securityHeaders, startUp, originCheck, identify, signInLimit, gatePages);
