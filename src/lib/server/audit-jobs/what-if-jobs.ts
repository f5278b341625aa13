/**
 * The what-if service of the main thread: reads a finished audit's stored wave and settings and
 * hands the designer's removed items to the what-if worker thread (one thread, the audit pool's
 * class and protocol, started on first use and kept; an idle thread does not keep the process
 * alive). The request thread never computes: it only reads rows and waits for the answer.
 * docs/decisions/011-decisions-and-what-if.md.
 */
import { storedWaveForJob } from './audit-jobs';
import { eq } from 'drizzle-orm';
import { audits, waves } from '../../../db/schema';
import type { Db } from '../../../db/client';
import type { WhatIfResponse } from '../../api/cut-list';
import type { AuditJson } from '../../audit/audit-json';
import { getDb } from '../db';
import { fail, HttpError } from '../errors';
import { auditSettingsHash, type ResolvedAuditSettings } from './audit-settings';
import type { WhatIfJob } from './what-if-compute';
import { AuditJobFailure, AuditWorkerPool } from './worker-pool';
import { locateAuditWorker, spawnAuditWorker, WHAT_IF_WORKER_FILES } from './worker-entry';

/** What-if requests waiting for the thread beyond which new ones are refused (503) rather than queued. */
export const WHAT_IF_QUEUE_LIMIT = 32;

let nextJob = 1;

/** The what-if service of one process. */
export class WhatIfJobs {
  private readonly db: Db;
  private readonly pool: AuditWorkerPool<WhatIfJob>;

  constructor(db: Db, pool: AuditWorkerPool<WhatIfJob>) {
    this.db = db;
    this.pool = pool;
  }

  /**
   * The what-if of removing the given items from a finished audit's item set.
   * @param auditId the audit (access checked by the route).
   * @param removed item ids to remove.
   * @throws {HttpError} 409 `audit-not-done`, `exclusions-changed`; 400 `unknown-item`,
   *   `repeated-item`; 503 `what-if-busy` when too many are waiting.
   * @returns the figures.
   */
  async compute(auditId: string, removed: readonly string[]): Promise<WhatIfResponse> {
    const audit = this.db
      .select({ status: audits.status, waveId: audits.waveId, settings: audits.settings, settingsHash: audits.settingsHash, result: audits.result })
      .from(audits)
      .where(eq(audits.id, auditId))
      .get();
    if (!audit) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
    if (audit.status !== 'done' || !audit.result) throw fail.conflict(`The audit is ${audit.status}; a what-if needs a finished audit.`, 'audit-not-done');
    const itemIds = (JSON.parse(audit.result) as Pick<AuditJson, 'items'>).items.map((item) => item.id);
    const known = new Set(itemIds);
    const unknown = removed.filter((id) => !known.has(id));
    if (unknown.length > 0) throw fail.badRequest(`removed: ${unknown.slice(0, 5).join(', ')} ${unknown.length === 1 ? 'is not an item' : 'are not items'} of this audit.`, 'unknown-item');
    if (new Set(removed).size !== removed.length) throw fail.badRequest('removed: an item is listed twice; list each item once.', 'repeated-item');
    if (this.pool.state().queued >= WHAT_IF_QUEUE_LIMIT) {
      throw new HttpError(503, 'what-if-busy', 'Too many what-if requests are waiting; try again in a moment.', { 'Retry-After': '1' });
    }
    const settings = audit.settings as ResolvedAuditSettings;
    let result;
    try {
      result = await this.pool.run({ prepare: () => this.jobFor(auditId, audit.waveId, settings, audit.settingsHash, removed) });
    } catch (error) {
      if (error instanceof HttpError) throw error;
      if (error instanceof AuditJobFailure) throw new Error(`what-if failed: ${error.message}`);
      throw error;
    }
    if (!result) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
    return JSON.parse(result.resultText) as WhatIfResponse;
  }

  /** The job: the stored wave as the audit read it, checked to be unchanged. */
  private jobFor(auditId: string, waveId: string, settings: ResolvedAuditSettings, settingsHash: string, removed: readonly string[]): WhatIfJob | null {
    const wave = this.db.select().from(waves).where(eq(waves.id, waveId)).get();
    if (!wave?.matrix) return null;
    if (auditSettingsHash(settings, wave.exclusions) !== settingsHash) {
      throw fail.conflict("The wave's excluded respondents changed after this audit ran, so its what-if would not match it; run a new audit.", 'exclusions-changed');
    }
    return {
      jobId: `what-if-${auditId}-${nextJob++}`,
      key: `${auditId}:${settingsHash}`,
      auditId,
      wave: storedWaveForJob(this.db, wave, wave.matrix, settings.outcome),
      settings,
      removed: [...removed],
    };
  }
}

const INSTANCE = Symbol.for('paredown.whatIfJobs');

/**
 * The what-if service of this process, created on first use (its thread starts with the first request).
 * @returns the service.
 */
export function whatIfJobs(): WhatIfJobs {
  const holder = globalThis as unknown as Record<symbol, WhatIfJobs | undefined>;
  let instance = holder[INSTANCE];
  if (!instance) {
    instance = new WhatIfJobs(getDb(), new AuditWorkerPool<WhatIfJob>(1, () => spawnAuditWorker(locateAuditWorker(import.meta.url, WHAT_IF_WORKER_FILES), 'paredown-what-if')));
    holder[INSTANCE] = instance;
  }
  return instance;
}
