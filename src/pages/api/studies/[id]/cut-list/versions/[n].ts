import type { APIRoute } from 'astro';
import { endpoint } from '../../../../../../lib/server/endpoint';
import { json } from '../../../../../../lib/server/errors';
import { requireAccess } from '../../../../../../lib/server/guard';
import { parseVersionNumber, versionDetail } from '../../../../../../lib/server/handoff/versions';

/**
 * GET /api/studies/{id}/cut-list/versions/{n} (members): one version's items in questionnaire
 * order with its diff against the version before; `latest` for the newest (409 before any).
 */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study } = requireAccess(locals, 'study', params.id ?? '', 'read:cutlist');
  const wanted = params.n === 'latest' ? null : parseVersionNumber(params.n ?? '');
  return json({ version: versionDetail(study.id, wanted) });
});
