import type { APIRoute } from 'astro';
import { requireAccess } from '../../../../lib/server/guard';
import { auditJobs } from '../../../../lib/server/audit-jobs/audit-jobs';
import { endpoint } from '../../../../lib/server/endpoint';
import { fail } from '../../../../lib/server/errors';
import { overlapMapOf } from '../../../../lib/server/workspace/overlap-map';
import type { OverlapMap } from '../../../../lib/api/overlap-map';

/**
 * GET /api/audits/{id}/overlap-map (members: aggregates only): the slice of a done audit the
 * overlap map draws (src/lib/api/overlap-map.ts). 409 `audit-not-done` until the audit is done.
 */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const id = params.id ?? '';
  requireAccess(locals, 'audit', id, 'read:audit');
  const jobs = auditJobs();
  const audit = jobs.summary(id);
  if (!audit) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
  const resultText = audit.status === 'done' ? jobs.resultText(id) : null;
  if (resultText === null) throw fail.conflict(`The audit is ${audit.status}; its overlap map can be drawn once it is done.`, 'audit-not-done');
  const body: OverlapMap = overlapMapOf(id, resultText);
  return new Response(JSON.stringify(body), { headers: { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'private, max-age=300' } });
});
