/**
 * Contracts of the caller's own routes: GET /api/me and PUT /api/me/password, and the password
 * policy every form and route that takes a password shares.
 */
import { z } from 'zod';
import type { Action, Role } from '../permissions';
import { callApi, type ApiResult } from './client';

/** A password policy the forms and the API share: 10 to 200 characters. */
export const passwordSchema = z
  .string()
  .min(10, 'The password needs at least 10 characters.')
  .max(200, 'The password may have at most 200 characters.');

/** GET /api/me: the caller, their teams, their role and permissions in each. */
export interface MeResponse {
  user: { id: string; email: string; name: string };
  /** How this request was authenticated. */
  authenticatedBy: 'session' | 'token' | null;
  teams: { id: string; name: string; role: Role; permissions: Action[] }[];
}

/** Body of PUT /api/me/password. */
export const changePasswordRequest = z.object({ currentPassword: z.string().min(1).max(200), newPassword: passwordSchema });
export type ChangePasswordRequest = z.input<typeof changePasswordRequest>;

/** PUT /api/me/password: sessions issued before stop working, so the page signs in again. */
export interface ChangePasswordResponse {
  changed: true;
  signInAgain: true;
}

/** The typed calls of this domain. */
export const meApi = {
  get: (): Promise<ApiResult<MeResponse>> => callApi('GET', '/api/me'),
  changePassword: (body: ChangePasswordRequest): Promise<ApiResult<ChangePasswordResponse>> => callApi('PUT', '/api/me/password', body),
};
