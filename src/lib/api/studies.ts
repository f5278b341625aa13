/** Contracts of the study routes: /api/studies and /api/studies/{id}. */
import type { z } from 'zod';
import type { createStudyRequest } from './schemas/studies';
import type { Role } from '../permissions';
import { callApi, segment, type ApiResult } from './client';
import type { ReviewState } from './handoff';

/** A study as lists show it. */
export interface StudySummary {
  id: string;
  name: string;
  description: string;
  team: { id: string; name: string };
  role: Role;
  waves: number;
  audits: number;
  createdAt: string;
  /**
   * Where the handoff stands: the latest published version of the cut list, the client's verdict
   * on it, and how many items of the study's cut list have no decision yet (null before any wave is
   * confirmed).
   */
  handoff: {
    latestVersion: { number: number; publishedAt: string; programmedAt: string | null } | null;
    review: ReviewState;
    undecided: number | null;
  };
}

/**
 * The constraints a study carries into every audit, as the API shows them. The stored column
 * (`studies.settings`, src/db/schema/studies.ts `StudySettings`) must stay assignable to this shape: the
 * server's `studyDetail` returns one as the other, so the compiler checks it.
 */
export interface StudySettingsView {
  lockedItems?: string[];
  minItemsPerScale?: number;
  alphaFloor?: number;
  maxAlphaDrop?: number;
  maxCutShare?: number;
  minutesPerItem?: number;
}

/** A study with its waves, audits and the state of its cut list. */
export interface StudyDetail {
  id: string;
  name: string;
  description: string;
  settings: StudySettingsView;
  team: { id: string; name: string };
  createdAt: string;
  waves: { id: string; label: string; status: string; format: string; rows: number; items: number; excluded: number; createdAt: string; confirmedAt: string | null }[];
  audits: { id: string; waveId: string; status: string; stage: string | null; progress: number; createdAt: string; finishedAt: string | null; error: string | null }[];
  cutList: {
    counts: Record<string, number>;
    latestVersion: { number: number; publishedAt: string; programmedAt: string | null } | null;
  };
}

/** GET /api/studies: the studies of the caller's teams. */
export interface ListStudiesResponse {
  studies: StudySummary[];
}

/** GET /api/studies/{id}: the study, with the caller's role in its team. */
export interface StudyResponse {
  study: StudyDetail & { role: Role };
}

export type CreateStudyRequest = z.input<typeof createStudyRequest>;

/** POST /api/studies: 201 with the new study. */
export interface CreateStudyResponse {
  study: { id: string; name: string; description: string; teamId: string; createdAt: string };
}

/** The typed calls of this domain. */
export const studiesApi = {
  list: (): Promise<ApiResult<ListStudiesResponse>> => callApi('GET', '/api/studies'),
  get: (studyId: string): Promise<ApiResult<StudyResponse>> => callApi('GET', `/api/studies/${segment(studyId)}`),
  create: (body: CreateStudyRequest): Promise<ApiResult<CreateStudyResponse>> => callApi('POST', '/api/studies', body),
  delete: (studyId: string): Promise<ApiResult<null>> => callApi('DELETE', `/api/studies/${segment(studyId)}`),
};
