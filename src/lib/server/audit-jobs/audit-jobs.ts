/**
 * Audits as background jobs: starting one (or reusing a stored result), running it in the worker
 * pool off the request path (shared fairly across teams, each audit within the server's time
 * limit), writing its progress (throttled), result, failure reason and timings to the `audits`
 * row, cancelling a queued or running one, retrying a failed or cancelled one, and, when the
 * process starts, marking every audit an earlier process left `queued` or `running` as failed
 * ("interrupted by a restart"). The main thread is the only writer of the audits table.
 *
 * One instance per process, started explicitly by `startAuditJobs()` (the middleware, on the
 * first request), which runs the restart recovery before anything else reads or starts an audit;
 * `auditJobs()` only returns it. docs/decisions/004-audit-jobs.md, 008.
 */
import { and, desc, eq, inArray, type SQL } from 'drizzle-orm';
import { audits, waveItems, waves } from '../../../db/schema';
import type { Db } from '../../../db/client';
import { logActivity } from '../activity';
import { getConfig } from '../config';
import type { CurrentUser } from '../current-user';
import { getDb } from '../db';
import { fail, HttpError } from '../errors';
import { nothingToCompute } from '../../audit/audit-input';
import { storedWaveForJob } from './stored-job-wave';
import { doneAuditResult } from './done-audit-results';
import type { AuditJson, EarlyCutListJson } from '../../audit/audit-json';
export { storedWaveForJob } from './stored-job-wave';
import { decodeMatrix } from '../../ingest/matrix-blob';
import type { StudyRow } from '../guard';
import { newId } from '../ids';
import { parseStoredSetup, type WaveRow } from '../waves/stored-wave';
import { auditCancelledReason, auditTimeLimitReason, statusWords } from '../../words';
import { auditSettingsHash, resolveAuditSettings, type AuditSettingsRequest, type ResolvedAuditSettings } from './audit-settings';
import { AuditJobCancelled, AuditJobFailure, AuditWorkerPool } from './worker-pool';
import { spawnAuditWorker } from './worker-entry';
import type { AuditWorkerJob } from './worker-protocol';
import type { AuditStatus, AuditSummary } from '../../api/audits';
export type { AuditStatus, AuditSummary } from '../../api/audits';

/** The reason stored on audits found unfinished when the server starts. */
export const INTERRUPTED_REASON = 'The audit was interrupted by a restart of the server before it finished; retry it.';

/** Progress is written to the database at most this often (and at every change of stage). */
export const PROGRESS_WRITE_INTERVAL_MS = 250;

/** Stored failure reasons are cut to this length. */
const MAX_REASON_LENGTH = 2_000;

/** The statuses an audit can still be cancelled in. */
const ACTIVE_STATUSES = ['queued', 'running'] as const;

/** The statuses an audit ends in without a result: it can be retried (or is queued again when started with the same settings). */
const ENDED_WITHOUT_RESULT: readonly AuditStatus[] = ['failed', 'cancelled'];

/** An audit row as read here (no result text). */
const summaryColumns = {
  id: audits.id,
  waveId: audits.waveId,
  studyId: waves.studyId,
  waveLabel: waves.label,
  status: audits.status,
  stage: audits.stage,
  progress: audits.progress,
  error: audits.error,
  settings: audits.settings,
  timings: audits.timings,
  createdAt: audits.createdAt,
  startedAt: audits.startedAt,
  finishedAt: audits.finishedAt,
};

type SummaryRow = {
  id: string;
  waveId: string;
  studyId: string;
  waveLabel: string;
  status: AuditStatus;
  stage: string | null;
  progress: number;
  error: string | null;
  settings: unknown;
  timings: Record<string, number> | null;
  createdAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
};

function summaryOf(row: SummaryRow, earlyCutList?: EarlyCutListJson): AuditSummary {
  const iso = (date: Date | null) => (date ? date.toISOString() : null);
  return {
    id: row.id,
    waveId: row.waveId,
    studyId: row.studyId,
    waveLabel: row.waveLabel,
    status: row.status,
    stage: row.stage,
    percent: row.status === 'done' ? 100 : row.progress,
    error: row.error,
    settings: row.settings as ResolvedAuditSettings,
    timings: row.timings,
    createdAt: row.createdAt.toISOString(),
    startedAt: iso(row.startedAt),
    finishedAt: iso(row.finishedAt),
    // Only while the bootstrap runs: once the audit ends its JSON (or its failure) says the rest.
    ...(row.status === 'running' && earlyCutList !== undefined ? { earlyCutList } : {}),
  };
}

