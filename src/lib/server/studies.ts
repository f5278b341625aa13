/** Studies: listing, reading with what lies under them, creating and deleting. */
import { and, count, desc, eq, inArray, sql } from 'drizzle-orm';
import { preparedQuery } from '../../db/prepared-query';
import type { z } from 'zod';
import { audits, cutListVersions, decisions, reviews, studies, teams, waveItems, waves, type StudySettings } from '../../db/schema';
import type { studySettingsRequestSchema } from '../api/cut-list';
import { cutListCounts, undecidedCount } from './cut-list';
import { fail } from './errors';
import { can, type Role } from '../permissions';
import { logActivity } from './activity';
import type { CurrentUser } from './current-user';
import { getDb } from './db';
import { serverFileStore } from './file-store';
import type { StudyRow } from './guard';
import { newId } from './ids';
import type { StudyDetail, StudySummary } from '../api/studies';
export type { StudyDetail, StudySummary } from '../api/studies';

/**
 * The studies the user may read, newest first, across all their teams.
 * @param user the signed-in user.
 * @returns the summaries.
 */
export function listStudies(user: CurrentUser): StudySummary[] {
  const readable = user.memberships.filter((m) => can(m.role, 'read:study'));
  if (readable.length === 0) return [];
  const db = getDb();
  const rows = db
    .select({ id: studies.id, name: studies.name, description: studies.description, teamId: studies.teamId, teamName: teams.name, createdAt: studies.createdAt })
    .from(studies)
    .innerJoin(teams, eq(teams.id, studies.teamId))
    .where(inArray(studies.teamId, readable.map((m) => m.teamId)))
    .orderBy(desc(studies.createdAt), studies.name)
    .all();
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const waveCounts = new Map(
    db.select({ studyId: waves.studyId, n: count() }).from(waves).where(inArray(waves.studyId, ids)).groupBy(waves.studyId).all().map((r) => [r.studyId, r.n]),
  );
  const auditCounts = new Map(
    db
      .select({ studyId: waves.studyId, n: count() })
      .from(audits)
      .innerJoin(waves, eq(waves.id, audits.waveId))
      .where(inArray(waves.studyId, ids))
      .groupBy(waves.studyId)
      .all()
      .map((r) => [r.studyId, r.n]),
  );
  const roleByTeam = new Map(readable.map((m) => [m.teamId, m.role]));
  const handoff = handoffOfStudies(ids);
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    description: r.description,
    team: { id: r.teamId, name: r.teamName },
    role: roleByTeam.get(r.teamId) as Role,
    waves: waveCounts.get(r.id) ?? 0,
    audits: auditCounts.get(r.id) ?? 0,
    createdAt: r.createdAt.toISOString(),
    handoff: {
      ...(handoff.get(r.id) ?? { latestVersion: null, review: 'none-published' }),
      // The items of the reference audit (else of the latest confirmed wave) without a decision.
      undecided: undecidedCount(db, r.id),
    },
  }));
}

/**
 * Where each study's handoff stands, in two reads for the whole list: its latest published version
 * (number, when published and programmed) and the newest verdict on that version (none: awaiting
 * the client), as `reviewState` tells it for one study.
 * @param ids the studies.
 * @returns by study id; a study with no version is left out.
 */
function handoffOfStudies(ids: readonly string[]): Map<string, Omit<StudySummary['handoff'], 'undecided'>> {
  const db = getDb();
  const latest = new Map<string, { id: string; number: number; publishedAt: Date; programmedAt: Date | null }>();
  const versionRows = db
    .select({ id: cutListVersions.id, studyId: cutListVersions.studyId, number: cutListVersions.number, publishedAt: cutListVersions.publishedAt, programmedAt: cutListVersions.programmedAt })
    .from(cutListVersions)
    .where(inArray(cutListVersions.studyId, [...ids]))
    .orderBy(desc(cutListVersions.number))
    .all();
  for (const row of versionRows) if (!latest.has(row.studyId)) latest.set(row.studyId, row);
  const verdicts = new Map<string, 'approved' | 'changes_requested'>();
  const versionIds = [...latest.values()].map((version) => version.id);
  if (versionIds.length > 0) {
    const reviewRows = db
      .select({ versionId: reviews.cutListVersionId, verdict: reviews.verdict })
      .from(reviews)
      .where(inArray(reviews.cutListVersionId, versionIds))
      .orderBy(desc(reviews.createdAt), desc(reviews.id))
      .all();
    for (const row of reviewRows) if (row.versionId !== null && !verdicts.has(row.versionId)) verdicts.set(row.versionId, row.verdict);
  }
  const result = new Map<string, Omit<StudySummary['handoff'], 'undecided'>>();
  for (const [studyId, version] of latest) {
    result.set(studyId, {
      latestVersion: { number: version.number, publishedAt: version.publishedAt.toISOString(), programmedAt: version.programmedAt ? version.programmedAt.toISOString() : null },
      review: verdicts.get(version.id) ?? 'awaiting',
    });
  }
  return result;
}

