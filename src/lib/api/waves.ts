/**
 * Contracts of the wave routes: upload (POST /api/studies/{id}/waves, multipart), the wave
 * (GET /api/waves/{id}), its setup (PUT /api/waves/{id}/setup) and its respondent rows
 * (GET /api/waves/{id}/respondents). One view shape answers the upload, the confirmation and
 * the wave; respondent-level parts are null for callers who may not read respondents.
 */
import type { z } from 'zod';
import type { confirmSetupRequest, respondentsQuery } from './schemas/waves';
import type { ScreeningFlag, ScreeningOptions } from '../ingest';
import type { ColumnProposal, ColumnSetup, ItemCounts, WaveSource, WaveWarning } from '../ingest/types';
import { callApi, segment, type ApiResult } from './client';

/** How the wave's files were read (enough to read them again exactly): the ingest's WaveSource. */
export type StoredSource = WaveSource;

/** The wave as every member may see it. */
export interface WaveSummary {
  id: string;
  studyId: string;
  label: string;
  status: 'proposed' | 'confirmed';
  format: string;
  sheet: string | null;
  fileName: string | null;
  codebookName: string | null;
  source: StoredSource | null;
  /** Respondents in the file. */
  rows: number;
  /** Items (proposed or confirmed). */
  items: number;
  /** Respondents left out of audits (confirmed waves). */
  excluded: number;
  createdAt: string;
  confirmedAt: string | null;
}

/** One screening flag reduced to counts. */
export interface FlagSummary {
  code: ScreeningFlag['code'];
  threshold: number;
  count: number;
  message: string;
}

/** Screening as every member may see it: counts only. */
export interface ScreeningSummary {
  respondents: number;
  options: ScreeningOptions;
  medianDuration: number | null;
  flags: FlagSummary[];
  /** How many respondents the screening proposes to leave out. */
  proposedCount: number;
}

/** One flagged respondent, for the designer's exclusion list. */
export interface FlaggedRespondent {
  /** 0-based respondent row. */
  row: number;
  respondentId: string | null;
  flags: ScreeningFlag['code'][];
  /** Completion time in seconds, when known. */
  duration: number | null;
}

/** Screening with the flagged respondents (owners and designers only). */
export interface ScreeningDetail extends ScreeningSummary {
  proposedExclusions: number[];
  flagged: FlaggedRespondent[];
}

/** One item of a wave as the API shows it. */
export interface ItemView {
  /** 0-based column of the item in the stored matrix. */
  position: number;
  id: string;
  header: string;
  scale: string | null;
  reverse: boolean;
  min: number | null;
  max: number | null;
  missingCodes: number[];
  text: string | null;
  valueLabels: Record<string, string> | null;
  /** What happened to the item's cells when recoded (absent for waves stored before counts were kept). */
  counts: ItemCounts | null;
}

/** An outcome column as the API shows it (aggregates only). */
export interface OutcomeView {
  id: string;
  header: string;
  counts: ItemCounts;
}

/** The answer of the wave routes (GET /api/waves/{id}; with more fields, the upload and the setup). */
export interface WaveView {
  wave: WaveSummary;
  /** Owners and designers: the proposed setup with reasons, profiles and counts. Others: null. */
  proposal: { respondents: number; columns: ColumnProposal[] } | null;
  /** The setup in force (as proposed, then as confirmed): what to send back to confirm. Owners and designers only. */
  setup: readonly ColumnSetup[] | null;
  items: ItemView[];
  outcomes: OutcomeView[];
  warnings: WaveWarning[];
  /** Owners and designers: with the flagged rows and proposed exclusions. Others: counts only. */
  screening: ScreeningDetail | ScreeningSummary | null;
  /** Why there is no screening, when there is none. */
  screeningNote: string | null;
  /** Owners and designers: the respondent rows left out of audits. Others: null (see wave.excluded). */
  exclusions: number[] | null;
}

/** POST /api/studies/{id}/waves: 201 with the proposed wave, or 200 with `duplicate: true`. */
export type UploadWaveResponse = WaveView & { duplicate: boolean };

/** The multipart fields of POST /api/studies/{id}/waves (sent as FormData, not JSON). */
export const uploadFields = ['file', 'codebook', 'sheet', 'label', 'asNewWave'] as const;

export type ConfirmSetupRequest = z.input<typeof confirmSetupRequest>;

/** PUT /api/waves/{id}/setup: the wave as confirmed (or as it would be, on a dry run). */
export type ConfirmSetupResponse = WaveView & { stored: boolean; dryRun: boolean };

export type RespondentsQuery = z.output<typeof respondentsQuery>;

/** One respondent as the designer's list shows them. */
export interface RespondentRow {
  /** 0-based row of the respondent in the wave (what exclusions refer to). */
  row: number;
  respondentId: string | null;
  /** Left out of audits. */
  excluded: boolean;
  /** Proposed for exclusion by the screening. */
  proposed: boolean;
  flags: ScreeningFlag['code'][];
  /** Longest run of one answer, in items. */
  longString: number | null;
  /** Standard deviation of the person's answers (as given), null when not computable. */
  withinSd: number | null;
  /** Share of items without a valid answer. */
  missingShare: number | null;
  /** Completion time in seconds, null when unknown. */
  duration: number | null;
  /** Weight, null without a weight column or when missing. */
  weight: number | null;
  /** Outcome values by outcome id (null where missing). */
  outcomes: Record<string, number | null>;
}

/** GET /api/waves/{id}/respondents: one page of respondents. */
export interface RespondentPage {
  waveId: string;
  page: number;
  perPage: number;
  /** Respondents matching the filter. */
  total: number;
  pages: number;
  respondents: RespondentRow[];
}

/** The typed calls of this domain (the upload goes through XMLHttpRequest for its progress: src/components/upload/upload-request.ts). */
export const wavesApi = {
  get: (waveId: string): Promise<ApiResult<WaveView>> => callApi('GET', `/api/waves/${segment(waveId)}`),
  confirmSetup: (waveId: string, body: ConfirmSetupRequest): Promise<ApiResult<ConfirmSetupResponse>> => callApi('PUT', `/api/waves/${segment(waveId)}/setup`, body),
  respondents: (waveId: string, query: Partial<Record<'page' | 'perPage', number> & Record<'flagged' | 'excluded', boolean>> = {}): Promise<ApiResult<RespondentPage>> => {
    const search = new URLSearchParams(Object.entries(query).map(([key, value]) => [key, String(value)]));
    const suffix = search.size > 0 ? `?${search}` : '';
    return callApi('GET', `/api/waves/${segment(waveId)}/respondents${suffix}`);
  },
};
