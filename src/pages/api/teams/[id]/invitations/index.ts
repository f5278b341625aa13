import type { APIRoute } from 'astro';
import { z } from 'zod';
import { roles } from '../../../../../lib/permissions';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireTeamAccess } from '../../../../../lib/server/guard';
import { inviteMember } from '../../../../../lib/server/invitations';
import { listPendingInvitations } from '../../../../../lib/server/teams';

const body = z.object({ email: z.email('That is not an e-mail address.').max(320), role: z.enum(roles) });

/** GET /api/teams/{id}/invitations: open invitations (owner). */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { membership } = requireTeamAccess(locals, params.id ?? '', 'manage:team');
  return json({ invitations: listPendingInvitations(membership.teamId) });
});

/** POST /api/teams/{id}/invitations: invite an e-mail address with a role (owner). */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, membership } = requireTeamAccess(locals, params.id ?? '', 'manage:team');
  const input = await readJson(request, body);
  const invitation = await inviteMember(user, membership.teamId, input.email, input.role);
  return json({ invitation }, 201);
});
