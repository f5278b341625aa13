/** Team membership: listing members, changing roles, removing members. */
import { and, eq, gt, isNull } from 'drizzle-orm';
import { invitations, memberships, teams, users } from '../../db/schema';
import type { Role } from '../permissions';
import { logActivity } from './activity';
import type { CurrentUser } from './current-user';
import { getDb } from './db';
import { fail } from './errors';
import type { InvitationView, MemberView } from '../api/teams';
export type { InvitationView, MemberView } from '../api/teams';

/** The team's name. */
export function teamName(teamId: string): string {
  return getDb().select({ name: teams.name }).from(teams).where(eq(teams.id, teamId)).get()?.name ?? '';
}

/**
 * The members of a team, owners first, then by name.
 * @param teamId the team.
 */
export function listMembers(teamId: string): MemberView[] {
  const order: Record<Role, number> = { owner: 0, designer: 1, field_manager: 2, client_reviewer: 3 };
  return getDb()
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.teamId, teamId))
    .all()
    .map((m) => ({ ...m, joinedAt: m.joinedAt.toISOString() }))
    .sort((a, b) => order[a.role] - order[b.role] || a.name.localeCompare(b.name));
}

/**
 * Invitations not yet accepted, revoked or expired.
 * @param teamId the team.
 */
export function listPendingInvitations(teamId: string): InvitationView[] {
  return getDb()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt, createdAt: invitations.createdAt })
    .from(invitations)
    .where(and(eq(invitations.teamId, teamId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
    .orderBy(invitations.createdAt)
    .all()
    .map((i) => ({ ...i, expiresAt: i.expiresAt.toISOString(), createdAt: i.createdAt.toISOString() }));
}

function ownerCount(tx: Pick<ReturnType<typeof getDb>, 'select'>, teamId: string): number {
  return tx.select({ userId: memberships.userId }).from(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.role, 'owner'))).all().length;
}

/**
 * Changes a member's role; a team always keeps at least one owner.
 * @param actor who changes it (an owner; checked by the guard).
 * @param teamId the team.
 * @param userId the member.
 * @param role the new role.
 * @throws HttpError 404 when the user is not a member, 409 when the last owner would be demoted.
 * @returns the member after the change.
 */
export function changeRole(actor: CurrentUser, teamId: string, userId: string, role: Role): MemberView {
  const db = getDb();
  db.transaction((tx) => {
    const current = tx.select({ role: memberships.role }).from(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId))).get();
    if (!current) throw fail.notFound('No such member in this team.', 'member-not-found');
    if (current.role === role) return;
    if (current.role === 'owner' && ownerCount(tx, teamId) <= 1) {
      throw fail.conflict('A team needs at least one owner: make someone else owner first.', 'last-owner');
    }
    tx.update(memberships).set({ role }).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId))).run();
    logActivity(tx, { teamId, userId: actor.id, action: 'member.role-changed', detail: { member: userId, from: current.role, to: role } });
  });
  const member = listMembers(teamId).find((m) => m.userId === userId);
  if (!member) throw fail.notFound('No such member in this team.', 'member-not-found');
  return member;
}

/**
 * Removes a member from a team; the last owner cannot be removed.
 * @param actor who removes them.
 * @param teamId the team.
 * @param userId the member.
 * @throws HttpError 404 when not a member, 409 for the last owner.
 */
export function removeMember(actor: CurrentUser, teamId: string, userId: string): void {
  getDb().transaction((tx) => {
    const current = tx.select({ role: memberships.role }).from(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId))).get();
    if (!current) throw fail.notFound('No such member in this team.', 'member-not-found');
    if (current.role === 'owner' && ownerCount(tx, teamId) <= 1) {
      throw fail.conflict('A team needs at least one owner: make someone else owner first.', 'last-owner');
    }
    tx.delete(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId))).run();
    logActivity(tx, { teamId, userId: actor.id, action: 'member.removed', detail: { member: userId, role: current.role } });
  });
}
