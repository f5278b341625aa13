/**
 * Contracts of the routes that need nobody signed in: POST /api/setup (first run) and
 * GET /api/health.
 */
import type { z } from 'zod';
import type { setupRequest } from './schemas/setup';
import { callApi, type ApiResult } from './client';

export type SetupRequest = z.input<typeof setupRequest>;

/** POST /api/setup: 201 with the new ids. */
export interface SetupResponse {
  userId: string;
  teamId: string;
}

/** GET /api/health. */
export type HealthResponse =
  | { status: 'ok' }
  /** 503: the upload storage cannot be written, so uploads are refused until it can. */
  | { status: 'degraded'; storage: 'not-writable'; message: string };

/** The typed calls of this domain. */
export const setupApi = {
  setUp: (body: SetupRequest): Promise<ApiResult<SetupResponse>> => callApi('POST', '/api/setup', body),
  health: (): Promise<ApiResult<HealthResponse>> => callApi('GET', '/api/health'),
};
