/**
 * Published versions of a study's cut list: publishing (freezing the current decisions with each
 * item's final wording and questionnaire order), reading versions with their diff, and the
 * "programmed" mark. Each write is one transaction with its activity entry; the e-mails go out
 * after it commits.
 */
import { and, desc, eq, inArray } from 'drizzle-orm';
import { audits, cutListVersions, reviews, users } from '../../../db/schema';
import type { Db } from '../../../db/client';
import type { DiffEntry, DiffField, FrozenItem, HandoffDecision, PersonRef, ProgrammedResponse, PublishResponse, ReviewView, VersionDetail, VersionDiff, VersionSummary } from '../../api/handoff';
import { handoffWords, programmedMail, publishedMail, staysInQuestionnaire } from '../../words/handoff';
import { logActivity } from '../activity';
import type { CurrentUser } from '../current-user';
import { getDb } from '../db';
import { fail } from '../errors';
import type { StudyRow } from '../guard';
import { newId } from '../ids';
import { mailEach, pageLink, teamAddresses } from './notify';
import { currentDecisions, latestConfirmedWave } from './study-items';

type VersionRow = typeof cutListVersions.$inferSelect;
type Reader = Pick<Db, 'select' | 'all'>;

const KINDS: readonly HandoffDecision[] = ['keep', 'drop', 'merge', 'reword', 'undecided'];

function iso(value: Date | number | null | undefined): string | null {
  if (value === null || value === undefined) return null;
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date.toISOString();
}

function textOrNull(value: unknown): string | null {
  return typeof value === 'string' ? value : null;
}

/**
 * A stored item of a version as a FrozenItem (tolerant of rows written before every field existed).
 * @param entry the stored JSON object.
 * @param index its place in the stored list (the order when no position was kept).
 */
export function frozenItem(entry: unknown, index: number): FrozenItem {
  const e = (entry ?? {}) as Record<string, unknown>;
  const decision = KINDS.includes(e.decision as HandoffDecision) ? (e.decision as HandoffDecision) : 'undecided';
  const wording = textOrNull(e.wording);
  const codebookWording = textOrNull(e.codebookWording) ?? textOrNull(e.text);
  return {
    itemId: String(e.itemId ?? e.item ?? ''),
    decision,
    into: textOrNull(e.into) ?? textOrNull(e.intoItemId),
    reason: textOrNull(e.reason) ?? '',
    wording,
    finalWording: textOrNull(e.finalWording) ?? wording ?? codebookWording,
    codebookWording,
    scale: textOrNull(e.scale),
    position: typeof e.position === 'number' ? e.position : index + 1,
    decidedBy: textOrNull(e.decidedBy),
    decidedById: textOrNull(e.decidedById),
    decidedAt: textOrNull(e.decidedAt),
  };
}

/** The items of a stored version in questionnaire order. */
export function versionItems(row: Pick<VersionRow, 'items'>): FrozenItem[] {
  const list = Array.isArray(row.items) ? row.items : [];
  return list.map(frozenItem).sort((a, b) => a.position - b.position);
}

/**
 * What changed from one version's items to the next's.
 * @param before the earlier version's items (null for the first version).
 * @param after the later version's items.
 * @param against the earlier version's number.
 */
export function diffVersions(before: FrozenItem[] | null, after: FrozenItem[], against: number | null): VersionDiff {
  if (!before) return { against: null, entries: [], unchanged: after.length };
  const old = new Map(before.map((item) => [item.itemId, item]));
  const pick = (item: FrozenItem) => ({ decision: item.decision, into: item.into, finalWording: item.finalWording, reason: item.reason });
  const entries: DiffEntry[] = [];
  let unchanged = 0;
  for (const item of after) {
    const was = old.get(item.itemId);
    if (!was) {
      entries.push({ itemId: item.itemId, change: 'added', fields: [], before: null, after: pick(item) });
      continue;
    }
    const fields: DiffField[] = [];
    if (was.decision !== item.decision) fields.push('decision');
    if ((was.into ?? null) !== (item.into ?? null)) fields.push('into');
    if ((was.finalWording ?? null) !== (item.finalWording ?? null)) fields.push('wording');
    if (was.reason !== item.reason) fields.push('reason');
    if (fields.length > 0) entries.push({ itemId: item.itemId, change: 'changed', fields, before: pick(was), after: pick(item) });
    else unchanged += 1;
  }
  const present = new Set(after.map((item) => item.itemId));
  for (const item of before) {
    if (!present.has(item.itemId)) entries.push({ itemId: item.itemId, change: 'removed', fields: [], before: pick(item), after: null });
  }
  return { against, entries, unchanged };
}

function names(db: Reader, ids: (string | null)[]): Map<string, string> {
  const wanted = [...new Set(ids.filter((id): id is string => !!id))];
  if (wanted.length === 0) return new Map();
  return new Map(db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, wanted)).all().map((u) => [u.id, u.name]));
}

function person(id: string | null, known: Map<string, string>): PersonRef | null {
  if (!id) return null;
  return { id, name: known.get(id) ?? 'a former member' };
}

