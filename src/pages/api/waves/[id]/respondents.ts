import type { APIRoute } from 'astro';
import type { RespondentPage } from '../../../../lib/api/waves';
import { respondentsQuery } from '../../../../lib/api/schemas/waves';
import { fail, json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';
import { respondentPage } from '../../../../lib/server/waves/respondent-rows';
import { waveEndpoint } from '../../../../lib/server/waves/wave-endpoint';

/**
 * GET /api/waves/{id}/respondents?page=&perPage=&flagged=&excluded= (owner, designer; never
 * reviewers or field managers): respondent-level rows with screening flags, a page at a time.
 */
export const GET: APIRoute = waveEndpoint(({ locals, params, url }) => {
  const { wave } = requireAccess(locals, 'wave', params.id ?? '', 'read:respondents');
  const parsed = respondentsQuery.safeParse(Object.fromEntries(url.searchParams));
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw fail.badRequest(`${issue.path.join('.')}: ${issue.message}`, 'invalid-query');
  }
  return json(respondentPage(wave, parsed.data) satisfies RespondentPage);
});
