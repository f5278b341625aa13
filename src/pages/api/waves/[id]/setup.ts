import type { APIRoute } from 'astro';
import type { ConfirmSetupResponse } from '../../../../lib/api/waves';
import { confirmSetupRequest } from '../../../../lib/api/schemas/waves';
import { json } from '../../../../lib/server/errors';
import { confirmWave } from '../../../../lib/server/waves/confirm-wave';
import { requireAccess } from '../../../../lib/server/guard';
import { readSetupJson, waveEndpoint } from '../../../../lib/server/waves/wave-endpoint';

/**
 * PUT /api/waves/{id}/setup (owner, designer): confirm the column setup and exclusions
 * (`{ setup: { columns }, exclusions, screening?, dryRun? }`). A proposed wave is built from its
 * stored original, screened and stored in one transaction; a confirmed wave may change only its
 * exclusions (409 otherwise). `dryRun: true` checks and previews without storing.
 */
export const PUT: APIRoute = waveEndpoint(async ({ locals, params, request }) => {
  const { user, study, wave } = requireAccess(locals, 'wave', params.id ?? '', 'confirm:wave');
  const input = await readSetupJson(request, confirmSetupRequest);
  const outcome = await confirmWave(user, study, wave, input);
  return json({ ...outcome.view, stored: outcome.stored, dryRun: input.dryRun === true } satisfies ConfirmSetupResponse);
});
