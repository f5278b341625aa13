import type { APIRoute } from 'astro';
import { acceptRequestSchema } from '../../../../../lib/api/cut-list';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireAccess } from '../../../../../lib/server/guard';
import { acceptRecommendations } from '../../../../../lib/server/cut-list';

/**
 * POST /api/studies/{id}/cut-list/accept (owner, designer): `{ "recommendation": 2 }` accepts one
 * recommendation of the study's latest finished audit, `{ "recommendation": "all-stable" }` every
 * stable one, in one transaction. Reword proposals stay undecided (`needsWording`). 409 `no-audit`
 * before an audit has finished; 404 `recommendation-not-found` for an index it does not have.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { study, user } = requireAccess(locals, 'study', params.id ?? '', 'decide:item');
  const body = await readJson(request, acceptRequestSchema);
  return json(acceptRecommendations(user, study, body.recommendation, body.reason));
});
