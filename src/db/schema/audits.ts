/** Audits: one run of the engine over a wave with given settings, its progress and its result. */
import { index, integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { users } from './accounts';
import { createdAt } from './columns';
import { waves } from './waves';

export const auditStatuses = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;

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
