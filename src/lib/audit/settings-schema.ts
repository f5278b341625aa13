/**
 * The strict request schema of an audit's settings, generated from the settings table
 * (settings-table.ts): the API's `POST /api/waves/{id}/audits` body and the command line's flags
 * and `--settings FILE.json` are checked by it alike. Unknown keys are refused with one sentence
 * naming the closest known setting; values outside their range with one sentence naming the range.
 * docs/decisions/006-settings-table-and-words.md.
 */
import { z } from 'zod';
import { auditSettingsProblems, type AuditSettingsRequest } from './settings-table';

/** Any subset of the audit settings, checked against the table. */
export const auditSettingsSchema = z
  .unknown()
  .superRefine((value, context) => {
    for (const message of auditSettingsProblems(value)) context.addIssue({ code: 'custom', message });
  })
  .transform((value) => value as AuditSettingsRequest);

/**
 * The body of POST /api/waves/{id}/audits: `{ "settings": { ... } }`, every key optional.
 * Unknown keys are refused (a misspelt threshold must not silently take its default).
 */
export const auditRequestSchema = z.strictObject({ settings: auditSettingsSchema.default({}) });
