import type { APIRoute } from 'astro';
import { z } from 'zod';
import { roles } from '../../../../../lib/permissions';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireTeamAccess } from '../../../../../lib/server/guard';
import { changeRole, removeMember } from '../../../../../lib/server/teams';

const body = z.object({ role: z.enum(roles) });

/** PUT /api/teams/{id}/members/{userId}: change a member's role (owner; the last owner stays). */
export const PUT: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, membership } = requireTeamAccess(locals, params.id ?? '', 'manage:team');
  const input = await readJson(request, body);
  return json({ member: changeRole(user, membership.teamId, params.userId ?? '', input.role) });
});

/** DELETE /api/teams/{id}/members/{userId}: remove a member (owner; the last owner stays). */
export const DELETE: APIRoute = endpoint(({ locals, params }) => {
  const { user, membership } = requireTeamAccess(locals, params.id ?? '', 'manage:team');
  removeMember(user, membership.teamId, params.userId ?? '');
  return new Response(null, { status: 204 });
});
