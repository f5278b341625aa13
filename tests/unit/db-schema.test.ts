/**
 * The schema split by domain (src/db/schema/) still describes exactly what the committed
 * migrations build: drizzle-kit's own differ (the code behind `npm run db:generate`) compares the
 * model with the latest snapshot in drizzle/meta and must find nothing to migrate. Also: every
 * domain file is re-exported from index.ts, the file drizzle.config.ts hands to drizzle-kit.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { generateSQLiteDrizzleJson, generateSQLiteMigration, type DrizzleSQLiteSnapshotJSON } from 'drizzle-kit/api';
import { describe, expect, it } from 'vitest';
import * as model from '../../src/db/schema';

const root = join(import.meta.dirname, '..', '..');
const schemaDir = join(root, 'src', 'db', 'schema');

function latestSnapshot(): DrizzleSQLiteSnapshotJSON {
  const journal = JSON.parse(readFileSync(join(root, 'drizzle', 'meta', '_journal.json'), 'utf8')) as { entries: { idx: number }[] };
  const last = Math.max(...journal.entries.map((e) => e.idx));
  const file = join(root, 'drizzle', 'meta', `${String(last).padStart(4, '0')}_snapshot.json`);
  return JSON.parse(readFileSync(file, 'utf8')) as DrizzleSQLiteSnapshotJSON;
}

describe('the database schema', () => {
  it('re-exports every domain file from index.ts (what drizzle.config.ts reads)', () => {
    const config = readFileSync(join(root, 'drizzle.config.ts'), 'utf8');
    expect(config).toContain("schema: './src/db/schema/index.ts'");
    const index = readFileSync(join(schemaDir, 'index.ts'), 'utf8');
    const domains = readdirSync(schemaDir).filter((f) => f.endsWith('.ts') && f !== 'index.ts' && f !== 'columns.ts');
    expect(domains.length).toBeGreaterThanOrEqual(8);
    const missing = domains.filter((f) => !index.includes(`export * from './${f.replace(/\.ts$/, '')}';`));
    expect(missing).toEqual([]);
  });

  it('matches the latest migration snapshot: nothing to migrate', async () => {
    const previous = latestSnapshot();
    const current = await generateSQLiteDrizzleJson(model as Record<string, unknown>, previous.id);
    expect(Object.keys(current.tables).sort()).toEqual(Object.keys(previous.tables).sort());
    expect(Object.keys(current.tables)).toHaveLength(18);
    expect(await generateSQLiteMigration(previous, current)).toEqual([]);
  });

  it('notices a table missing from the model (the comparison can fail)', async () => {
    const previous = latestSnapshot();
    const withoutOutbox = Object.fromEntries(Object.entries(model).filter(([name]) => name !== 'emailOutbox'));
    const current = await generateSQLiteDrizzleJson(withoutOutbox, previous.id);
    expect(await generateSQLiteMigration(previous, current)).toEqual(['DROP TABLE `email_outbox`;']);
  });
});

describe('the migrations folder', () => {
  it('is found from the working directory or MIGRATIONS_DIR, and its absence is said with the way out', async () => {
    const { migrationsFolder } = await import('../../src/db/migrate');
    const before = process.env.MIGRATIONS_DIR;
    try {
      process.env.MIGRATIONS_DIR = join(root, 'drizzle');
      expect(migrationsFolder()).toBe(join(root, 'drizzle'));
      // A server started elsewhere used to fail each request with Drizzle's bare "Can't find meta/_journal.json".
      process.env.MIGRATIONS_DIR = join(root, 'src');
      expect(() => migrationsFolder()).toThrow(`No database migrations at ${join(root, 'src')} (meta/_journal.json is missing)`);
      expect(() => migrationsFolder()).toThrow(/set MIGRATIONS_DIR/);
    } finally {
      if (before === undefined) delete process.env.MIGRATIONS_DIR;
      else process.env.MIGRATIONS_DIR = before;
    }
  });
});
