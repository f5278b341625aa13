/**
 * Contracts of the team routes: members (/api/teams/{id}/members[/{userId}]), invitations
 * (/api/teams/{id}/invitations[/{invitationId}]) and accepting one (/api/invitations/{token}/accept).
 */
import { z } from 'zod';
import { roles, type Role } from '../permissions';
import { callApi, segment, type ApiResult } from './client';
import { passwordSchema } from './me';

/** A member as the members page and the API show them. */
export interface MemberView {
  userId: string;
  name: string;
  email: string;
  role: Role;
  joinedAt: string;
}

/** An open invitation. */
export interface InvitationView {
  id: string;
  email: string;
  role: Role;
  expiresAt: string;
  createdAt: string;
}

/** GET /api/teams/{id}/members: owners also get the open invitations. */
export interface MembersResponse {
  team: { id: string; name: string };
  members: MemberView[];
  invitations?: InvitationView[];
}

/** Body of PUT /api/teams/{id}/members/{userId}. */
export const changeRoleRequest = z.object({ role: z.enum(roles) });
export type ChangeRoleRequest = z.input<typeof changeRoleRequest>;

/** PUT /api/teams/{id}/members/{userId}: the member with the new role. */
export interface ChangeRoleResponse {
  member: MemberView;
}

/** GET /api/teams/{id}/invitations (owner). */
export interface InvitationsResponse {
  invitations: InvitationView[];
}

/** Body of POST /api/teams/{id}/invitations. */
export const inviteRequest = z.object({ email: z.email('That is not an e-mail address.').max(320), role: z.enum(roles) });
export type InviteRequest = z.input<typeof inviteRequest>;

/** POST /api/teams/{id}/invitations: 201 with the invitation sent. */
export interface InviteResponse {
  invitation: { id: string; email: string; role: Role; expiresAt: string };
}

/**
 * Body of POST /api/invitations/{token}/accept: nothing when signed in as the invited address;
 * a name and a password to create the account otherwise.
 */
export const acceptInvitationRequest = z.object({ name: z.string().trim().min(1).max(200).optional(), password: passwordSchema.optional() });
export type AcceptInvitationRequest = z.input<typeof acceptInvitationRequest>;

/** POST /api/invitations/{token}/accept: 201. */
export interface AcceptInvitationResponse {
  userId: string;
  team: { id: string; name: string };
  role: Role;
}

/** The typed calls of this domain. */
export const teamsApi = {
  members: (teamId: string): Promise<ApiResult<MembersResponse>> => callApi('GET', `/api/teams/${segment(teamId)}/members`),
  changeRole: (teamId: string, userId: string, body: ChangeRoleRequest): Promise<ApiResult<ChangeRoleResponse>> =>
    callApi('PUT', `/api/teams/${segment(teamId)}/members/${segment(userId)}`, body),
  removeMember: (teamId: string, userId: string): Promise<ApiResult<null>> => callApi('DELETE', `/api/teams/${segment(teamId)}/members/${segment(userId)}`),
  invitations: (teamId: string): Promise<ApiResult<InvitationsResponse>> => callApi('GET', `/api/teams/${segment(teamId)}/invitations`),
  invite: (teamId: string, body: InviteRequest): Promise<ApiResult<InviteResponse>> => callApi('POST', `/api/teams/${segment(teamId)}/invitations`, body),
  withdrawInvitation: (teamId: string, invitationId: string): Promise<ApiResult<null>> =>
    callApi('DELETE', `/api/teams/${segment(teamId)}/invitations/${segment(invitationId)}`),
  acceptInvitation: (token: string, body: AcceptInvitationRequest): Promise<ApiResult<AcceptInvitationResponse>> =>
    callApi('POST', `/api/invitations/${segment(token)}/accept`, body),
};
