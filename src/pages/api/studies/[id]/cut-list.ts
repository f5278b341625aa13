import type { APIRoute } from 'astro';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';
import { cutList } from '../../../../lib/server/cut-list';

/**
 * GET /api/studies/{id}/cut-list (members): every item's current decision with who, when and
 * why, its wording and scale, the recommendation and stability behind it, the locks and
 * constraints, the counts and the history of changes (newest first). `CutListResponse` in
 * src/lib/api/cut-list.ts.
 */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study, membership } = requireAccess(locals, 'study', params.id ?? '', 'read:cutlist');
  return json(cutList(study, membership.role));
});
