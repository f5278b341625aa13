import type { APIRoute } from 'astro';
import type { CreateStudyResponse, ListStudiesResponse } from '../../../lib/api/studies';
import { createStudyRequest } from '../../../lib/api/schemas/studies';
import { can } from '../../../lib/permissions';
import { endpoint, readJson } from '../../../lib/server/endpoint';
import { fail, json } from '../../../lib/server/errors';
import { requireAccess, requireUser } from '../../../lib/server/guard';
import { createStudy, listStudies } from '../../../lib/server/studies';

/** GET /api/studies: the studies of the caller's teams. */
export const GET: APIRoute = endpoint(({ locals }) => {
  const user = requireUser(locals);
  return json({ studies: listStudies(user) } satisfies ListStudiesResponse);
});

/** POST /api/studies: create a study in a team (owner, designer). */
export const POST: APIRoute = endpoint(async ({ locals, request }) => {
  const user = requireUser(locals);
  const input = await readJson(request, createStudyRequest);
  let teamId = input.teamId;
  if (!teamId) {
    const creatable = user.memberships.filter((m) => can(m.role, 'create:study'));
    if (creatable.length === 0) {
      throw fail.forbidden('None of your roles may create studies: it needs the permission create:study, which belongs to owner or survey designer.', 'missing-permission');
    }
    if (creatable.length > 1) throw fail.badRequest('You may create studies in several teams: say in which one (teamId).', 'team-required');
    teamId = creatable[0].teamId;
  }
  requireAccess(locals, 'team', teamId, 'create:study');
  const study = createStudy(user, teamId, input.name, input.description);
  return json({ study: { id: study.id, name: study.name, description: study.description, teamId: study.teamId, createdAt: study.createdAt.toISOString() } } satisfies CreateStudyResponse, 201, {
    Location: `/api/studies/${study.id}`,
  });
});
