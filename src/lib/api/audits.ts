/**
 * Contracts of the audit routes: start and list (POST/GET /api/waves/{id}/audits), one audit
 * (GET /api/audits/{id}, `?download=1` for the JSON alone), retry (POST /api/audits/{id}/retry)
 * and cancel (POST /api/audits/{id}/cancel).
 *
 * The settings request and the stored settings are defined by the settings table
 * (src/lib/audit/settings-table.ts, docs/decisions/006): this file re-exports their types and
 * ./schemas/audits.ts the schema, so routes, islands and tests name one place.
 */
import type { AuditJson, EarlyCutListJson } from '../audit/audit-json';
import type { EngineSettings } from '../engine/engine-settings';
import { callApi, segment, type ApiResult } from './client';
import type { WaveSummary } from './waves';

// Types only (erased from the browser's bundle); the schema itself: ./schemas/audits.ts.
import type { AuditSettingsRequest, ResolvedAuditSettings } from '../audit/settings-table';
export type { AuditSettingsRequest, ResolvedAuditSettings };

/**
 * The states of an audit, in the order it passes them (failed or cancelled may follow queued or
 * running; a failed or cancelled audit can be retried, which queues it again).
 */
export const auditStatuses = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;
export type AuditStatus = (typeof auditStatuses)[number];

/** An audit as the API and pages show it (without its result). */
export interface AuditSummary {
  id: string;
  waveId: string;
  studyId: string;
  waveLabel: string;
  status: AuditStatus;
  /** The stage running now (`loading`, `evidence`, `structure`, `engine`, `outcome`, `saving`), or null. */
  stage: string | null;
  /** 0-100; 100 once done. */
  percent: number;
  /** Why it failed (or who cancelled it), when it failed or was cancelled. */
  error: string | null;
  settings: ResolvedAuditSettings;
  /** Milliseconds per stage, once it ended. */
  timings: Record<string, number> | null;
  /**
   * While it runs its bootstrap: the recommendations already made, stability still null
   * (`EarlyCutListJson`). Absent otherwise.
   */
  earlyCutList?: EarlyCutListJson;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

/** One wave, ready for the form that starts an audit (aggregates only). */
export interface AuditFormWave {
  id: string;
  label: string;
  status: WaveSummary['status'];
  respondents: number;
  excluded: number;
  items: { id: string; scale: string | null; text: string | null }[];
  outcomes: { id: string; header: string }[];
  /** The settings of an audit started without changes (study constraints over engine defaults). */
  defaults: ResolvedAuditSettings;
}

/** The engine's own defaults, shown beside each field of the form. */
export type EngineDefaults = EngineSettings;

/** Body of POST /api/waves/{id}/audits. */
export interface StartAuditRequest {
  settings?: AuditSettingsRequest;
}

/** POST /api/waves/{id}/audits: 202 with the queued audit, or 200 with `reused: true`. */
export interface StartAuditResponse {
  audit: AuditSummary;
  reused: boolean;
}

/** GET /api/waves/{id}/audits: the wave's audits, newest first, and what the form needs. */
export interface WaveAuditsResponse {
  wave: AuditFormWave;
  audits: AuditSummary[];
}

/** GET /api/audits/{id}: the audit and, once done, its JSON (audit-json.md). */
export interface AuditResponse {
  audit: AuditSummary;
  result: AuditJson | null;
}

/** POST /api/audits/{id}/retry: 202 with the audit queued again. */
export interface RetryAuditResponse {
  audit: AuditSummary;
}

/** POST /api/audits/{id}/cancel: 200 with the audit, now cancelled. */
export interface CancelAuditResponse {
  audit: AuditSummary;
}

/** The typed calls of this domain. */
export const auditsApi = {
  start: (waveId: string, body: StartAuditRequest): Promise<ApiResult<StartAuditResponse>> => callApi('POST', `/api/waves/${segment(waveId)}/audits`, body),
  listForWave: (waveId: string): Promise<ApiResult<WaveAuditsResponse>> => callApi('GET', `/api/waves/${segment(waveId)}/audits`),
  get: (auditId: string): Promise<ApiResult<AuditResponse>> => callApi('GET', `/api/audits/${segment(auditId)}`),
  retry: (auditId: string): Promise<ApiResult<RetryAuditResponse>> => callApi('POST', `/api/audits/${segment(auditId)}/retry`),
  cancel: (auditId: string): Promise<ApiResult<CancelAuditResponse>> => callApi('POST', `/api/audits/${segment(auditId)}/cancel`),
};
