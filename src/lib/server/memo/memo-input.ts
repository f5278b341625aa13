/**
 * Gathers what the redundancy memo is written from: the stored audit, its wave and study, the
 * decisions (a published version, or the current ones), the latest review of that version and
 * the study's comments. Aggregates and decisions only: respondent rows and respondent ids are
 * never read here.
 */
import { and, asc, desc, eq, inArray, isNull } from 'drizzle-orm';
import { audits, comments, cutListVersions, decisions, reviews, storedFiles, studies, teams, users, waves } from '../../../db/schema';
import type { AuditJson } from '../../audit/audit-json';
import type { MemoDecision, MemoDecisionKind, MemoInput } from '../../memo/memo-input';
import { getDb } from '../db';
import { fail } from '../errors';
import { screeningSummary } from '../waves/stored-wave';
import type { ScreeningResult } from '../../ingest';

/** Which decisions the memo reports. */
export type MemoDecisionChoice = { kind: 'latest' } | { kind: 'current' } | { kind: 'version'; number: number };

/**
 * Reads the `?decisions=` and `?version=` query of a memo request.
 * @param query the URL's search parameters.
 * @throws HttpError 400 `invalid-version` when the version is not a positive whole number.
 * @returns the choice: a published version, the current decisions, or (default) the latest
 *   published version when there is one and the current decisions otherwise.
 */
export function memoDecisionChoice(query: URLSearchParams): MemoDecisionChoice {
  const version = query.get('version');
  if (version !== null) {
    if (!/^[1-9][0-9]{0,8}$/.test(version)) throw fail.badRequest('The version must be a published version number such as 1 or 2.', 'invalid-version');
    return { kind: 'version', number: Number(version) };
  }
  return query.get('decisions') === 'current' ? { kind: 'current' } : { kind: 'latest' };
}

const DECISION_KINDS: readonly MemoDecisionKind[] = ['keep', 'drop', 'merge', 'reword', 'undecided'];

function asDecisionKind(value: unknown): MemoDecisionKind {
  return DECISION_KINDS.includes(value as MemoDecisionKind) ? (value as MemoDecisionKind) : 'undecided';
}

function iso(value: Date | number | null | undefined): string | null {
  if (value === null || value === undefined) return null;
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date.toISOString();
}

/**
 * Gathers the memo's input for a finished audit.
 * @param auditId the audit (the caller has passed the guard for it).
 * @param choice which decisions to report.
 * @param preparedFor the name of who asked for the memo (the preparer when nobody published yet).
 * @throws HttpError 404 when the audit is gone, 409 `audit-not-done` while it is not done,
 *   404 `version-not-found` for a version that was never published.
 * @returns the memo input.
 */
