/**
 * The settings of one audit as the API receives them, and their resolved, canonical form.
 *
 * A request names any subset of the engine's settings (src/lib/engine/engine-settings.ts, by
 * their names there), the outcome column, the locked items and the parallel-analysis size. What
 * it leaves out comes first from the study's own settings (`studies.settings`: locked items,
 * minimum items per scale, alpha floor, maximum alpha drop, cut cap, minutes per item), then from
 * the engine's stated defaults. The resolved settings are complete, so the same audit can be run
 * again exactly; their hash, with a digest of the wave's exclusions (the one part of a confirmed
 * wave that may still change), decides whether a stored result is reused.
 */
import { z } from 'zod';
import { AUDIT_SCHEMA } from '../../audit/audit-json';
import { DEFAULT_ENGINE_SETTINGS, resolveEngineSettings, type EngineSettings } from '../../engine/engine-settings';
import type { StudySettings } from '../../../db/schema';
import { HttpError } from '../errors';
import { sha256Hex } from '../ids';

/** Random data sets of parallel analysis when the request does not say (runAudit's default). */
export const DEFAULT_PARALLEL_ITERATIONS = 100;

/** The most bootstrap resamples one audit may ask for (about 10 minutes of polychoric work here). */
export const MAX_BOOTSTRAP = 10_000;

/** Faults a test server (PAREDOWN_MODE=test) may inject into an audit, to test failure handling. */
export const testFaults = ['throw', 'crash'] as const;
export type TestFault = (typeof testFaults)[number];

const share = z.number().min(0).max(1);

/**
 * The body of POST /api/waves/{id}/audits: `{ "settings": { ... } }`, every key optional.
 * Unknown keys are refused (a misspelt threshold must not silently take its default).
 */
export const auditRequestSchema = z
  .object({
    settings: z
      .object({
        method: z.enum(['pearson', 'spearman', 'polychoric']).optional(),
        missing: z.enum(['pairwise', 'listwise']).optional(),
        outcome: z.string().min(1).max(200).nullable().optional(),
        bootstrap: z.number().int().min(0).max(MAX_BOOTSTRAP).optional(),
        seed: z.number().int().min(-(2 ** 31)).max(2 ** 31 - 1).optional(),
        locked: z.array(z.string().min(1).max(200)).max(5_000).optional(),
        parallelIterations: z.number().int().min(10).max(1_000).optional(),
        strongPairThreshold: share.optional(),
        conditionIndexThreshold: z.number().min(1).max(1e6).optional(),
        varianceProportionThreshold: share.optional(),
        dependencyVifThreshold: z.number().min(1).max(1e6).optional(),
        mergeCorrelation: share.optional(),
        mergeWordingSimilarity: share.optional(),
        rewordWordingSimilarity: share.optional(),
        minItemsPerScale: z.number().int().min(1).max(1_000).optional(),
        alphaFloor: share.optional(),
        maxAlphaDrop: share.optional(),
        maxCutShare: share.optional(),
        secondsPerItem: z.number().positive().max(3_600).optional(),
        stabilityThreshold: share.optional(),
        confidenceLevel: z.number().gt(0).lt(1).optional(),
        testFault: z.enum(testFaults).optional(),
      })
      .strict()
      .default({}),
  })
  .strict();

/** The settings part of a request. */
export type AuditSettingsRequest = z.infer<typeof auditRequestSchema>['settings'];

/** Complete settings of one audit: what is stored with it and handed to runAudit. */
export interface ResolvedAuditSettings extends EngineSettings {
  /** Outcome column id, or null for no outcome model. */
  readonly outcome: string | null;
  /** Item ids the designer locked, sorted, without repeats. */
  readonly locked: readonly string[];
  readonly parallelIterations: number;
  /** Test servers only: a fault to inject. Absent otherwise. */
  readonly testFault?: TestFault;
}

/**
 * The settings an audit of this study takes when the request says nothing: the study's
 * constraints over the engine's defaults.
 * @param study the study's stored settings.
 * @returns the engine settings the study implies (not yet checked).
 */
