/**
 * The settings of one audit on the server: the study's constraints as the base of a request,
 * and the reuse key.
 *
 * The settings themselves (names, ranges, defaults, the request schema, the one stored shape)
 * come from the settings table, src/lib/audit/settings-table.ts and settings-schema.ts
 * (docs/decisions/006). A request names any subset of them; what it leaves out comes first from
 * the study's own settings (`studies.settings`: locked items, minimum items per scale, alpha
 * floor, maximum alpha drop, cut cap, minutes per item), then from the table's defaults. The
 * resolved settings are complete, so the same audit can be run again exactly; their hash, with a
 * digest of the wave's exclusions (the one part of a confirmed wave that may still change),
 * decides whether a stored result is reused.
 */
import { AUDIT_SCHEMA } from '../../audit/audit-json';
import {
  AuditSettingsError,
  resolveAuditSettings as resolveFromTable,
  type AuditSettingsRequest,
  type ResolvedAuditSettings,
} from '../../audit/settings-table';
import type { StudySettings } from '../../../db/schema';
import { HttpError } from '../errors';
import { sha256Hex } from '../ids';

export { auditRequestSchema } from '../../audit/settings-schema';
export { DEFAULT_PARALLEL_ITERATIONS, MAX_BOOTSTRAP, testFaults } from '../../audit/settings-table';
export type { AuditSettingsRequest, ResolvedAuditSettings, TestFault } from '../../audit/settings-table';

/**
 * The settings an audit of this study takes when the request says nothing: the study's
 * constraints over the engine's defaults.
 * @param study the study's stored settings.
 * @returns the settings the study implies (checked when resolved).
 */
export function studyDefaults(study: StudySettings): AuditSettingsRequest & { locked: string[] } {
  const defaults: { -readonly [Key in keyof AuditSettingsRequest]: AuditSettingsRequest[Key] } = {};
  if (typeof study.minItemsPerScale === 'number') defaults.minItemsPerScale = study.minItemsPerScale;
  if (typeof study.alphaFloor === 'number') defaults.alphaFloor = study.alphaFloor;
  if (typeof study.maxAlphaDrop === 'number') defaults.maxAlphaDrop = study.maxAlphaDrop;
  if (typeof study.maxCutShare === 'number') defaults.maxCutShare = study.maxCutShare;
  if (typeof study.minutesPerItem === 'number' && study.minutesPerItem > 0) defaults.secondsPerItem = Math.round(study.minutesPerItem * 60 * 1000) / 1000;
  return { ...defaults, locked: Array.isArray(study.lockedItems) ? [...study.lockedItems] : [] };
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
  try {
    return resolveFromTable(request, studyDefaults(study), options);
  } catch (error) {
    if (error instanceof AuditSettingsError) throw new HttpError(400, 'invalid-settings', `settings: ${error.message}`);
    throw error;
  }
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
