import type { APIRoute } from 'astro';
import type { ChangePasswordResponse } from '../../../lib/api/me';
import { changePasswordRequest } from '../../../lib/api/schemas/me';
import { changePassword } from '../../../lib/server/accounts';
import { endpoint, readJson } from '../../../lib/server/endpoint';
import { fail, json } from '../../../lib/server/errors';
import { requireUser } from '../../../lib/server/guard';


/**
 * PUT /api/me/password: change one's own password (signed in with a session, not a token). Every
 * session ends (the caller signs in again); `revokeTokens: true` also revokes the API tokens.
 */
export const PUT: APIRoute = endpoint(async ({ locals, request }) => {
  const user = requireUser(locals);
  if (locals.authVia !== 'session') throw fail.forbidden('Change the password from the account page, signed in; API tokens cannot.', 'session-required');
  const input = await readJson(request, changePasswordRequest);
  const { tokensRevoked } = await changePassword(user, input.currentPassword, input.newPassword, { revokeTokens: input.revokeTokens ?? false });
  return json({ changed: true, signInAgain: true, tokensRevoked } satisfies ChangePasswordResponse);
});
