import type { APIRoute } from 'astro';
import type { InvitationsResponse, InviteResponse } from '../../../../../lib/api/teams';
import { inviteRequest } from '../../../../../lib/api/schemas/teams';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireAccess } from '../../../../../lib/server/guard';
import { inviteMember } from '../../../../../lib/server/invitations';
import { listPendingInvitations } from '../../../../../lib/server/teams';

/** GET /api/teams/{id}/invitations: open invitations (owner). */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { membership } = requireAccess(locals, 'team', params.id ?? '', 'manage:team');
  return json({ invitations: listPendingInvitations(membership.teamId) } satisfies InvitationsResponse);
});

/** POST /api/teams/{id}/invitations: invite an e-mail address with a role (owner). */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, membership } = requireAccess(locals, 'team', params.id ?? '', 'manage:team');
  const input = await readJson(request, inviteRequest);
  const invitation = await inviteMember(user, membership.teamId, input.email, input.role);
  return json({ invitation } satisfies InviteResponse, 201);
});
