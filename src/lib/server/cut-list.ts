/**
 * The cut list of a study: the current decision per item, the recommendations they answer, the
 * history of every change, and the writes (one decision, or accepting recommendations), each in
 * one transaction with its activity entry.
 *
 * Which audit: decisions belong to the study and the item id, not to an audit, so they survive a
 * new wave or a new audit. The recommendations, stability, item wording and what-if come from
 * the study's REFERENCE AUDIT: its latest finished (done) audit. Before any audit has finished,
 * the items come from the latest confirmed wave, with no recommendation. Every decision records
 * the reference audit it was made under. docs/decisions/011-decisions-and-what-if.md.
 */
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import { preparedQuery } from '../../db/prepared-query';
import { audits, decisionHistory, decisions, users, waveItems, waves } from '../../db/schema';
import type { Db } from '../../db/client';
import type { AuditJson } from '../audit/audit-json';
import {
  removingKinds,
  type AcceptResponse,
  type CutListConstraints,
  type CutListItem,
  type CutListRecommendation,
  type CutListResponse,
  type DecisionKind,
  type HistoryEntry,
  type ItemRecommendation,
} from '../api/cut-list';
import { can, type Role } from '../permissions';
import { logActivity } from './activity';
import { doneAuditResult } from './audit-jobs/done-audit-results';
import type { CurrentUser } from './current-user';
import { getDb } from './db';
import { fail } from './errors';
import type { StudyRow } from './guard';

/** The reference audit of a study, with its parsed result. */
export interface ReferenceAudit {
  id: string;
  waveId: string;
  waveLabel: string;
  finishedAt: Date | null;
  settings: Record<string, unknown>;
  result: AuditJson;
}

// Read on every study page: built once (src/db/prepared-query.ts).
const latestDoneAudit = preparedQuery((db) =>
  db
    .select({ id: audits.id, waveId: audits.waveId, waveLabel: waves.label, finishedAt: audits.finishedAt, settings: audits.settings })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId))
    .where(and(eq(waves.studyId, sql.placeholder('studyId')), eq(audits.status, 'done')))
    .orderBy(desc(audits.finishedAt), desc(audits.createdAt))
    .limit(1)
    .prepare(),
);
const decisionsOfStudy = preparedQuery((db) => db.select().from(decisions).where(eq(decisions.studyId, sql.placeholder('studyId'))).prepare());

/**
 * The study's latest finished audit.
 * @param db the database.
 * @param studyId the study.
 * @returns the audit with its parsed JSON, or null when none has finished.
 */
export function referenceAudit(db: Db, studyId: string): ReferenceAudit | null {
  const row = latestDoneAudit(db).get({ studyId });
  if (!row) return null;
  // Parsed once per process and shared, frozen (a done audit never changes).
  const result = doneAuditResult(db, row.id);
  if (!result) return null;
  return { ...row, settings: (row.settings ?? {}) as Record<string, unknown>, result };
}

/** An item the cut list lists, before its decision is attached. */
interface BaseItem {
  id: string;
  scale: string | null;
  text: string | null;
  position: number;
  vif: number | null;
  topPartner: { id: string; r: number } | null;
}

/** The items decisions are made on: the reference audit's, else the latest confirmed wave's. */
function baseItems(db: Db, studyId: string, reference: ReferenceAudit | null): BaseItem[] {
  if (reference) {
    return reference.result.items.map((item, position) => ({
      id: item.id,
      scale: item.scale,
      text: typeof item.text === 'string' ? item.text : null,
      position,
      vif: item.vif,
      topPartner: item.topPartner,
    }));
  }
  const wave = db
    .select({ id: waves.id })
    .from(waves)
    .where(and(eq(waves.studyId, studyId), eq(waves.status, 'confirmed')))
    .orderBy(desc(waves.confirmedAt), desc(waves.createdAt))
    .limit(1)
    .get();
  if (!wave) return [];
  return db
    .select({ id: waveItems.itemId, scale: waveItems.scale, text: waveItems.text, position: waveItems.position })
    .from(waveItems)
    .where(eq(waveItems.waveId, wave.id))
    .orderBy(waveItems.position)
    .all()
    .map((item) => ({ ...item, vif: null, topPartner: null }));
}