// The study page's reads, built once (src/db/prepared-query.ts).
const teamById = preparedQuery((db) => db.select({ id: teams.id, name: teams.name }).from(teams).where(eq(teams.id, sql.placeholder('teamId'))).prepare());
const wavesOfStudy = preparedQuery((db) =>
  db
    .select({ id: waves.id, label: waves.label, status: waves.status, format: waves.format, rows: waves.rowCount, items: waves.itemCount, exclusions: waves.exclusions, createdAt: waves.createdAt, confirmedAt: waves.confirmedAt })
    .from(waves)
    .where(eq(waves.studyId, sql.placeholder('studyId')))
    .orderBy(waves.createdAt)
    .prepare(),
);
const auditsOfStudy = preparedQuery((db) =>
  db
    .select({ id: audits.id, waveId: audits.waveId, status: audits.status, stage: audits.stage, progress: audits.progress, createdAt: audits.createdAt, finishedAt: audits.finishedAt, error: audits.error })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId))
    .where(eq(waves.studyId, sql.placeholder('studyId')))
    .orderBy(desc(audits.createdAt))
    .prepare(),
);
const latestVersionOf = preparedQuery((db) =>
  db
    .select({ number: cutListVersions.number, publishedAt: cutListVersions.publishedAt, programmedAt: cutListVersions.programmedAt })
    .from(cutListVersions)
    .where(eq(cutListVersions.studyId, sql.placeholder('studyId')))
    .orderBy(desc(cutListVersions.number))
    .limit(1)
    .prepare(),
);

/**
 * Reads a study with what lies under it (no respondent-level data).
 * @param study the study row (already checked by the guard).
 * @param cutListCountsOfStudy the cut list's counts when the caller has them already.
 * @returns the detail.
 */
export function studyDetail(study: StudyRow, cutListCountsOfStudy?: Record<string, number>): StudyDetail {
  const db = getDb();
  const team = teamById(db).get({ teamId: study.teamId });
  const waveRows = wavesOfStudy(db).all({ studyId: study.id });
  const auditRows = auditsOfStudy(db).all({ studyId: study.id });
  // Items of the latest finished audit (else of the latest confirmed wave) with no decision count as undecided.
  const counts: Record<string, number> = cutListCountsOfStudy ?? cutListCounts(study);
  const latest = latestVersionOf(db).get({ studyId: study.id });
  const iso = (d: Date | null) => (d ? d.toISOString() : null);
  return {
    id: study.id,
    name: study.name,
    description: study.description,
    settings: study.settings,
    team: team ?? { id: study.teamId, name: '' },
    createdAt: study.createdAt.toISOString(),
    waves: waveRows.map(({ exclusions, ...w }) => ({ ...w, excluded: exclusions.length, createdAt: w.createdAt.toISOString(), confirmedAt: iso(w.confirmedAt) })),
    audits: auditRows.map((a) => ({ ...a, createdAt: a.createdAt.toISOString(), finishedAt: iso(a.finishedAt) })),
    cutList: {
      counts,
      latestVersion: latest ? { number: latest.number, publishedAt: latest.publishedAt.toISOString(), programmedAt: iso(latest.programmedAt) } : null,
    },
  };
}

/**
 * Creates a study in a team (the caller's permission is checked by the guard).
 * @param user who creates it.
 * @param teamId the team.
 * @param name the study's name.
 * @param description optional words on it.
 * @returns the new study row.
 */
export function createStudy(user: CurrentUser, teamId: string, name: string, description: string): StudyRow {
  const db = getDb();
  return db.transaction((tx) => {
    const study = tx.insert(studies).values({ id: newId(), teamId, name, description, createdBy: user.id }).returning().get();
    logActivity(tx, { teamId, studyId: study.id, userId: user.id, action: 'study.created', detail: { name } });
    return study;
  });
}

/**
 * Deletes a study with everything under it (waves, items, audits, decisions, versions, comments,
 * reviews cascade), then removes stored uploads that no wave refers to any more.
 * @param user who deletes it.
 * @param study the study row.
 */
export function deleteStudy(user: CurrentUser, study: StudyRow): void {
  const db = getDb();
  serverFileStore().transaction(db, (tx, files) => {
    const hashes = tx.select({ file: waves.fileHash, codebook: waves.codebookHash }).from(waves).where(eq(waves.studyId, study.id)).all();
    tx.delete(studies).where(eq(studies.id, study.id)).run();
    logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'study.deleted', detail: { name: study.name } });
    // The study's files that no other wave uses: their records go now, their bytes once this commits.
    files.forgetUnused([...new Set(hashes.flatMap((h) => [h.file, h.codebook]).filter((h): h is string => !!h))]);
  });
}

