/** Request schemas of the team, member and invitation routes (types and calls: ../teams.ts). */
import { z } from 'zod';
import { roles } from '../../permissions';
import { passwordSchema } from './me';

/** Body of PUT /api/teams/{id}/members/{userId}. */
export const changeRoleRequest = z.object({ role: z.enum(roles) });

/** Body of POST /api/teams/{id}/invitations. */
export const inviteRequest = z.object({ email: z.email('That is not an e-mail address.').max(320), role: z.enum(roles) });

/**
 * Body of POST /api/invitations/{token}/accept: nothing when signed in as the invited address;
 * a name and a password to create the account otherwise.
 */
export const acceptInvitationRequest = z.object({ name: z.string().trim().min(1).max(200).optional(), password: passwordSchema.optional() });
