import type { APIRoute } from 'astro';
import { programmedRequestSchema } from '../../../../../lib/api/handoff';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/errors';
import { requireAccess } from '../../../../../lib/server/guard';
import { markProgrammed } from '../../../../../lib/server/handoff/versions';

/**
 * POST /api/studies/{id}/cut-list/programmed (field manager, owner): marks the latest published
 * version (or `{ "version": N }`) as programmed and e-mails the designers; 409 before any version
 * or when it is already marked.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, study } = requireAccess(locals, 'study', params.id ?? '', 'mark:programmed');
  const { version } = await readJson(request, programmedRequestSchema);
  return json(await markProgrammed(user, study, version));
});
