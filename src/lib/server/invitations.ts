/**
 * Invitations: an owner invites an e-mail address with a role; the link in the e-mail carries a
 * random token (only its sha256 is stored) valid for a week; the invitee sets a name and password
 * (or, already having an account, signs in) and joins the team with that role.
 */
import { and, eq, isNull } from 'drizzle-orm';
import { invitations, memberships, teams, users } from '../../db/schema';
import { roleLabels, type Role } from '../permissions';
import { logActivity } from './activity';
import { getConfig } from './config';
import type { CurrentUser } from './current-user';
import { getDb } from './db';
import { HttpError, fail } from './errors';
import { newId, newSecretToken, sha256Hex } from './ids';
import { escapeHtml, sendMail } from './mail';
import { hashPassword } from './passwords';

const validityMs = 7 * 24 * 3_600_000;

/** What the invitation page needs to know about a token. */
export interface InvitationLookup {
  id: string;
  teamId: string;
  teamName: string;
  email: string;
  role: Role;
  expiresAt: Date;
  state: 'open' | 'accepted' | 'expired' | 'revoked';
  /** Whether an account with the invited address exists already. */
  accountExists: boolean;
}

/**
 * Creates an invitation and e-mails its link.
 * @param actor the inviting owner.
 * @param teamId the team.
 * @param email the invitee's address.
 * @param role the role they will have.
 * @throws HttpError 409 when the address is already a member; 503 when the e-mail could not be sent.
 * @returns the invitation (without its token).
 */
export async function inviteMember(actor: CurrentUser, teamId: string, email: string, role: Role) {
  const db = getDb();
  const address = email.trim().toLowerCase();
  const token = newSecretToken();
  const team = db.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId)).get();
  if (!team) throw fail.notFound('No such team among yours.', 'team-not-found');
  const invitation = db.transaction((tx) => {
    const member = tx
      .select({ userId: memberships.userId })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.teamId, teamId), eq(users.email, address)))
      .get();
    if (member) throw fail.conflict(`${address} is already a member of this team.`, 'already-member');
    // A new invitation replaces an open one for the same address.
    tx.update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.teamId, teamId), eq(invitations.email, address), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .run();
    const row = tx
      .insert(invitations)
      .values({ id: newId(), teamId, email: address, role, tokenHash: sha256Hex(token), invitedBy: actor.id, expiresAt: new Date(Date.now() + validityMs) })
      .returning()
      .get();
    logActivity(tx, { teamId, userId: actor.id, action: 'invitation.created', detail: { email: address, role } });
    return row;
  });
  const link = `${getConfig().publicUrl}/invite/${token}`;
  const roleName = roleLabels[role].toLowerCase();
  const text = [
    `${actor.name} invites you to join the team "${team.name}" on Paredown as ${roleName}.`,
    '',
    `Accept the invitation here (the link works for 7 days):`,
    link,
    '',
    'If you did not expect this e-mail, ignore it: nothing happens unless the link is opened.',
  ].join('\n');
  const html = `<p>${escapeHtml(actor.name)} invites you to join the team <strong>${escapeHtml(team.name)}</strong> on Paredown as ${escapeHtml(roleName)}.</p><p><a href="${escapeHtml(link)}">Accept the invitation</a> (the link works for 7 days).</p><p>If you did not expect this e-mail, ignore it.</p>`;
  try {
    await sendMail({ to: address, subject: `Invitation to ${team.name} on Paredown`, text, html, teamId });
  } catch (error) {
    db.update(invitations).set({ revokedAt: new Date() }).where(eq(invitations.id, invitation.id)).run();
    console.error('[paredown] invitation e-mail failed:', error);
    throw new HttpError(503, 'mail-failed', 'The invitation e-mail could not be sent; try again later.');
  }
  return { id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt.toISOString() };
}

/**
 * Finds the invitation behind a token.
 * @param token the token from the link.
 * @returns the invitation, or null when no invitation has that token.
 */
