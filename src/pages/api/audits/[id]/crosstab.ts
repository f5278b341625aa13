import type { APIRoute } from 'astro';
import { can } from '../../../../lib/permissions';
import { requireAccess } from '../../../../lib/server/guard';
import { auditJobs } from '../../../../lib/server/audit-jobs/audit-jobs';
import { endpoint } from '../../../../lib/server/endpoint';
import { fail } from '../../../../lib/server/errors';
import { pairCrosstab } from '../../../../lib/server/workspace/pair-crosstab';
import type { Crosstab } from '../../../../lib/api/overlap-map';

/**
 * GET /api/audits/{id}/crosstab?a=ITEM&b=ITEM (members): the two items' recoded answers counted
 * against each other over the respondents the audit used (src/lib/api/overlap-map.ts). Counts
 * are aggregates; callers whose role may not read respondent rows get small cells withheld.
 */
export const GET: APIRoute = endpoint(({ locals, params, url }) => {
  const id = params.id ?? '';
  const { membership, waveId } = requireAccess(locals, 'audit', id, 'read:audit');
  const a = url.searchParams.get('a')?.trim() ?? '';
  const b = url.searchParams.get('b')?.trim() ?? '';
  if (!a || !b) throw fail.badRequest('Name the two items to count: ?a=ITEM&b=ITEM, with item ids as the map shows them.', 'items-required');
  const audit = auditJobs().summary(id);
  if (!audit) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
  if (audit.status !== 'done') throw fail.conflict(`The audit is ${audit.status}; pairs can be opened once it is done.`, 'audit-not-done');
  const body: Crosstab = pairCrosstab(id, waveId, a, b, !can(membership.role, 'read:respondents'));
  return new Response(JSON.stringify(body), { headers: { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store' } });
});
