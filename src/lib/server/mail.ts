/**
 * Outgoing e-mail through nodemailer. With MAIL_TRANSPORT=outbox (development, demo, tests) a
 * transport of our own writes each message into the email_outbox table instead of sending it;
 * with smtp the message goes to SMTP_URL and is also recorded in the outbox table as sent.
 */
import nodemailer from 'nodemailer';
import type { Transport, SentMessageInfo } from 'nodemailer';
import type MailMessage from 'nodemailer/lib/mailer/mail-message';
import { eq } from 'drizzle-orm';
import { emailOutbox } from '../../db/schema';
import { getConfig } from './config';
import { getDb, isDatabaseHandedIn } from './db';

/** A message to send. */
export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  /** The team whose work sends it (its owners see it in the outbox page). */
  teamId?: string | null;
}

function addressText(value: unknown): string {
  if (!value) return '';
  if (Array.isArray(value)) return value.map(addressText).join(', ');
  if (typeof value === 'string') return value;
  if (typeof value === 'object' && value && 'address' in value) return String((value as { address: string }).address);
  return String(value);
}

/** A nodemailer transport that stores messages in the outbox table. */
class OutboxTransport implements Transport<SentMessageInfo> {
  name = 'paredown-outbox';
  version = '1';

  send(mail: MailMessage, callback: (error: Error | null, info: SentMessageInfo) => void): void {
    try {
      const data = mail.data;
      const headers = (data.headers ?? {}) as Record<string, string>;
      const teamId = headers['X-Paredown-Team'] || null;
      const row = getDb()
        .insert(emailOutbox)
        .values({
          teamId,
          to: addressText(data.to).toLowerCase(),
          subject: String(data.subject ?? ''),
          text: String(data.text ?? ''),
          html: data.html ? String(data.html) : null,
          sentAt: new Date(),
          transport: 'outbox',
        })
        .returning({ id: emailOutbox.id })
        .get();
      callback(null, { messageId: `<outbox-${row.id}@paredown>`, envelope: mail.message.getEnvelope() });
    } catch (error) {
      callback(error as Error, null);
    }
  }
}

let transporter: nodemailer.Transporter | null = null;
/** The outbox's transport: it writes into whichever database `getDb()` answers. */
const outboxTransporter = nodemailer.createTransport(new OutboxTransport());

function getTransporter(): nodemailer.Transporter {
  if (transporter) return transporter;
  const config = getConfig();
  transporter = config.mailTransport === 'smtp' && config.smtpUrl ? nodemailer.createTransport(config.smtpUrl) : outboxTransporter;
  return transporter;
}

/**
 * Sends one e-mail (or stores it in the outbox).
 * @param mail the message.
 * @throws Error when the SMTP server refuses it (recorded in the outbox table with the reason).
 */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  const config = getConfig();
  const message = {
    from: config.mailFrom,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html,
    headers: mail.teamId ? { 'X-Paredown-Team': mail.teamId } : undefined,
  };
  if (config.mailTransport === 'outbox' || isDatabaseHandedIn()) {
    // The demo seed's mail (withDatabase) is kept in the seeded database's outbox, never sent.
    await outboxTransporter.sendMail(message);
    return;
  }
  const row = getDb()
    .insert(emailOutbox)
    .values({ teamId: mail.teamId ?? null, to: mail.to.toLowerCase(), subject: mail.subject, text: mail.text, html: mail.html ?? null, transport: 'smtp' })
    .returning({ id: emailOutbox.id })
    .get();
  try {
    await getTransporter().sendMail(message);
    getDb().update(emailOutbox).set({ sentAt: new Date() }).where(eq(emailOutbox.id, row.id)).run();
  } catch (error) {
    getDb().update(emailOutbox).set({ error: String((error as Error).message ?? error) }).where(eq(emailOutbox.id, row.id)).run();
    throw error;
  }
}

/** Escapes text for the HTML part of a message. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}
