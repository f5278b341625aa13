import type { APIRoute } from 'astro';
import { asc, eq } from 'drizzle-orm';
import { decisionHistory, users } from '../../../../../db/schema';
import { toCsv } from '../../../../../lib/export/spreadsheet-cells';
import { fileStem } from '../../../../../lib/memo/memo-format';
import { getDb } from '../../../../../lib/server/db';
import { endpoint } from '../../../../../lib/server/endpoint';
import { requireAccess } from '../../../../../lib/server/guard';

/**
 * GET /api/studies/{id}/cut-list/history.csv (members): every decision ever made on the study's
 * items, oldest first (when, who, item, decision, merged into, reason, audit), as CSV with
 * spreadsheet-safe cells.
 */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study } = requireAccess(locals, 'study', params.id ?? '', 'read:cutlist');
  const rows = getDb()
    .select({
      at: decisionHistory.decidedAt,
      who: users.name,
      item: decisionHistory.itemId,
      decision: decisionHistory.decision,
      into: decisionHistory.intoItemId,
      reason: decisionHistory.reason,
      audit: decisionHistory.auditId,
    })
    .from(decisionHistory)
    .leftJoin(users, eq(users.id, decisionHistory.decidedBy))
    .where(eq(decisionHistory.studyId, study.id))
    .orderBy(asc(decisionHistory.decidedAt), asc(decisionHistory.id))
    .all();
  const csv = toCsv([
    ['decided_at_utc', 'decided_by', 'item', 'decision', 'merged_into', 'reason', 'audit'],
    ...rows.map((row) => [row.at.toISOString(), row.who ?? 'a former member', row.item, row.decision, row.into, row.reason, row.audit]),
  ]);
  return new Response(csv, {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${fileStem('paredown-decision-history', study.name)}.csv"`,
      'Cache-Control': 'no-store',
    },
  });
});
