import type { APIRoute } from 'astro';
import { z } from 'zod';
import { changePassword } from '../../../lib/server/accounts';
import { endpoint, readJson } from '../../../lib/server/endpoint';
import { fail, json } from '../../../lib/server/errors';
import { requireUser } from '../../../lib/server/guard';
import { passwordSchema } from '../../../lib/server/passwords';

const body = z.object({
  currentPassword: z.string().min(1).max(200),
  newPassword: passwordSchema,
  /** Also revoke every personal API token (sessions always end). */
  revokeTokens: z.boolean().optional(),
});

/**
 * PUT /api/me/password: change one's own password (signed in with a session, not a token). Every
 * session ends (the caller signs in again); `revokeTokens: true` also revokes the API tokens.
 */
export const PUT: APIRoute = endpoint(async ({ locals, request }) => {
  const user = requireUser(locals);
  if (locals.authVia !== 'session') throw fail.forbidden('Change the password from the account page, signed in; API tokens cannot.', 'session-required');
  const input = await readJson(request, body);
  const { tokensRevoked } = await changePassword(user, input.currentPassword, input.newPassword, { revokeTokens: input.revokeTokens ?? false });
  return json({ changed: true, signInAgain: true, tokensRevoked });
});