export function gatherMemoInput(auditId: string, choice: MemoDecisionChoice, preparedFor: string): MemoInput {
  const db = getDb();
  const row = db
    .select({
      auditId: audits.id,
      status: audits.status,
      result: audits.result,
      finishedAt: audits.finishedAt,
      startedBy: users.name,
      waveLabel: waves.label,
      waveConfirmedAt: waves.confirmedAt,
      waveScreening: waves.screening,
      fileName: storedFiles.originalName,
      studyId: studies.id,
      studyName: studies.name,
      studyDescription: studies.description,
      teamName: teams.name,
    })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId))
    .innerJoin(studies, eq(studies.id, waves.studyId))
    .innerJoin(teams, eq(teams.id, studies.teamId))
    .leftJoin(storedFiles, eq(storedFiles.hash, waves.fileHash))
    .leftJoin(users, eq(users.id, audits.createdBy))
    .where(eq(audits.id, auditId))
    .get();
  if (!row) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
  if (row.status !== 'done' || !row.result) {
    throw fail.conflict(`The audit is ${row.status}; its memo can be made once it is done.`, 'audit-not-done');
  }
  const result = JSON.parse(row.result) as AuditJson;
  const names = new Map<string, string>();
  const nameOf = (id: string | null | undefined): string | null => {
    if (!id) return null;
    if (!names.has(id)) names.set(id, db.select({ name: users.name }).from(users).where(eq(users.id, id)).get()?.name ?? 'a former member');
    return names.get(id) ?? null;
  };

  const published = choice.kind === 'current'
    ? undefined
    : db
        .select()
        .from(cutListVersions)
        .where(choice.kind === 'version' ? and(eq(cutListVersions.studyId, row.studyId), eq(cutListVersions.number, choice.number)) : eq(cutListVersions.studyId, row.studyId))
        .orderBy(desc(cutListVersions.number))
        .get();
  if (choice.kind === 'version' && !published) throw fail.notFound(`Version ${choice.number} of this study's cut list was never published.`, 'version-not-found');

  let decided: MemoDecision[];
  if (published) {
    decided = (published.items as Record<string, unknown>[]).map((entry) => ({
      itemId: String(entry.itemId ?? entry.item ?? ''),
      decision: asDecisionKind(entry.decision),
      into: typeof (entry.into ?? entry.intoItemId) === 'string' ? String(entry.into ?? entry.intoItemId) : null,
      reason: typeof entry.reason === 'string' ? entry.reason : '',
      wording: typeof entry.wording === 'string' ? entry.wording : typeof entry.newText === 'string' ? entry.newText : null,
      decidedBy: typeof entry.decidedBy === 'string' ? entry.decidedBy : nameOf(typeof entry.decidedById === 'string' ? entry.decidedById : null),
      decidedAt: typeof entry.decidedAt === 'string' ? entry.decidedAt : iso(typeof entry.decidedAt === 'number' ? entry.decidedAt : null),
    }));
  } else {
    decided = db
      .select()
      .from(decisions)
      .where(eq(decisions.studyId, row.studyId))
      .all()
      .map((decision) => ({
        itemId: decision.itemId,
        decision: asDecisionKind(decision.decision),
        into: decision.intoItemId,
        reason: decision.reason,
        wording: (decision as { wording?: string | null }).wording ?? null,
        decidedBy: nameOf(decision.decidedBy),
        decidedAt: iso(decision.decidedAt),
      }));
  }
  // Every item of the audit has a line: an item nobody decided on is undecided.
  const byItem = new Map(decided.map((decision) => [decision.itemId, decision]));
  const items: MemoDecision[] = result.items.map(
    (item) => byItem.get(item.id) ?? { itemId: item.id, decision: 'undecided', into: null, reason: '', wording: null, decidedBy: null, decidedAt: null },
  );

  const review = db
    .select()
    .from(reviews)
    .where(published ? and(eq(reviews.studyId, row.studyId), eq(reviews.cutListVersionId, published.id)) : and(eq(reviews.studyId, row.studyId), isNull(reviews.cutListVersionId)))
    .orderBy(desc(reviews.createdAt))
    .get();
  const thread = db
    .select()
    .from(comments)
    .where(and(eq(comments.studyId, row.studyId), inArray(comments.targetKind, ['study', 'item', 'audit'])))
    .orderBy(asc(comments.createdAt))
    .all()
    .filter((comment) => comment.targetKind !== 'audit' || comment.targetId === auditId);

  const screening = screeningSummary((row.waveScreening as ScreeningResult | null) ?? null);
  return {
    study: { name: row.studyName, description: row.studyDescription, team: row.teamName },
    wave: { label: row.waveLabel, fileName: row.fileName ?? null, confirmedAt: iso(row.waveConfirmedAt) },
    audit: { id: row.auditId, finishedAt: iso(row.finishedAt), startedBy: row.startedBy ?? null, result },
    screening: screening ? { respondents: screening.respondents, flags: screening.flags.map(({ code, count, message }) => ({ code, count, message })) } : null,
    decisions: {
      version: published?.number ?? null,
      publishedBy: published ? nameOf(published.publishedBy) : null,
      publishedAt: published ? iso(published.publishedAt) : null,
      items,
    },
    preparedBy: published ? nameOf(published.publishedBy) : preparedFor,
    review: review ? { reviewer: nameOf(review.reviewerId), verdict: review.verdict, at: iso(review.createdAt) ?? new Date().toISOString(), comment: review.comment } : null,
    comments: thread.map((comment) => ({
      author: nameOf(comment.authorId),
      at: iso(comment.createdAt) ?? '',
      about: comment.targetKind === 'study' ? 'the study' : comment.targetKind === 'item' ? `item ${comment.targetId}` : 'this audit',
      body: comment.body,
    })),
    generatedAt: new Date().toISOString(),
  };
}