/** Locks and constraints: the study's, with the reference audit's locks added. */
function constraintsOf(study: Pick<StudyRow, 'settings'>, reference: ReferenceAudit | null): CutListConstraints {
  const auditSettings = reference?.settings ?? {};
  const number = (value: unknown) => (typeof value === 'number' && Number.isFinite(value) ? value : null);
  const auditLocked = Array.isArray(auditSettings.locked) ? (auditSettings.locked as unknown[]).filter((id): id is string => typeof id === 'string') : [];
  const settings = study.settings ?? {};
  return {
    lockedItems: [...new Set([...(settings.lockedItems ?? []), ...auditLocked])].sort(),
    minItemsPerScale: number(settings.minItemsPerScale) ?? number(auditSettings.minItemsPerScale),
    alphaFloor: number(settings.alphaFloor) ?? number(auditSettings.alphaFloor),
    maxAlphaDrop: number(settings.maxAlphaDrop) ?? number(auditSettings.maxAlphaDrop),
    secondsPerItem: number(auditSettings.secondsPerItem),
  };
}

/** Whether a recommendation counts as stable: the bootstrap ran and did not mark it unstable. */
export function isStable(recommendation: AuditJson['recommendations'][number]): boolean {
  return typeof recommendation.stability === 'number' && recommendation.unstable !== true;
}

type DecisionRow = typeof decisions.$inferSelect;

/** What an engine action asks of the cut list, as a decision. */
function actionAsDecision(action: { action: string; into: string | null }): { decision: DecisionKind; into: string | null } {
  const decision = (['keep', 'drop', 'merge', 'reword'] as const).find((kind) => kind === action.action) ?? 'keep';
  return { decision, into: decision === 'merge' ? action.into : null };
}

/** The items of a study's cut list with their decisions, and what they were worked out from. */
interface DecidedItems {
  reference: ReferenceAudit | null;
  constraints: CutListConstraints;
  items: CutListItem[];
  counts: Record<DecisionKind, number>;
  recommendations: AuditJson['recommendations'];
}

/**
 * The items of the cut list with their decisions and the counts, without the history and the
 * recommendation views (what the study page needs, at a fraction of the cost).
 * @param db the database.
 * @param study the study (access checked by the guard).
 * @returns the reference audit, constraints, items, counts and the reference audit's recommendations.
 */
function decidedItems(db: Db, study: Pick<StudyRow, 'id' | 'settings'>): DecidedItems {
  const reference = referenceAudit(db, study.id);
  const base = baseItems(db, study.id, reference);
  const constraints = constraintsOf(study, reference);
  const locked = new Set(constraints.lockedItems);
  const rows = decisionsOfStudy(db).all({ studyId: study.id });
  const byItem = new Map(rows.map((row) => [row.itemId, row]));
  const people = peopleNamed(db, [...rows.map((row) => row.decidedBy)]);

  const recommendations = reference?.result.recommendations ?? [];
  const recommendationOf = new Map<string, ItemRecommendation>();
  recommendations.forEach((recommendation, index) => {
    for (const action of recommendation.actions) {
      recommendationOf.set(action.item, {
        index,
        action: action.action,
        into: action.into,
        stability: typeof recommendation.stability === 'number' ? recommendation.stability : null,
        unstable: recommendation.unstable === true,
      });
    }
  });

  const itemOf = (item: BaseItem, inAudit: boolean): CutListItem => {
    const row = byItem.get(item.id);
    return {
      ...item,
      locked: locked.has(item.id),
      inAudit,
      decision: row?.decision ?? 'undecided',
      into: row?.intoItemId ?? null,
      wording: row?.wording ?? null,
      reason: row?.reason ?? '',
      decidedBy: row?.decidedBy ? (people.get(row.decidedBy) ?? null) : null,
      decidedAt: row ? row.decidedAt.toISOString() : null,
      auditId: row?.auditId ?? null,
      recommendation: recommendationOf.get(item.id) ?? null,
    };
  };
  const items = base.map((item) => itemOf(item, true));
  const listed = new Set(base.map((item) => item.id));
  // Decisions on items the reference audit does not have (an earlier wave's) stay visible.
  for (const row of rows) {
    if (!listed.has(row.itemId)) items.push(itemOf({ id: row.itemId, scale: null, text: null, position: items.length, vif: null, topPartner: null }, false));
  }

  const counts: Record<DecisionKind, number> = { keep: 0, drop: 0, merge: 0, reword: 0, undecided: 0 };
  for (const item of items) if (item.inAudit) counts[item.decision] += 1;
  return { reference, constraints, items, counts, recommendations };
}

/**
 * The whole cut list of a study as the API answers it.
 * @param study the study (access checked by the guard).
 * @param role the caller's role (for canDecide).
 * @returns items with decisions, recommendations, counts, constraints and the history.
 */
