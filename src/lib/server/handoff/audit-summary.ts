/**
 * The aggregates of an audit for the client reviewer: counts, KMO, condition number, the largest
 * VIF and each scale's reliability before and after the proposed cut. Only figures over all
 * respondents: no respondent row, id or answer is read or returned.
 */
import { and, desc, eq } from 'drizzle-orm';
import { audits, waves } from '../../../db/schema';
import { doneAuditResult } from '../audit-jobs/done-audit-results';
import { getDb } from '../db';

/** One scale's reliability before and after the audit's proposed cut. */
export interface ScaleSummary {
  id: string;
  items: number;
  alpha: number | null;
  omega: number | null;
  itemsAfter: number | null;
  alphaAfter: number | null;
  omegaAfter: number | null;
}

/** What the reviewer sees of an audit. */
export interface AuditSummary {
  auditId: string;
  waveLabel: string;
  finishedAt: string | null;
  method: string;
  respondentsUsed: number;
  respondentsExcluded: number;
  items: number;
  kmo: number | null;
  conditionNumber: number | null;
  maxVif: number | null;
  maxVifAfter: number | null;
  conditionNumberAfter: number | null;
  itemsRemoved: number | null;
  minutesSaved: number | null;
  scales: ScaleSummary[];
}

/**
 * The aggregates of an audit of the study: the given one when it is done, else the study's latest
 * done audit.
 * @param studyId the study.
 * @param preferred the audit a published version was made under, if any.
 * @returns the summary, or null when the study has no finished audit.
 */
export function auditSummary(studyId: string, preferred: string | null): AuditSummary | null {
  const db = getDb();
  const base = db
    .select({ id: audits.id, finishedAt: audits.finishedAt, label: waves.label })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId));
  const row =
    (preferred ? base.where(and(eq(waves.studyId, studyId), eq(audits.id, preferred), eq(audits.status, 'done'))).get() : undefined) ??
    base.where(and(eq(waves.studyId, studyId), eq(audits.status, 'done'))).orderBy(desc(audits.finishedAt)).limit(1).get();
  if (!row) return null;
  // Parsed once per process and shared, frozen (a done audit never changes).
  const result = doneAuditResult(db, row.id);
  if (!result) return null;
  const vifs = result.items.map((item) => item.vif).filter((v): v is number => typeof v === 'number' && Number.isFinite(v));
  const after = new Map((result.afterCut?.scales ?? []).map((scale) => [scale.id, scale]));
  return {
    auditId: row.id,
    waveLabel: row.label,
    finishedAt: row.finishedAt ? row.finishedAt.toISOString() : null,
    method: result.correlation.method,
    respondentsUsed: result.input.respondentsUsed,
    respondentsExcluded: result.input.respondentsExcluded,
    items: result.input.items,
    kmo: result.kmo,
    conditionNumber: result.conditionNumber,
    maxVif: vifs.length > 0 ? Math.max(...vifs) : null,
    maxVifAfter: result.afterCut?.maxVif ?? null,
    conditionNumberAfter: result.afterCut?.conditionNumber ?? null,
    itemsRemoved: result.afterCut?.itemsRemoved ?? null,
    minutesSaved: result.afterCut?.minutesSaved ?? null,
    scales: result.scales.map((scale) => ({
      id: scale.id,
      items: scale.items.length,
      alpha: scale.alpha,
      omega: scale.omegaTotal,
      itemsAfter: after.get(scale.id)?.items ?? null,
      alphaAfter: after.get(scale.id)?.alpha ?? null,
      omegaAfter: after.get(scale.id)?.omegaTotal ?? null,
    })),
  };
}
