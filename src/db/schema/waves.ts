/** Waves: the original uploads, each pilot wave read from them, and the wave's items. */
import { sql } from 'drizzle-orm';
import { blob, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { users } from './accounts';
import { createdAt } from './columns';
import { studies } from './studies';

export const waveStatuses = ['proposed', 'confirmed'] as const;

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