/**
 * Marks every audit left `queued` or `running` as failed with INTERRUPTED_REASON. Only correct
 * in a process that has not queued any audit itself yet (its own jobs live in its memory).
 * @param db the database.
 * @returns how many audits were marked.
 */
export function recoverInterruptedAudits(db: Db): number {
  const result = db
    .update(audits)
    .set({ status: 'failed', error: INTERRUPTED_REASON, finishedAt: new Date() })
    .where(inArray(audits.status, ['queued', 'running']))
    .run();
  return result.changes;
}

/** What starting an audit did. */
export interface StartedAudit {
  audit: AuditSummary;
  /** True when a stored (or still running) audit with the same settings was returned instead. */
  reused: boolean;
}

/** The audits service of one process. */
export class AuditJobs {
  private readonly db: Db;
  private readonly pool: AuditWorkerPool;
  /** The early cut lists of running audits (held in memory: they mean nothing once the audit ends). */
  private readonly earlyCutLists = new Map<string, EarlyCutListJson>();

  /**
   * @param db the database.
   * @param pool the worker pool that runs the audits.
   */
  constructor(db: Db, pool: AuditWorkerPool) {
    this.db = db;
    this.pool = pool;
  }

  /** The pool's counts (for logs and tests). */
  poolState() {
    return this.pool.state();
  }

