/** Studies: listing, reading with what lies under them, creating and deleting. */
import { count, desc, eq, inArray } from 'drizzle-orm';
import { audits, cutListVersions, decisions, studies, teams, waves } from '../../db/schema';
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
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    description: r.description,
    team: { id: r.teamId, name: r.teamName },
    role: roleByTeam.get(r.teamId) as Role,
    waves: waveCounts.get(r.id) ?? 0,
    audits: auditCounts.get(r.id) ?? 0,
    createdAt: r.createdAt.toISOString(),
  }));
}

/**
 * Reads a study with what lies under it (no respondent-level data).
 * @param study the study row (already checked by the guard).
 * @returns the detail.
 */
export function studyDetail(study: StudyRow): StudyDetail {
  const db = getDb();
  const team = db.select({ id: teams.id, name: teams.name }).from(teams).where(eq(teams.id, study.teamId)).get();
  const waveRows = db
    .select({ id: waves.id, label: waves.label, status: waves.status, format: waves.format, rows: waves.rowCount, items: waves.itemCount, exclusions: waves.exclusions, createdAt: waves.createdAt, confirmedAt: waves.confirmedAt })
    .from(waves)
    .where(eq(waves.studyId, study.id))
    .orderBy(waves.createdAt)
    .all();
  const auditRows = db
    .select({ id: audits.id, waveId: audits.waveId, status: audits.status, stage: audits.stage, progress: audits.progress, createdAt: audits.createdAt, finishedAt: audits.finishedAt, error: audits.error })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId))
    .where(eq(waves.studyId, study.id))
    .orderBy(desc(audits.createdAt))
    .all();
  const counts: Record<string, number> = { keep: 0, drop: 0, merge: 0, reword: 0, undecided: 0 };
  for (const row of db.select({ decision: decisions.decision, n: count() }).from(decisions).where(eq(decisions.studyId, study.id)).groupBy(decisions.decision).all()) {
    counts[row.decision] = row.n;
  }
  const latest = db
    .select({ number: cutListVersions.number, publishedAt: cutListVersions.publishedAt, programmedAt: cutListVersions.programmedAt })
    .from(cutListVersions)
    .where(eq(cutListVersions.studyId, study.id))
    .orderBy(desc(cutListVersions.number))
    .limit(1)
    .get();
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
