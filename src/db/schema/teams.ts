/** Teams: who belongs to which team in which role, and the invitations that bring people in. */
import { index, integer, primaryKey, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { users } from './accounts';
import { createdAt } from './columns';

/** Roles inside a team (product.md). */
export const teamRoles = ['owner', 'designer', 'field_manager', 'client_reviewer'] as const;
export type TeamRole = (typeof teamRoles)[number];

export const teams = sqliteTable('teams', {
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  createdAt: createdAt(),
});

export const memberships = sqliteTable(
  'memberships',
  {
    teamId: text('team_id').notNull().references(() => teams.id, { onDelete: 'cascade' }),
    userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    role: text('role', { enum: teamRoles }).notNull(),
    createdAt: createdAt(),
  },
  (table) => [primaryKey({ columns: [table.teamId, table.userId] }), index('memberships_user').on(table.userId)],
);

export const invitations = sqliteTable(
  'invitations',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id').notNull().references(() => teams.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    role: text('role', { enum: teamRoles }).notNull(),
    /** sha256 of the token in the link; the token itself is never stored. */
    tokenHash: text('token_hash').notNull().unique(),
    invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
    acceptedAt: integer('accepted_at', { mode: 'timestamp_ms' }),
    acceptedBy: text('accepted_by').references(() => users.id, { onDelete: 'set null' }),
    revokedAt: integer('revoked_at', { mode: 'timestamp_ms' }),
    createdAt: createdAt(),
  },
  (table) => [index('invitations_team').on(table.teamId)],
);
