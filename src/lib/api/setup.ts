/**
 * Contracts of the routes that need nobody signed in: POST /api/setup (first run) and
 * GET /api/health.
 */
import { z } from 'zod';
import { callApi, type ApiResult } from './client';
import { passwordSchema } from './me';

/** Body of POST /api/setup: the first owner and their team (on an empty database only). */
export const setupRequest = z.object({
  teamName: z.string().trim().min(1, 'The team needs a name.').max(200),
  name: z.string().trim().min(1, 'Your name is needed.').max(200),
  email: z.email('That is not an e-mail address.').max(320),
  password: passwordSchema,
});
export type SetupRequest = z.input<typeof setupRequest>;

/** POST /api/setup: 201 with the new ids. */
export interface SetupResponse {
  userId: string;
  teamId: string;
}

/** GET /api/health. */
export interface HealthResponse {
  status: 'ok';
}

/** The typed calls of this domain. */
export const setupApi = {
  setUp: (body: SetupRequest): Promise<ApiResult<SetupResponse>> => callApi('POST', '/api/setup', body),
  health: (): Promise<ApiResult<HealthResponse>> => callApi('GET', '/api/health'),
};
