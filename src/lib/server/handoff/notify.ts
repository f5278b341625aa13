/**
 * E-mails of the handoff: to the members of a study's team who hold given roles, through the mail
 * module (the outbox in development, demo and tests; SMTP in production). Sent after the write's
 * transaction has committed; a refused message is recorded in the outbox table with its reason
 * and never undoes the write.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { memberships, users } from '../../../db/schema';
import type { Role } from '../../permissions';
import type { MailWords } from '../../words/handoff';
import { getConfig } from '../config';
import { getDb } from '../db';
import { sendMail } from '../mail';

/**
 * The addresses of a team's members in the given roles, sorted, without the one who acted.
 * @param teamId the team.
 * @param roles the roles to reach.
 * @param exceptUserId the member who acted (not told about their own action).
 */
export function teamAddresses(teamId: string, roles: readonly Role[], exceptUserId: string | null): string[] {
  const rows = getDb()
    .select({ id: users.id, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.teamId, teamId), inArray(memberships.role, [...roles])))
    .all();
  return [...new Set(rows.filter((row) => row.id !== exceptUserId).map((row) => row.email))].sort();
}

/**
 * Sends one message to each address.
 * @param teamId the team whose work sends it.
 * @param to the addresses.
 * @param words the subject and text.
 * @returns the addresses the mail module accepted.
 */
export async function mailEach(teamId: string, to: readonly string[], words: MailWords): Promise<string[]> {
  const sent: string[] = [];
  for (const address of to) {
    try {
      await sendMail({ to: address, subject: words.subject, text: words.text, teamId });
      sent.push(address);
    } catch (error) {
      console.error(`[paredown] mail to ${address} failed:`, (error as Error).message);
    }
  }
  return sent;
}

/** An absolute link to a page of the app, for e-mails. */
export function pageLink(path: string): string {
  return `${getConfig().publicUrl}${path}`;
}
