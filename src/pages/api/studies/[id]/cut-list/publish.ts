import type { APIRoute } from 'astro';
import { publishRequestSchema } from '../../../../../lib/api/handoff';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireAccess } from '../../../../../lib/server/guard';
import { publishCutList } from '../../../../../lib/server/handoff/versions';

/**
 * POST /api/studies/{id}/cut-list/publish (owner, designer): freezes the current decisions as the
 * next numbered version (201 with its diff) and e-mails the team's field managers and client
 * reviewers; 409 naming the undecided items while any item of the latest confirmed wave is
 * undecided.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, study } = requireAccess(locals, 'study', params.id ?? '', 'publish:cutlist');
  const { note } = await readJson(request, publishRequestSchema);
  return json(await publishCutList(user, study, note), 201);
});
