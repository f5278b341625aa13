import type { APIRoute } from 'astro';
import type { ChangeRoleResponse } from '../../../../../lib/api/teams';
import { changeRoleRequest } from '../../../../../lib/api/schemas/teams';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireAccess } from '../../../../../lib/server/guard';
import { changeRole, removeMember } from '../../../../../lib/server/teams';

/** PUT /api/teams/{id}/members/{userId}: change a member's role (owner; the last owner stays). */
export const PUT: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, membership } = requireAccess(locals, 'team', params.id ?? '', 'manage:team');
  const input = await readJson(request, changeRoleRequest);
  return json({ member: changeRole(user, membership.teamId, params.userId ?? '', input.role) } satisfies ChangeRoleResponse);
});

/** DELETE /api/teams/{id}/members/{userId}: remove a member (owner; the last owner stays). */
export const DELETE: APIRoute = endpoint(({ locals, params }) => {
  const { user, membership } = requireAccess(locals, 'team', params.id ?? '', 'manage:team');
  removeMember(user, membership.teamId, params.userId ?? '');
  return new Response(null, { status: 204 });
});
