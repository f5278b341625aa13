import type { APIRoute } from 'astro';
import type { CreateTokenResponse, ListTokensResponse } from '../../../lib/api/tokens';
import { createTokenRequest } from '../../../lib/api/schemas/tokens';
import { createApiToken, listApiTokens } from '../../../lib/server/api-tokens';
import { endpoint, readJson } from '../../../lib/server/endpoint';
import { fail, json } from '../../../lib/server/errors';
import { requireUser } from '../../../lib/server/guard';

/** GET /api/tokens: the caller's live tokens (never their secrets). */
export const GET: APIRoute = endpoint(({ locals }) => {
  const user = requireUser(locals);
  return json({ tokens: listApiTokens(user.id) } satisfies ListTokensResponse);
});

/**
 * POST /api/tokens: create a token; its secret is in this answer only. Signed in with a session
 * only: a token cannot mint further tokens that would outlive its own revocation.
 */
export const POST: APIRoute = endpoint(async ({ locals, request }) => {
  const user = requireUser(locals);
  if (locals.authVia !== 'session') throw fail.forbidden('Create tokens from the account page, signed in; an API token cannot create another.', 'session-required');
  const input = await readJson(request, createTokenRequest);
  const { token, secret } = createApiToken(user, input.name);
  return json({ token, secret } satisfies CreateTokenResponse, 201);
});
