import type { APIRoute } from 'astro';
import { endpoint } from '../../../../../../lib/server/endpoint';
import { json } from '../../../../../../lib/server/errors';
import { requireAccess } from '../../../../../../lib/server/guard';
import { listVersions } from '../../../../../../lib/server/handoff/versions';

/** GET /api/studies/{id}/cut-list/versions (members): the published versions, newest first. */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study } = requireAccess(locals, 'study', params.id ?? '', 'read:cutlist');
  return json({ versions: listVersions(study.id) });
});
