/** Request schemas of the caller's own routes (types and calls: ../me.ts), and the password policy. */
import { z } from 'zod';

/** A password policy the forms and the API share: 10 to 200 characters. */
export const passwordSchema = z
  .string()
  .min(10, 'The password needs at least 10 characters.')
  .max(200, 'The password may have at most 200 characters.');

/** Body of PUT /api/me/password. */
export const changePasswordRequest = z.object({
  currentPassword: z.string().min(1).max(200),
  newPassword: passwordSchema,
  /** Also revoke every personal API token (sessions always end). */
  revokeTokens: z.boolean().optional(),
});