  /**
   * Starts an audit of a wave, or returns the audit that already has these settings.
   * @param user who starts it.
   * @param study the wave's study (access checked by the guard).
   * @param wave the wave row.
   * @param request the request's settings (validated by the route's schema).
   * @param options `allowTestFaults` (test servers).
   * @throws {HttpError} 409 `wave-not-confirmed` when the wave's setup is not confirmed (or it has
   *   no stored responses); 400 `invalid-settings`, `unknown-locked-item`, `unknown-predictor`, `unknown-outcome`;
   *   422 `nothing-to-compute` when fewer than two respondents or two varying items are left.
   * @returns the audit and whether it was reused.
   */
  start(user: CurrentUser, study: StudyRow, wave: WaveRow, request: AuditSettingsRequest, options: { allowTestFaults: boolean }): StartedAudit {
    if (wave.status !== 'confirmed' || !wave.matrix) {
      throw fail.conflict(`The wave "${wave.label}" is not confirmed yet: confirm its column setup before running an audit.`, 'wave-not-confirmed');
    }
    const settings = this.checkedAgainstWave(resolveAuditSettings(request, study.settings, options), wave, request.locked !== undefined);
    const nothing = nothingToCompute(decodeMatrix(wave.matrix), { skipRows: wave.exclusions });
    if (nothing) throw new HttpError(422, 'nothing-to-compute', nothing);
    const settingsHash = auditSettingsHash(settings, wave.exclusions);
    const outcome = this.db.transaction((tx) => {
      const existing = tx
        .select({ id: audits.id, status: audits.status })
        .from(audits)
        .where(and(eq(audits.waveId, wave.id), eq(audits.settingsHash, settingsHash)))
        .orderBy(desc(audits.createdAt))
        .all();
      const usable = existing.find((row) => row.status === 'done') ?? existing.find((row) => !ENDED_WITHOUT_RESULT.includes(row.status));
      if (usable) return { id: usable.id, reused: true, queue: false };
      const failed = existing.find((row) => ENDED_WITHOUT_RESULT.includes(row.status));
      if (failed) {
        requeue(tx, failed.id);
        logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'audit.retried', detail: { audit: failed.id, wave: wave.id } });
        return { id: failed.id, reused: false, queue: true };
      }
      const id = newId();
      tx.insert(audits).values({ id, waveId: wave.id, settings, settingsHash, status: 'queued', progress: 0, createdBy: user.id }).run();
      logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'audit.started', detail: { audit: id, wave: wave.id, method: settings.method, bootstrap: settings.bootstrap } });
      return { id, reused: false, queue: true };
    });
    if (outcome.queue) this.enqueue(outcome.id, study.teamId);
    return { audit: this.summary(outcome.id)!, reused: outcome.reused };
  }

  /**
   * Runs a failed or cancelled audit again with its stored settings.
   * @param user who retries.
   * @param study its study.
   * @param auditId the audit.
   * @throws {HttpError} 409 `audit-not-failed` when it is queued, running or done.
   * @returns the audit, queued again.
   */
  retry(user: CurrentUser, study: StudyRow, auditId: string): AuditSummary {
    const queued = this.db.transaction((tx) => {
      const row = tx.select({ status: audits.status, waveId: audits.waveId }).from(audits).where(eq(audits.id, auditId)).get();
      if (!row) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
      if (!ENDED_WITHOUT_RESULT.includes(row.status)) return row.status;
      requeue(tx, auditId);
      logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'audit.retried', detail: { audit: auditId, wave: row.waveId } });
      return null;
    });
    if (queued !== null) throw fail.conflict(`Only a failed or cancelled audit can be retried; this one is ${statusWords[queued]?.toLowerCase() ?? queued}.`, 'audit-not-failed');
    this.enqueue(auditId, study.teamId);
    return this.summary(auditId)!;
  }

  /**
   * Cancels a queued or running audit: it is marked cancelled (with who did it), then a queued one
   * leaves the pool's queue and a running one's worker thread is ended (the pool starts a fresh
   * thread for the next audit). A result that arrives after the mark is not stored.
   * @param user who cancels.
   * @param study its study.
   * @param auditId the audit.
   * @throws {HttpError} 404 `audit-not-found`; 409 `audit-not-active` when it is done, failed or
   *   already cancelled.
   * @returns the cancelled audit.
   */
  cancel(user: CurrentUser, study: StudyRow, auditId: string): AuditSummary {
    const refused = this.db.transaction((tx) => {
      const row = tx.select({ status: audits.status, waveId: audits.waveId }).from(audits).where(eq(audits.id, auditId)).get();
      if (!row) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
      if (!(ACTIVE_STATUSES as readonly AuditStatus[]).includes(row.status)) return row.status;
      tx.update(audits)
        .set({ status: 'cancelled', stage: null, error: auditCancelledReason(user.name), finishedAt: new Date() })
        .where(eq(audits.id, auditId))
        .run();
      logActivity(tx, { teamId: study.teamId, studyId: study.id, userId: user.id, action: 'audit.cancelled', detail: { audit: auditId, wave: row.waveId, was: row.status } });
      return null;
    });
    if (refused !== null) {
      throw fail.conflict(`Only a queued or running audit can be cancelled; this one is ${statusWords[refused]?.toLowerCase() ?? refused}.`, 'audit-not-active');
    }
    // The row says cancelled before the pool lets go, so neither a late result nor the pool's
    // rejection (both written only while queued or running) overwrites it.
    this.pool.cancel(auditId, 'cancelled');
    return this.summary(auditId)!;
  }

  /**
   * One audit's summary.
   * @param auditId the audit.
   * @returns the summary, or null when there is no such audit.
   */
  summary(auditId: string): AuditSummary | null {
    const row = this.summaryQuery().where(eq(audits.id, auditId)).get();
    return row ? summaryOf(row as SummaryRow, this.earlyCutLists.get(auditId)) : null;
  }

  /**
   * The stored audit JSON text of a finished audit.
   * @param auditId the audit.
   * @returns the text, or null when it has none (not done, or no such audit).
   */
  resultText(auditId: string): string | null {
    return this.db.select({ result: audits.result }).from(audits).where(and(eq(audits.id, auditId), eq(audits.status, 'done'))).get()?.result ?? null;
  }

  /**
   * The parsed result of a finished audit, shared and frozen (read and parsed once per process:
   * done-audit-results.ts).
   * @param auditId the audit.
   * @returns the result, or null when it has none (not done, or no such audit).
   */
  result(auditId: string): AuditJson | null {
    return doneAuditResult(this.db, auditId);
  }

  /**
   * The audits of a wave, newest first.
   * @param waveId the wave.
   * @returns their summaries.
   */
  listForWave(waveId: string): AuditSummary[] {
    return this.summariesWhere(eq(audits.waveId, waveId));
  }

  /**
   * The audits of every wave of a study, newest first.
   * @param studyId the study.
   * @returns their summaries.
   */
  listForStudy(studyId: string): AuditSummary[] {
    return this.summariesWhere(eq(waves.studyId, studyId));
  }

  /** The summary columns of audits joined to their waves, for a `where` to narrow. */
  private summaryQuery() {
    return this.db.select(summaryColumns).from(audits).innerJoin(waves, eq(waves.id, audits.waveId));
  }

  /** The summaries of the audits matching a condition on the audit or its wave, newest first. */
  private summariesWhere(condition: SQL): AuditSummary[] {
    return this.summaryQuery()
      .where(condition)
      .orderBy(desc(audits.createdAt))
      .all()
      .map((row) => summaryOf(row as SummaryRow, this.earlyCutLists.get(row.id)));
  }

  /**
   * Checks the locked items, the driver model's predictors and the outcome against the wave.
   * Locked items the request names must be items of the wave; the study's own locked items may
   * name items of other waves and are kept only where this wave has them. Predictors must be items
   * of the wave (refused here, not when the audit runs). The outcome may be named by id or column
   * header.
   */
  private checkedAgainstWave(settings: ResolvedAuditSettings, wave: WaveRow, lockedFromRequest: boolean): ResolvedAuditSettings {
    const itemIds = new Set(this.db.select({ id: waveItems.itemId }).from(waveItems).where(eq(waveItems.waveId, wave.id)).all().map((row) => row.id));
    let locked = settings.locked;
    const unknown = locked.filter((id) => !itemIds.has(id));
    if (unknown.length > 0) {
      if (lockedFromRequest) {
        throw fail.badRequest(
          `settings.locked: ${unknown.join(', ')} ${unknown.length > 1 ? 'are not items' : 'is not an item'} of this wave; lock items by their id as listed in the column setup.`,
          'unknown-locked-item',
        );
      }
      locked = locked.filter((id) => itemIds.has(id));
    }
    const unknownPredictors = settings.predictors.filter((id) => !itemIds.has(id));
    if (unknownPredictors.length > 0) {
      const shown = unknownPredictors.length > 10 ? `${unknownPredictors.slice(0, 10).join(', ')} and ${unknownPredictors.length - 10} more` : unknownPredictors.join(', ');
      throw fail.badRequest(
        `settings.predictors: ${shown} ${unknownPredictors.length > 1 ? 'are not items' : 'is not an item'} of this wave; name the driver model's predictors by their item ids as listed in the column setup.`,
        'unknown-predictor',
      );
    }
    let outcome = settings.outcome;
    if (outcome !== null) {
      const outcomes = parseStoredSetup(wave.setup, wave.rowCount).outcomes ?? [];
      const found = outcomes.find((entry) => entry.id === outcome || entry.header === outcome);
      if (!found) {
        const names = outcomes.map((entry) => entry.id);
        throw fail.badRequest(
          `settings.outcome: "${outcome}" is not an outcome column of this wave${names.length ? ` (outcomes: ${names.join(', ')})` : ' (it has none)'}.`,
          'unknown-outcome',
        );
      }
      outcome = found.id;
    }
    return Object.freeze({ ...settings, locked, outcome });
  }

  /** Hands an audit to the pool (in its team's share) and records what happens to it. */
  private enqueue(auditId: string, teamId: string): void {
    const queuedAt = Date.now();
    let startedAt = queuedAt;
    let lastStage: string | null = null;
    let lastPercent = -1;
    let lastWrite = 0;
    const db = this.db;
    const whileRunning = and(eq(audits.id, auditId), eq(audits.status, 'running'));
    this.pool
      .run({
        key: auditId,
        group: teamId,
        prepare: () => this.jobFor(auditId),
        onStart: () => {
          startedAt = Date.now();
          db.update(audits)
            .set({ status: 'running', stage: 'loading', progress: 0, startedAt: new Date(startedAt) })
            .where(and(eq(audits.id, auditId), eq(audits.status, 'queued')))
            .run();
        },
        onProgress: (stage, fraction) => {
          const percent = Math.max(0, Math.min(99, Math.floor(fraction * 100)));
          const now = Date.now();
          if (stage === lastStage && (percent === lastPercent || now - lastWrite < PROGRESS_WRITE_INTERVAL_MS)) return;
          lastStage = stage;
          lastPercent = percent;
          lastWrite = now;
          db.update(audits).set({ stage, progress: percent }).where(whileRunning).run();
        },
        onCutList: (cutList) => {
          this.earlyCutLists.set(auditId, cutList);
        },
      })
      .finally(() => this.earlyCutLists.delete(auditId))
      .then((result) => {
        if (result === null) return;
        const finished = Date.now();
        const timings = { ...result.timings, queuedMs: startedAt - queuedAt, totalMs: finished - queuedAt };
        db.update(audits)
          .set({ status: 'done', stage: null, progress: 100, result: result.resultText, error: null, timings, finishedAt: new Date(finished) })
          .where(whileRunning)
          .run();
      })
      .catch((error: unknown) => {
        // Cancelled: `cancel` has written the row already.
        if (error instanceof AuditJobCancelled) return;
        const message = error instanceof AuditJobFailure ? error.message : `The audit could not run: ${error instanceof Error ? error.message : String(error)}`;
        if (!(error instanceof AuditJobFailure)) console.error(`[paredown] audit ${auditId} could not run:`, error);
        const finished = Date.now();
        db.update(audits)
          .set({
            status: 'failed',
            error: message.slice(0, MAX_REASON_LENGTH),
            finishedAt: new Date(finished),
            timings: { queuedMs: startedAt - queuedAt, totalMs: finished - queuedAt },
          })
          .where(and(eq(audits.id, auditId), inArray(audits.status, ['queued', 'running'])))
          .run();
      });
  }

  /** The job of a queued audit, read when a thread is free; null when it is gone or no longer queued. */
  private jobFor(auditId: string): AuditWorkerJob | null {
    const audit = this.db.select({ waveId: audits.waveId, status: audits.status, settings: audits.settings, settingsHash: audits.settingsHash }).from(audits).where(eq(audits.id, auditId)).get();
    if (!audit || audit.status !== 'queued') return null;
    const wave = this.db.select().from(waves).where(eq(waves.id, audit.waveId)).get();
    if (!wave?.matrix) throw new AuditJobFailure('The wave has no stored responses to audit.');
    const settings = audit.settings as ResolvedAuditSettings;
    if (auditSettingsHash(settings, wave.exclusions) !== audit.settingsHash) {
      throw new AuditJobFailure("The wave's excluded respondents changed after this audit was queued; start the audit again.");
    }
    return { jobId: auditId, wave: storedWaveForJob(this.db, wave, wave.matrix, settings.outcome), settings, resampleThreads: getConfig().resampleThreads };
  }
}

