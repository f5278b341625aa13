/** The handoff: comments on a study, its items and audits, and the client's reviews of a version. */
import { index, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { users } from './accounts';
import { createdAt } from './columns';
import { cutListVersions } from './cut-lists';
import { studies } from './studies';

export const commentTargets = ['study', 'item', 'audit'] as const;
export const reviewVerdicts = ['approved', 'changes_requested'] as const;

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
