import type { APIRoute } from 'astro';
import { auditJobs } from '../../../../lib/server/audit-jobs/audit-jobs';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';

/**
 * POST /api/audits/{id}/retry (owner, designer): run a failed audit again with its stored
 * settings; 202 with the audit queued again, 409 `audit-not-failed` when it is not failed.
 */
export const POST: APIRoute = endpoint(({ locals, params }) => {
  const jobs = auditJobs();
  const id = params.id ?? '';
  const { user, study } = requireAccess(locals, 'audit', id, 'run:audit');
  return json({ audit: jobs.retry(user, study, id) }, 202, { Location: `/api/audits/${id}` });
});
