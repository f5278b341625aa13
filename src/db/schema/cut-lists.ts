/** The cut list: the current decision per item, every decision ever made, and published versions. */
import { index, integer, primaryKey, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { users } from './accounts';
import { audits } from './audits';
import { studies } from './studies';

export const decisionKinds = ['keep', 'drop', 'merge', 'reword', 'undecided'] as const;
export type DecisionKind = (typeof decisionKinds)[number];

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
