import type { APIRoute } from 'astro';
import type { CancelAuditResponse } from '../../../../lib/api/audits';
import { auditJobs } from '../../../../lib/server/audit-jobs/audit-jobs';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';

/**
 * POST /api/audits/{id}/cancel (owner, designer; api.md): stops a queued or running audit. 200
 * with the audit, now `cancelled`; 409 `audit-not-active` when it is done, failed or cancelled.
 * docs/decisions/016-fair-audits.md.
 */
export const POST: APIRoute = endpoint(({ locals, params }) => {
  const jobs = auditJobs();
  const id = params.id ?? '';
  const { user, study } = requireAccess(locals, 'audit', id, 'run:audit');
  return json({ audit: jobs.cancel(user, study, id) } satisfies CancelAuditResponse);
});
