import type { APIRoute } from 'astro';
import { revokeApiToken } from '../../../lib/server/api-tokens';
import { endpoint } from '../../../lib/server/endpoint';
import { requireUser } from '../../../lib/server/guard';

/** DELETE /api/tokens/{id}: revoke one of the caller's tokens. */
export const DELETE: APIRoute = endpoint(({ locals, params }) => {
  const user = requireUser(locals);
  revokeApiToken(user, params.id ?? '');
  return new Response(null, { status: 204 });
});
