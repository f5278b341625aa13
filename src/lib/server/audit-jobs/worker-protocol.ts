/**
 * The messages between the server's main thread and an audit worker thread. The worker gets
 * one job at a time: the wave as stored (matrix blob, items, exclusions, the one outcome the
 * settings name) and the resolved settings; it answers with progress (and, before a bootstrap,
 * the early cut list), then either the audit JSON as text or the reason it failed. Plain data only (structured clone).
 */
import type { AuditSetup } from '../../audit/audit-input';
import type { EarlyCutListJson } from '../../audit/audit-json';
import type { ResolvedAuditSettings } from './audit-settings';

/** An item of the stored wave, as the audit reads it. */
export interface JobItem {
  readonly id: string;
  readonly scale: string | null;
  readonly reverse: boolean;
  readonly min: number;
  readonly max: number;
  readonly text: string | null;
}

/** An outcome column of the stored wave: one value per respondent, null where missing. */
export interface JobOutcome {
  readonly id: string;
  readonly header: string;
  readonly values: readonly (number | null)[];
}

/** What one audit job carries into the worker. */
export interface AuditWorkerJob {
  readonly jobId: string;
  readonly wave: {
    /** The recoded matrix as stored (`encodeMatrix`). */
    readonly matrixBlob: Uint8Array;
    /** Respondents in the stored wave, before exclusions. */
    readonly respondents: number;
    /** 0-based rows left out of audits. */
    readonly excluded: readonly number[];
    /** One per matrix column, in column order. */
    readonly items: readonly JobItem[];
    /** The outcome the settings name (or none). */
    readonly outcomes: readonly JobOutcome[];
    /** The columns left out, the screening, item types and facets (from the stored setup document). */
    readonly setup: AuditSetup;
  };
  readonly settings: ResolvedAuditSettings;
  /** Threads that decide the bootstrap's resamples (the configuration's RESAMPLE_THREADS); 0 or absent: the audit's own thread. */
  readonly resampleThreads?: number;
}

/** Milliseconds spent in each stage of one audit. */
export type StageTimings = Record<string, number>;

/** What a worker posts back. */
export type AuditWorkerMessage =
  | { readonly type: 'progress'; readonly jobId: string; readonly stage: string; readonly fraction: number }
  | { readonly type: 'cut-list'; readonly jobId: string; readonly cutList: EarlyCutListJson }
  | { readonly type: 'done'; readonly jobId: string; readonly resultText: string; readonly timings: StageTimings }
  | { readonly type: 'failed'; readonly jobId: string; readonly message: string };
