/** Accounts: people, their API tokens and the sign-in attempts the rate limit counts. */
import { index, integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { createdAt } from './columns';

export const users = sqliteTable('users', {
  id: text('id').primaryKey(),
  /** Stored lower-case; unique. */
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  passwordHash: text('password_hash').notNull(),
  /** Raised when the password changes: sessions issued under an older value stop working. */
  sessionEpoch: integer('session_epoch').notNull().default(0),
  createdAt: createdAt(),
});

export const apiTokens = sqliteTable(
  'api_tokens',
  {
    id: text('id').primaryKey(),
    userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    /** The first characters of the token, shown to recognise it. */
    prefix: text('prefix').notNull(),
    /** sha256 of the whole token, hex. */
    tokenHash: text('token_hash').notNull().unique(),
    createdAt: createdAt(),
    lastUsedAt: integer('last_used_at', { mode: 'timestamp_ms' }),
    revokedAt: integer('revoked_at', { mode: 'timestamp_ms' }),
  },
  (table) => [index('api_tokens_user').on(table.userId)],
);

/** Sign-in attempts, for rate limiting failed ones per e-mail and per client address. */
export const signInAttempts = sqliteTable(
  'sign_in_attempts',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    email: text('email').notNull(),
    address: text('address').notNull(),
    succeeded: integer('succeeded', { mode: 'boolean' }).notNull(),
    at: integer('at', { mode: 'timestamp_ms' }).notNull(),
  },
  (table) => [index('sign_in_attempts_email').on(table.email, table.at), index('sign_in_attempts_address').on(table.address, table.at)],
);