/** Reviews as the API shows them, newest first. */
export function reviewViews(db: Reader, studyId: string): ReviewView[] {
  const rows = db
    .select({ id: reviews.id, versionNumber: cutListVersions.number, verdict: reviews.verdict, comment: reviews.comment, reviewerId: reviews.reviewerId, createdAt: reviews.createdAt })
    .from(reviews)
    .leftJoin(cutListVersions, eq(cutListVersions.id, reviews.cutListVersionId))
    .where(eq(reviews.studyId, studyId))
    .orderBy(desc(reviews.createdAt), desc(reviews.id))
    .all();
  const known = names(db, rows.map((r) => r.reviewerId));
  return rows.map((r) => ({ id: r.id, version: r.versionNumber ?? null, verdict: r.verdict, comment: r.comment, reviewer: person(r.reviewerId, known), createdAt: iso(r.createdAt) ?? '' }));
}

function countsOf(items: FrozenItem[]): Record<HandoffDecision, number> {
  const counts: Record<HandoffDecision, number> = { keep: 0, drop: 0, merge: 0, reword: 0, undecided: 0 };
  for (const item of items) counts[item.decision] += 1;
  return counts;
}

function summaryOf(row: VersionRow, known: Map<string, string>, review: ReviewView | null): VersionSummary {
  return {
    number: row.number,
    publishedAt: iso(row.publishedAt) ?? '',
    publishedBy: person(row.publishedBy, known),
    programmedAt: iso(row.programmedAt),
    programmedBy: person(row.programmedBy, known),
    auditId: row.auditId,
    counts: countsOf(versionItems(row)),
    review,
  };
}

function versionRows(db: Reader, studyId: string): VersionRow[] {
  return db.select().from(cutListVersions).where(eq(cutListVersions.studyId, studyId)).orderBy(desc(cutListVersions.number)).all();
}

/**
 * The published versions of a study, newest first.
 * @param studyId the study.
 */
export function listVersions(studyId: string): VersionSummary[] {
  const db = getDb();
  const rows = versionRows(db, studyId);
  const known = names(db, rows.flatMap((r) => [r.publishedBy, r.programmedBy]));
  const allReviews = reviewViews(db, studyId);
  return rows.map((row) => summaryOf(row, known, allReviews.find((r) => r.version === row.number) ?? null));
}

/**
 * Parses a version number from a path or query.
 * @param value the text.
 * @throws HttpError 400 `invalid-version` when it is not a positive whole number.
 */
export function parseVersionNumber(value: string): number {
  if (!/^[1-9][0-9]{0,8}$/.test(value)) throw fail.badRequest(handoffWords.badVersion, 'invalid-version');
  return Number(value);
}

/**
 * One version with its items and its diff against the version before it.
 * @param studyId the study.
 * @param number the version, or null for the latest.
 * @throws HttpError 409 `nothing-published` when asked for the latest of none, 404
 *   `version-not-found` for a number never published.
 */
export function versionDetail(studyId: string, number: number | null): VersionDetail {
  const db = getDb();
  const rows = versionRows(db, studyId);
  if (rows.length === 0 && number === null) throw fail.conflict(handoffWords.nothingPublished, 'nothing-published');
  const index = number === null ? 0 : rows.findIndex((row) => row.number === number);
  if (index < 0 || !rows[index]) throw fail.notFound(handoffWords.versionNotFound(number ?? 0), 'version-not-found');
  const row = rows[index];
  const previous = rows[index + 1] ?? null;
  const known = names(db, [row.publishedBy, row.programmedBy]);
  const review = reviewViews(db, studyId).find((r) => r.version === row.number) ?? null;
  const items = versionItems(row);
  return { ...summaryOf(row, known, review), items, diff: diffVersions(previous ? versionItems(previous) : null, items, previous?.number ?? null) };
}

/**
 * Publishes the current decisions as the next numbered version and e-mails the team's field
 * managers and client reviewers.
 * @param user who publishes (the guard checked `publish:cutlist`).
 * @param study the study.
 * @param note words for the team, put into the e-mail.
 * @throws HttpError 409 `no-confirmed-wave` without a confirmed wave, `items-undecided` (naming
 *   them) while an item of the latest confirmed wave has no decision, `unchanged` when nothing
 *   differs from the latest version.
 * @returns the new version with its diff, and who was e-mailed.
 */
