import type { APIRoute } from 'astro';
import { endpoint } from '../../../../../lib/server/endpoint';
import { requireAccess } from '../../../../../lib/server/guard';
import { withdrawInvitation } from '../../../../../lib/server/invitations';

/** DELETE /api/teams/{id}/invitations/{invitationId}: withdraw an open invitation (owner). */
export const DELETE: APIRoute = endpoint(({ locals, params }) => {
  const { user, membership } = requireAccess(locals, 'team', params.id ?? '', 'manage:team');
  withdrawInvitation(user, membership.teamId, params.invitationId ?? '');
  return new Response(null, { status: 204 });
});
