/**
 * Queries built once per connection. Drizzle turns a query builder into SQL text on every call
 * (walking the builder, quoting names, collecting parameters): on a study page that was about a
 * tenth of the web thread's time, for the same few queries with different ids
 * (docs/decisions/025-prepared-queries.md). A query written with `sql.placeholder(...)` for its
 * values and ended with `.prepare()` is built once; each call then only binds the values.
 */
import type { Db } from './client';

/**
 * A query prepared on first use for each connection (tests open several).
 * @param prepare builds the query with placeholders and calls `.prepare()`.
 * @returns the prepared query of a connection.
 * @example
 * const studyById = preparedQuery((db) => db.select().from(studies).where(eq(studies.id, sql.placeholder('id'))).prepare());
 * const study = studyById(getDb()).get({ id });
 */
export function preparedQuery<Query>(prepare: (db: Db) => Query): (db: Db) => Query {
  const kept = new WeakMap<Db, Query>();
  return (db) => {
    let query = kept.get(db);
    if (query === undefined) {
      query = prepare(db);
      kept.set(db, query);
    }
    return query;
  };
}
