import type { APIRoute } from 'astro';
import type { StudyResponse } from '../../../lib/api/studies';
import { studySettingsRequestSchema } from '../../../lib/api/cut-list';
import { endpoint, readJson } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/errors';
import { requireAccess } from '../../../lib/server/guard';
import { deleteStudy, studyDetail, updateStudy } from '../../../lib/server/studies';

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

/**
 * PATCH /api/studies/{id} (owner, designer): name, description and the study's default
 * constraints (`settings.lockedItems`, `settings.minItemsPerScale`, `settings.alphaFloor`; null
 * clears one). Audits started later take them where their own settings are silent.
 */
export const PATCH: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { study, user, membership } = requireAccess(locals, 'study', params.id ?? '', 'edit:study');
  const change = await readJson(request, studySettingsRequestSchema);
  const updated = updateStudy(user, study, change);
  return json({ study: { ...studyDetail(updated), role: membership.role } });
});
