/**
 * Prepared statements kept by their SQL. Drizzle asks better-sqlite3 to prepare every query it
 * runs, and SQLite compiles the text each time: on a study page, a fifth of the web thread's work
 * was compiling the same few statements again (docs/decisions/023-page-cost.md). A statement is
 * reusable once its last use has ended, so the connection's `prepare` answers a kept statement for
 * SQL it has seen, in the state a fresh one has (rows as objects), unless that statement is still
 * being iterated, which gets a fresh one. SQLite recompiles a kept statement by itself when the
 * schema changes. At most `limit` statements are kept, the least recently asked for leaving first.
 */
import type Database from 'better-sqlite3';

/** Statements one connection keeps (queries with lists of different lengths each count). */
export const KEPT_STATEMENTS = 256;

/**
 * Makes the connection's `prepare` keep what it compiles.
 * @param sqlite the connection (changed in place).
 * @param limit statements kept at most.
 */
export function keepPreparedStatements(sqlite: Database.Database, limit: number = KEPT_STATEMENTS): void {
  const compile = sqlite.prepare.bind(sqlite);
  const kept = new Map<string, Database.Statement>();
  const prepare = (source: string): Database.Statement => {
    const statement = kept.get(source);
    if (statement !== undefined && !statement.busy) {
      kept.delete(source);
      kept.set(source, statement);
      // Drizzle switches a statement to arrays with raw() and never back: a fresh one gives objects.
      if (statement.reader) statement.raw(false);
      return statement;
    }
    const fresh = compile(source);
    if (statement === undefined) {
      kept.set(source, fresh);
      if (kept.size > limit) kept.delete(kept.keys().next().value as string);
    }
    return fresh;
  };
  sqlite.prepare = prepare as typeof sqlite.prepare;
}
