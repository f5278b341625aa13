/**
 * The demo's finished audit: so that whoever signs in first (a field manager or a reviewer as much
 * as a designer) sees figures, recommendations and a cut list to work on, the seed runs one audit
 * of the demo wave in-process, the way the audit worker would (executeAuditJob: the same reader of
 * the stored wave, the same runAudit), with the study's constraints, Paredown's defaults and a
 * smaller bootstrap than the default so that a fresh start stays quick, and stores it as done.
 * Self-contained: it needs only the seeded study and wave rows.
 */
import { availableParallelism } from 'node:os';
import { MAX_RESAMPLE_THREADS } from '../audit/resample-threads';
import { eq } from 'drizzle-orm';
import { audits, studies, users, waves } from '../../db/schema';
import type { Db } from '../../db/client';
import { logActivity } from './activity';
import { auditSettingsHash, resolveAuditSettings } from './audit-jobs/audit-settings';
import { executeAuditJob } from './audit-jobs/execute-audit-job';
import { storedWaveForJob } from './audit-jobs/stored-job-wave';

/** Bootstrap resamples of the demo audit (the default is 200; 60 keep a fresh start quick and still mark unstable proposals). */
export const DEMO_AUDIT_BOOTSTRAP = 60;
/** Its seed: fixed, so the demo reads the same on every fresh start. */
export const DEMO_AUDIT_SEED = 2027;
/** Its id, fixed like the other demo ids. */
export const DEMO_AUDIT_ID = 'audit-riverbend-pilot-1';

/**
 * Runs and stores the demo audit of a seeded wave.
 * @param db the database with the demo seeded.
 * @param ids the demo study and wave, the user recorded as having started it, and the audit's id
 *   (DEMO_AUDIT_ID by default).
 * @throws {Error} when the wave is missing or the audit fails (the seed then reports it).
 * @returns the audit id and how long it ran, in milliseconds.
 */
export async function seedDemoAudit(db: Db, ids: { study: string; wave: string; startedBy: string; id?: string }): Promise<{ id: string; runMs: number }> {
  const auditId = ids.id ?? DEMO_AUDIT_ID;
  const study = db.select().from(studies).where(eq(studies.id, ids.study)).get();
  const wave = db.select().from(waves).where(eq(waves.id, ids.wave)).get();
  if (!study || !wave?.matrix) throw new Error(`seedDemoAudit: the demo study ${ids.study} or its wave ${ids.wave} with stored responses is missing`);
  const settings = resolveAuditSettings({ bootstrap: DEMO_AUDIT_BOOTSTRAP, seed: DEMO_AUDIT_SEED }, study.settings, { allowTestFaults: false });
  const startedAt = new Date();
  const result = await executeAuditJob(
    {
      jobId: auditId,
      wave: storedWaveForJob(db, wave, wave.matrix, null),
      settings,
      // The seed runs before the server reads its configuration: as many threads as the server's default.
      resampleThreads: Math.min(MAX_RESAMPLE_THREADS, availableParallelism()),
    },
    () => {},
  );
  const finishedAt = new Date();
  const startedBy = db.select({ id: users.id }).from(users).where(eq(users.id, ids.startedBy)).get()?.id ?? null;
  db.transaction((tx) => {
    tx.insert(audits)
      .values({
        id: auditId,
        waveId: wave.id,
        settings,
        settingsHash: auditSettingsHash(settings, wave.exclusions),
        status: 'done',
        progress: 100,
        result: result.resultText,
        timings: { ...result.timings, queuedMs: 0, totalMs: finishedAt.getTime() - startedAt.getTime() },
        createdBy: startedBy,
        createdAt: startedAt,
        startedAt,
        finishedAt,
      })
      .run();
    logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: startedBy, action: 'audit.started', detail: { audit: auditId, wave: wave.id, method: settings.method, bootstrap: settings.bootstrap, seeded: true } });
  });
  return { id: auditId, runMs: finishedAt.getTime() - startedAt.getTime() };
}