export function findInvitation(token: string): InvitationLookup | null {
  if (!token || token.length > 200) return null;
  const db = getDb();
  const row = db
    .select({ invitation: invitations, teamName: teams.name })
    .from(invitations)
    .innerJoin(teams, eq(teams.id, invitations.teamId))
    .where(eq(invitations.tokenHash, sha256Hex(token)))
    .get();
  if (!row) return null;
  const i = row.invitation;
  const state = i.acceptedAt ? 'accepted' : i.revokedAt ? 'revoked' : i.expiresAt.getTime() < Date.now() ? 'expired' : 'open';
  const accountExists = !!db.select({ id: users.id }).from(users).where(eq(users.email, i.email)).get();
  return { id: i.id, teamId: i.teamId, teamName: row.teamName, email: i.email, role: i.role, expiresAt: i.expiresAt, state, accountExists };
}

/**
 * Accepts an invitation, creating the account when the invitee has none.
 * @param token the token from the link.
 * @param caller the signed-in user, or null.
 * @param newAccount name and password for a new account (when not signed in).
 * @throws HttpError 404 unknown token; 409 used, expired or revoked, or an account exists and the
 *   caller is not signed in as it; 403 signed in as another address; 400 name or password missing.
 * @returns the user id, team and role.
 */
export async function acceptInvitation(token: string, caller: CurrentUser | null, newAccount: { name?: string; password?: string }) {
  const invitation = findInvitation(token);
  if (!invitation) throw fail.notFound('This invitation link is not valid.', 'invitation-not-found');
  if (invitation.state !== 'open') {
    const said = { accepted: 'has been used already', expired: 'has expired', revoked: 'has been replaced or withdrawn' }[invitation.state];
    throw fail.conflict(`This invitation ${said}; ask the team owner for a new one.`, `invitation-${invitation.state}`);
  }
  if (caller && caller.email !== invitation.email) {
    throw fail.forbidden(`This invitation is for ${invitation.email}; sign out and accept it as that address.`, 'invitation-for-another-address');
  }
  if (!caller && invitation.accountExists) {
    throw fail.conflict(`An account for ${invitation.email} exists already: sign in, then accept the invitation.`, 'account-exists');
  }
  let passwordHash: string | null = null;
  if (!caller) {
    if (!newAccount.name?.trim() || !newAccount.password) throw fail.badRequest('A name and a password are needed to create the account.', 'invalid-body');
    passwordHash = await hashPassword(newAccount.password);
  }
  const db = getDb();
  return db.transaction((tx) => {
    // Re-check inside the transaction: two tabs may accept the same link at once.
    const fresh = tx.select({ acceptedAt: invitations.acceptedAt }).from(invitations).where(eq(invitations.id, invitation.id)).get();
    if (fresh?.acceptedAt) throw fail.conflict('This invitation has been used; ask the team owner for a new one.', 'invitation-accepted');
    let userId = caller?.id;
    if (!userId) {
      userId = newId();
      tx.insert(users).values({ id: userId, email: invitation.email, name: newAccount.name!.trim(), passwordHash: passwordHash! }).run();
    }
    tx.insert(memberships)
      .values({ teamId: invitation.teamId, userId, role: invitation.role })
      .onConflictDoUpdate({ target: [memberships.teamId, memberships.userId], set: { role: invitation.role } })
      .run();
    tx.update(invitations).set({ acceptedAt: new Date(), acceptedBy: userId }).where(eq(invitations.id, invitation.id)).run();
    logActivity(tx, { teamId: invitation.teamId, userId, action: 'invitation.accepted', detail: { email: invitation.email, role: invitation.role, newAccount: !caller } });
    return { userId, team: { id: invitation.teamId, name: invitation.teamName }, role: invitation.role };
  });
}

/**
 * Withdraws an open invitation: its link stops working.
 * @param actor the owner withdrawing it.
 * @param teamId the team.
 * @param invitationId the invitation.
 * @throws HttpError 404 when the team has no such open invitation.
 */
export function withdrawInvitation(actor: CurrentUser, teamId: string, invitationId: string): void {
  getDb().transaction((tx) => {
    const result = tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.id, invitationId), eq(invitations.teamId, teamId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .run();
    if (result.changes === 0) throw fail.notFound('No such open invitation in this team.', 'invitation-not-found');
    logActivity(tx, { teamId, userId: actor.id, action: 'invitation.withdrawn', detail: { invitationId } });
  });
}