export function cutList(study: StudyRow, role: Role | null): CutListResponse {
  const db = getDb();
  const { reference, constraints, items, counts, recommendations } = decidedItems(db, study);
  const current = new Map(items.map((item) => [item.id, item]));
  const recommendationViews: CutListRecommendation[] = recommendations.map((recommendation, index) => ({
    index,
    cluster: [...recommendation.cluster],
    keep: recommendation.keep,
    actions: recommendation.actions.map((action) => ({ item: action.item, action: action.action, into: action.into })),
    reason: recommendation.reason,
    maxR: typeof recommendation.evidence.maxR === 'number' ? recommendation.evidence.maxR : null,
    stability: typeof recommendation.stability === 'number' ? recommendation.stability : null,
    unstable: recommendation.unstable === true,
    stable: isStable(recommendation),
    accepted: recommendation.actions.every((action) => {
      const item = current.get(action.item);
      const wanted = actionAsDecision(action);
      return item !== undefined && item.decision === wanted.decision && (wanted.decision !== 'merge' || item.into === wanted.into);
    }),
    cautions: Array.isArray(recommendation.cautions) ? (recommendation.cautions as unknown[]).filter((c): c is string => typeof c === 'string') : [],
  }));

  return {
    studyId: study.id,
    audit: reference
      ? {
          id: reference.id,
          waveId: reference.waveId,
          waveLabel: reference.waveLabel,
          finishedAt: reference.finishedAt ? reference.finishedAt.toISOString() : null,
          bootstrap: typeof reference.settings.bootstrap === 'number' ? reference.settings.bootstrap : 0,
        }
      : null,
    constraints,
    counts,
    items,
    recommendations: recommendationViews,
    history: decisionHistoryOf(db, study.id),
    canDecide: can(role, 'decide:item'),
  };
}

/**
 * The decision counts the study page shows (items of the reference audit, else of the latest
 * confirmed wave; an item with no decision counts as undecided).
 * @param study the study.
 * @returns counts per decision.
 */
export function cutListCounts(study: Pick<StudyRow, 'id' | 'settings'>): Record<DecisionKind, number> {
  return decidedItems(getDb(), study).counts;
}

/** The item ids of a done audit's JSON, read by SQLite's JSON functions (nothing parsed in JavaScript). */
const auditItemIds = preparedQuery((db) =>
  db
    .select({ id: sql<string>`json_extract(items.value, '$.id')` })
    .from(sql`${audits}, json_each(${audits.result}, '$.items') as items`)
    .where(eq(audits.id, sql.placeholder('auditId')))
    .prepare(),
);

/**
 * How many items of the study's cut list have no decision, as `cutListCounts` counts them, for the
 * studies list: the reference audit's item ids are read by SQLite's JSON functions, so listing many
 * studies neither parses their audits' JSON nor pushes the study pages' parsed results out of the
 * per-process cache (docs/decisions/023-page-cost.md).
 * @param db the database.
 * @param studyId the study.
 * @returns the number of undecided items, or null when the cut list has no items yet (no finished
 *   audit and no confirmed wave): then there is nothing to decide, and nothing to publish either.
 */
export function undecidedCount(db: Db, studyId: string): number | null {
  const reference = latestDoneAudit(db).get({ studyId });
  const ids = reference ? auditItemIds(db).all({ auditId: reference.id }).map((row) => row.id) : baseItems(db, studyId, null).map((item) => item.id);
  const rows = decisionsOfStudy(db).all({ studyId });
  if (ids.length === 0 && rows.length === 0) return null;
  const decisionOf = new Map(rows.map((row) => [row.itemId, row.decision]));
  const listed = new Set(ids);
  let undecided = 0;
  for (const id of ids) if ((decisionOf.get(id) ?? 'undecided') === 'undecided') undecided += 1;
  // Decisions on items the reference audit does not have are listed too (decidedItems).
  for (const row of rows) if (!listed.has(row.itemId) && row.decision === 'undecided') undecided += 1;
  return undecided;
}

/**
 * The cut list's items and its counts from one pass (the study page shows both).
 * @param study the study (access checked by the guard).
 * @returns the items (those of the reference audit first) and the counts, as {@link cutListCounts}.
 */
export function cutListItemsAndCounts(study: StudyRow): { items: CutListItem[]; counts: Record<DecisionKind, number> } {
  const { items, counts } = decidedItems(getDb(), study);
  return { items, counts };
}

/** Names of the given users. */
function peopleNamed(db: Db, ids: (string | null)[]): Map<string, { id: string; name: string }> {
  const wanted = [...new Set(ids.filter((id): id is string => id !== null))];
  if (wanted.length === 0) return new Map();
  return new Map(db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, wanted)).all().map((user) => [user.id, user]));
}