export function studyDefaults(study: StudySettings): Partial<EngineSettings> & { locked: string[] } {
  const defaults: Partial<Record<keyof EngineSettings, number>> = {};
  if (typeof study.minItemsPerScale === 'number') defaults.minItemsPerScale = study.minItemsPerScale;
  if (typeof study.alphaFloor === 'number') defaults.alphaFloor = study.alphaFloor;
  if (typeof study.maxAlphaDrop === 'number') defaults.maxAlphaDrop = study.maxAlphaDrop;
  if (typeof study.maxCutShare === 'number') defaults.maxCutShare = study.maxCutShare;
  if (typeof study.minutesPerItem === 'number' && study.minutesPerItem > 0) defaults.secondsPerItem = Math.round(study.minutesPerItem * 60 * 1000) / 1000;
  return { ...(defaults as Partial<EngineSettings>), locked: Array.isArray(study.lockedItems) ? [...study.lockedItems] : [] };
}

/**
 * Resolves a request's settings against the study and the engine's defaults, and checks them.
 * @param request the validated `settings` of the request body.
 * @param study the study's stored settings (its constraints and locked items).
 * @param options `allowTestFaults`: whether `testFault` is accepted (test servers only).
 * @throws {HttpError} 400 `invalid-settings` when a value is out of range for the engine (the
 *   message names the setting), or `testFault` is sent to a server that is not in test mode.
 * @returns complete, frozen settings.
 * References: docs/decisions/003-redundancy-engine.md (the defaults and house figures).
 */
export function resolveAuditSettings(
  request: AuditSettingsRequest,
  study: StudySettings,
  options: { allowTestFaults: boolean },
): ResolvedAuditSettings {
  const { outcome = null, locked, parallelIterations = DEFAULT_PARALLEL_ITERATIONS, testFault, ...engineOverrides } = request;
  if (testFault !== undefined && !options.allowTestFaults) {
    throw new HttpError(400, 'invalid-settings', 'settings: testFault is only accepted by a test server.');
  }
  const { locked: studyLocked, ...fromStudy } = studyDefaults(study);
  let engine: EngineSettings;
  try {
    engine = resolveEngineSettings({ ...fromStudy, ...engineOverrides });
  } catch (error) {
    if (error instanceof RangeError) {
      throw new HttpError(400, 'invalid-settings', `settings: ${error.message.replace(/^resolveEngineSettings: /, '')}.`);
    }
    throw error;
  }
  const resolved: ResolvedAuditSettings = {
    ...engine,
    outcome,
    locked: [...new Set(locked ?? studyLocked)].sort(),
    parallelIterations,
    ...(testFault === undefined ? {} : { testFault }),
  };
  return Object.freeze(resolved);
}

/**
 * The settings a form shows before the designer changes anything.
 * @param study the study's stored settings.
 * @returns resolved settings (no outcome; the study's locked items).
 */
export function defaultAuditSettings(study: StudySettings): ResolvedAuditSettings {
  return resolveAuditSettings({}, study, { allowTestFaults: false });
}

/** JSON with object keys sorted at every level: one text per value, whatever the key order. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

/**
 * The key under which a stored result is reused: sha256 over the audit schema version, the
 * resolved settings and the wave's exclusions (sorted), in canonical JSON.
 * @param settings resolved settings.
 * @param exclusions the wave's excluded respondent rows at the time of the audit.
 * @returns 64 hex characters.
 */
export function auditSettingsHash(settings: ResolvedAuditSettings, exclusions: readonly number[]): string {
  const input = { schema: AUDIT_SCHEMA, settings, exclusions: [...exclusions].sort((a, b) => a - b) };
  return sha256Hex(canonicalJson(input));
}

/** The engine's own defaults, for showing beside each field (no study constraints applied). */
export const engineDefaults: EngineSettings = DEFAULT_ENGINE_SETTINGS;
