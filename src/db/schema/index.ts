/**
 * The whole data model of Paredown (SQLite through Drizzle), one file per domain. Import it as
 * `src/db/schema`; `drizzle.config.ts` reads this file, so a new domain file is seen by
 * `npm run db:generate` only once it is re-exported here (tests/unit/db-schema.test.ts checks).
 *
 * Conventions: ids are random text (`newId()`), times are integer milliseconds since the epoch
 * (`timestamp_ms`, `createdAt()` in `columns.ts`), JSON lives in text columns (`mode: 'json'`),
 * and everything under a study is deleted with it (`onDelete: 'cascade'`).
 */
export * from './accounts';
export * from './teams';
export * from './studies';
export * from './waves';
export * from './audits';
export * from './cut-lists';
export * from './handoff';
export * from './activity';