/** The most history entries the cut list carries. */
const HISTORY_LIMIT = 500;

/**
 * Every recorded change of a study's decisions, newest first.
 * @param db the database.
 * @param studyId the study.
 * @returns the entries.
 */
export function decisionHistoryOf(db: Db, studyId: string): HistoryEntry[] {
  const rows = db
    .select()
    .from(decisionHistory)
    .where(eq(decisionHistory.studyId, studyId))
    .orderBy(desc(decisionHistory.id))
    .limit(HISTORY_LIMIT)
    .all();
  const people = peopleNamed(db, rows.map((row) => row.decidedBy));
  return rows.map((row) => ({
    id: row.id,
    itemId: row.itemId,
    from: row.previousDecision,
    to: row.decision,
    into: row.intoItemId,
    wording: row.wording,
    reason: row.reason,
    by: row.decidedBy ? (people.get(row.decidedBy) ?? null) : null,
    at: row.decidedAt.toISOString(),
    auditId: row.auditId,
  }));
}

/** One decision to write. */
export interface DecisionChange {
  itemId: string;
  decision: DecisionKind;
  into: string | null;
  wording: string | null;
  reason: string;
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/**
 * Checks a set of changes against the items, the locks and the other decisions, then writes
 * them with their history and one activity entry, all inside the caller's transaction.
 * @returns the ids whose decision changed.
 */
function applyChanges(
  tx: Tx,
  user: CurrentUser,
  study: StudyRow,
  reference: ReferenceAudit | null,
  known: Set<string>,
  locked: Set<string>,
  changes: DecisionChange[],
  action: string,
  detail: Record<string, unknown>,
): string[] {
  const rows = new Map<string, DecisionRow>(tx.select().from(decisions).where(eq(decisions.studyId, study.id)).all().map((row) => [row.itemId, row]));
  const after = new Map<string, { decision: DecisionKind; into: string | null }>();
  for (const [id, row] of rows) after.set(id, { decision: row.decision, into: row.intoItemId });
  for (const change of changes) after.set(change.itemId, { decision: change.decision, into: change.into });

  for (const change of changes) {
    if (!known.has(change.itemId)) {
      throw fail.notFound(`"${change.itemId}" is not an item of this study's ${reference ? 'latest audit' : 'confirmed wave'}.`, 'item-not-found');
    }
    if (removingKinds.includes(change.decision) && locked.has(change.itemId)) {
      throw fail.conflict(
        `${change.itemId} is locked (a trend, mandated or validated item), so it cannot be ${change.decision === 'drop' ? 'dropped' : 'merged'}; keep or reword it, or release the lock in the study settings first.`,
        'item-locked',
      );
    }
    if (change.decision === 'merge') {
      const into = change.into as string;
      if (into === change.itemId) throw fail.badRequest(`An item cannot be merged into itself; name another item of the study as into.`, 'merge-into-itself');
      if (!known.has(into)) throw fail.badRequest(`into: "${into}" is not an item of this study's ${reference ? 'latest audit' : 'confirmed wave'}.`, 'unknown-merge-target');
      const target = after.get(into);
      if (target && removingKinds.includes(target.decision)) {
        throw fail.conflict(`${into} is itself ${target.decision === 'drop' ? 'dropped' : `merged into ${target.into}`}, so ${change.itemId} cannot be merged into it; merge into an item that stays.`, 'merge-target-removed');
      }
    }
    if (removingKinds.includes(change.decision)) {
      const mergedHere = [...after].filter(([id, state]) => state.decision === 'merge' && state.into === change.itemId && id !== change.itemId).map(([id]) => id);
      if (mergedHere.length > 0) {
        throw fail.conflict(
          `${mergedHere.join(', ')} ${mergedHere.length === 1 ? 'is' : 'are'} merged into ${change.itemId}, so it cannot be ${change.decision === 'drop' ? 'dropped' : 'merged'} itself; change ${mergedHere.length === 1 ? 'that decision' : 'those decisions'} first.`,
          'item-is-merge-target',
        );
      }
    }
  }

  const now = new Date();
  const changed: string[] = [];
  for (const change of changes) {
    const before = rows.get(change.itemId);
    const previous: DecisionKind = before?.decision ?? 'undecided';
    if (before && before.decision === change.decision && before.intoItemId === change.into && (before.wording ?? null) === change.wording && before.reason === change.reason) continue;
    if (!before && change.decision === 'undecided') continue;
    const values = {
      decision: change.decision,
      intoItemId: change.into,
      wording: change.wording,
      reason: change.reason,
      auditId: reference?.id ?? null,
      decidedBy: user.id,
      decidedAt: now,
    };
    tx.insert(decisions)
      .values({ studyId: study.id, itemId: change.itemId, ...values })
      .onConflictDoUpdate({ target: [decisions.studyId, decisions.itemId], set: values })
      .run();
    tx.insert(decisionHistory).values({ studyId: study.id, itemId: change.itemId, previousDecision: previous, ...values }).run();
    changed.push(change.itemId);
  }
  if (changed.length > 0) {
    logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action, detail: { ...detail, items: changed, audit: reference?.id ?? null } });
  }
  return changed;
}

