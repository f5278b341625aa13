import type { APIRoute } from 'astro';
import { whatIfRequestSchema } from '../../../../lib/api/cut-list';
import { requireAccess } from '../../../../lib/server/guard';
import { whatIfJobs } from '../../../../lib/server/audit-jobs/what-if-jobs';
import { endpoint, readJson } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';

/**
 * POST /api/audits/{id}/what-if (members): `{ "removed": [item ids] }` → max VIF, condition
 * number, each scale's alpha, omega and Spearman-Brown projection, items removed and minutes
 * saved, computed in the what-if worker thread (never on the request thread). 409
 * `audit-not-done` before the audit finished; 400 for an id the audit does not have.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const id = params.id ?? '';
  requireAccess(locals, 'audit', id, 'read:audit');
  const body = await readJson(request, whatIfRequestSchema);
  return json(await whatIfJobs().compute(id, body.removed));
});
