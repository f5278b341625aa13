/**
 * The team's conversation about a study: threaded comments on the study, an item or an audit;
 * the client's review of the latest published version; and the activity view (who did what,
 * when). Writes are one transaction with their activity entry; e-mails go out after it.
 */
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { preparedQuery } from '../../../db/prepared-query';
import { activityLog, audits, comments, cutListVersions, reviews, users, waveItems, waves } from '../../../db/schema';
import type { ActivityView, CommentRequest, CommentTargetKind, CommentView, ReviewRequest, ReviewResponse, ReviewState } from '../../api/handoff';
import { activitySentence, handoffWords, reviewedMail } from '../../words/handoff';
import { logActivity } from '../activity';
import type { CurrentUser } from '../current-user';
import { getDb } from '../db';
import { fail } from '../errors';
import type { StudyRow } from '../guard';
import { newId } from '../ids';
import { mailEach, pageLink } from './notify';
import { designerAddresses, reviewViews } from './versions';

type CommentRow = typeof comments.$inferSelect;

function auditWords(studyId: string): Map<string, string> {
  const rows = getDb()
    .select({ id: audits.id, label: waves.label, createdAt: audits.createdAt })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId))
    .where(eq(waves.studyId, studyId))
    .all();
  return new Map(rows.map((row) => [row.id, `the audit of ${row.label} started ${row.createdAt.toISOString().slice(0, 16).replace('T', ' ')} UTC`]));
}

function about(kind: CommentTargetKind, id: string, auditsKnown: Map<string, string>): string {
  if (kind === 'study') return 'the study';
  if (kind === 'item') return `item ${id}`;
  return auditsKnown.get(id) ?? 'an audit';
}

function threadsOf(rows: CommentRow[], authors: Map<string, string>, auditsKnown: Map<string, string>): CommentView[] {
  const views = new Map<string, CommentView>();
  for (const row of rows) {
    views.set(row.id, {
      id: row.id,
      parentId: row.parentId,
      target: { kind: row.targetKind, id: row.targetId },
      about: about(row.targetKind, row.targetId, auditsKnown),
      author: row.authorId ? { id: row.authorId, name: authors.get(row.authorId) ?? 'a former member' } : null,
      body: row.body,
      createdAt: row.createdAt.toISOString(),
      replies: [],
    });
  }
  const roots: CommentView[] = [];
  for (const row of rows) {
    const view = views.get(row.id)!;
    const parent = row.parentId ? views.get(row.parentId) : undefined;
    if (parent) parent.replies.push(view);
    else roots.push(view);
  }
  return roots;
}

function authorNames(ids: (string | null)[]): Map<string, string> {
  const wanted = [...new Set(ids.filter((id): id is string => !!id))];
  if (wanted.length === 0) return new Map();
  return new Map(getDb().select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, wanted)).all().map((u) => [u.id, u.name]));
}

/**
 * The study's comments as threads, oldest first.
 * @param studyId the study.
 * @returns the threads and how many comments there are.
 */
export function listComments(studyId: string): { threads: CommentView[]; count: number } {
  const rows = getDb().select().from(comments).where(eq(comments.studyId, studyId)).orderBy(asc(comments.createdAt), asc(comments.id)).all();
  return { threads: threadsOf(rows, authorNames(rows.map((r) => r.authorId)), auditWords(studyId)), count: rows.length };
}

/**
 * Adds a comment (or an answer to one).
 * @param user the author (the guard checked `comment`).
 * @param study the study.
 * @param request the parsed body.
 * @throws HttpError 404 `comment-not-found` for an answer to a comment not in this study,
 *   400 `unknown-item` / `unknown-audit` for a target that is not the study's.
 * @returns the new comment.
 */
