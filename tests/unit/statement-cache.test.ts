/**
 * Kept prepared statements: the same SQL answers the same statement, in a fresh statement's state,
 * a statement still being iterated is never handed out twice, and the number kept is bounded.
 */
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { keepPreparedStatements } from '../../src/db/statement-cache';

function connection(limit?: number): Database.Database {
  const sqlite = new Database(':memory:');
  sqlite.exec('create table item (id text primary key, position integer); insert into item values (\'a\', 1), (\'b\', 2), (\'c\', 3);');
  keepPreparedStatements(sqlite, limit);
  return sqlite;
}

describe('kept prepared statements', () => {
  it('answers the kept statement for SQL it has seen, giving rows as objects after a raw() use', () => {
    const sqlite = connection();
    const first = sqlite.prepare('select id, position from item order by position');
    expect(first.raw().all()).toEqual([['a', 1], ['b', 2], ['c', 3]]);
    const second = sqlite.prepare('select id, position from item order by position');
    expect(second).toBe(first);
    expect(second.all()).toEqual([{ id: 'a', position: 1 }, { id: 'b', position: 2 }, { id: 'c', position: 3 }]);
    // Statements that return no rows are kept too.
    const insert = sqlite.prepare('insert into item values (?, ?)');
    insert.run('d', 4);
    expect(sqlite.prepare('insert into item values (?, ?)')).toBe(insert);
  });

  it('gives a fresh statement while the kept one is being iterated', () => {
    const sqlite = connection();
    const source = 'select id from item order by position';
    const outer = sqlite.prepare(source);
    const seen: string[] = [];
    for (const row of outer.iterate() as IterableIterator<{ id: string }>) {
      const inner = sqlite.prepare(source);
      expect(inner).not.toBe(outer);
      seen.push(`${row.id}:${(inner.all() as { id: string }[]).length}`);
    }
    expect(seen).toEqual(['a:3', 'b:3', 'c:3']);
    expect(sqlite.prepare(source)).toBe(outer);
  });

  it('keeps at most the limit, the least recently asked for leaving first', () => {
    const sqlite = connection(2);
    const one = sqlite.prepare('select 1');
    const two = sqlite.prepare('select 2');
    expect(sqlite.prepare('select 1')).toBe(one);
    sqlite.prepare('select 3');
    expect(sqlite.prepare('select 1')).toBe(one);
    expect(sqlite.prepare('select 2')).not.toBe(two);
  });

  it('sees a schema change: a kept statement is recompiled by SQLite', () => {
    const sqlite = connection();
    expect(sqlite.prepare('select * from item where id = ?').get('a')).toEqual({ id: 'a', position: 1 });
    sqlite.exec('alter table item add column label text');
    expect(sqlite.prepare('select * from item where id = ?').get('a')).toEqual({ id: 'a', position: 1, label: null });
  });
});
