import type { APIRoute } from 'astro';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';
import { studyActivity } from '../../../../lib/server/handoff/conversation';

/** GET /api/studies/{id}/activity (members): who did what on the study, newest first. */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study } = requireAccess(locals, 'study', params.id ?? '', 'read:study');
  return json({ entries: studyActivity(study.id) });
});
