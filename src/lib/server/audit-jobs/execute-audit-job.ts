/**
 * One audit job from stored data to the audit JSON text: decode the stored matrix, build the
 * audit input with its setup (`auditInputFromJobWave`, through the command line's `auditInputFromSetup`), run the audit (`runAudit`), serialise. Runs inside an audit
 * worker thread (audit-worker.ts) and, in tests, on the calling thread; it touches no database,
 * so the main thread alone writes the audits table.
 */
import type { AuditJson, EarlyCutListJson } from '../../audit/audit-json';
import { createResampleThreadRunner } from '../../audit/resample-threads';
import { runAudit } from '../../audit/run-audit';
import { auditInputFromJobWave } from './job-input';
import type { AuditWorkerJob, StageTimings } from './worker-protocol';

/** The stages an audit reports, in order: ours around runAudit's own four. */
export const AUDIT_STAGES = ['loading', 'evidence', 'structure', 'engine', 'outcome', 'saving'] as const;

/** Where in the overall bar each of our own stages sits (runAudit's run from 0.02 to 0.98). */
const LOADING_SHARE = 0.02;
const RUN_SHARE = 0.96;

/** The audit JSON as text, and how long each stage took. */
export interface AuditJobResult {
  readonly resultText: string;
  readonly timings: StageTimings;
}

/** Called with a stage name and the overall share done (0 to 1). */
export type JobProgress = (stage: string, fraction: number) => void;

/** Called once with the early cut list, when a bootstrap is about to check it. */
export type JobCutList = (cutList: EarlyCutListJson) => void;

/**
 * Paths of numbers that JSON cannot hold (NaN, ±Infinity) inside a value.
 * @param value any plain value.
 * @param limit stop after this many.
 * @returns paths such as `items[3].vif`.
 */
export function nonFinitePaths(value: unknown, limit = 20): string[] {
  const found: string[] = [];
  const visit = (node: unknown, path: string): void => {
    if (found.length >= limit) return;
    if (typeof node === 'number') {
      if (!Number.isFinite(node)) found.push(path || '(root)');
    } else if (Array.isArray(node)) {
      node.forEach((entry, index) => visit(entry, `${path}[${index}]`));
    } else if (node !== null && typeof node === 'object') {
      for (const [key, entry] of Object.entries(node)) visit(entry, path ? `${path}.${key}` : key);
    }
  };
  visit(value, '');
  return found;
}

/**
 * Serialises an audit. JSON turns NaN and infinities into null silently; audit-json.md wants a
 * warning beside every null, so any such number found is named in a `non-finite-value` warning.
 * @param audit the audit JSON object (its warnings array may be extended).
 * @returns the text.
 */
export function serialiseAudit(audit: AuditJson): string {
  const paths = nonFinitePaths(audit);
  if (paths.length > 0) {
    audit.warnings.push({
      code: 'non-finite-value',
      items: [],
      message: `Some figures could not be expressed as numbers and are shown as null: ${paths.join(', ')}.`,
    });
  }
  return JSON.stringify(audit);
}

/**
 * Runs one audit job.
 * @param job the stored wave and the resolved settings.
 * @param onProgress stage and overall share done.
 * @param signal aborts between bootstrap resamples.
 * @param onCutList hears the early cut list; the time it came (from the job's start) is kept as
 *   the `cutListAtMs` timing.
 * @throws {Error} whatever the audit throws (a bad setting, an outcome or locked item the wave
 *   does not have, an injected test fault): the caller stores it as the failure's reason.
 * @returns the audit JSON text and the time spent per stage.
 * References: ../shared/docs/audit-json.md (the result), src/lib/audit/run-audit.ts.
 */
export async function executeAuditJob(job: AuditWorkerJob, onProgress: JobProgress, signal?: AbortSignal, onCutList?: JobCutList): Promise<AuditJobResult> {
  const timings: StageTimings = {};
  const started = performance.now();
  let stage = 'loading';
  let stageStarted = started;
  const enter = (next: string): void => {
    if (next === stage) return;
    const now = performance.now();
    timings[`${stage}Ms`] = Math.round((timings[`${stage}Ms`] ?? 0) + (now - stageStarted));
    stage = next;
    stageStarted = now;
  };

  onProgress('loading', 0);
  const { settings, wave } = job;
  const input = auditInputFromJobWave(wave, { outcome: settings.outcome, locked: settings.locked });
  const testFault = settings.testFault;
  onProgress('loading', LOADING_SHARE);

  const audit = await runAudit(
    input,
    settings,
    (runStage, fraction) => {
      enter(runStage);
      if (testFault === 'throw' && runStage === 'engine') {
        throw new Error('An injected test fault made the audit throw in its engine stage (settings.testFault = "throw").');
      }
      onProgress(runStage, LOADING_SHARE + RUN_SHARE * fraction);
    },
    signal,
    // Threads only when there are resamples to decide; each audit gets its own, ended with it.
    (job.resampleThreads ?? 0) > 0 && settings.bootstrap > 0 ? createResampleThreadRunner(job.resampleThreads as number) : undefined,
    onCutList === undefined
      ? undefined
      : (cutList) => {
          timings.cutListAtMs = Math.round(performance.now() - started);
          onCutList(cutList);
        },
  );

  enter('saving');
  onProgress('saving', LOADING_SHARE + RUN_SHARE);
  const resultText = serialiseAudit(audit);
  enter('done');
  timings.runMs = Math.round(performance.now() - started);
  return { resultText, timings };
}
