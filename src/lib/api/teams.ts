/**
 * Contracts of the team routes: members (/api/teams/{id}/members[/{userId}]), invitations
 * (/api/teams/{id}/invitations[/{invitationId}]) and accepting one (/api/invitations/{token}/accept).
 */
import type { z } from 'zod';
import type { acceptInvitationRequest, changeRoleRequest, inviteRequest } from './schemas/teams';
import type { Role } from '../permissions';
import { callApi, segment, type ApiResult } from './client';

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

export type ChangeRoleRequest = z.input<typeof changeRoleRequest>;

/** PUT /api/teams/{id}/members/{userId}: the member with the new role. */
export interface ChangeRoleResponse {
  member: MemberView;
}

/** GET /api/teams/{id}/invitations (owner). */
export interface InvitationsResponse {
  invitations: InvitationView[];
}

export type InviteRequest = z.input<typeof inviteRequest>;

/** POST /api/teams/{id}/invitations: 201 with the invitation sent. */
export interface InviteResponse {
  invitation: { id: string; email: string; role: Role; expiresAt: string };
}

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
