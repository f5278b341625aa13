import type { APIRoute } from 'astro';
import { z } from 'zod';
import { fail, json } from '../../../../lib/server/errors';
import { respondentPage } from '../../../../lib/server/waves/respondent-rows';
import { requireWaveAccess } from '../../../../lib/server/waves/wave-access';
import { waveEndpoint } from '../../../../lib/server/waves/wave-endpoint';

const yesNo = z.enum(['1', '0', 'true', 'false']).transform((value) => value === '1' || value === 'true');

const query = z.object({
  page: z.coerce.number().int().min(1).default(1),
  perPage: z.coerce.number().int().min(1).max(1000).default(100),
  flagged: yesNo.default(false),
  excluded: yesNo.default(false),
});

/**
 * GET /api/waves/{id}/respondents?page=&perPage=&flagged=&excluded= (owner, designer; never
 * reviewers or field managers): respondent-level rows with screening flags, a page at a time.
 */
export const GET: APIRoute = waveEndpoint(({ locals, params, url }) => {
  const { wave } = requireWaveAccess(locals, params.id ?? '', 'read:respondents');
  const parsed = query.safeParse(Object.fromEntries(url.searchParams));
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw fail.badRequest(`${issue.path.join('.')}: ${issue.message}`, 'invalid-query');
  }
  return json(respondentPage(wave, parsed.data));
});
