/** What the app records beside the work: the activity log and every e-mail it sent. */
import { sql } from 'drizzle-orm';
import { index, integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { users } from './accounts';
import { createdAt } from './columns';
import { teams } from './teams';

/** Who did what, when. Team and study rows stay readable after a study is deleted (no cascade). */
export const activityLog = sqliteTable(
  'activity_log',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    teamId: text('team_id').references(() => teams.id, { onDelete: 'set null' }),
    /** Not a foreign key: the entry that records a study's deletion outlives the study. */
    studyId: text('study_id'),
    userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
    action: text('action').notNull(),
    detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>().notNull().default(sql`'{}'`),
    at: integer('at', { mode: 'timestamp_ms' }).notNull(),
  },
  (table) => [index('activity_team').on(table.teamId, table.at), index('activity_study').on(table.studyId, table.at)],
);

export const emailOutbox = sqliteTable(
  'email_outbox',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    /** The team whose work sent the mail (its owners may read it in the outbox page). */
    teamId: text('team_id').references(() => teams.id, { onDelete: 'set null' }),
    to: text('to').notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html'),
    createdAt: createdAt(),
    sentAt: integer('sent_at', { mode: 'timestamp_ms' }),
    /** outbox | smtp */
    transport: text('transport').notNull(),
    error: text('error'),
  },
  (table) => [index('email_outbox_to').on(table.to)],
);
