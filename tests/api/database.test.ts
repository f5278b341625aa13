/** The database on its own: migrations from an empty file, and an idempotent demo seed. */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDatabase, type Db } from '../../src/db/client';
import { seedDemo } from '../../src/lib/server/demo-seed';
import { decodeMatrix } from '../../src/lib/ingest';

const folder = mkdtempSync(join(tmpdir(), 'paredown-db-test-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

function tableNames(db: Db): string[] {
  return (db.$client.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").all() as { name: string }[]).map((r) => r.name);
}

function dump(db: Db): Record<string, unknown[]> {
  const out: Record<string, unknown[]> = {};
  for (const name of tableNames(db)) out[name] = db.$client.prepare(`select * from "${name}" order by rowid`).all();
  return out;
}

function filesUnder(dir: string): Record<string, number> {
  const out: Record<string, number> = {};
  const walk = (d: string) => {
    for (const entry of readdirSync(d, { withFileTypes: true })) {
      const path = join(d, entry.name);
      if (entry.isDirectory()) walk(path);
      else out[path.slice(dir.length)] = statSync(path).mtimeMs;
    }
  };
  walk(dir);
  return out;
}

describe('migrations', () => {
  it('bring an empty file to the whole schema, with foreign keys on and WAL', () => {
    const db = openDatabase(join(folder, 'empty.sqlite'));
    const tables = tableNames(db);
    for (const expected of [
      'users', 'teams', 'memberships', 'invitations', 'studies', 'stored_files', 'waves', 'wave_items', 'audits',
      'decisions', 'decision_history', 'cut_list_versions', 'comments', 'reviews', 'activity_log', 'api_tokens',
      'email_outbox', 'sign_in_attempts', '__drizzle_migrations',
    ]) {
      expect(tables).toContain(expected);
    }
    expect(db.$client.pragma('foreign_keys', { simple: true })).toBe(1);
    expect(db.$client.pragma('journal_mode', { simple: true })).toBe('wal');
    const applied = db.$client.prepare('select count(*) as n from __drizzle_migrations').get() as { n: number };
    const committed = readdirSync('drizzle').filter((f) => f.endsWith('.sql')).length;
    expect(applied.n).toBe(committed);
    db.$client.close();
  });

  it('leave a migrated database unchanged when applied again', () => {
    const path = join(folder, 'twice.sqlite');
    const first = openDatabase(path);
    const before = dump(first);
    first.$client.close();
    const second = openDatabase(path);
    expect(dump(second)).toEqual(before);
    second.$client.close();
  });

  it('delete everything under a study with it', async () => {
    const db = openDatabase(join(folder, 'cascade.sqlite'));
    await seedDemo(db, { enabled: true, uploadDir: join(folder, 'cascade-uploads'), fixturesDir: 'fixtures/demo' });
    const count = (table: string) => (db.$client.prepare(`select count(*) as n from ${table}`).get() as { n: number }).n;
    const itemsOf = (wave: string) => (db.$client.prepare('select count(*) as n from wave_items where wave_id = ?').get(wave) as { n: number }).n;
    // Two demo studies with a wave each: the member survey's goes with its study, the other stays.
    expect(count('waves')).toBe(2);
    expect(itemsOf('wave-riverbend-pilot-1')).toBeGreaterThan(30);
    const otherItems = itemsOf('wave-riverbend-home-service-pilot');
    expect(otherItems).toBeGreaterThan(10);
    db.$client.prepare("delete from studies where id = 'study-riverbend-members-2027'").run();
    expect(count('waves')).toBe(1);
    expect(itemsOf('wave-riverbend-pilot-1')).toBe(0);
    expect(count('wave_items')).toBe(otherItems);
    db.$client.close();
  });
});

describe('demo seed', () => {
  it('seeds an empty database with the demo accounts, teams, study and pilot wave', async () => {
    const db = openDatabase(join(folder, 'seed.sqlite'));
    const outcome = await seedDemo(db, { enabled: true, uploadDir: join(folder, 'uploads'), fixturesDir: 'fixtures/demo' });
    expect(outcome.seeded).toBe(true);
    const users = db.$client.prepare('select email from users order by email').all() as { email: string }[];
    expect(users.map((u) => u.email)).toEqual([
      'designer@paredown.test', 'field@paredown.test', 'outsider@paredown.test', 'owner@paredown.test', 'reviewer@paredown.test',
    ]);
    const wave = db.$client.prepare("select * from waves where id = 'wave-riverbend-pilot-1'").get() as { row_count: number; item_count: number; file_hash: string; matrix: Buffer; status: string; respondent_ids: string };
    expect(wave.row_count).toBe(400); // fixtures/demo/README.md: 400 members answered
    expect(wave.item_count).toBe(41); // fixtures/demo/README.md: 41 item columns in six scales
    expect(wave.status).toBe('confirmed');
    const matrix = decodeMatrix(new Uint8Array(wave.matrix));
    expect([matrix.rows, matrix.columns]).toEqual([400, 41]);
    expect(JSON.parse(wave.respondent_ids).slice(0, 2)).toEqual(['270001', '270002']); // first rows of fixtures/demo/library-pilot-1.csv
    const reversed = db.$client.prepare("select item_id from wave_items where reverse = 1").all() as { item_id: string }[];
    expect(reversed.map((r) => r.item_id)).toEqual(['staff_6']); // fixtures/demo/library-codebook.csv: the one reverse-keyed item
    const stored = db.$client.prepare('select storage_path from stored_files where hash = ?').get(wave.file_hash) as { storage_path: string };
    expect(readFileSync(join(folder, 'uploads', stored.storage_path))).toEqual(readFileSync('fixtures/demo/library-pilot-1.csv'));
    // The home-service study: its wave audited, every item decided, version 1 published (not yet
    // programmed or reviewed), and the publication's e-mails to the field manager and the reviewer.
    const home = db.$client.prepare("select item_count, row_count from waves where id = 'wave-riverbend-home-service-pilot'").get() as { item_count: number; row_count: number };
    expect(home.item_count).toBe(14); // src/lib/synth/demo.ts, HOME_SERVICE_SPEC: 14 items in three scales
    const versions = db.$client.prepare("select number, programmed_at, items from cut_list_versions where study_id = 'study-riverbend-home-service-2026'").all() as { number: number; programmed_at: number | null; items: string }[];
    expect(versions.map((v) => [v.number, v.programmed_at])).toEqual([[1, null]]);
    const frozen = JSON.parse(versions[0].items) as { decision: string }[];
    expect(frozen).toHaveLength(home.item_count);
    expect(frozen.filter((item) => item.decision === 'undecided')).toEqual([]);
    expect(frozen.filter((item) => item.decision !== 'keep').length).toBeGreaterThan(0);
    expect((db.$client.prepare("select count(*) as n from reviews where study_id = 'study-riverbend-home-service-2026'").get() as { n: number }).n).toBe(0);
    const mails = db.$client.prepare('select "to", subject from email_outbox order by id').all() as { to: string; subject: string }[];
    expect(mails.map((mail) => mail.to).sort()).toEqual(['field@paredown.test', 'reviewer@paredown.test']);
    for (const mail of mails) expect(mail.subject).toBe('Cut list version 1 of “Riverbend home library service survey 2026” is published');
    db.$client.close();
  });

  it('changes nothing when run a second time', async () => {
    const path = join(folder, 'seed-twice.sqlite');
    const uploads = join(folder, 'uploads-twice');
    const db = openDatabase(path);
    expect((await seedDemo(db, { enabled: true, uploadDir: uploads, fixturesDir: 'fixtures/demo' })).seeded).toBe(true);
    const before = dump(db);
    const filesBefore = filesUnder(uploads);
    const second = await seedDemo(db, { enabled: true, uploadDir: uploads, fixturesDir: 'fixtures/demo' });
    expect(second).toMatchObject({ seeded: false, reason: 'the database has users already' });
    expect(dump(db)).toEqual(before);
    expect(filesUnder(uploads)).toEqual(filesBefore);
    db.$client.close();
  });

  it('does nothing when demo seeding is off', async () => {
    const db = openDatabase(join(folder, 'seed-off.sqlite'));
    const outcome = await seedDemo(db, { enabled: false, uploadDir: join(folder, 'uploads-off') });
    expect(outcome.seeded).toBe(false);
    expect((db.$client.prepare('select count(*) as n from users').get() as { n: number }).n).toBe(0);
    db.$client.close();
  });
});
