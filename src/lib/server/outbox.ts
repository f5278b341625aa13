/**
 * The outbox page's data: with MAIL_TRANSPORT=outbox, mails are not sent but kept. A user sees the
 * mails addressed to them and, in teams they own, every mail the team's work sent (so an owner
 * can hand an invitation link over by hand in a demo).
 */
import { desc, eq, inArray, or } from 'drizzle-orm';
import { emailOutbox } from '../../db/schema';
import { can } from '../permissions';
import { getConfig } from './config';
import type { CurrentUser } from './current-user';
import { getDb } from './db';
import type { OutboxMail } from '../api/outbox';
export type { OutboxMail } from '../api/outbox';

/** Whether the outbox is in use (MAIL_TRANSPORT=outbox). */
export function outboxEnabled(): boolean {
  return getConfig().mailTransport === 'outbox';
}

/**
 * The mails the user may read, newest first.
 * @param user the signed-in user.
 * @param limit at most this many.
 */
export function listOutbox(user: CurrentUser, limit = 100): OutboxMail[] {
  // Those who manage a team (its owners) also see the mail sent on its behalf.
  const ownedTeams = user.memberships.filter((m) => can(m.role, 'manage:team')).map((m) => m.teamId);
  const visible = ownedTeams.length > 0 ? or(eq(emailOutbox.to, user.email), inArray(emailOutbox.teamId, ownedTeams)) : eq(emailOutbox.to, user.email);
  return getDb()
    .select({ id: emailOutbox.id, to: emailOutbox.to, subject: emailOutbox.subject, text: emailOutbox.text, createdAt: emailOutbox.createdAt })
    .from(emailOutbox)
    .where(visible)
    .orderBy(desc(emailOutbox.id))
    .limit(limit)
    .all()
    .map((m) => ({ ...m, createdAt: m.createdAt.toISOString() }));
}
