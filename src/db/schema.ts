/**
 * The whole data model of Paredown (SQLite through Drizzle). Designed up front so later work
 * (waves, audits, the cut list, reviews) adds rows, not tables that fight each other.
 *
 * Conventions: ids are random text (`newId()`), times are integer milliseconds since the epoch
 * (`timestamp_ms`), JSON lives in text columns (`mode: 'json'`), and everything under a study is
 * deleted with it (`onDelete: 'cascade'`).
 */
import { sql } from 'drizzle-orm';
import { blob, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';

/** Roles inside a team (product.md). */
export const teamRoles = ['owner', 'designer', 'field_manager', 'client_reviewer'] as const;
export type TeamRole = (typeof teamRoles)[number];

export const decisionKinds = ['keep', 'drop', 'merge', 'reword', 'undecided'] as const;
export type DecisionKind = (typeof decisionKinds)[number];

export const auditStatuses = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;
export const waveStatuses = ['proposed', 'confirmed'] as const;
export const commentTargets = ['study', 'item', 'audit'] as const;
export const reviewVerdicts = ['approved', 'changes_requested'] as const;

const createdAt = () =>
  integer('created_at', { mode: 'timestamp_ms' })
    .notNull()
    .default(sql`(cast(unixepoch('subsec') * 1000 as integer))`);

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

/** Settings a study carries into every audit (constraints of issue 5). */
export interface StudySettings {
  lockedItems?: string[];
  minItemsPerScale?: number;
  alphaFloor?: number;
  maxAlphaDrop?: number;
  maxCutShare?: number;
  minutesPerItem?: number;
}

export const studies = sqliteTable(
  'studies',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id').notNull().references(() => teams.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    description: text('description').notNull().default(''),
    settings: text('settings', { mode: 'json' }).$type<StudySettings>().notNull().default(sql`'{}'`),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (table) => [index('studies_team').on(table.teamId)],
);

/** Original uploads, kept byte for byte on disk under UPLOAD_DIR and addressed by their hash. */
export const storedFiles = sqliteTable('stored_files', {
  /** sha256 of the bytes, hex; also the file name under UPLOAD_DIR. */
  hash: text('hash').primaryKey(),
  size: integer('size').notNull(),
  originalName: text('original_name').notNull(),
  mediaType: text('media_type'),
  /** Relative to UPLOAD_DIR. */
  storagePath: text('storage_path').notNull(),
  createdAt: createdAt(),
});

export const waves = sqliteTable(
  'waves',
  {
    id: text('id').primaryKey(),
    studyId: text('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    label: text('label').notNull(),
    fileHash: text('file_hash').notNull().references(() => storedFiles.hash),
    codebookHash: text('codebook_hash').references(() => storedFiles.hash),
    /** csv | tsv | xlsx | xls | ods */
    format: text('format').notNull(),
    sheet: text('sheet'),
    status: text('status', { enum: waveStatuses }).notNull().default('proposed'),
    /** The column setup (roles, scales, ranges) as proposed or confirmed. */
    setup: text('setup', { mode: 'json' }).$type<unknown>(),
    /** Screening flags and counts. */
    screening: text('screening', { mode: 'json' }).$type<unknown>(),
    /** Respondent row indices (0-based) left out of audits. */
    exclusions: text('exclusions', { mode: 'json' }).$type<number[]>().notNull().default(sql`'[]'`),
    rowCount: integer('row_count').notNull().default(0),
    itemCount: integer('item_count').notNull().default(0),
    /** Recoded responses (missing NaN, reverse-keyed flipped), as src/lib/ingest's encodeMatrix writes them. */
    matrix: blob('matrix', { mode: 'buffer' }),
    respondentIds: text('respondent_ids', { mode: 'json' }).$type<string[]>(),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    confirmedAt: integer('confirmed_at', { mode: 'timestamp_ms' }),
  },
  (table) => [index('waves_study').on(table.studyId)],
);

export const waveItems = sqliteTable(
  'wave_items',
  {
    waveId: text('wave_id').notNull().references(() => waves.id, { onDelete: 'cascade' }),
    /** 0-based column of the item in the stored matrix. */
    position: integer('position').notNull(),
    itemId: text('item_id').notNull(),
    /** The column header in the uploaded file. */
    header: text('header').notNull(),
    scale: text('scale'),
    reverse: integer('reverse', { mode: 'boolean' }).notNull().default(false),
    min: real('min'),
    max: real('max'),
    missingCodes: text('missing_codes', { mode: 'json' }).$type<number[]>().notNull().default(sql`'[]'`),
    text: text('text'),
    valueLabels: text('value_labels', { mode: 'json' }).$type<Record<string, string>>(),
  },
  (table) => [primaryKey({ columns: [table.waveId, table.position] }), uniqueIndex('wave_items_item').on(table.waveId, table.itemId)],
);

export const audits = sqliteTable(
  'audits',
  {
    id: text('id').primaryKey(),
    waveId: text('wave_id').notNull().references(() => waves.id, { onDelete: 'cascade' }),
    settings: text('settings', { mode: 'json' }).$type<unknown>().notNull(),
    /** sha256 of the canonical settings JSON: the same settings on the same wave reuse a result. */
    settingsHash: text('settings_hash').notNull(),
    status: text('status', { enum: auditStatuses }).notNull().default('queued'),
    stage: text('stage'),
    progress: integer('progress').notNull().default(0),
    /** The audit JSON of audit-json.md, as text. */
    result: text('result'),
    error: text('error'),
    /** Milliseconds per stage. */
    timings: text('timings', { mode: 'json' }).$type<Record<string, number>>(),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    startedAt: integer('started_at', { mode: 'timestamp_ms' }),
    finishedAt: integer('finished_at', { mode: 'timestamp_ms' }),
  },
  (table) => [index('audits_wave').on(table.waveId), index('audits_settings').on(table.waveId, table.settingsHash)],
);

/** The current decision per study and item: the cut list. */
export const decisions = sqliteTable(
  'decisions',
  {
    studyId: text('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    itemId: text('item_id').notNull(),
    decision: text('decision', { enum: decisionKinds }).notNull().default('undecided'),
    /** Target item of a merge. */
    intoItemId: text('into_item_id'),
    /** The new wording of a reword (null for every other decision). */
    wording: text('wording'),
    reason: text('reason').notNull().default(''),
    auditId: text('audit_id').references(() => audits.id, { onDelete: 'set null' }),
    decidedBy: text('decided_by').references(() => users.id, { onDelete: 'set null' }),
    decidedAt: integer('decided_at', { mode: 'timestamp_ms' }).notNull(),
  },
  (table) => [primaryKey({ columns: [table.studyId, table.itemId] })],
);

/** Every decision ever made, append-only. */
export const decisionHistory = sqliteTable(
  'decision_history',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    studyId: text('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    itemId: text('item_id').notNull(),
    decision: text('decision', { enum: decisionKinds }).notNull(),
    intoItemId: text('into_item_id'),
    /** The new wording of a reword. */
    wording: text('wording'),
    /** The decision this entry replaced ('undecided' for an item's first). */
    previousDecision: text('previous_decision', { enum: decisionKinds }).notNull().default('undecided'),
    reason: text('reason').notNull().default(''),
    auditId: text('audit_id').references(() => audits.id, { onDelete: 'set null' }),
    decidedBy: text('decided_by').references(() => users.id, { onDelete: 'set null' }),
    decidedAt: integer('decided_at', { mode: 'timestamp_ms' }).notNull(),
  },
  (table) => [index('decision_history_study').on(table.studyId, table.itemId)],
);

/** A published, numbered cut list: what the field manager programs. */
export const cutListVersions = sqliteTable(
  'cut_list_versions',
  {
    id: text('id').primaryKey(),
    studyId: text('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    /** [{ itemId, decision, into, reason, text }] frozen at publication. */
    items: text('items', { mode: 'json' }).$type<unknown[]>().notNull(),
    auditId: text('audit_id').references(() => audits.id, { onDelete: 'set null' }),
    publishedBy: text('published_by').references(() => users.id, { onDelete: 'set null' }),
    publishedAt: integer('published_at', { mode: 'timestamp_ms' }).notNull(),
    programmedBy: text('programmed_by').references(() => users.id, { onDelete: 'set null' }),
    programmedAt: integer('programmed_at', { mode: 'timestamp_ms' }),
  },
  (table) => [uniqueIndex('cut_list_versions_number').on(table.studyId, table.number)],
);

export const comments = sqliteTable(
  'comments',
  {
    id: text('id').primaryKey(),
    studyId: text('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    targetKind: text('target_kind', { enum: commentTargets }).notNull(),
    /** Item id or audit id; the study id for study comments. */
    targetId: text('target_id').notNull(),
    authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
    /** The comment this one answers (threads); null for a comment that starts a thread. */
    parentId: text('parent_id'),
    body: text('body').notNull(),
    createdAt: createdAt(),
  },
  (table) => [index('comments_target').on(table.studyId, table.targetKind, table.targetId)],
);

export const reviews = sqliteTable(
  'reviews',
  {
    id: text('id').primaryKey(),
    studyId: text('study_id').notNull().references(() => studies.id, { onDelete: 'cascade' }),
    cutListVersionId: text('cut_list_version_id').references(() => cutListVersions.id, { onDelete: 'cascade' }),
    reviewerId: text('reviewer_id').references(() => users.id, { onDelete: 'set null' }),
    verdict: text('verdict', { enum: reviewVerdicts }).notNull(),
    comment: text('comment').notNull().default(''),
    createdAt: createdAt(),
  },
  (table) => [index('reviews_study').on(table.studyId)],
);

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
