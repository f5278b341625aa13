/**
 * Contracts of the caller's own routes: GET /api/me and PUT /api/me/password (the password
 * policy every form and route shares is in ./schemas/me.ts).
 */
import type { z } from 'zod';
import type { changePasswordRequest } from './schemas/me';
import type { Action, Role } from '../permissions';
import { callApi, type ApiResult } from './client';

/** GET /api/me: the caller, their teams, their role and permissions in each. */
export interface MeResponse {
  user: { id: string; email: string; name: string };
  /** How this request was authenticated. */
  authenticatedBy: 'session' | 'token' | null;
  teams: { id: string; name: string; role: Role; permissions: Action[] }[];
}

export type ChangePasswordRequest = z.input<typeof changePasswordRequest>;

/** PUT /api/me/password: sessions issued before stop working, so the page signs in again. */
export interface ChangePasswordResponse {
  changed: true;
  signInAgain: true;
  /** How many personal API tokens were revoked (0 unless asked). */
  tokensRevoked: number;
}

/** The typed calls of this domain. */
export const meApi = {
  get: (): Promise<ApiResult<MeResponse>> => callApi('GET', '/api/me'),
  changePassword: (body: ChangePasswordRequest): Promise<ApiResult<ChangePasswordResponse>> => callApi('PUT', '/api/me/password', body),
};
