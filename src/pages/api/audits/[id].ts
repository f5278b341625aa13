import type { APIRoute } from 'astro';
import { auditJobs } from '../../../lib/server/audit-jobs/audit-jobs';
import { endpoint } from '../../../lib/server/endpoint';
import { fail } from '../../../lib/server/errors';
import { requireAccess } from '../../../lib/server/guard';

/**
 * GET /api/audits/{id} (members, reviewers included: the audit JSON holds aggregates only):
 * `{ audit, result }` with the status, stage and percent while queued or running, the audit JSON
 * (audit-json.md) as `result` when done, and the stored reason as `audit.error` when failed.
 * `?download=1`: the audit JSON alone as a file (409 until the audit is done).
 */
export const GET: APIRoute = endpoint(({ locals, params, url }) => {
  const jobs = auditJobs();
  const id = params.id ?? '';
  requireAccess(locals, 'audit', id, 'read:audit');
  const audit = jobs.summary(id);
  if (!audit) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
  const resultText = audit.status === 'done' ? jobs.resultText(id) : null;
  const headers = { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store' };
  if (url.searchParams.get('download') === '1') {
    if (resultText === null) throw fail.conflict(`The audit is ${audit.status}; its JSON can be downloaded once it is done.`, 'audit-not-done');
    const name = `paredown-audit-${audit.waveLabel.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'wave'}-${id}.json`;
    return new Response(resultText, { headers: { ...headers, 'Content-Disposition': `attachment; filename="${name}"` } });
  }
  // The stored text is spliced in as it is: no parse and re-serialisation of a large result.
  return new Response(`{"audit":${JSON.stringify(audit)},"result":${resultText ?? 'null'}}`, { headers });
});