export async function publishCutList(user: CurrentUser, study: StudyRow, note: string): Promise<PublishResponse> {
  const db = getDb();
  const number = db.transaction((tx) => {
    const wave = latestConfirmedWave(tx, study.id);
    if (!wave || wave.items.length === 0) throw fail.conflict(handoffWords.noConfirmedWave, 'no-confirmed-wave');
    const decided = currentDecisions(tx, study.id);
    const undecided = wave.items.filter((item) => (decided.get(item.itemId)?.decision ?? 'undecided') === 'undecided').map((item) => item.itemId);
    if (undecided.length > 0) throw fail.conflict(handoffWords.undecided(undecided), 'items-undecided');
    const items: FrozenItem[] = wave.items.map((item) => {
      const decision = decided.get(item.itemId)!;
      const wording = decision.decision === 'reword' || decision.decision === 'merge' ? decision.wording : null;
      return {
        itemId: item.itemId,
        decision: decision.decision,
        into: decision.decision === 'merge' ? decision.into : null,
        reason: decision.reason,
        wording,
        finalWording: wording ?? item.text,
        codebookWording: item.text,
        scale: item.scale,
        position: item.position,
        decidedBy: decision.decidedBy,
        decidedById: decision.decidedById,
        decidedAt: iso(decision.decidedAt),
      };
    });
    const previous = tx.select().from(cutListVersions).where(eq(cutListVersions.studyId, study.id)).orderBy(desc(cutListVersions.number)).limit(1).get();
    const diff = diffVersions(previous ? versionItems(previous) : null, items, previous?.number ?? null);
    if (previous && diff.entries.length === 0) {
      throw fail.conflict(`Nothing differs from version ${previous.number}, so there is nothing new to publish; change a decision first.`, 'unchanged');
    }
    const audit = tx
      .select({ id: audits.id })
      .from(audits)
      .where(and(eq(audits.waveId, wave.id), eq(audits.status, 'done')))
      .orderBy(desc(audits.finishedAt), desc(audits.createdAt))
      .limit(1)
      .get();
    const next = (previous?.number ?? 0) + 1;
    tx.insert(cutListVersions)
      .values({ id: newId(), studyId: study.id, number: next, items, auditId: audit?.id ?? null, publishedBy: user.id, publishedAt: new Date() })
      .run();
    const kept = items.filter((item) => staysInQuestionnaire(item.decision)).length;
    logActivity(tx, {
      teamId: study.teamId,
      studyId: study.id,
      userId: user.id,
      action: 'cutlist.published',
      detail: { version: next, wave: wave.id, kept, removed: items.length - kept, changes: previous ? diff.entries.length : null, note },
    });
    return next;
  });
  const version = versionDetail(study.id, number);
  const kept = version.items.filter((item) => staysInQuestionnaire(item.decision)).length;
  const to = teamAddresses(study.teamId, ['field_manager', 'client_reviewer'], user.id);
  const notified = await mailEach(
    study.teamId,
    to,
    publishedMail({
      study: study.name,
      version: number,
      by: user.name,
      kept,
      removed: version.items.length - kept,
      changes: version.diff.against === null ? null : version.diff.entries.length,
      fieldListUrl: pageLink(`/studies/${study.id}/field-list`),
      reviewUrl: pageLink(`/studies/${study.id}/review`),
      note,
    }),
  );
  return { version, notified };
}

/**
 * The designers to tell about what happened to a version: the team's designers and whoever
 * published it, but not the one who acted.
 */
export function designerAddresses(study: StudyRow, publishedBy: string | null, actorId: string): string[] {
  const to = new Set(teamAddresses(study.teamId, ['designer'], actorId));
  if (publishedBy && publishedBy !== actorId) {
    const publisher = getDb().select({ email: users.email }).from(users).where(eq(users.id, publishedBy)).get();
    if (publisher) to.add(publisher.email);
  }
  return [...to].sort();
}

/**
 * Marks a published version as programmed and e-mails the designers.
 * @param user who marks it (the guard checked `mark:programmed`).
 * @param study the study.
 * @param number the version, or undefined for the latest.
 * @throws HttpError 409 `nothing-published` before any version, `already-programmed`; 404
 *   `version-not-found` for a number never published.
 */
export async function markProgrammed(user: CurrentUser, study: StudyRow, number: number | undefined): Promise<ProgrammedResponse> {
  const db = getDb();
  const row = db.transaction((tx) => {
    const rows = versionRows(tx, study.id);
    if (rows.length === 0) throw fail.conflict(handoffWords.nothingPublished, 'nothing-published');
    const target = number === undefined ? rows[0] : rows.find((r) => r.number === number);
    if (!target) throw fail.notFound(handoffWords.versionNotFound(number ?? 0), 'version-not-found');
    if (target.programmedAt) {
      const who = target.programmedBy ? (names(tx, [target.programmedBy]).get(target.programmedBy) ?? null) : null;
      throw fail.conflict(handoffWords.alreadyProgrammed(target.number, who, target.programmedAt.toISOString().slice(0, 16).replace('T', ' ') + ' UTC'), 'already-programmed');
    }
    const updated = tx
      .update(cutListVersions)
      .set({ programmedBy: user.id, programmedAt: new Date() })
      .where(eq(cutListVersions.id, target.id))
      .returning()
      .get();
    logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'cutlist.programmed', detail: { version: target.number } });
    return updated;
  });
  const known = names(db, [row.publishedBy, row.programmedBy]);
  const review = reviewViews(db, study.id).find((r) => r.version === row.number) ?? null;
  const notified = await mailEach(
    study.teamId,
    designerAddresses(study, row.publishedBy, user.id),
    programmedMail({ study: study.name, version: row.number, by: user.name, url: pageLink(`/studies/${study.id}/field-list?version=${row.number}`) }),
  );
  return { version: summaryOf(row, known, review), notified };
}
