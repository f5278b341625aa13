import type { APIRoute } from 'astro';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/errors';
import { requireStudyAccess } from '../../../lib/server/guard';
import { deleteStudy, studyDetail } from '../../../lib/server/studies';

/** GET /api/studies/{id}: the study with its waves, audits and cut-list state (members). */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study, membership } = requireStudyAccess(locals, params.id ?? '', 'read:study');
  return json({ study: { ...studyDetail(study), role: membership.role } });
});

/** DELETE /api/studies/{id}: delete with everything under it (owner). */
export const DELETE: APIRoute = endpoint(({ locals, params }) => {
  const { study, user } = requireStudyAccess(locals, params.id ?? '', 'delete:study');
  deleteStudy(user, study);
  return new Response(null, { status: 204 });
});
