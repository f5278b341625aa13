import type { APIRoute } from 'astro';
import type { StudyResponse } from '../../../lib/api/studies';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/errors';
import { requireAccess } from '../../../lib/server/guard';
import { deleteStudy, studyDetail } from '../../../lib/server/studies';

/** GET /api/studies/{id}: the study with its waves, audits and cut-list state (members). */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study, membership } = requireAccess(locals, 'study', params.id ?? '', 'read:study');
  return json({ study: { ...studyDetail(study), role: membership.role } } satisfies StudyResponse);
});

/** DELETE /api/studies/{id}: delete with everything under it (owner). */
export const DELETE: APIRoute = endpoint(({ locals, params }) => {
  const { study, user } = requireAccess(locals, 'study', params.id ?? '', 'delete:study');
  deleteStudy(user, study);
  return new Response(null, { status: 204 });
});