export function addComment(user: CurrentUser, study: StudyRow, request: { target: { kind: CommentTargetKind; id?: string }; parentId?: string; body: string }): CommentView {
  const db = getDb();
  const row = db.transaction((tx) => {
    let kind: CommentTargetKind = request.target.kind;
    let targetId = kind === 'study' ? study.id : (request.target.id ?? '');
    if (request.parentId) {
      const parent = tx.select().from(comments).where(and(eq(comments.id, request.parentId), eq(comments.studyId, study.id))).get();
      if (!parent) throw fail.notFound(handoffWords.parentNotFound, 'comment-not-found');
      // An answer belongs to its thread's target.
      kind = parent.targetKind;
      targetId = parent.targetId;
    } else if (kind === 'item') {
      const known = tx
        .select({ id: waveItems.itemId })
        .from(waveItems)
        .innerJoin(waves, eq(waves.id, waveItems.waveId))
        .where(and(eq(waves.studyId, study.id), eq(waveItems.itemId, targetId)))
        .limit(1)
        .get();
      if (!known) throw fail.badRequest(handoffWords.itemNotFound(targetId), 'unknown-item');
    } else if (kind === 'audit') {
      const known = tx
        .select({ id: audits.id })
        .from(audits)
        .innerJoin(waves, eq(waves.id, audits.waveId))
        .where(and(eq(waves.studyId, study.id), eq(audits.id, targetId)))
        .get();
      if (!known) throw fail.badRequest(handoffWords.auditNotFound, 'unknown-audit');
    }
    const inserted = tx
      .insert(comments)
      .values({ id: newId(), studyId: study.id, targetKind: kind, targetId, authorId: user.id, parentId: request.parentId ?? null, body: request.body })
      .returning()
      .get();
    logActivity(tx, {
      teamId: study.teamId,
      studyId: study.id,
      userId: user.id,
      action: 'comment.posted',
      detail: { comment: inserted.id, target: kind, targetId, parentId: inserted.parentId, about: about(kind, targetId, kind === 'audit' ? auditWords(study.id) : new Map()) },
    });
    return inserted;
  });
  return threadsOf([row], new Map([[user.id, user.name]]), row.targetKind === 'audit' ? auditWords(study.id) : new Map())[0];
}

// Read on every study and review page: built once (src/db/prepared-query.ts).
const latestVersionNumber = preparedQuery((db) =>
  db.select({ number: cutListVersions.number }).from(cutListVersions).where(eq(cutListVersions.studyId, sql.placeholder('studyId'))).orderBy(desc(cutListVersions.number)).limit(1).prepare(),
);

/**
 * The review state of the study's latest published version, with every review.
 * @param studyId the study.
 */
export function reviewState(studyId: string): ReviewResponse {
  const db = getDb();
  const latest = latestVersionNumber(db).get({ studyId });
  const history = reviewViews(db, studyId);
  const current = latest ? (history.find((r) => r.version === latest.number) ?? null) : null;
  const state: ReviewState = !latest ? 'none-published' : current ? current.verdict : 'awaiting';
  return { state, latestVersion: latest?.number ?? null, current, history };
}

/**
 * Records the client's verdict on the latest published version and e-mails the designers.
 * @param user the reviewer (the guard checked `review`).
 * @param study the study.
 * @param request approve, or ask for changes with a comment.
 * @throws HttpError 409 `nothing-published` before any version.
 */
export async function addReview(user: CurrentUser, study: StudyRow, request: { verdict: ReviewRequest['verdict']; comment: string }): Promise<ReviewResponse> {
  const db = getDb();
  const version = db.transaction((tx) => {
    const latest = tx.select().from(cutListVersions).where(eq(cutListVersions.studyId, study.id)).orderBy(desc(cutListVersions.number)).limit(1).get();
    if (!latest) throw fail.conflict(handoffWords.nothingPublished, 'nothing-published');
    tx.insert(reviews).values({ id: newId(), studyId: study.id, cutListVersionId: latest.id, reviewerId: user.id, verdict: request.verdict, comment: request.comment }).run();
    logActivity(tx, {
      teamId: study.teamId,
      studyId: study.id,
      userId: user.id,
      action: request.verdict === 'approved' ? 'review.approved' : 'review.changes-requested',
      detail: { version: latest.number, comment: request.comment },
    });
    return latest;
  });
  const notified = await mailEach(
    study.teamId,
    designerAddresses(study, version.publishedBy, user.id),
    reviewedMail({ study: study.name, version: version.number, by: user.name, verdict: request.verdict, comment: request.comment, url: pageLink(`/studies/${study.id}/review`) }),
  );
  return { ...reviewState(study.id), notified };
}

/** Actions the activity view leaves out (they concern accounts, not the study's work). */
const PRIVATE_ACTIONS = new Set(['account.password-changed', 'token.created', 'token.revoked']);

/**
 * Who did what on a study, newest first.
 * @param studyId the study.
 * @param limit at most this many entries.
 */
export function studyActivity(studyId: string, limit = 300): ActivityView[] {
  const rows = getDb()
    .select({ id: activityLog.id, at: activityLog.at, userId: activityLog.userId, name: users.name, action: activityLog.action, detail: activityLog.detail })
    .from(activityLog)
    .leftJoin(users, eq(users.id, activityLog.userId))
    .where(eq(activityLog.studyId, studyId))
    .orderBy(desc(activityLog.at), desc(activityLog.id))
    .limit(limit)
    .all();
  return rows
    .filter((row) => !PRIVATE_ACTIONS.has(row.action))
    .map((row) => ({
      id: row.id,
      at: row.at.toISOString(),
      who: row.userId ? { id: row.userId, name: row.name ?? 'a former member' } : null,
      action: row.action,
      sentence: activitySentence(row.action, row.detail ?? {}),
    }));
}

export type { CommentRequest };