/** Items and locks decisions are checked against. */
function decisionContext(db: Db, study: StudyRow) {
  const reference = referenceAudit(db, study.id);
  const known = new Set(baseItems(db, study.id, reference).map((item) => item.id));
  const locked = new Set(constraintsOf(study, reference).lockedItems);
  return { reference, known, locked };
}

/**
 * Sets one item's decision.
 * @param user who decides.
 * @param study the study (access checked).
 * @param change the decision (validated by decisionRequestSchema).
 * @throws {HttpError} 404 `item-not-found`; 400 `merge-into-itself`, `unknown-merge-target`;
 *   409 `item-locked`, `merge-target-removed`, `item-is-merge-target`.
 * @returns whether anything changed.
 */
export function setDecision(user: CurrentUser, study: StudyRow, change: DecisionChange): { changed: boolean } {
  const db = getDb();
  const { reference, known, locked } = decisionContext(db, study);
  const changed = db.transaction((tx) =>
    applyChanges(tx, user, study, reference, known, locked, [change], 'decision.changed', { decision: change.decision, into: change.into, reason: change.reason }),
  );
  return { changed: changed.length > 0 };
}

/**
 * Accepts one recommendation of the reference audit, or every stable one, in one transaction.
 * Reword proposals are left undecided: a reword needs its new wording, which only a person writes.
 * Locked items are never changed to drop or merge (the engine does not propose that; checked again).
 * @param user who accepts.
 * @param study the study.
 * @param which a recommendation index or 'all-stable'.
 * @param reason the reason recorded (default: the recommendation's own reason).
 * @throws {HttpError} 409 `no-audit` before an audit has finished; 404 `recommendation-not-found`;
 *   409 as setDecision when the current decisions conflict.
 * @returns what changed and what still needs wording.
 */
export function acceptRecommendations(user: CurrentUser, study: StudyRow, which: number | 'all-stable', reason?: string): AcceptResponse {
  const db = getDb();
  const { reference, known, locked } = decisionContext(db, study);
  if (!reference) throw fail.conflict('No audit of this study has finished yet, so there is no recommendation to accept; run an audit first.', 'no-audit');
  const all = reference.result.recommendations;
  let chosen: number[];
  if (which === 'all-stable') {
    chosen = all.map((recommendation, index) => (isStable(recommendation) ? index : -1)).filter((index) => index >= 0);
  } else {
    if (which >= all.length) {
      throw fail.notFound(`The latest audit has ${all.length} recommendation${all.length === 1 ? '' : 's'} (indices 0 to ${all.length - 1}); there is no recommendation ${which}.`, 'recommendation-not-found');
    }
    chosen = [which];
  }
  const changes: DecisionChange[] = [];
  const needsWording: string[] = [];
  for (const index of chosen) {
    const recommendation = all[index];
    const why = reason?.trim() || `Accepted the audit's recommendation: ${recommendation.reason}`;
    for (const action of recommendation.actions) {
      const wanted = actionAsDecision(action);
      if (wanted.decision === 'reword') {
        needsWording.push(action.item);
        continue;
      }
      if (removingKinds.includes(wanted.decision) && locked.has(action.item)) continue;
      changes.push({ itemId: action.item, decision: wanted.decision, into: wanted.into, wording: null, reason: why });
    }
  }
  // Keeps first, so a merge target is never seen as removed because of an older decision.
  changes.sort((a, b) => Number(removingKinds.includes(a.decision)) - Number(removingKinds.includes(b.decision)));
  const changed = db.transaction((tx) =>
    applyChanges(tx, user, study, reference, known, locked, changes, 'decision.accepted', { recommendations: chosen }),
  );
  return { changed, needsWording, accepted: chosen };
}

/**
 * One item of the cut list (after a write).
 * @param study the study.
 * @param itemId the item.
 * @returns the item or null.
 */
export function cutListItem(study: StudyRow, itemId: string): CutListItem | null {
  return cutList(study, null).items.find((item) => item.id === itemId) ?? null;
}
