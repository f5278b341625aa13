import type { APIRoute } from 'astro';
import type { WaveView } from '../../../lib/api/waves';
import { can } from '../../../lib/permissions';
import { json } from '../../../lib/server/errors';
import { requireAccess } from '../../../lib/server/guard';
import { waveEndpoint } from '../../../lib/server/waves/wave-endpoint';
import { storedWaveView } from '../../../lib/server/waves/wave-view';
import { discardWave } from '../../../lib/server/studies';

/**
 * GET /api/waves/{id} (members): the wave's metadata, items, warnings and screening summary.
 * Owners and designers also get the proposal, the setup, the flagged rows and the exclusions;
 * everyone else gets aggregates only.
 */
export const GET: APIRoute = waveEndpoint(({ locals, params }) => {
  const { wave, membership } = requireAccess(locals, 'wave', params.id ?? '', 'read:study');
  return json(storedWaveView(wave, can(membership.role, 'read:respondents')) satisfies WaveView);
});

/**
 * DELETE /api/waves/{id} (owner, designer): discard a wave whose column setup was never
 * confirmed; 409 `wave-confirmed` for a confirmed one (audits and decisions rest on it).
 */
export const DELETE: APIRoute = waveEndpoint(({ locals, params }) => {
  const { wave, study, user } = requireAccess(locals, 'wave', params.id ?? '', 'upload:wave');
  discardWave(user, study, wave);
  return new Response(null, { status: 204 });
});
