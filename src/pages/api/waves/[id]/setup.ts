import type { APIRoute } from 'astro';
import { z } from 'zod';
import { json } from '../../../../lib/server/errors';
import { confirmWave } from '../../../../lib/server/waves/confirm-wave';
import { requireWaveAccess } from '../../../../lib/server/waves/wave-access';
import { readSetupJson, waveEndpoint } from '../../../../lib/server/waves/wave-endpoint';

const screeningOptions = z
  .object({
    longStringShare: z.number().gt(0).lte(1),
    longStringMinimum: z.number().int().gte(2),
    withinSdMaximum: z.number().gte(0),
    withinSdMinimumAnswers: z.number().int().gte(2),
    speederShare: z.number().gt(0).lte(1),
    missingShareAbove: z.number().gte(0).lte(1),
  })
  .partial();

const body = z.object({
  setup: z.unknown().optional(),
  exclusions: z.array(z.number()).optional(),
  screening: screeningOptions.optional(),
  dryRun: z.boolean().optional(),
});

/**
 * PUT /api/waves/{id}/setup (owner, designer): confirm the column setup and exclusions
 * (`{ setup: { columns }, exclusions, screening?, dryRun? }`). A proposed wave is built from its
 * stored original, screened and stored in one transaction; a confirmed wave may change only its
 * exclusions (409 otherwise). `dryRun: true` checks and previews without storing.
 */
export const PUT: APIRoute = waveEndpoint(async ({ locals, params, request }) => {
  const { user, study, wave } = requireWaveAccess(locals, params.id ?? '', 'confirm:wave');
  const input = await readSetupJson(request, body);
  const outcome = await confirmWave(user, study, wave, input);
  return json({ ...outcome.view, stored: outcome.stored, dryRun: input.dryRun === true });
});