/**
 * Discards a wave whose column setup was never confirmed (its upload and proposal), with its
 * stored files when nothing else refers to them. A confirmed wave stays: audits and decisions rest on it.
 * @param user who discards it.
 * @param study its study.
 * @param wave the wave row.
 * @throws {HttpError} 409 `wave-confirmed` for a confirmed wave.
 */
export function discardWave(user: CurrentUser, study: StudyRow, wave: { id: string; label: string; status: string; fileHash: string; codebookHash: string | null }): void {
  if (wave.status === 'confirmed') {
    throw fail.conflict(`The wave "${wave.label}" is confirmed: audits and decisions rest on it, so it cannot be discarded (only a study's owner can delete the whole study).`, 'wave-confirmed');
  }
  serverFileStore().transaction(getDb(), (tx, files) => {
    const deleted = tx.delete(waves).where(and(eq(waves.id, wave.id), eq(waves.status, 'proposed'))).run();
    if (deleted.changes === 0) throw fail.conflict(`The wave "${wave.label}" was confirmed meanwhile, so it cannot be discarded.`, 'wave-confirmed');
    logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'wave.discarded', detail: { wave: wave.id, label: wave.label } });
    // Its files, when no other wave uses them: records now, bytes once this commits.
    files.forgetUnused([wave.fileHash, ...(wave.codebookHash ? [wave.codebookHash] : [])]);
  });
}

/** The body PATCH /api/studies/{id} has after validation. */
export type StudyChange = z.infer<typeof studySettingsRequestSchema>;

/**
 * Changes a study's name, description and default constraints (locked items, minimum items per
 * scale, alpha floor; `null` clears one), in one transaction with its activity entry.
 * @param user who changes it.
 * @param study the study row.
 * @param change the validated body.
 * @throws {HttpError} 400 `unknown-locked-item` for an id no wave of the study has; 409
 *   `locked-item-removed` when a newly locked item is decided drop or merge.
 * @returns the updated row.
 */
export function updateStudy(user: CurrentUser, study: StudyRow, change: StudyChange): StudyRow {
  const db = getDb();
  return db.transaction((tx) => {
    const settings: StudySettings = { ...(study.settings ?? {}) };
    const changedKeys: string[] = [];
    if (change.settings) {
      const wanted = change.settings;
      if (wanted.lockedItems !== undefined) {
        const locked = [...new Set(wanted.lockedItems)].sort();
        const studyWaves = tx.select({ id: waves.id }).from(waves).where(eq(waves.studyId, study.id)).all().map((w) => w.id);
        const known = new Set(studyWaves.length === 0 ? [] : tx.select({ id: waveItems.itemId }).from(waveItems).where(inArray(waveItems.waveId, studyWaves)).all().map((r) => r.id));
        const unknown = locked.filter((id) => !known.has(id));
        if (unknown.length > 0) {
          throw fail.badRequest(
            `settings.lockedItems: ${unknown.slice(0, 5).join(', ')} ${unknown.length === 1 ? 'is not an item' : 'are not items'} of any wave of this study; lock items by their id as listed in the column setup.`,
            'unknown-locked-item',
          );
        }
        const removedNow = locked.length === 0
          ? []
          : tx.select({ itemId: decisions.itemId, decision: decisions.decision }).from(decisions).where(and(eq(decisions.studyId, study.id), inArray(decisions.itemId, locked), inArray(decisions.decision, ['drop', 'merge']))).all();
        if (removedNow.length > 0) {
          throw fail.conflict(
            `${removedNow.map((r) => `${r.itemId} (${r.decision})`).join(', ')} ${removedNow.length === 1 ? 'is' : 'are'} decided to leave the questionnaire; change ${removedNow.length === 1 ? 'that decision' : 'those decisions'} before locking.`,
            'locked-item-removed',
          );
        }
        settings.lockedItems = locked;
        changedKeys.push('lockedItems');
      }
      for (const key of ['minItemsPerScale', 'alphaFloor'] as const) {
        const value = wanted[key];
        if (value === undefined) continue;
        if (value === null) delete settings[key];
        else settings[key] = value;
        changedKeys.push(key);
      }
    }
    const values: Partial<StudyRow> = { settings };
    if (change.name !== undefined) {
      values.name = change.name;
      changedKeys.push('name');
    }
    if (change.description !== undefined) {
      values.description = change.description;
      changedKeys.push('description');
    }
    const updated = tx.update(studies).set(values).where(eq(studies.id, study.id)).returning().get();
    logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'study.updated', detail: { changed: changedKeys } });
    return updated;
  });
}