/** Puts a failed audit back in the queue, clearing what the failed run left. */
function requeue(tx: Pick<Db, 'update'>, auditId: string): void {
  tx.update(audits)
    .set({ status: 'queued', stage: null, progress: 0, result: null, error: null, timings: null, startedAt: null, finishedAt: null })
    .where(eq(audits.id, auditId))
    .run();
}

const INSTANCE = Symbol.for('paredown.auditJobs');

/**
 * Starts the audits service of this process, once: the restart recovery runs first (audits an
 * earlier process left queued or running are marked failed), then the pool is made (its threads
 * start with the first audit). The middleware calls it on the first request, since Astro's
 * standalone server has no start-up hook; later calls return the running service. This is the
 * only place the recovery writes: reading audits never does (docs/decisions/008).
 * @throws {Error} when the configuration is invalid (AUDIT_WORKERS among others; see parseConfig).
 * @returns the service.
 */
export function startAuditJobs(): AuditJobs {
  const holder = globalThis as unknown as Record<symbol, AuditJobs | undefined>;
  let instance = holder[INSTANCE];
  if (!instance) {
    const db = getDb();
    const config = getConfig();
    const recovered = recoverInterruptedAudits(db);
    if (recovered > 0) console.log(`[paredown] ${recovered} audit${recovered === 1 ? '' : 's'} left unfinished by an earlier run marked failed (interrupted by a restart).`);
    const pool = new AuditWorkerPool(config.auditWorkers, () => spawnAuditWorker(), {
      perGroup: config.auditWorkersPerTeam,
      maxRunMs: config.auditMaxSeconds * 1000,
      overTime: auditTimeLimitReason,
    });
    instance = new AuditJobs(db, pool);
    holder[INSTANCE] = instance;
  }
  return instance;
}

/**
 * The running audits service of this process. Has no side effect: it never creates the service
 * or runs the restart recovery (that is {@link startAuditJobs}, called by the middleware).
 * @throws {Error} when the service was not started (a code path that skipped the middleware).
 * @returns the service.
 */
export function auditJobs(): AuditJobs {
  const instance = (globalThis as unknown as Record<symbol, AuditJobs | undefined>)[INSTANCE];
  if (!instance) throw new Error('The audits service has not been started: the middleware calls startAuditJobs() on the first request (src/middleware.ts).');
  return instance;
}
