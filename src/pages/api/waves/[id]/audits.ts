import type { APIRoute } from 'astro';
import type { StartAuditResponse, WaveAuditsResponse } from '../../../../lib/api/audits';
import { auditRequestSchema } from '../../../../lib/api/schemas/audits';
import { auditFormWave } from '../../../../lib/server/audit-jobs/audit-form-data';
import { auditJobs } from '../../../../lib/server/audit-jobs/audit-jobs';
import { getConfig } from '../../../../lib/server/config';
import { endpoint, readJson } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';

/**
 * POST /api/waves/{id}/audits (owner, designer): start an audit with `{ settings }` (any of
 * method, missing, outcome, bootstrap, seed, locked, the engine's thresholds and constraints by
 * their names; the rest from the study and the engine's defaults). Answers 202 with the queued
 * audit at once, or 200 with `reused: true` and the audit that already has the same resolved
 * settings on this wave. 400 bad settings, 409 a wave that is not confirmed.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const jobs = auditJobs();
  const { user, study, wave } = requireAccess(locals, 'wave', params.id ?? '', 'run:audit');
  const body = await readJson(request, auditRequestSchema);
  const started = jobs.start(user, study, wave, body.settings, { allowTestFaults: getConfig().mode === 'test' });
  return json({ audit: started.audit, reused: started.reused } satisfies StartAuditResponse, started.reused ? 200 : 202, { Location: `/api/audits/${started.audit.id}` });
});

/**
 * GET /api/waves/{id}/audits (members): the wave's audits, newest first, with what a form needs
 * to start one (items, outcome columns, the default settings).
 */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const jobs = auditJobs();
  const { study, wave } = requireAccess(locals, 'wave', params.id ?? '', 'read:audit');
  return json({ wave: auditFormWave(study, wave), audits: jobs.listForWave(wave.id) } satisfies WaveAuditsResponse);
});
