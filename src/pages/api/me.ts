import type { APIRoute } from 'astro';
import type { MeResponse } from '../../lib/api/me';
import { actions, can } from '../../lib/permissions';
import { endpoint } from '../../lib/server/endpoint';
import { json } from '../../lib/server/errors';
import { requireUser } from '../../lib/server/guard';

/** GET /api/me: the caller, their teams, their role and permissions in each. */
export const GET: APIRoute = endpoint(({ locals }) => {
  const user = requireUser(locals);
  const answer: MeResponse = {
    user: { id: user.id, email: user.email, name: user.name },
    authenticatedBy: locals.authVia,
    teams: user.memberships.map((m) => ({
      id: m.teamId,
      name: m.teamName,
      role: m.role,
      permissions: actions.filter((action) => can(m.role, action)),
    })),
  };
  return json(answer);
});
