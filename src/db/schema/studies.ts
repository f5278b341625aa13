/** Studies: a team's questionnaire under audit, with the settings it carries into every audit. */
import { sql } from 'drizzle-orm';
import { index, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { users } from './accounts';
import { createdAt } from './columns';
import { teams } from './teams';

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
