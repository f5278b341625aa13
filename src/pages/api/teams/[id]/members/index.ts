import type { APIRoute } from 'astro';
import type { MembersResponse } from '../../../../../lib/api/teams';
import { can } from '../../../../../lib/permissions';
import { endpoint } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireAccess } from '../../../../../lib/server/guard';
import { listMembers, listPendingInvitations } from '../../../../../lib/server/teams';

/** GET /api/teams/{id}/members: the team's members; owners also see open invitations. */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { membership } = requireAccess(locals, 'team', params.id ?? '', 'read:members');
  const members = listMembers(membership.teamId);
  const invitations = can(membership.role, 'manage:team') ? listPendingInvitations(membership.teamId) : undefined;
  return json({ team: { id: membership.teamId, name: membership.teamName }, members, invitations } satisfies MembersResponse);
});
