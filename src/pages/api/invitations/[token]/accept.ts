import type { APIRoute } from 'astro';
import type { AcceptInvitationResponse } from '../../../../lib/api/teams';
import { acceptInvitationRequest } from '../../../../lib/api/schemas/teams';
import { endpoint, readJson } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { acceptInvitation } from '../../../../lib/server/invitations';

/**
 * POST /api/invitations/{token}/accept: join the team. Signed in as the invited address: no body.
 * Not signed in and no account yet: `{ name, password }` creates the account.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const input = await readJson(request, acceptInvitationRequest);
  const result = await acceptInvitation(params.token ?? '', locals.user, input);
  return json(result satisfies AcceptInvitationResponse, 201);
});
